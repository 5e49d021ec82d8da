import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { derSnr, median, spectrumSnr } from '../../src/lines/snr.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { repoPath } from '../helpers/paths.js';
import { normal } from '../helpers/random.js';

const fixture = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'scipy-fits.json'), 'utf8')) as {
  numpy: string;
  derSnr: { flux: number[]; signal: number; noise: number; snr: number };
};

describe('DER_SNR', () => {
  it(`matches the published definition computed with numpy ${fixture.numpy} (test/reference/make_scipy_fits.py)`, () => {
    // Source: Stoehr et al. 2008, ASP Conf. Ser. 394, 505 (definition); values by numpy.
    const r = derSnr(fixture.derSnr.flux);
    expect(r.signal).toBeCloseTo(fixture.derSnr.signal, 10);
    expect(r.noise / fixture.derSnr.noise - 1).toBeLessThan(1e-12);
    expect(r.snr / fixture.derSnr.snr - 1).toBeLessThan(1e-12);
    expect(r.pixelsUsed).toBe(397); // three zeros dropped
  });

  it('recovers the noise of white Gaussian noise', () => {
    const g = normal(11);
    const flux = Array.from({ length: 20000 }, () => 50 + 0.5 * g());
    const r = derSnr(flux);
    // The estimator is unbiased for white Gaussian noise (that is what 1.482602/√6 calibrates);
    // with 20 000 pixels its scatter is about 1 %, so 3 % is a safe bound.
    expect(r.noise / 0.5).toBeGreaterThan(0.97);
    expect(r.noise / 0.5).toBeLessThan(1.03);
    expect(r.snr).toBeCloseTo(100, -1);
  });

  it('returns NaN for fewer than five values and skips unusable pixels of a spectrum', () => {
    expect(derSnr([1, 2, 3, 4]).snr).toBeNaN();
    expect(derSnr([1, 2, NaN, 3, 0, 4]).pixelsUsed).toBe(4);
    const s = createSpectrum({ wavelength: [1, 2, 3, 4, 5, 6, 7], flux: [1, 1.1, NaN, 0.9, 1, 1.05, 0.95], mask: [0, 0, 0, 0, 1, 0, 0] });
    expect(spectrumSnr(s).pixelsUsed).toBe(5);
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 2, 3])).toBe(2.5);
  });
});
