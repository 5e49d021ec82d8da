import { describe, expect, it } from 'vitest';
import { fftInPlace } from '../../src/math/fft.js';
import { mulberry32 } from '../helpers/random.js';

describe('fftInPlace', () => {
  it('equals the direct DFT X[k] = Σ x[n] e^{−2πikn/N} (definition), and inverts without 1/N', () => {
    const rand = mulberry32(5);
    for (const n of [1, 2, 16, 128]) {
      const re = Float64Array.from({ length: n }, () => rand() - 0.5);
      const im = Float64Array.from({ length: n }, () => rand() - 0.5);
      const [r0, i0] = [re.slice(), im.slice()];
      fftInPlace(re, im, 'forward');
      for (let k = 0; k < n; k++) {
        let sr = 0, si = 0;
        for (let m = 0; m < n; m++) {
          const a = (-2 * Math.PI * k * m) / n;
          sr += r0[m] * Math.cos(a) - i0[m] * Math.sin(a);
          si += r0[m] * Math.sin(a) + i0[m] * Math.cos(a);
        }
        expect(re[k]).toBeCloseTo(sr, 11);
        expect(im[k]).toBeCloseTo(si, 11);
      }
      fftInPlace(re, im, 'inverse');
      for (let m = 0; m < n; m++) {
        expect(re[m] / n).toBeCloseTo(r0[m], 12);
        expect(im[m] / n).toBeCloseTo(i0[m], 12);
      }
    }
  });

  it('refuses unequal or non-power-of-two lengths', () => {
    expect(() => fftInPlace(new Float64Array(4), new Float64Array(2), 'forward')).toThrow('real and imaginary parts need equal lengths (got 4 and 2)');
    expect(() => fftInPlace(new Float64Array(6), new Float64Array(6), 'forward')).toThrow('FFT length must be a power of two (got 6)');
  });
});
