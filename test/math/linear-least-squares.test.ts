import { describe, expect, it } from 'vitest';
import { solveLinearLeastSquares } from '../../src/math/linear-least-squares.js';
import { CubicBSplineBasis, chebyshevDerivative, chebyshevEvaluate, chebyshevRow } from '../../src/math/basis.js';
import { UsageError } from '../../src/errors.js';
import { mulberry32, gaussian } from '../helpers/random.js';

describe('solveLinearLeastSquares', () => {
  it('recovers an exact polynomial and leaves its inputs unchanged', () => {
    const xs = Array.from({ length: 20 }, (_, i) => i * 0.37 - 2);
    const design = new Float64Array(xs.flatMap((x) => [1, x, x * x, x * x * x]));
    const values = new Float64Array(xs.map((x) => 1.5 - 2 * x + 0.25 * x * x + 0.125 * x * x * x));
    const before = values.slice();
    const r = solveLinearLeastSquares(design, xs.length, 4, values);
    [1.5, -2, 0.25, 0.125].forEach((c, i) => expect(r.coefficients[i]).toBeCloseTo(c, 12));
    expect(r.chiSquare).toBeLessThan(1e-20);
    expect(r.degreesOfFreedom).toBe(16);
    expect(values).toEqual(before);
  });

  it('gives the textbook straight-line variances', () => {
    // Straight-line fit variances σ_a² = σ² Σx²/Δ, σ_b² = σ² N/Δ, Δ = NΣx² − (Σx)²
    // (Bevington & Robinson, Data Reduction and Error Analysis, ch. 6; from memory).
    const xs = [1, 2, 4, 7, 11];
    const sigma = 0.5;
    const design = new Float64Array(xs.flatMap((x) => [1, x]));
    const r = solveLinearLeastSquares(design, 5, 2, Float64Array.of(2, 3, 5, 9, 12), new Float64Array(5).fill(1 / sigma ** 2));
    const N = 5, Sx = xs.reduce((a, b) => a + b), Sxx = xs.reduce((a, b) => a + b * b);
    const D = N * Sxx - Sx * Sx;
    expect(r.covariance[0]).toBeCloseTo((sigma ** 2 * Sxx) / D, 14);
    expect(r.covariance[3]).toBeCloseTo((sigma ** 2 * N) / D, 14);
    expect(r.covariance[1]).toBeCloseTo((-(sigma ** 2) * Sx) / D, 14);
  });

  it('reports coefficient scatter that matches the covariance (simulation)', () => {
    const rand = mulberry32(7);
    const xs = Array.from({ length: 50 }, (_, i) => i / 49);
    const sig = xs.map((x) => 0.1 + 0.2 * x);
    const design = new Float64Array(xs.flatMap((x) => [1, x, x * x]));
    const w = new Float64Array(sig.map((s) => 1 / (s * s)));
    const draws: number[] = [];
    let cov = 0;
    for (let k = 0; k < 2000; k++) {
      const y = new Float64Array(xs.map((x, i) => 1 + x - x * x + sig[i] * gaussian(rand)));
      const r = solveLinearLeastSquares(design, 50, 3, y, w);
      draws.push(r.coefficients[2]);
      cov = r.covariance[8];
    }
    const mean = draws.reduce((a, b) => a + b) / draws.length;
    const sd = Math.sqrt(draws.reduce((a, b) => a + (b - mean) ** 2, 0) / (draws.length - 1));
    expect(sd / Math.sqrt(cov)).toBeGreaterThan(0.94);
    expect(sd / Math.sqrt(cov)).toBeLessThan(1.06);
  });

  it('ignores rows with zero or NaN weight and rejects degenerate problems', () => {
    const design = Float64Array.of(1, 0, 1, 1, 1, 2, 1, 3);
    const r = solveLinearLeastSquares(design, 4, 2, Float64Array.of(1, 3, 99, 7), Float64Array.of(1, 1, 0, 1));
    expect(r.coefficients[0]).toBeCloseTo(1, 12);
    expect(r.coefficients[1]).toBeCloseTo(2, 12);
    expect(() => solveLinearLeastSquares(Float64Array.of(1, 2, 2, 4, 3, 6), 3, 2, Float64Array.of(1, 2, 3))).toThrow(UsageError);
    expect(() => solveLinearLeastSquares(Float64Array.of(1, 2), 1, 2, Float64Array.of(1))).toThrow(/needs at least 2 usable points, got 1/);
  });
});

describe('bases', () => {
  it('Chebyshev rows equal cos(k·arccos t), Clenshaw sums them, the derivative matches finite differences', () => {
    const d = { min: 4000, max: 7000 };
    const c = [0.3, -1.2, 0.7, 0.05, -0.4, 0.2];
    for (const x of [4000, 4500.5, 5500, 6999]) {
      const t = (2 * x - 11000) / 3000;
      const row = chebyshevRow(x, 5, d);
      row.forEach((v, k) => expect(v).toBeCloseTo(Math.cos(k * Math.acos(t)), 12));
      expect(chebyshevEvaluate(c, x, d)).toBeCloseTo(c.reduce((s, ck, k) => s + ck * row[k], 0), 12);
      const h = 1e-3;
      expect(chebyshevDerivative(c, x, d)).toBeCloseTo((chebyshevEvaluate(c, x + h, d) - chebyshevEvaluate(c, x - h, d)) / (2 * h), 8);
    }
  });

  it('cubic B-splines sum to one and reproduce straight lines', () => {
    const b = new CubicBSplineBasis(0, 10, 4);
    for (const x of [0, 0.1, 2.5, 7.77, 10]) expect(b.row(x).reduce((a, v) => a + v, 0)).toBeCloseTo(1, 14);
    const xs = Array.from({ length: 41 }, (_, i) => i / 4);
    const design = new Float64Array(xs.flatMap((x) => Array.from(b.row(x))));
    const r = solveLinearLeastSquares(design, xs.length, b.size, new Float64Array(xs.map((x) => 3 - 0.5 * x)));
    for (const x of [0.3, 5, 9.9]) expect(b.evaluate(r.coefficients, x)).toBeCloseTo(3 - 0.5 * x, 10);
  });
});
