import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { UsageError } from '../../../src/errors.js';
import { verifyFitsChecksums } from '../../../src/io/fits/checksum.js';
import { parseFitsSpectrum } from '../../../src/io/fits/spectrum.js';
import { parseFitsStructure } from '../../../src/io/fits/structure.js';
import { AXIS_TOLERANCE_PIXELS, encodeFitsSpectrum, writeFitsSpectrum, wrap } from '../../../src/io/fits/write.js';
import { readSpectrum } from '../../../src/io/read.js';
import { collectingLogger } from '../../../src/logger.js';
import { Header } from '../../../src/spectrum/header.js';
import { provenanceEntry } from '../../../src/spectrum/provenance.js';
import { createSpectrum, type Spectrum, type SpectrumInit } from '../../../src/spectrum/spectrum.js';
import { fixture, fixtureBytes, hex64 } from './helpers.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-fits-write-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const N = 200;
function flux(n = N): number[] {
  // Values that need all 53 bits (not float32-representable), with a NaN.
  return Array.from({ length: n }, (_, i) => (i === 17 ? NaN : 1000 + 100 * Math.sin(i / 7) + 1 / 3));
}

const header = Header.from([
  { keyword: 'SIMPLE', value: true },
  { keyword: 'BITPIX', value: 16 },
  { keyword: 'NAXIS', value: 1 },
  { keyword: 'NAXIS1', value: 99 },
  { keyword: 'BSCALE', value: 2 },
  { keyword: 'CRVAL1', value: 1 },
  { keyword: 'OBJECT', value: 'LVAC-7', comment: 'invented star' },
  { keyword: 'DATE-OBS', value: '2026-05-14T03:12:45.5' },
  { keyword: 'EXPTIME', value: 150, rawValue: '1.5D2', comment: 'D exponent kept' },
  { keyword: 'BIGINT', value: 1234567890123456789012n },
  { keyword: 'NOVALUE', value: null, comment: 'undefined' },
  { keyword: 'CPLX', value: '(1.5, -2.0)', rawValue: '(1.5, -2.0)' },
  { keyword: 'FLAG', value: false },
  { keyword: 'QUOTE', value: "it's" },
  { keyword: 'LONGSTR', value: 'x'.repeat(150) + " with a quote ' inside", comment: 'a long comment that will not fit on the last card of the long string at all, so it continues' },
  { keyword: 'LVAC DET CHIP NAME', value: 'Invented CCD', comment: 'HIERARCH' },
  { keyword: 'COMMENT', text: 'This spectrum is INVENTED test data.' },
  { keyword: 'HISTORY', text: 'an earlier step' },
  { keyword: '', text: '  blank keyword commentary' },
  { keyword: 'CHECKSUM', value: 'stale' },
  { keyword: 'DATASUM', value: '0' },
]);

function spectrum(init: Partial<SpectrumInit> = {}): Spectrum {
  return createSpectrum({
    wavelength: Array.from({ length: N }, (_, i) => 6000 + 0.25 * i),
    flux: flux(),
    medium: 'air',
    fluxUnit: 'adu',
    header,
    provenance: [provenanceEntry('calibrate', { lamp: 'neon-argon', order: 3, lines: Array.from({ length: 20 }, (_, i) => 5852.4878 + i) })],
    ...init,
  });
}

/** Cards of a header without those the writer rewrites (structural, WCS, scaling, checksum). */
function lasting(h: Header): string[] {
  return h.cards
    .filter((c) => !['SIMPLE', 'XTENSION', 'BITPIX', 'NAXIS', 'NAXIS1', 'NAXIS2', 'EXTEND', 'BSCALE', 'CRVAL1', 'CDELT1', 'CRPIX1', 'CTYPE1', 'CUNIT1', 'BUNIT', 'CHECKSUM', 'DATASUM', 'DC-FLAG', 'PCOUNT', 'GCOUNT', 'TFIELDS', 'EXTNAME', 'AIRORVAC'].includes(c.keyword) && !/^T(TYPE|FORM|UNIT)\d$/.test(c.keyword))
    .map((c) => JSON.stringify([c.keyword, c.value, c.comment, c.text, c.rawValue], (_, v) => (typeof v === 'bigint' ? `${v}n` : v)));
}

describe('encodeFitsSpectrum / parseFitsSpectrum round trip', () => {
  it('float64, linear air WCS: flux bit-exact, wavelengths to float64 rounding, every lasting card kept', () => {
    const s = spectrum({ uncertainty: Array.from({ length: N }, (_, i) => 1 + i / 3), mask: Array.from({ length: N }, (_, i) => (i % 50 === 3 ? 1 : 0)) });
    const bytes = encodeFitsSpectrum(s);
    expect(bytes.length % 2880).toBe(0);
    const r = parseFitsSpectrum(bytes, 'round.fits');
    expect(hex64(r.flux)).toEqual(hex64(s.flux));
    expect(hex64(r.uncertainty!)).toEqual(hex64(s.uncertainty!));
    expect(Array.from(r.mask!)).toEqual(Array.from(s.mask!));
    expect(r.unit).toBe('angstrom');
    expect(r.medium).toBe('air');
    expect(r.fluxUnit).toBe('adu');
    // The axis is recomputed from CRVAL1 + CDELT1·(p − 1): a few ulp of 6000 Å (1e-12 Å) at most.
    for (let i = 0; i < N; i++) expect(Math.abs(r.wavelength[i] - s.wavelength[i])).toBeLessThan(1e-9);
    const theirs = lasting(r.header);
    const ours = lasting(s.header);
    expect(theirs.slice(0, ours.length)).toEqual(ours);
    expect(r.header.get('CTYPE1')).toBe('AWAV');
    expect(r.header.get('CHECKSUM')).not.toBe('stale');
  });

  it('writes the provenance as HISTORY lines of at most 72 characters, in order', () => {
    const s = spectrum();
    const r = parseFitsSpectrum(encodeFitsSpectrum(s), 'h.fits');
    const history = r.header.commentary('HISTORY');
    expect(history[0]).toBe('an earlier step');
    const lines = history.slice(1);
    expect(lines.length).toBeGreaterThan(1);
    for (const line of lines) expect(line.length).toBeLessThanOrEqual(72);
    expect(lines.join('')).toBe(`lineshift 0.1.0 calibrate ${JSON.stringify(s.provenance[0].parameters)}`);
    expect(lines[0].startsWith('lineshift 0.1.0 calibrate {')).toBe(true);
  });

  it('float32 round trip is bit-exact for float32 values', () => {
    const f = Float32Array.from(flux());
    const s = spectrum({ flux: f });
    const bytes = encodeFitsSpectrum(s, { dataType: 'float32' });
    expect(parseFitsStructure(bytes, 'f.fits')[0].bitpix).toBe(-32);
    const r = parseFitsSpectrum(bytes, 'f.fits');
    expect(hex64(r.flux)).toEqual(hex64(Float64Array.from(f)));
    // float32 of float64 data rounds each value to 24 bits: relative error ≤ 2^-24.
    const r2 = parseFitsSpectrum(encodeFitsSpectrum(spectrum(), { dataType: 'float32' }), 'g.fits');
    const s2 = spectrum();
    for (let i = 0; i < N; i++) if (!Number.isNaN(s2.flux[i])) expect(Math.abs(r2.flux[i] - s2.flux[i]) / s2.flux[i]).toBeLessThanOrEqual(2 ** -24);
  });

  it.each([
    ['vacuum', 'WAVE-LOG', 'vacuum'],
    ['air', 'AWAV-LOG', 'air'],
    [null, 'LINEAR', null],
  ] as const)('log-linear axis, medium %s: CTYPE1 %s, read back to 1e-12 relative', (medium, ctype, back) => {
    const w = Array.from({ length: N }, (_, i) => 4000 * Math.exp((i * 2e-5)));
    const s = spectrum({ wavelength: w, medium });
    const r = parseFitsSpectrum(encodeFitsSpectrum(s), 'log.fits');
    expect(r.header.get('CTYPE1')).toBe(ctype);
    expect(r.medium).toBe(back);
    if (medium === null) expect(r.header.get('DC-FLAG')).toBe(1);
    for (let i = 0; i < N; i++) expect(Math.abs(r.wavelength[i] - w[i]) / w[i]).toBeLessThan(1e-12);
    expect(hex64(r.flux)).toEqual(hex64(s.flux));
  });

  it('writes a neither-linear-nor-log axis as a binary table, read back exactly', () => {
    const w = Array.from({ length: N }, (_, i) => 5000 + i + 1e-4 * i * i);
    const s = spectrum({ wavelength: w, medium: 'vacuum', unit: 'nm', uncertainty: Array.from({ length: N }, () => 0.5), mask: Array.from({ length: N }, (_, i) => (i === 5 ? 1 : 0)) });
    const bytes = encodeFitsSpectrum(s, { dataType: 'float32' });
    const hdus = parseFitsStructure(bytes, 't.fits');
    expect(hdus.map((h) => h.kind)).toEqual(['primary', 'bintable']);
    const r = parseFitsSpectrum(bytes, 't.fits');
    expect(r.source?.hdu).toBe(1);
    expect(hex64(r.wavelength)).toEqual(hex64(s.wavelength));
    expect(hex64(r.flux)).toEqual(hex64(Float64Array.from(Float32Array.from(s.flux))));
    expect(Array.from(r.uncertainty!)).toEqual(Array.from(s.uncertainty!));
    expect(Array.from(r.mask!)).toEqual(Array.from(s.mask!));
    expect([r.unit, r.medium, r.fluxUnit]).toEqual(['nm', 'vacuum', 'adu']);
    expect(lasting(r.header).slice(0, lasting(s.header).length)).toEqual(lasting(s.header));
  });

  it('chooses the layout from the axis within the tolerance, or as forced', () => {
    const kind = (bytes: Uint8Array) => parseFitsStructure(bytes, 'k.fits').map((h) => h.kind).join(',');
    const base = Array.from({ length: N }, (_, i) => 6000 + 0.25 * i);
    // A departure of 1e-7 pixel (below AXIS_TOLERANCE_PIXELS) still counts as linear; 1e-5 does not.
    const bumped = (px: number) => base.map((v, i) => (i === 100 ? v + 0.25 * px : v));
    expect(AXIS_TOLERANCE_PIXELS).toBe(1e-6);
    expect(kind(encodeFitsSpectrum(spectrum({ wavelength: bumped(1e-7) })))).toBe('primary');
    expect(kind(encodeFitsSpectrum(spectrum({ wavelength: bumped(1e-5) })))).toBe('primary,bintable');
    const log = collectingLogger();
    const forced = encodeFitsSpectrum(spectrum({ wavelength: bumped(1e-5) }), { layout: 'linear', logger: log });
    expect(kind(forced)).toBe('primary');
    expect(log.warnings.map((w) => w.code)).toEqual(['fits.forced-linear']);
    expect(kind(encodeFitsSpectrum(spectrum(), { layout: 'table' }))).toBe('primary,bintable');
  });

  it('writes the pixel index without a WCS and other pixel axes with CTYPE1 PIXEL', () => {
    const s = createSpectrum({ wavelength: Array.from({ length: 10 }, (_, i) => i), flux: Array(10).fill(1), unit: 'pixel' });
    const bytes = encodeFitsSpectrum(s);
    expect(parseFitsStructure(bytes, 'p.fits')[0].header.has('CRVAL1')).toBe(false);
    const r = parseFitsSpectrum(bytes, 'p.fits');
    expect([r.unit, Array.from(r.wavelength)]).toEqual(['pixel', Array.from(s.wavelength)]);
    const shifted = createSpectrum({ wavelength: Array.from({ length: 10 }, (_, i) => 100 + i), flux: Array(10).fill(1), unit: 'pixel' });
    const r2 = parseFitsSpectrum(encodeFitsSpectrum(shifted), 'p2.fits');
    expect(r2.header.get('CTYPE1')).toBe('PIXEL');
    expect([r2.unit, Array.from(r2.wavelength)]).toEqual(['pixel', Array.from(shifted.wavelength)]);
  });

  it('does not modify the spectrum it writes', () => {
    const s = spectrum({ uncertainty: Array(N).fill(2) });
    const before = [hex64(s.wavelength), hex64(s.flux), hex64(s.uncertainty!), JSON.stringify(s.header.toJSON()), s.provenance.length];
    encodeFitsSpectrum(s, { dataType: 'float32' });
    encodeFitsSpectrum(s, { layout: 'table' });
    expect([hex64(s.wavelength), hex64(s.flux), hex64(s.uncertainty!), JSON.stringify(s.header.toJSON()), s.provenance.length]).toEqual(before);
  });

  it('replaces non-ASCII text with ? and warns, drops non-finite numbers', () => {
    const log = collectingLogger();
    const s = spectrum({ header: Header.from([{ keyword: 'OBSERVER', value: 'Zoë Ångström' }, { keyword: 'BAD', value: NaN }]) });
    const r = parseFitsSpectrum(encodeFitsSpectrum(s, { logger: log }), 'a.fits');
    expect(r.header.get('OBSERVER')).toBe('Zo? ?ngstr?m');
    expect(r.header.has('BAD')).toBe(false);
    expect(log.warnings.map((w) => w.code).sort()).toEqual(['fits.card-non-ascii', 'fits.card-not-written']);
  });

  it('skips, with a warning, cards FITS cannot hold', () => {
    const log = collectingLogger();
    const s = spectrum({ header: Header.from([{ keyword: 'K'.repeat(70), value: 1 }, { keyword: 'LONG TEXT KEY', text: 'no value' }, { keyword: 'KEPT', value: 2 }]) });
    const r = parseFitsSpectrum(encodeFitsSpectrum(s, { logger: log }), 'k.fits');
    expect(r.header.get('KEPT')).toBe(2);
    expect(r.header.has('K'.repeat(70))).toBe(false);
    expect(log.warnings.map((w) => w.code)).toEqual(['fits.card-not-written', 'fits.card-not-written']);
  });

  it('rejects bad options with a UsageError', () => {
    expect(() => encodeFitsSpectrum(spectrum(), { dataType: 'int16' as never })).toThrow(UsageError);
    expect(() => encodeFitsSpectrum(spectrum(), { layout: 'spline' as never })).toThrow(/layout must be/);
  });
});

describe('FITS checksums (FITS Standard 4.0 §4.4.2.7, Appendix J)', () => {
  it('verifies CHECKSUM and DATASUM written by astropy (test/fixtures/fits/checksum_astropy.fits)', () => {
    const expected = JSON.parse(readFileSync(fixture('expected.json'), 'utf8')).files['checksum_astropy.fits'].checksums as { checksum: number; datasum: number }[];
    const ours = verifyFitsChecksums(fixtureBytes('checksum_astropy.fits'), 'c.fits');
    // astropy: 1 = ok, 0 = bad, 2 = absent.
    const code = { ok: 1, bad: 0, absent: 2 } as const;
    expect(ours.map((r) => ({ checksum: code[r.checksum], datasum: code[r.datasum] }))).toEqual(expected);
  });

  it('accepts our own output and catches a flipped bit in header or data', () => {
    const bytes = encodeFitsSpectrum(spectrum({ uncertainty: Array(N).fill(2) }));
    expect(verifyFitsChecksums(bytes, 'ok.fits')).toEqual([
      { hdu: 0, checksum: 'ok', datasum: 'ok' },
      { hdu: 1, checksum: 'ok', datasum: 'ok' },
    ]);
    const data = bytes.slice();
    data[parseFitsStructure(bytes, 'ok.fits')[0].dataOffset + 5] ^= 0x10;
    expect(verifyFitsChecksums(data, 'bad.fits')[0]).toEqual({ hdu: 0, checksum: 'bad', datasum: 'bad' });
    const head = bytes.slice();
    const at = new TextDecoder().decode(head.subarray(0, 2880)).indexOf("'LVAC-7");
    head[at + 1] = 'M'.charCodeAt(0);
    expect(verifyFitsChecksums(head, 'bad.fits')[0]).toEqual({ hdu: 0, checksum: 'bad', datasum: 'ok' });
    expect(verifyFitsChecksums(fixtureBytes('bitpix8_scaled.fits'), 'n.fits')).toEqual([{ hdu: 0, checksum: 'absent', datasum: 'absent' }]);
  });
});

describe('writeFitsSpectrum', () => {
  it('writes through a temporary file and leaves nothing else behind', () => {
    const out = join(dir, 'a', 'out.fits');
    expect(() => writeFitsSpectrum(out, spectrum())).toThrow(/ENOENT/);
    const folder = mkdtempSync(join(dir, 'w-'));
    const path = join(folder, 'out.fits');
    writeFileSync(path, 'old');
    writeFitsSpectrum(path, spectrum());
    expect(readdirSync(folder)).toEqual(['out.fits']);
    expect(hex64(readSpectrum(path).flux)).toEqual(hex64(spectrum().flux));
  });

  it('never leaves a partial file when encoding fails', () => {
    const folder = mkdtempSync(join(dir, 'f-'));
    const s = spectrum({ wavelength: Array.from({ length: N }, (_, i) => -100 + i) });
    expect(() => writeFitsSpectrum(join(folder, 'x.fits'), s, { layout: 'log-linear' })).toThrow(UsageError);
    expect(readdirSync(folder)).toEqual([]);
  });

  it('refuses to overwrite the file the spectrum was read from', () => {
    const folder = mkdtempSync(join(dir, 'i-'));
    const input = join(folder, 'in.fits');
    writeFileSync(input, fixtureBytes('float32_log_wcs.fits'));
    const s = readSpectrum(input);
    const before = readFileSync(input);
    expect(() => writeFitsSpectrum(join(folder, '.', 'in.fits'), s)).toThrow(`${join(folder, '.', 'in.fits')}: is the file this spectrum was read from; lineshift never overwrites its input, so write to another file`);
    expect(readFileSync(input).equals(before)).toBe(true);
    writeFitsSpectrum(join(folder, 'copy.fits'), s);
    expect(existsSync(join(folder, 'copy.fits'))).toBe(true);
  });

  it('refuses a folder as output', () => {
    expect(() => writeFitsSpectrum(dir, spectrum())).toThrow(/is a folder/);
  });
});

describe('wrap', () => {
  it('breaks at spaces or commas and keeps every character', () => {
    const text = 'lineshift 0.1.0 calibrate {"lamp":"neon-argon","order":3,"lines":[5852.4878,5853.4878,5854.4878,5855.4878]}';
    const lines = wrap(text, 72);
    expect(lines.every((l) => l.length <= 72)).toBe(true);
    expect(lines.join('')).toBe(text);
    expect(lines.length).toBe(2);
    expect(wrap('x'.repeat(150), 72).map((l) => l.length)).toEqual([72, 72, 6]);
  });
});
