/**
 * Curve fitting y ≈ f(x; p) on top of {@link leastSquares}: the model is given point by
 * point with its gradient, the data as x, y and optional 1-σ uncertainties.
 */
import { UsageError } from '../errors.js';
import { leastSquares, type LeastSquaresOptions, type LeastSquaresResult } from './least-squares.js';

/** Data for {@link fitCurve}. Arrays of equal length. */
export interface CurveData {
  /** Independent variable, any unit. */
  readonly x: ArrayLike<number>;
  /** Measured values. NaN or infinite values are skipped. */
  readonly y: ArrayLike<number>;
  /** 1-σ uncertainties of y; points whose σ is NaN, ≤ 0 or infinite are skipped. */
  readonly sigma?: ArrayLike<number>;
}

/**
 * A model evaluated at one point: returns f(x; p) and, when `gradient` is not null,
 * writes ∂f/∂pⱼ into `gradient[j]` for every parameter.
 */
export type CurveModel = (x: number, parameters: Float64Array, gradient: Float64Array | null) => number;

/** Options of {@link fitCurve}: those of {@link leastSquares} without `weights` (they come from `sigma`). */
export type CurveFitOptions = Omit<LeastSquaresOptions, 'weights'>;

/**
 * Fits y ≈ f(x; p) by weighted least squares, minimising χ² = Σ ((f(xᵢ) − yᵢ)/σᵢ)².
 *
 * Method: residuals whitened by σᵢ (so each residual has unit variance) and minimised by
 * {@link leastSquares} (Levenberg–Marquardt, covariance from the QR of the whitened
 * Jacobian). Missing data: points with a non-finite x or y, or an unusable σ, are skipped.
 * Without `sigma`, every point has σ = 1 and the uncertainties are scaled by the reduced
 * χ² unless `uncertaintySource` says otherwise; with `sigma`, they come from the data.
 *
 * @param data x, y and optional σ (same length).
 * @param model the model value and gradient at one x.
 * @param options starting values (required), bounds, fixed parameters, tolerances.
 * @returns the {@link LeastSquaresResult}; never throws on a numerical failure.
 * @throws {UsageError} when the arrays differ in length or an option is malformed.
 * @example
 * const r = fitCurve({ x: [0, 1, 2, 3], y: [1.1, 2.9, 5.1, 7.0] },
 *   (x, p, grad) => { if (grad) { grad[0] = 1; grad[1] = x; } return p[0] + p[1] * x; },
 *   { initial: [0, 1] });
 * r.parameters; // ≈ [1.04, 1.99]
 */
export function fitCurve(data: CurveData, model: CurveModel, options: CurveFitOptions): LeastSquaresResult {
  const n0 = data.x.length;
  if (data.y.length !== n0 || (data.sigma && data.sigma.length !== n0)) {
    throw new UsageError('fit.length-mismatch', `x has ${n0} values, y ${data.y.length}${data.sigma ? `, sigma ${data.sigma.length}` : ''}; they must be equal`);
  }
  const keep: number[] = [];
  for (let i = 0; i < n0; i++) {
    const s = data.sigma ? data.sigma[i] : 1;
    if (Number.isFinite(data.x[i]) && Number.isFinite(data.y[i]) && s > 0 && Number.isFinite(s)) keep.push(i);
  }
  const m = keep.length;
  const x = new Float64Array(m), y = new Float64Array(m), inv = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const i = keep[k];
    x[k] = data.x[i];
    y[k] = data.y[i];
    inv[k] = data.sigma ? 1 / data.sigma[i] : 1;
  }
  const n = options.initial.length;
  const grad = new Float64Array(n);
  return leastSquares({
    residualCount: m,
    evaluate(p, res, jac) {
      for (let i = 0; i < m; i++) {
        grad.fill(0);
        const f = model(x[i], p, grad);
        const w = inv[i];
        res[i] = (f - y[i]) * w;
        const row = i * n;
        for (let j = 0; j < n; j++) jac[row + j] = grad[j] * w;
      }
    },
  }, { ...options, uncertaintySource: options.uncertaintySource ?? (data.sigma ? 'data' : 'scaled-by-reduced-chi-square') });
}
