import { describe, expect, it } from 'vitest';
import { circularCrossCorrelation, nextPowerOfTwo } from '../../src/math/fft.js';
import { mulberry32 } from '../helpers/random.js';

describe('circularCrossCorrelation', () => {
  it('equals the direct O(N²) sum (definition)', () => {
    const rand = mulberry32(11);
    for (const n of [1, 2, 8, 64, 256]) {
      const a = Float64Array.from({ length: n }, () => rand() - 0.5);
      const b = Float64Array.from({ length: n }, () => rand() - 0.5);
      const fast = circularCrossCorrelation(a, b);
      for (let k = 0; k < n; k++) {
        let s = 0;
        for (let m = 0; m < n; m++) s += a[m] * b[(m - k + n) % n];
        expect(fast[k]).toBeCloseTo(s, 12);
      }
    }
  });

  it('puts the peak at the shift of a shifted copy', () => {
    const n = 128;
    const b = Float64Array.from({ length: n }, (_, i) => Math.exp(-0.5 * ((i - 40) / 3) ** 2));
    const a = Float64Array.from({ length: n }, (_, i) => Math.exp(-0.5 * ((i - 47) / 3) ** 2));
    const c = circularCrossCorrelation(a, b);
    expect(c.indexOf(Math.max(...c))).toBe(7);
  });

  it('rejects lengths that are not powers of two', () => {
    expect(() => circularCrossCorrelation(new Float64Array(6), new Float64Array(6))).toThrow(/power of two \(got 6\)/);
    expect(nextPowerOfTwo(4097)).toBe(8192);
  });
});
