import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { fitCurve, type CurveModel } from '../../src/fit/curve.js';
import { leastSquares, solveDampedStep, type LeastSquaresProblem } from '../../src/fit/least-squares.js';
import { normal } from '../helpers/random.js';
import { choleskyInPlace, inverseNormalMatrix, pivotedQR, solveLeastSquaresQR } from '../../src/fit/linalg.js';

const rng = normal;

const line: CurveModel = (x, p, g) => {
  if (g) { g[0] = 1; g[1] = x; }
  return p[0] + p[1] * x;
};

const expModel: CurveModel = (x, p, g) => {
  const e = Math.exp(-p[1] * x);
  if (g) { g[0] = e; g[1] = -p[0] * x * e; }
  return p[0] * e;
};

describe('linear algebra', () => {
  it('QR least squares and (AᵀA)⁻¹ match the normal equations on a small exact case', () => {
    // A = [[1,0],[1,1],[1,2]], b = [1,2,4]: normal equations give x = [5/6, 3/2] (hand calculation).
    const a = Float64Array.from([1, 0, 1, 1, 1, 2]);
    const x = solveLeastSquaresQR(a, 3, 2, Float64Array.from([1, 2, 4]))!;
    expect(x[0]).toBeCloseTo(5 / 6, 14);
    expect(x[1]).toBeCloseTo(1.5, 14);
    // AᵀA = [[3,3],[3,5]], inverse = [[5,-3],[-3,3]]/6 (hand calculation).
    const inv = inverseNormalMatrix(pivotedQR(a, 3, 2))!;
    expect(Array.from(inv).map((v) => v * 6)).toEqual([5, -3, -3, 3].map((v) => expect.closeTo(v, 12)));
  });

  it('reports rank deficiency and non-positive-definite matrices', () => {
    const a = Float64Array.from([1, 2, 2, 4, 3, 6]);
    expect(pivotedQR(a, 3, 2).rank).toBe(1);
    expect(inverseNormalMatrix(pivotedQR(a, 3, 2))).toBeNull();
    expect(choleskyInPlace(Float64Array.from([1, 2, 2, 1]), 2)).toBe(false);
  });
});

describe('leastSquares', () => {
  it('reproduces ordinary linear regression exactly, with the textbook covariance', () => {
    // Straight line through 10 points with known σ = 0.5: the covariance is σ²(XᵀX)⁻¹ (Gauss–Markov; from memory).
    const x = Array.from({ length: 10 }, (_, i) => i);
    const gauss = rng(1);
    const y = x.map((v) => 2 + 0.5 * v + 0.5 * gauss());
    const sigma = x.map(() => 0.5);
    const r = fitCurve({ x, y, sigma }, line, { initial: [0, 0] });
    expect(r.converged).toBe(true);
    const n = 10, sx = 45, sxx = 285;
    const sy = y.reduce((a, b) => a + b, 0);
    const sxy = x.reduce((a, v, i) => a + v * y[i], 0);
    const det = n * sxx - sx * sx;
    // Default stopping rules leave the parameters within ~√(ftol·χ²)·σ ≈ 1e-4 σ of the exact
    // minimum; 1e-6 σ is met here because the problem is linear.
    expect(Math.abs(r.parameters[0] - (sxx * sy - sx * sxy) / det)).toBeLessThan(1e-6 * r.uncertainties[0]);
    expect(Math.abs(r.parameters[1] - (n * sxy - sx * sy) / det)).toBeLessThan(1e-6 * r.uncertainties[1]);
    expect(r.uncertainties[0]).toBeCloseTo(0.5 * Math.sqrt(sxx / det), 12);
    expect(r.uncertainties[1]).toBeCloseTo(0.5 * Math.sqrt(n / det), 12);
    expect(r.correlation[0][1]).toBeCloseTo(-sx / Math.sqrt(n * sxx), 12);
    expect(r.uncertaintySource).toBe('data');
    expect(r.degreesOfFreedom).toBe(8);
  });

  it('weights and whitened residuals give the same answer', () => {
    const gauss = rng(2);
    const x = Array.from({ length: 40 }, (_, i) => i / 10);
    const sigma = x.map((_, i) => 0.02 + 0.1 * (i % 5));
    const y = x.map((v, i) => 3 * Math.exp(-0.7 * v) + sigma[i] * gauss());
    const whitened = fitCurve({ x, y, sigma }, expModel, { initial: [1, 1] });
    const problem: LeastSquaresProblem = {
      residualCount: x.length,
      evaluate(p, res, jac) {
        for (let i = 0; i < x.length; i++) {
          const e = Math.exp(-p[1] * x[i]);
          res[i] = p[0] * e - y[i];
          jac[2 * i] = e;
          jac[2 * i + 1] = -p[0] * x[i] * e;
        }
      },
    };
    const weighted = leastSquares(problem, { initial: [1, 1], weights: sigma.map((s) => 1 / (s * s)) });
    expect(weighted.converged).toBe(true);
    for (let j = 0; j < 2; j++) {
      expect(weighted.parameters[j]).toBeCloseTo(whitened.parameters[j], 10);
      expect(weighted.uncertainties[j]).toBeCloseTo(whitened.uncertainties[j], 10);
    }
    expect(weighted.chiSquare).toBeCloseTo(whitened.chiSquare, 8);
  });

  it('scales the covariance by the reduced χ² on request', () => {
    const gauss = rng(3);
    const x = Array.from({ length: 30 }, (_, i) => i);
    const y = x.map((v) => 1 + 2 * v + 3 * gauss());
    const a = fitCurve({ x, y, sigma: x.map(() => 1) }, line, { initial: [0, 0] });
    const b = fitCurve({ x, y, sigma: x.map(() => 1) }, line, { initial: [0, 0], uncertaintySource: 'scaled-by-reduced-chi-square' });
    expect(b.uncertaintySource).toBe('scaled-by-reduced-chi-square');
    expect(b.uncertainties[1] / a.uncertainties[1]).toBeCloseTo(Math.sqrt(a.reducedChiSquare), 12);
  });

  it('holds fixed parameters and gives them zero uncertainty', () => {
    const x = [0, 1, 2, 3, 4];
    const y = [1, 3.1, 4.9, 7.2, 9];
    const r = fitCurve({ x, y }, line, { initial: [1, 0], fixed: [true, false] });
    expect(r.converged).toBe(true);
    expect(r.parameters[0]).toBe(1);
    expect(r.uncertainties[0]).toBe(0);
    // Slope with the intercept held at 1: Σx(y−1)/Σx² (closed form).
    const slope = x.reduce((s, v, i) => s + v * (y[i] - 1), 0) / x.reduce((s, v) => s + v * v, 0);
    expect(r.parameters[1]).toBeCloseTo(slope, 10);
    expect(r.degreesOfFreedom).toBe(4);
    expect(r.correlation[0][1]).toBe(0);
  });

  it('respects bounds and reports parameters on them', () => {
    const x = [0, 1, 2, 3, 4];
    const y = [5, 4, 3, 2, 1];
    const r = fitCurve({ x, y }, line, { initial: [0, 0], lower: [-Infinity, 0] });
    expect(r.converged).toBe(true);
    expect(r.parameters[1]).toBe(0);
    expect(r.atBound).toEqual([false, true]);
    expect(r.parameters[0]).toBeCloseTo(3, 10); // mean of y when the slope is held at 0
    // A starting value outside the bounds is moved onto them.
    const s = fitCurve({ x, y }, line, { initial: [0, -5], lower: [-Infinity, -0.5], upper: [Infinity, 10] });
    expect(s.parameters[1]).toBe(-0.5);
  });

  it('stops on the iteration limit with converged: false', () => {
    const x = Array.from({ length: 20 }, (_, i) => i / 4);
    const y = x.map((v) => 2 * Math.exp(-0.3 * v));
    const r = fitCurve({ x, y: y.map((v, i) => v + 0.01 * Math.sin(i)) }, expModel, { initial: [10, 5], maxIterations: 2 });
    expect(r.converged).toBe(false);
    expect(r.reason).toBe('max-iterations');
    expect(r.iterations).toBe(2);
    expect(r.message).toBe('did not converge: the iteration limit was reached (after 2 steps)');
    expect(r.uncertainties.every(Number.isNaN)).toBe(true);
  });

  it('reports NaN at the start, a throwing model and too few points instead of throwing', () => {
    const x = [1, 2, 3];
    const nan: CurveModel = (_x, p, g) => { if (g) g[0] = 1; return p[0] < 0 ? NaN : p[0]; };
    const r1 = fitCurve({ x, y: [1, 2, 3] }, nan, { initial: [-1] });
    expect(r1).toMatchObject({ converged: false, reason: 'non-finite-residuals' });
    expect(r1.message).toBe('did not converge: a residual is NaN or infinite (residual 0 is NaN at the starting point)');
    const badJac: CurveModel = (_x, p, g) => { if (g) g[0] = Infinity; return p[0]; };
    expect(fitCurve({ x, y: [1, 2, 3] }, badJac, { initial: [1] }).reason).toBe('non-finite-jacobian');
    const boom: CurveModel = () => { throw new Error('model exploded'); };
    const r2 = fitCurve({ x, y: [1, 2, 3] }, boom, { initial: [1] });
    expect(r2).toMatchObject({ converged: false, reason: 'evaluation-failed' });
    expect(r2.message).toMatch(/model exploded/);
    const r3 = fitCurve({ x: [1], y: [1] }, line, { initial: [0, 0] });
    expect(r3).toMatchObject({ converged: false, reason: 'too-few-points', degreesOfFreedom: -1 });
    // With data uncertainties, exactly as many points as parameters is allowed (dof = 0).
    const r4 = fitCurve({ x: [0, 1], y: [1, 3], sigma: [1, 1] }, line, { initial: [0, 0] });
    expect(r4.converged).toBe(true);
    expect(r4.parameters[1]).toBeCloseTo(2, 12);
  });

  it('treats NaN at a trial point as a rejected step and still converges', () => {
    // √p is NaN for p < 0: the first full Gauss–Newton step overshoots below zero.
    const x = Array.from({ length: 10 }, (_, i) => i);
    const y = x.map((v) => Math.sqrt(0.04) * v);
    const model: CurveModel = (xv, p, g) => {
      const s = Math.sqrt(p[0]);
      if (g) g[0] = xv / (2 * s);
      return s * xv;
    };
    const r = fitCurve({ x, y }, model, { initial: [25] });
    expect(r.converged).toBe(true);
    expect(r.parameters[0]).toBeCloseTo(0.04, 10);
  });

  it('says singular-covariance when a parameter is not determined', () => {
    // p0 and p1 enter only as their sum.
    const model: CurveModel = (xv, p, g) => { if (g) { g[0] = xv; g[1] = xv; } return (p[0] + p[1]) * xv; };
    const r = fitCurve({ x: [1, 2, 3, 4], y: [2, 4.1, 5.9, 8] }, model, { initial: [0.5, 0.5] });
    expect(r).toMatchObject({ converged: false, reason: 'singular-covariance' });
    expect(r.parameters[0] + r.parameters[1]).toBeCloseTo(2, 2);
    expect(r.uncertainties.every(Number.isNaN)).toBe(true);
  });

  it('stops at an exact fit', () => {
    const r = fitCurve({ x: [0, 1, 2], y: [1, 3, 5] }, line, { initial: [1, 2] });
    expect(r).toMatchObject({ converged: true, reason: 'exact-fit', chiSquare: 0 });
  });

  it('does not modify its inputs', () => {
    const x = Object.freeze([0, 1, 2, 3]);
    const y = Object.freeze([1, 2.9, 5.2, 7]);
    const initial = Object.freeze([0, 0]);
    const r = fitCurve({ x, y }, line, { initial, lower: Object.freeze([-10, -10]) });
    expect(r.converged).toBe(true);
    expect(initial).toEqual([0, 0]);
  });

  it('rejects malformed calls with a UsageError', () => {
    const p: LeastSquaresProblem = { residualCount: 2, evaluate() {} };
    expect(() => leastSquares(p, { initial: [1, 2], lower: [0] })).toThrow(new UsageError('fit.option-length', 'option lower has 1 values but there are 2 parameters'));
    expect(() => leastSquares(p, { initial: [NaN] })).toThrow(/starting value of parameter 0 is NaN/);
    expect(() => leastSquares(p, { initial: [1], lower: [2], upper: [1], parameterNames: ['width'] })).toThrow(/bounds of width are \[2, 1\]/);
    expect(() => leastSquares(p, { initial: [1], weights: [1, -1] })).toThrow(/weight of residual 1 is -1/);
    expect(() => leastSquares(p, { initial: [1], relativeStepTolerance: -1 })).toThrow(/relativeStepTolerance must be a finite number ≥ 0/);
  });
});

describe('damped step', () => {
  it('falls back to QR when the normal matrix is not numerically positive-definite', () => {
    // Columns differ by 1e-9: cond(J) ≈ 1e9, cond(JᵀJ) ≈ 1e18 > 1/ε, so Cholesky of JᵀJ fails
    // or loses every digit, while QR of J keeps about 7 (ε·cond(J)).
    const m = 4, n = 2;
    const jac = Float64Array.from([1, 1, 1, 1 + 1e-9, 1, 1 + 2e-9, 1, 1 + 3e-9]);
    const truth = [1, 2];
    const r = Float64Array.from({ length: m }, (_, i) => -(jac[2 * i] * truth[0] + jac[2 * i + 1] * truth[1]));
    const a = new Float64Array(4), g = new Float64Array(2);
    for (let i = 0; i < m; i++) for (let k = 0; k < n; k++) {
      g[k] += jac[2 * i + k] * r[i];
      for (let l = 0; l < n; l++) a[k * 2 + l] += jac[2 * i + k] * jac[2 * i + l];
    }
    expect(choleskyInPlace(Float64Array.from(a), 2)).toBe(false);
    const delta = new Float64Array(2);
    const ok = solveDampedStep(a, g, Float64Array.from([1, 1]), 0, new Uint8Array(2), 2, new Float64Array(4), delta, jac, r, Int32Array.from([0, 1]), m, n);
    expect(ok).toBe(true);
    expect(delta[0]).toBeCloseTo(1, 5);
    expect(delta[1]).toBeCloseTo(2, 5);
  });
});
