import { describe, expect, it } from 'vitest';
import { calibrationVelocityErrorKmPerS } from '../../src/velocity/calibration-error.js';
import { meanStd, normal } from '../helpers/random.js';

describe('calibrationVelocityErrorKmPerS', () => {
  it('is c·rms·√(p/N)/λ', () => {
    // c = 299 792.458 km/s (exact, SI); 0.05 Å·√(4/16) at 6000 Å.
    expect(calibrationVelocityErrorKmPerS({ rmsAngstrom: 0.05, lineCount: 16, coefficients: 4 }, 6000)).toBeCloseTo((299792.458 * 0.025) / 6000, 12);
  });

  it('matches the scatter of least-squares dispersion solutions averaged over their lines (simulation)', () => {
    // A quadratic (p = 3) fitted to N = 12 lamp lines with σ = 0.04 Å: the rms over the lines of
    // (fitted − true) is σ·√(p/N) (mean leverage p/N, common practice). 4000 seeded solutions.
    const gauss = normal(21);
    const x = Array.from({ length: 12 }, (_, i) => -1 + (2 * i) / 11);
    const sigma = 0.04;
    const errors: number[] = [];
    for (let k = 0; k < 4000; k++) {
      const y = x.map(() => sigma * gauss());
      // Least squares in 1, x, x² by the normal equations (small, well-conditioned on [−1, 1]).
      const A = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
      const b = [0, 0, 0];
      for (let i = 0; i < x.length; i++) {
        const row = [1, x[i], x[i] * x[i]];
        for (let r = 0; r < 3; r++) { b[r] += row[r] * y[i]; for (let c = 0; c < 3; c++) A[r][c] += row[r] * row[c]; }
      }
      const det = (m: number[][]) => m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
      const d = det(A);
      const coef = [0, 1, 2].map((j) => det(A.map((row, r) => row.map((v, c) => (c === j ? b[r] : v)))) / d);
      for (const xi of x) errors.push(coef[0] + coef[1] * xi + coef[2] * xi * xi);
    }
    const { std } = meanStd(errors);
    const predicted = calibrationVelocityErrorKmPerS({ rmsAngstrom: sigma, lineCount: 12, coefficients: 3 }, 299792.458);
    // 4000 × 12 errors (correlated within a solution): agreement to 3 %.
    expect(Math.abs(std / predicted - 1)).toBeLessThan(0.03);
  });

  it.each([
    [{ rmsAngstrom: -1, lineCount: 10, coefficients: 2 }, 'the calibration rms must be a number of Å ≥ 0 (got -1)'],
    [{ rmsAngstrom: 0.1, lineCount: 0, coefficients: 1 }, 'the number of calibration lines must be a whole number ≥ 1 (got 0)'],
    [{ rmsAngstrom: 0.1, lineCount: 5, coefficients: 6 }, 'the number of coefficients of the dispersion solution must be a whole number from 1 to the number of calibration lines, 5 (got 6)'],
  ])('refuses %j', (c, message) => {
    expect(() => calibrationVelocityErrorKmPerS(c, 5000)).toThrow(message);
  });
});
