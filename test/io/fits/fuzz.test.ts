/**
 * Property: whatever is done to a valid FITS file (byte flips, truncation, card edits,
 * inserted or removed blocks), the reader returns a spectrum or throws an InputError, each
 * call within a time bound, and never allocates beyond what the file justifies (a huge
 * allocation would throw a RangeError or take far longer than the bound).
 */
import fc from 'fast-check';
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { parseFitsSpectrum } from '../../../src/io/fits/spectrum.js';
import { verifyFitsChecksums } from '../../../src/io/fits/checksum.js';
import { encodeFitsSpectrum } from '../../../src/io/fits/write.js';
import { createSpectrum } from '../../../src/spectrum/spectrum.js';
import { Header } from '../../../src/spectrum/header.js';
import { FIXTURES, fixtureBytes } from './helpers.js';

/** Time bound per call: the files are ≤ 15 kB and a normal read takes well under 5 ms. */
const BOUND_MS = 200;

const bases: Uint8Array[] = [
  ...readdirSync(FIXTURES).filter((f) => f.endsWith('.fits')).map((f) => fixtureBytes(f)),
  encodeFitsSpectrum(createSpectrum({
    wavelength: Array.from({ length: 64 }, (_, i) => 5000 + i + 0.01 * i * i),
    flux: Array.from({ length: 64 }, (_, i) => Math.sin(i)),
    uncertainty: Array(64).fill(0.1),
    mask: Array.from({ length: 64 }, (_, i) => i % 7 === 0 ? 1 : 0),
    medium: 'air',
    header: Header.from([{ keyword: 'LONGSTR', value: 'z'.repeat(200) }, { keyword: 'LVAC HIER KEY', value: 1 }]),
  })),
  encodeFitsSpectrum(createSpectrum({ wavelength: [6000, 6001, 6002, 6003], flux: [1, 2, 3, 4], uncertainty: [1, 1, 1, 1], medium: 'vacuum' })),
];

/** Card texts likely to hit edge cases of the structure and WCS code. */
const NASTY_CARDS = [
  'END', 'NAXIS   =                   -5', 'NAXIS   =                  999', 'NAXIS   =                    0', 'NAXIS   =                    2',
  'NAXIS1  =                    0', 'NAXIS1  =      999999999999999', 'NAXIS1  = 99999999999999999999999', 'NAXIS2  =                    1', 'NAXIS2  =           2147483647',
  'BITPIX  =                    7', 'BITPIX  =                  -64', 'BITPIX  =                    8', "XTENSION= 'BINTABLE'", "XTENSION= 'IMAGE   '",
  'PCOUNT  =           1000000000', 'GCOUNT  =                    0', 'TFIELDS =                  999', "TFORM1  = '99999999999D'", "TFORM2  = '0E'", "TFORM1  = 'Q'",
  "TTYPE1  = 'WAVE'", "TTYPE2  = 'FLUX'", "TTYPE1  = 'loglam'", 'TSCAL2  =                  0.0', 'TNULL2  =                   -1',
  "CTYPE1  = 'FREQ'", "CTYPE1  = 'WAVE-LOG'", "CTYPE1  = 'AWAV-TAB'", 'CDELT1  =                  0.0', 'CRVAL1  =                -1.0', 'CD1_1   =               1.0E308',
  'CRPIX1  =              1.0E300', 'DC-FLAG =                    1', "CUNIT1  = 'furlong'", "CUNIT1  = 'm'", 'BSCALE  =                  0.0', 'BLANK   =                    0',
  "LONG    = 'x&'", "CONTINUE  '&'", "CONTINUE  'y'", "HIERARCH = 'x'", "OBJECT  = 'unterminated", "EXTNAME = 'ERROR'", "EXTNAME = 'IVAR'",
  'SIMPLE  =                    F', '        = garbage', 'DATE-OBS= 2026-05-14', 'CPLX    = (1, 2)', 'BIG     = 123456789012345678901234567890',
];

function timed(bytes: Uint8Array): void {
  const t0 = performance.now();
  try {
    const s = parseFitsSpectrum(bytes, 'fuzz.fits');
    expect(s.flux.length).toBe(s.wavelength.length);
    expect(s.flux.length).toBeGreaterThan(0);
    // Output never exceeds what the input justifies: one value per stored byte at most.
    expect(s.flux.length).toBeLessThanOrEqual(bytes.length);
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    expect(e.message.startsWith('fuzz.fits')).toBe(true);
  }
  try {
    verifyFitsChecksums(bytes, 'fuzz.fits');
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
  }
  const ms = performance.now() - t0;
  if (ms > BOUND_MS) throw new Error(`a read took ${ms.toFixed(1)} ms, more than ${BOUND_MS} ms`);
}

const base = fc.integer({ min: 0, max: bases.length - 1 }).map((i) => bases[i]);

describe('FITS reader under random damage (fast-check)', () => {
  it('valid bases read without error', () => {
    for (const b of bases) {
      try {
        parseFitsSpectrum(b, 'fuzz.fits');
      } catch (e) {
        // Only the deliberate 2-D image fixture may fail.
        expect((e as InputError).code).toBe('fits.image-not-spectrum');
      }
    }
  });

  it('byte flips', () => {
    fc.assert(
      fc.property(base, fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }), fc.boolean(), (b, flips, inHeader) => {
        const bytes = b.slice();
        // Half the runs aim at the first header block, where damage matters most.
        for (const [p, v] of flips) bytes[inHeader ? p % 2880 : p % bytes.length] = v;
        timed(bytes);
      }),
      { numRuns: 1000, seed: 20260514 },
    );
  });

  it('truncations', () => {
    fc.assert(fc.property(base, fc.double({ min: 0, max: 1, noNaN: true }), (b, f) => timed(b.slice(0, Math.floor(f * b.length)))), { numRuns: 400, seed: 1 });
  });

  it('card edits', () => {
    fc.assert(
      fc.property(base, fc.nat(), fc.oneof(fc.constantFrom(...NASTY_CARDS), fc.string({ maxLength: 80 })), fc.constantFrom('replace', 'insert', 'delete'), (b, at, text, how) => {
        const cardsInFile = Math.floor(b.length / 80);
        const k = at % cardsInFile;
        const card = new Uint8Array(80).fill(0x20);
        for (let i = 0; i < Math.min(80, text.length); i++) card[i] = text.charCodeAt(i) & 0xff;
        let bytes: Uint8Array;
        if (how === 'replace') {
          bytes = b.slice();
          bytes.set(card, 80 * k);
        } else if (how === 'insert') {
          // Insert a card and drop the last blank one of its block, keeping the block length.
          bytes = b.slice();
          const block = Math.floor(k / 36) * 2880;
          const tail = b.slice(80 * k, block + 2880 - 80);
          bytes.set(card, 80 * k);
          bytes.set(tail, 80 * k + 80);
        } else {
          bytes = b.slice();
          const block = Math.floor(k / 36) * 2880;
          bytes.set(b.slice(80 * k + 80, block + 2880), 80 * k);
          bytes.fill(0x20, block + 2880 - 80, block + 2880);
        }
        timed(bytes);
      }),
      { numRuns: 1200, seed: 7 },
    );
  });

  it('inserted and removed blocks', () => {
    fc.assert(
      fc.property(base, fc.nat(), fc.constantFrom('zeros', 'blanks', 'random', 'copy', 'remove'), fc.uint8Array({ minLength: 2880, maxLength: 2880 }), (b, at, kind, random) => {
        const blocks = b.length / 2880;
        const k = at % (blocks + 1);
        let bytes: Uint8Array;
        if (kind === 'remove') {
          if (blocks < 2) return;
          const r = k % blocks;
          bytes = new Uint8Array(b.length - 2880);
          bytes.set(b.subarray(0, r * 2880));
          bytes.set(b.subarray((r + 1) * 2880), r * 2880);
        } else {
          const block = kind === 'zeros' ? new Uint8Array(2880) : kind === 'blanks' ? new Uint8Array(2880).fill(0x20) : kind === 'random' ? random : b.slice((k % blocks) * 2880, (k % blocks + 1) * 2880);
          bytes = new Uint8Array(b.length + 2880);
          bytes.set(b.subarray(0, k * 2880));
          bytes.set(block, k * 2880);
          bytes.set(b.subarray(k * 2880), (k + 1) * 2880);
        }
        timed(bytes);
      }),
      { numRuns: 500, seed: 11 },
    );
  });
});
