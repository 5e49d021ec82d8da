import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { Header } from '../../src/spectrum/header.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import { sliceSpectrum } from '../../src/spectrum/slice.js';
import { convertSpectrumUnit } from '../../src/spectrum/convert.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';

const base = createSpectrum({
  wavelength: [6560, 6561, 6562, 6563, 6564],
  flux: [1, 2, 3, 4, 5],
  uncertainty: [0.1, 0.2, 0.3, 0.4, 0.5],
  mask: [0, 0, 1, 0, 0],
  medium: 'air',
  header: Header.from([{ keyword: 'OBJECT', value: 'LVAC-7' }]),
  provenance: [provenanceEntry('read-text', { file: 'x.csv' })],
  source: { file: 'x.csv', format: 'text' },
});

describe('sliceSpectrum', () => {
  it('keeps the pixels in the range, both ends included, with uncertainty, mask, header and provenance', () => {
    const before = base.flux.slice();
    const s = sliceSpectrum(base, { min: 6561, max: 6563 });
    expect(Array.from(s.wavelength)).toEqual([6561, 6562, 6563]);
    expect(Array.from(s.flux)).toEqual([2, 3, 4]);
    expect(Array.from(s.uncertainty!)).toEqual([0.2, 0.3, 0.4]);
    expect(Array.from(s.mask!)).toEqual([0, 1, 0]);
    expect(s.header.get('OBJECT')).toBe('LVAC-7');
    expect(s.medium).toBe('air');
    expect(s.provenance.map((p) => p.step)).toEqual(['read-text', 'slice']);
    expect(s.provenance[1].parameters).toEqual({ min: 6561, max: 6563, unit: 'angstrom', pixels: 3 });
    expect(base.flux).toEqual(before);
    s.flux[0] = 99;
    expect(base.flux[1]).toBe(2);
  });

  it('takes the range in another unit and works on a decreasing axis', () => {
    expect(Array.from(sliceSpectrum(base, { min: 656.15, max: 656.25, unit: 'nm' }).flux)).toEqual([3]);
    // Ends given exactly in another unit stay included despite rounding in the conversion.
    // In binary, 400.014 nm × 10 = 4000.1400000000003 Å (above the pixel at 4000.14) and
    // 400.015 × 10 = 4000.1499999999996 (below the pixel at 4000.15).
    const fine = createSpectrum({ wavelength: [4000.13, 4000.14, 4000.15, 4000.16], flux: [1, 2, 3, 4] });
    expect(Array.from(sliceSpectrum(fine, { min: 400.014, max: 400.015, unit: 'nm' }).flux)).toEqual([2, 3]);
    const dec = createSpectrum({ wavelength: [5, 4, 3, 2, 1], flux: [50, 40, 30, 20, 10], unit: 'nm' });
    expect(Array.from(sliceSpectrum(dec, { min: 2, max: 4 }).flux)).toEqual([40, 30, 20]);
  });

  it('throws an InputError when no pixel lies in the range, and a UsageError for a bad range', () => {
    expect(() => sliceSpectrum(base, { min: 7000, max: 7100 })).toThrow(new InputError('spectrum.empty-range', 'no pixel lies between 7000 and 7100 Angstrom (the spectrum covers 6560 to 6564 Angstrom)', { file: 'x.csv' }).message);
    expect(() => sliceSpectrum(base, { min: 6561.2, max: 6561.8 })).toThrow(InputError);
    expect(() => sliceSpectrum(base, { min: 6563, max: 6561 })).toThrow('the slice range has min 6563 above max 6561');
    expect(() => sliceSpectrum(base, { min: NaN, max: 6561 })).toThrow(UsageError);
    const pix = createSpectrum({ wavelength: [0, 1, 2], flux: [1, 1, 1], unit: 'pixel' });
    expect(() => sliceSpectrum(pix, { min: 1, max: 2, unit: 'nm' })).toThrow(UsageError);
    expect(Array.from(sliceSpectrum(pix, { min: 1, max: 2 }).wavelength)).toEqual([1, 2]);
  });
});

describe('convertSpectrumUnit', () => {
  it('converts Å → nm → µm → Å, keeping the values to one rounding', () => {
    const before = base.wavelength.slice();
    const nm = convertSpectrumUnit(base, 'nm');
    expect(base.wavelength).toEqual(before);
    expect(base.unit).toBe('angstrom');
    expect(nm.unit).toBe('nm');
    expect(Array.from(nm.wavelength)).toEqual([656, 656.1, 656.2, 656.3, 656.4]);
    const back = convertSpectrumUnit(convertSpectrumUnit(nm, 'um'), 'angstrom');
    for (let i = 0; i < 5; i++) expect(Math.abs(back.wavelength[i] - base.wavelength[i])).toBeLessThanOrEqual(6564 * 2 ** -51);
    expect(back.provenance.map((p) => p.step)).toEqual(['read-text', 'convert-unit', 'convert-unit', 'convert-unit']);
    expect(Array.from(back.flux)).toEqual(Array.from(base.flux));
    expect(convertSpectrumUnit(base, 'angstrom')).toBe(base);
  });

  it('refuses pixel axes with a UsageError', () => {
    const pix = createSpectrum({ wavelength: [0, 1, 2], flux: [1, 1, 1], unit: 'pixel' });
    expect(() => convertSpectrumUnit(pix, 'nm')).toThrow(UsageError);
    expect(() => convertSpectrumUnit(base, 'pixel')).toThrow('cannot convert a spectral axis from Angstrom to pixel: a pixel axis has no wavelength unit; calibrate the spectrum first');
  });
});
