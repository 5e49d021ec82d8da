import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';

describe('createSpectrum', () => {
  it('copies its inputs and fills defaults', () => {
    const w = [1, 2, 3];
    const s = createSpectrum({ wavelength: w, flux: [4, 5, 6] });
    w[0] = 99;
    expect(s.wavelength[0]).toBe(1);
    expect(s.unit).toBe('angstrom');
    expect(s.medium).toBeNull();
    expect(Object.isFrozen(s)).toBe(true);
  });

  it('accepts a decreasing axis', () => {
    expect(createSpectrum({ wavelength: [3, 2, 1], flux: [1, 1, 1] }).wavelength[2]).toBe(1);
  });

  it.each([
    [[1, 2, 2, 3], 'spectrum.duplicate-wavelength', /repeated at pixels 1 and 2/],
    [[1, 2, 1.5, 3], 'spectrum.not-monotonic', /turns at pixel 2/],
    [[1, NaN, 3, 4], 'spectrum.bad-wavelength', /pixel 1 is NaN/],
  ])('rejects the axis %j', (axis, code, message) => {
    try {
      createSpectrum({ wavelength: axis, flux: axis.map(() => 1) }, { file: 'x.txt' });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe(code);
      expect((e as InputError).message).toMatch(/^x\.txt: index \d: /);
      expect((e as InputError).message).toMatch(message);
    }
  });

  it('rejects mismatched lengths and empty spectra', () => {
    expect(() => createSpectrum({ wavelength: [1, 2], flux: [1] })).toThrow(/flux has 1 values but the spectral axis has 2/);
    expect(() => createSpectrum({ wavelength: [], flux: [] })).toThrow(/no pixels/);
  });
});
