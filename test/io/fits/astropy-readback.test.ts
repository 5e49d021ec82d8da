/**
 * Files written by our FITS writer, read by astropy (Debian's python3-astropy) through
 * test/reference/make_fits_fixtures.py --read-back: same data, same WCS wavelengths, same
 * header cards, and astropy's checksum verification passes. Skipped, with a printed
 * reason, when /usr/bin/python3 cannot import astropy.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFitsSpectrum, type FitsWriteOptions } from '../../../src/io/fits/write.js';
import { readSpectrum } from '../../../src/io/read.js';
import { Header } from '../../../src/spectrum/header.js';
import { provenanceEntry } from '../../../src/spectrum/provenance.js';
import { createSpectrum, type Spectrum, type SpectrumInit } from '../../../src/spectrum/spectrum.js';
import { angstromPerUnit } from '../../../src/spectrum/units.js';
import { repoPath } from '../../helpers/paths.js';
import { asPyCard, hex64, normalisePy, type PyValue } from './helpers.js';

const PYTHON = '/usr/bin/python3';
const probe = spawnSync(PYTHON, ['-c', 'import astropy, numpy; print(astropy.__version__)'], { encoding: 'utf8' });
const astropyVersion = probe.status === 0 ? probe.stdout.trim() : undefined;

const N = 120;
const header = Header.from([
  { keyword: 'OBJECT', value: 'LVAC-7', comment: 'invented star' },
  { keyword: 'DATE-OBS', value: '2026-05-14T03:12:45.5' },
  { keyword: 'EXPTIME', value: 150, rawValue: '1.5D2', comment: 'D exponent' },
  { keyword: 'GAIN', value: 0.1 + 0.2 },
  { keyword: 'BIGINT', value: 1234567890123456789012n },
  { keyword: 'NOVALUE', value: null, comment: 'undefined' },
  { keyword: 'CPLX', value: '(1.5, -2.0)', rawValue: '(1.5, -2.0)' },
  { keyword: 'QUOTE', value: "O'Kafor" },
  { keyword: 'LONGSTR', value: 'A long value: ' + 'abcdefghij'.repeat(15), comment: 'continued over several cards' },
  { keyword: 'LVAC DET CHIP NAME', value: 'Invented CCD', comment: 'HIERARCH' },
  { keyword: 'COMMENT', text: 'INVENTED test data for lineshift.' },
  { keyword: 'HISTORY', text: 'an earlier step' },
]);

function make(init: Partial<SpectrumInit>): Spectrum {
  return createSpectrum({
    wavelength: Array.from({ length: N }, (_, i) => 6000 + 0.3 * i),
    flux: Array.from({ length: N }, (_, i) => (i === 9 ? NaN : 500 + 50 * Math.cos(i / 5) + 1 / 7)),
    medium: 'air',
    fluxUnit: 'adu',
    header,
    provenance: [provenanceEntry('calibrate', { lamp: 'neon-argon', lines: [5852.4878, 5881.895, 5944.8342, 6029.9971, 6074.3377, 6143.0623] })],
    ...init,
  });
}

const cases: [string, Spectrum, FitsWriteOptions][] = [
  ['linear-air-f64.fits', make({ uncertainty: Array.from({ length: N }, (_, i) => 1 + i / 10), mask: Array.from({ length: N }, (_, i) => (i === 40 ? 1 : 0)) }), {}],
  ['linear-vacuum-nm-f32.fits', make({ wavelength: Array.from({ length: N }, (_, i) => 400 + 0.05 * i), unit: 'nm', medium: 'vacuum' }), { dataType: 'float32' }],
  ['log-air.fits', make({ wavelength: Array.from({ length: N }, (_, i) => 3900 * Math.exp(i * 3e-5)) }), {}],
  ['log10-unknown-medium.fits', make({ wavelength: Array.from({ length: N }, (_, i) => 3900 * Math.exp(i * 3e-5)), medium: null }), {}],
  ['table-nonlinear.fits', make({ wavelength: Array.from({ length: N }, (_, i) => 5000 + i + 0.002 * i * i), uncertainty: Array(N).fill(3) }), { dataType: 'float32' }],
  ['pixel-index.fits', make({ wavelength: Array.from({ length: N }, (_, i) => i), unit: 'pixel' }), {}],
];

interface ReadBack {
  hdus: { name: string; verifyChecksum: number; verifyDatasum: number; cards: [string, PyValue, string][] }[];
  fluxHex: string[];
  wavelength?: number[];
  wcsUnit?: string;
  uncertHex?: string[];
  maskHex?: string[];
  warnings: string[];
}

/** Å per unit for the units astropy.wcs reports after converting to SI, or the table's TUNIT. */
const ANGSTROM_PER: Record<string, number> = { m: 1e10, Angstrom: 1, nm: 10, pixel: 1 };

if (astropyVersion === undefined) {
  console.warn(`SKIPPED "FITS files read by astropy": ${PYTHON} cannot import astropy (install Debian's python3-astropy): ${probe.error?.message ?? probe.stderr?.trim()}`);
}

(astropyVersion ? describe : describe.skip)(`our FITS files read by astropy ${astropyVersion ?? '[SKIPPED: astropy not importable]'}`, () => {
  const dir = mkdtempSync(join(tmpdir(), 'lineshift-astropy-'));
  let report: Record<string, ReadBack> = {};
  beforeAll(() => {
    const paths = cases.map(([name, s, o]) => {
      const path = join(dir, name);
      writeFitsSpectrum(path, s, o);
      return path;
    });
    const run = spawnSync(PYTHON, [repoPath('test', 'reference', 'make_fits_fixtures.py'), '--read-back', ...paths], { encoding: 'utf8', cwd: repoPath() });
    if (run.status !== 0) throw new Error(`read-back failed: ${run.stderr}`);
    report = (JSON.parse(run.stdout) as { files: Record<string, ReadBack> }).files;
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it.each(cases)('%s: astropy verifies CHECKSUM and DATASUM of every HDU, with no warning', (name) => {
    const r = report[join(dir, name)];
    expect(r.warnings).toEqual([]);
    for (const h of r.hdus) expect([h.name, h.verifyChecksum, h.verifyDatasum]).toEqual([h.name, 1, 1]);
  });

  it.each(cases)('%s: astropy reads the same flux, uncertainty and mask, bit for bit', (name, s, o) => {
    const r = report[join(dir, name)];
    const written = o.dataType === 'float32' ? Float64Array.from(Float32Array.from(s.flux)) : s.flux;
    expect(r.fluxHex).toEqual(hex64(written));
    if (s.uncertainty) {
      const u = o.dataType === 'float32' ? Float64Array.from(Float32Array.from(s.uncertainty)) : s.uncertainty;
      expect(r.uncertHex).toEqual(hex64(u));
    }
    if (s.mask) expect(r.maskHex).toEqual(hex64(Float64Array.from(s.mask)));
  });

  it.each(cases)('%s: astropy.wcs (or the table column) gives our wavelengths to 1e-9 relative', (name, s) => {
    const r = report[join(dir, name)];
    if (s.unit === 'pixel' && name === 'pixel-index.fits') {
      // No WCS is written for the 0-based pixel index.
      expect(r.wavelength).toBeUndefined();
      return;
    }
    const factor = ANGSTROM_PER[r.wcsUnit ?? ''];
    expect(factor, `unit ${r.wcsUnit}`).toBeDefined();
    const ours = angstromPerUnit(s.unit);
    let worst = 0;
    s.wavelength.forEach((w, i) => {
      worst = Math.max(worst, Math.abs(r.wavelength![i] * factor - w * ours) / (w * ours));
    });
    expect(worst).toBeLessThan(1e-9);
  });

  it.each(cases)('%s: astropy reads every header card as our reader does', (name) => {
    const r = report[join(dir, name)];
    const ours = readSpectrum(join(dir, name));
    const hdu = r.hdus[ours.source!.hdu!];
    expect(ours.header.cards.map((c) => normalisePy(asPyCard(c)))).toEqual(hdu.cards.map(normalisePy));
    expect(ours.header.string('LONGSTR')).toBe('A long value: ' + 'abcdefghij'.repeat(15));
  });
});
