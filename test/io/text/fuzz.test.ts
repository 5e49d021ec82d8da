import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { parseTextSpectrum } from '../../../src/io/text/read.js';
import { formatTextSpectrum } from '../../../src/io/text/write.js';
import { createSpectrum } from '../../../src/spectrum/spectrum.js';

/** Time bound per parse of a file of a few kB: generous against a loaded CI machine (a parse takes well under 1 ms here). */
const MAX_MS_PER_PARSE = 250;

/** Valid text spectra in several layouts. */
const validFile = fc
  .record({
    n: fc.integer({ min: 2, max: 60 }),
    start: fc.double({ min: 3000, max: 9000, noNaN: true }),
    step: fc.double({ min: 0.01, max: 5, noNaN: true }),
    withUnc: fc.boolean(),
    layout: fc.constantFrom('csv', 'tsv', 'whitespace', 'semicolon', 'bare'),
    crlf: fc.boolean(),
    bom: fc.boolean(),
    seedFlux: fc.array(fc.double({ min: -10, max: 1e5, noNaN: true }), { minLength: 60, maxLength: 60 }),
  })
  .map((r) => {
    const s = createSpectrum({
      wavelength: Array.from({ length: r.n }, (_, i) => r.start + i * r.step),
      flux: r.seedFlux.slice(0, r.n),
      uncertainty: r.withUnc ? r.seedFlux.slice(0, r.n).map((f) => Math.abs(f) / 10 + 1) : undefined,
      unit: 'angstrom',
      medium: 'air',
    });
    let text: string;
    if (r.layout === 'csv' || r.layout === 'tsv') text = formatTextSpectrum(s, { format: r.layout });
    else {
      const d = r.layout === 'semicolon' ? ';' : '   ';
      const rows = Array.from(s.wavelength, (w, i) => [w, s.flux[i], ...(s.uncertainty ? [s.uncertainty[i]] : [])].join(d));
      text = (r.layout === 'bare' ? '' : `# medium: air\nwavelength [Angstrom]${d}flux${s.uncertainty ? `${d}sigma` : ''}\n`) + rows.join('\n') + '\n';
    }
    if (r.crlf) text = text.replace(/\n/g, '\r\n');
    return (r.bom ? '\ufeff' : '') + text;
  });

type Mutation =
  | { kind: 'delete'; at: number; length: number }
  | { kind: 'insert'; at: number; text: string }
  | { kind: 'byte'; at: number; byte: number }
  | { kind: 'duplicate-line'; at: number }
  | { kind: 'swap-lines'; a: number; b: number }
  | { kind: 'truncate'; at: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 20 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(fc.string({ maxLength: 8 }), fc.constantFrom(',', '\t', '"', '#', '\n', 'nan', '-', 'e', '1e999', '\u0000', '\r', ' ', '[nm]', 'Å')) }),
  fc.record({ kind: fc.constant('byte' as const), at: fc.nat(), byte: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ kind: fc.constant('duplicate-line' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swap-lines' as const), a: fc.nat(), b: fc.nat() }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
);

function mutate(text: string, ms: Mutation[]): Uint8Array {
  let bytes = new TextEncoder().encode(text);
  for (const m of ms) {
    const n = bytes.length;
    if (n === 0) break;
    if (m.kind === 'byte') {
      bytes = bytes.slice();
      bytes[m.at % n] = m.byte;
      continue;
    }
    let t = new TextDecoder('latin1').decode(bytes);
    if (m.kind === 'delete') {
      const at = m.at % t.length;
      t = t.slice(0, at) + t.slice(at + m.length);
    } else if (m.kind === 'insert') {
      const at = m.at % (t.length + 1);
      t = t.slice(0, at) + m.text + t.slice(at);
    } else if (m.kind === 'truncate') {
      t = t.slice(0, m.at % t.length);
    } else {
      const lines = t.split('\n');
      if (m.kind === 'duplicate-line') {
        const i = m.at % lines.length;
        lines.splice(i, 0, lines[i]);
      } else {
        const a = m.a % lines.length;
        const b = m.b % lines.length;
        [lines[a], lines[b]] = [lines[b], lines[a]];
      }
      t = lines.join('\n');
    }
    bytes = Uint8Array.from(t, (c) => c.charCodeAt(0) & 0xff);
  }
  return bytes;
}

describe('parseTextSpectrum on mutated files', () => {
  it('either returns a valid spectrum or throws an InputError, quickly', () => {
    let worstMs = 0;
    let ok = 0;
    let rejected = 0;
    fc.assert(
      fc.property(validFile, fc.array(mutation, { minLength: 1, maxLength: 4 }), (text, ms) => {
        const bytes = mutate(text, ms);
        const t0 = performance.now();
        try {
          const s = parseTextSpectrum(bytes, 'fuzz.csv', { unit: 'angstrom' });
          expect(s.wavelength.length).toBe(s.flux.length);
          expect(s.wavelength.length).toBeGreaterThan(0);
          for (const w of s.wavelength) expect(Number.isFinite(w)).toBe(true);
          ok++;
        } catch (e) {
          if (!(e instanceof InputError)) throw e;
          expect(e.message.startsWith('fuzz.csv')).toBe(true);
          expect(e.code).toMatch(/^(text|spectrum)\.[a-z-]+$/);
          rejected++;
        }
        const dt = performance.now() - t0;
        worstMs = Math.max(worstMs, dt);
        expect(dt).toBeLessThan(MAX_MS_PER_PARSE);
      }),
      { numRuns: 1500, seed: 7 },
    );
    console.info(`mutated text files: ${ok} read, ${rejected} rejected with InputError; slowest parse ${worstMs.toFixed(2)} ms`);
    expect(ok).toBeGreaterThan(50);
    expect(rejected).toBeGreaterThan(50);
  });

  it('rejects a 4 MB file of one line quickly, without building rows', () => {
    const bytes = new Uint8Array(4_000_000).fill(0x37);
    const t0 = performance.now();
    expect(() => parseTextSpectrum(bytes, 'long.csv')).toThrow('long.csv: line 1: the line is longer than 65536 characters');
    expect(performance.now() - t0).toBeLessThan(2000);
  });
});
