/**
 * Our FITS reader against astropy: fixtures and expected values written by
 * test/reference/make_fits_fixtures.py with Debian's astropy (version, date and the exact
 * calls are recorded in test/fixtures/fits/expected.json).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { parseFitsSpectrum } from '../../../src/io/fits/spectrum.js';
import { readSpectrum } from '../../../src/io/read.js';
import { createSpectrum } from '../../../src/spectrum/spectrum.js';
import { angstromPerUnit } from '../../../src/spectrum/units.js';
import { asPyCard, fixture, hex64, normalisePy, type PyValue } from './helpers.js';

interface Expected {
  hdu: number;
  pixels: number;
  fluxHex: string[];
  nanCount: number;
  unit: 'angstrom' | 'pixel';
  medium: 'air' | 'vacuum' | null;
  wavelengthAngstrom?: number[];
  wavelengthPixels?: number[];
  uncertaintyHex?: string[];
  mask?: number[];
  cards: [string, PyValue, string][];
  error?: boolean;
  shapeNaxis?: number[];
}

const doc = JSON.parse(readFileSync(fixture('expected.json'), 'utf8')) as { astropy: string; files: Record<string, Expected> };
const spectra = Object.entries(doc.files).filter(([, e]) => !e.error);

describe(`FITS reader against astropy ${doc.astropy} (test/fixtures/fits/expected.json)`, () => {
  it('covers the planned cases', () => {
    expect(spectra.length).toBeGreaterThanOrEqual(16);
  });

  it.each(spectra)('%s: HDU, pixel count, flux bit-exact, NaN count', (name, e) => {
    const s = readSpectrum(fixture(name));
    expect(s.source?.hdu).toBe(e.hdu);
    expect(s.flux.length).toBe(e.pixels);
    // Source: astropy's data (fluxCall in expected.json), compared bit for bit.
    expect(hex64(s.flux)).toEqual(e.fluxHex);
    expect(Array.from(s.flux).filter(Number.isNaN).length).toBe(e.nanCount);
    if (e.uncertaintyHex) expect(hex64(s.uncertainty ?? [])).toEqual(e.uncertaintyHex);
    if (e.mask) expect(Array.from(s.mask ?? [])).toEqual(e.mask);
  });

  it.each(spectra)('%s: wavelengths agree with astropy.wcs / astropy tables to 1e-9 relative, medium per Paper III', (name, e) => {
    const s = readSpectrum(fixture(name));
    expect(s.medium).toBe(e.medium);
    if (e.unit === 'pixel') {
      // No WCS: our convention, the 0-based pixel index (documented in DEVELOPERS.md).
      expect(s.unit).toBe('pixel');
      expect(s.wavelength[0]).toBe(0);
      expect(s.wavelength[e.pixels - 1]).toBe(e.pixels - 1);
      return;
    }
    const scale = angstromPerUnit(s.unit);
    let worst = 0;
    e.wavelengthPixels!.forEach((p, k) => {
      const ours = s.wavelength[p - 1] * scale;
      const theirs = e.wavelengthAngstrom![k];
      worst = Math.max(worst, Math.abs(ours - theirs) / theirs);
    });
    // 1e-9 relative: astropy.wcs converts to metres and back, which costs a few ulp; any
    // real disagreement (a pixel off, a wrong convention) is > 1e-5.
    expect(worst).toBeLessThan(1e-9);
  });

  it.each(spectra)('%s: every header card as astropy reads it (keyword, value, comment)', (name, e) => {
    const s = readSpectrum(fixture(name));
    const ours = s.header.cards.slice(0, e.cards.length).map((c) => normalisePy(asPyCard(c)));
    expect(ours).toEqual(e.cards.map(normalisePy));
  });

  it('returns a frozen Spectrum of the same shape as createSpectrum, with provenance and source', () => {
    const s = readSpectrum(fixture('image_extension.fits'));
    const made = createSpectrum({ wavelength: s.wavelength, flux: s.flux, uncertainty: s.uncertainty, unit: s.unit, medium: s.medium, fluxUnit: s.fluxUnit, header: s.header, provenance: s.provenance, source: s.source });
    expect(Object.keys(s).sort()).toEqual(Object.keys(made).sort());
    expect(Object.isFrozen(s)).toBe(true);
    expect(s.source).toEqual({ file: fixture('image_extension.fits'), hdu: 1, format: 'fits' });
    expect(s.provenance.map((p) => [p.step, p.parameters])).toEqual([['read-fits', { file: 'image_extension.fits', hdu: 1 }]]);
  });

  it('leaves the bytes it reads untouched', () => {
    for (const name of ['table_scaled.fits', 'uint64.fits', 'image_extension.fits']) {
      const bytes = new Uint8Array(readFileSync(fixture(name)));
      const copy = bytes.slice();
      parseFitsSpectrum(bytes, name);
      expect(Buffer.from(bytes).equals(Buffer.from(copy))).toBe(true);
    }
  });

  it('reports the 2-D image with its size', () => {
    const e = doc.files['image_2d.fits'];
    expect(() => readSpectrum(fixture('image_2d.fits'))).toThrow(InputError);
    expect(() => readSpectrum(fixture('image_2d.fits'))).toThrow(
      `${fixture('image_2d.fits')}: HDU 0 holds a 2-D image of ${e.shapeNaxis!.join('×')} pixels, not a 1-D spectrum; extract the spectrum first`,
    );
  });

  it('takes OBJECT and DATE-OBS from a data-less primary HDU when the spectrum is in an extension', () => {
    const s = readSpectrum(fixture('image_extension.fits'));
    expect(s.header.string('OBJECT')).toBe('LVAC-7');
    expect(s.header.string('DATE-OBS')).toBe('2026-05-14T03:12:45.5');
    expect(s.header.string('EXTNAME')).toBe('FLUX');
    expect(s.fluxUnit).toBe('adu');
  });
});
