import { mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync, linkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { UsageError } from '../../../src/errors.js';
import { parseTextSpectrum } from '../../../src/io/text/read.js';
import { formatTextSpectrum, writeTextSpectrum } from '../../../src/io/text/write.js';
import { readSpectrum } from '../../../src/io/read.js';
import { Header, type HeaderCard } from '../../../src/spectrum/header.js';
import { provenanceEntry } from '../../../src/spectrum/provenance.js';
import { createSpectrum, type SpectralUnit, type Spectrum } from '../../../src/spectrum/spectrum.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-text-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Element-wise identity (Object.is: NaN equals NaN, −0 differs from 0). */
function sameArray(a: ArrayLike<number> | undefined, b: ArrayLike<number> | undefined): boolean {
  if (a === undefined || b === undefined) return a === b;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function expectSameSpectrum(back: Spectrum, s: Spectrum): void {
  expect(sameArray(back.wavelength, s.wavelength)).toBe(true);
  expect(sameArray(back.flux, s.flux)).toBe(true);
  expect(sameArray(back.uncertainty, s.uncertainty)).toBe(true);
  expect(sameArray(back.mask, s.mask)).toBe(true);
  expect(back.unit).toBe(s.unit);
  expect(back.medium).toBe(s.medium);
  expect(back.fluxUnit).toBe(s.fluxUnit);
  expect(back.header.cards).toEqual(s.header.cards);
  expect(back.provenance.slice(0, -1)).toEqual(s.provenance);
  expect(back.provenance.at(-1)?.step).toBe('read-text');
}

const finiteNoNegZero = fc.double({ noNaN: true, noDefaultInfinity: true }).filter((x) => !Object.is(x, -0));

const spectrumArb = fc
  .record({
    n: fc.integer({ min: 1, max: 40 }),
    start: fc.double({ min: -1e6, max: 1e6, noNaN: true }),
    steps: fc.array(fc.double({ min: 1e-9, max: 1e3, noNaN: true }), { minLength: 40, maxLength: 40 }),
    decreasing: fc.boolean(),
    flux: fc.array(fc.double(), { minLength: 40, maxLength: 40 }),
    unc: fc.option(fc.array(fc.double(), { minLength: 40, maxLength: 40 })),
    mask: fc.option(fc.array(fc.integer({ min: 0, max: 1 }), { minLength: 40, maxLength: 40 })),
    unit: fc.constantFrom<SpectralUnit>('angstrom', 'nm', 'um', 'pixel'),
    medium: fc.constantFrom('air' as const, 'vacuum' as const, null),
    fluxUnit: fc.option(fc.string({ minLength: 1, maxLength: 12 }).map((u) => u.replace(/[\r\n]/g, '').trim()).filter((u) => u !== '')),
    cards: fc.array(
      fc.oneof(
        fc.record({ keyword: fc.string({ maxLength: 10 }), value: fc.oneof(fc.string(), finiteNoNegZero, fc.boolean(), fc.constant(null), fc.bigInt()) }),
        fc.record({ keyword: fc.constantFrom('HISTORY', 'COMMENT'), text: fc.string() }),
        fc.record({ keyword: fc.constant('EXPTIME'), value: finiteNoNegZero, comment: fc.string(), rawValue: fc.string() }),
      ),
      { maxLength: 4 },
    ),
    steps2: fc.array(fc.record({ step: fc.string({ minLength: 1, maxLength: 8 }), params: fc.dictionary(fc.string({ maxLength: 6 }), fc.oneof(fc.string(), fc.integer(), fc.boolean())) }), { maxLength: 3 }),
  })
  .map((r) => {
    const w: number[] = [];
    let x = r.start;
    for (let i = 0; i < r.n; i++) {
      w.push(x);
      const next = x + r.steps[i];
      x = next > x ? next : x + Math.abs(x) * 1e-12 + 1e-300;
    }
    if (r.decreasing) w.reverse();
    return createSpectrum({
      wavelength: w,
      flux: r.flux.slice(0, r.n),
      uncertainty: r.unc?.slice(0, r.n),
      mask: r.mask?.slice(0, r.n),
      unit: r.unit,
      medium: r.medium,
      fluxUnit: r.fluxUnit,
      header: Header.from(r.cards as HeaderCard[]),
      provenance: r.steps2.map((p) => provenanceEntry(p.step, p.params)),
    });
  });

describe('formatTextSpectrum / parseTextSpectrum round trip', () => {
  it('gives back exactly the same arrays, units, medium, header and provenance (CSV and TSV)', () => {
    fc.assert(
      fc.property(spectrumArb, fc.constantFrom('csv' as const, 'tsv' as const), (s, format) => {
        const text = formatTextSpectrum(s, { format });
        const back = parseTextSpectrum(new TextEncoder().encode(text), 'rt.csv');
        expectSameSpectrum(back, s);
      }),
      { numRuns: 300, seed: 20260412 },
    );
  });

  it('writes a header row naming columns and units, comment lines with medium and provenance', () => {
    const s = createSpectrum({
      wavelength: [656.1, 656.2],
      flux: [1, -0],
      uncertainty: [0.1, NaN],
      mask: [0, 1],
      unit: 'nm',
      medium: 'air',
      fluxUnit: 'adu',
      provenance: [provenanceEntry('calibrate', { lamp: 'neon' })],
    });
    expect(formatTextSpectrum(s, { comments: ['invented sample', 'second line'] })).toBe(
      [
        '# spectrum written by lineshift 0.1.0',
        '# invented sample',
        '# second line',
        '# medium: air',
        '# provenance: {"step":"calibrate","parameters":{"lamp":"neon"},"version":"lineshift 0.1.0"}',
        'wavelength [nm],flux [adu],uncertainty [adu],mask',
        '656.1,1,0.1,0',
        '656.2,-0,NaN,1',
        '',
      ].join('\n'),
    );
    expect(formatTextSpectrum(s, { format: 'tsv' }).split('\n')[3]).toBe('wavelength [nm]\tflux [adu]\tuncertainty [adu]\tmask');
  });

  it('does not modify the spectrum it writes', () => {
    const s = createSpectrum({ wavelength: [1, 2], flux: [3, 4], unit: 'nm' });
    const before = { w: s.wavelength.slice(), f: s.flux.slice() };
    formatTextSpectrum(s);
    expect(s.wavelength).toEqual(before.w);
    expect(s.flux).toEqual(before.f);
  });
});

describe('writeTextSpectrum', () => {
  it('writes through a temporary file in the same folder and leaves none behind; the file reads back exactly', () => {
    const s = createSpectrum({ wavelength: [6562.1, 6562.2, 6562.3], flux: [0.1, 0.2, 1 / 3], unit: 'angstrom', medium: 'vacuum' });
    const path = join(dir, 'out.csv');
    writeFileSync(path, 'old content');
    writeTextSpectrum(path, s);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    const back = readSpectrum(path);
    expectSameSpectrum(back, s);
    expect(readFileSync(path, 'utf8')).toBe(formatTextSpectrum(s));
  });

  it('refuses to overwrite the file the spectrum was read from (same path, a symlink, or a hard link)', () => {
    const input = join(dir, 'input.csv');
    writeFileSync(input, 'wavelength [nm],flux\n500,1\n501,2\n');
    const s = readSpectrum(input);
    const link = join(dir, 'link.csv');
    symlinkSync(input, link);
    const hard = join(dir, 'hard.csv');
    linkSync(input, hard);
    for (const target of [input, link, hard, join(dir, '.', 'input.csv')]) {
      try {
        writeTextSpectrum(target, s);
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(UsageError);
        expect((e as UsageError).message).toBe(`${target}: refusing to overwrite the spectrum's own input file ${input}; choose another output name`);
      }
    }
    expect(readFileSync(input, 'utf8')).toBe('wavelength [nm],flux\n500,1\n501,2\n');
  });

  it('refuses a folder as output', () => {
    const s = createSpectrum({ wavelength: [1, 2], flux: [3, 4], unit: 'nm' });
    expect(() => writeTextSpectrum(dir, s)).toThrow(`${dir}: the output path is a folder, not a file`);
  });
});
