/**
 * Dispersion polynomials: λ(p) = Σ cₖ Tₖ(t), t the pixel scaled onto [−1, 1] over the
 * basis domain, fitted by weighted linear least squares (Householder QR), with iterative
 * sigma clipping. Internal to the calibrate area; the public face is `solution.ts`.
 */
import { UsageError } from '../errors.js';
import { chebyshevDerivative, chebyshevEvaluate, chebyshevRow, type Domain } from '../math/basis.js';
import { solveLinearLeastSquares } from '../math/linear-least-squares.js';
import { median } from '../lines/snr.js';

/** Highest polynomial order a dispersion solution may have. */
export const MAX_SOLUTION_ORDER = 5;

/** Centroid precision floor added in quadrature to every line's pixel uncertainty, pixels: no line centre is trusted to better than this (our own choice; lamp centroids rarely reach 0.005 pixel). */
export const PIXEL_UNCERTAINTY_FLOOR = 0.005;

/** A (pixel, wavelength) pair to fit. */
export interface FitPoint {
  readonly pixel: number;
  /** 1-σ of the pixel centre (> 0; NaN or missing = unknown, taken as the median of the others). */
  readonly pixelUncertainty: number;
  readonly wavelengthAngstrom: number;
  /** 1-σ accuracy of the list wavelength, Å (≥ 0; default 0). */
  readonly wavelengthUncertaintyAngstrom?: number;
}

/** Why a point was left out of a fit. */
export type PointRejection = 'sigma-clipped';

/** Result of {@link fitPolynomial}. */
export interface PolynomialFit {
  readonly coefficients: Float64Array;
  /** Covariance of the coefficients, row-major, scaled by max(1, χ²/dof). */
  readonly covariance: Float64Array;
  readonly order: number;
  readonly domain: Domain;
  /** Per point: used in the final fit. */
  readonly used: readonly boolean[];
  /** Per point: residual λ_list − λ_fit, Å. */
  readonly residualAngstrom: Float64Array;
  /** Per point: residual in pixels (Å divided by the local dispersion). */
  readonly residualPixels: Float64Array;
  /** Per point: the 1-σ used as its weight, Å: the centre's error carried into wavelength and the list's accuracy, in quadrature. */
  readonly sigmaAngstrom: Float64Array;
  /** The robust scale of the normalised residuals r/σ over the used points at the last clipping step, ≥ 1. */
  readonly residualScale: number;
  readonly chiSquare: number;
  readonly degreesOfFreedom: number;
}

/** Options of {@link fitPolynomial}. */
export interface PolynomialFitOptions {
  readonly order: number;
  readonly domain: Domain;
  /** Reject points whose |residual| exceeds this many times their own σ (scaled by the robust spread of the normalised residuals when that exceeds 1). Default 3. */
  readonly clipSigma?: number;
  /** Never reject more than this fraction of the points. Default 0.34. */
  readonly maxRejectFraction?: number;
  /** Never go below this many used points. Default order + 3. */
  readonly minPoints?: number;
  /** Points that must not be used at all (e.g. saturated). */
  readonly exclude?: readonly boolean[];
}

/** Default sigma-clipping threshold, in robust σ (common practice). */
export const DEFAULT_CLIP_SIGMA = 3;
const DEFAULT_MAX_REJECT_FRACTION = 0.34;

/** λ at a pixel from Chebyshev coefficients. */
export function evaluatePolynomial(coefficients: ArrayLike<number>, domain: Domain, pixel: number): number {
  return chebyshevEvaluate(coefficients, pixel, domain);
}

/** dλ/dpixel. */
export function derivativePolynomial(coefficients: ArrayLike<number>, domain: Domain, pixel: number): number {
  return chebyshevDerivative(coefficients, pixel, domain);
}

/** √(rowᵀ C row): 1-σ of λ at a pixel from the coefficient covariance. */
export function polynomialSigma(covariance: ArrayLike<number>, order: number, domain: Domain, pixel: number): number {
  const n = order + 1;
  const row = chebyshevRow(pixel, order, domain);
  let s = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += row[i] * covariance[i * n + j] * row[j];
  return Math.sqrt(Math.max(0, s));
}

function solve(points: readonly FitPoint[], use: readonly boolean[], order: number, domain: Domain, sigma: Float64Array | null) {
  const n = order + 1;
  const idx: number[] = [];
  for (let i = 0; i < points.length; i++) if (use[i]) idx.push(i);
  const a = new Float64Array(idx.length * n);
  const b = new Float64Array(idx.length);
  const w = new Float64Array(idx.length);
  const row = new Float64Array(n);
  idx.forEach((i, r) => {
    chebyshevRow(points[i].pixel, order, domain, row);
    a.set(row, r * n);
    b[r] = points[i].wavelengthAngstrom;
    w[r] = sigma ? 1 / (sigma[i] * sigma[i]) : 1;
  });
  return solveLinearLeastSquares(a, idx.length, n, b, w);
}

/**
 * Fits λ(p) as a Chebyshev series of the given order by weighted least squares, with
 * iterative sigma clipping of the single worst point while its residual lies beyond
 * `clipSigma` of its own uncertainty.
 *
 * Method: an unweighted first fit gives the local dispersion; each point's weight is then
 * 1/σ² with σ = √((|dλ/dp| · √(σ_p² + floor²))² + σ_list²): the centre's error carried into
 * wavelength (floor {@link PIXEL_UNCERTAINTY_FLOOR}) and the list's own accuracy σ_list
 * (`wavelengthUncertaintyAngstrom`), in quadrature. Clipping works on the normalised
 * residuals zᵢ = rᵢ/σᵢ with the robust scale s = max(1, 1.4826 × median |z|) over the used
 * points (s > 1 when the scatter shows the σ are too small): the point with the largest
 * |z|/s beyond `clipSigma` is dropped and the fit repeated, until none is or the limits on
 * rejections are reached. So a faint line whose centre is known to ±0.1 pixel is judged by
 * that, not by the ±0.01 pixel of the bright ones. The covariance is scaled by
 * max(1, χ²/dof), so that it never claims more than the scatter shows.
 *
 * @throws {UsageError} when fewer usable points than order + 1, or the order is outside 1–5.
 */
export function fitPolynomial(points: readonly FitPoint[], options: PolynomialFitOptions): PolynomialFit {
  const { order, domain } = options;
  if (!Number.isInteger(order) || order < 1 || order > MAX_SOLUTION_ORDER) {
    throw new UsageError('calibrate.bad-order', `the polynomial order must be a whole number from 1 to ${MAX_SOLUTION_ORDER}, got ${order}`);
  }
  const clip = options.clipSigma ?? DEFAULT_CLIP_SIGMA;
  const m = points.length;
  const use = points.map((_, i) => !(options.exclude?.[i] ?? false));
  const available = use.filter(Boolean).length;
  if (available < order + 1) {
    throw new UsageError('calibrate.too-few-points', `a dispersion polynomial of order ${order} needs at least ${order + 1} lines, got ${available}`);
  }
  const minPoints = Math.max(order + 1, options.minPoints ?? order + 3);
  const maxReject = Math.floor(available * (options.maxRejectFraction ?? DEFAULT_MAX_REJECT_FRACTION));
  const known = points.map((p) => p.pixelUncertainty).filter((s) => s > 0 && Number.isFinite(s));
  const typical = known.length ? median(known) : 0.05;
  const sigmaPix = points.map((p) => Math.hypot(p.pixelUncertainty > 0 && Number.isFinite(p.pixelUncertainty) ? p.pixelUncertainty : typical, PIXEL_UNCERTAINTY_FLOOR));
  const sigmaList = points.map((p) => (p.wavelengthUncertaintyAngstrom !== undefined && p.wavelengthUncertaintyAngstrom > 0 && Number.isFinite(p.wavelengthUncertaintyAngstrom) ? p.wavelengthUncertaintyAngstrom : 0));
  const sigma = new Float64Array(m);
  const residual = new Float64Array(m);
  const residualPx = new Float64Array(m);
  let rejected = 0;
  let scale = 1;
  let fit = solve(points, use, order, domain, null);
  for (let iter = 0; iter <= m; iter++) {
    for (let i = 0; i < m; i++) {
      const disp = Math.abs(chebyshevDerivative(fit.coefficients, points[i].pixel, domain));
      sigma[i] = Math.max(Math.hypot(disp * sigmaPix[i], sigmaList[i]), 1e-12);
    }
    fit = solve(points, use, order, domain, sigma);
    for (let i = 0; i < m; i++) {
      residual[i] = points[i].wavelengthAngstrom - chebyshevEvaluate(fit.coefficients, points[i].pixel, domain);
      residualPx[i] = residual[i] / Math.max(Math.abs(chebyshevDerivative(fit.coefficients, points[i].pixel, domain)), 1e-12);
    }
    const usedIdx = [...use.keys()].filter((i) => use[i]);
    scale = Math.max(1, 1.4826 * median(usedIdx.map((i) => Math.abs(residual[i]) / sigma[i])));
    if (usedIdx.length <= minPoints || rejected >= maxReject) break;
    let worst = -1;
    let worstZ = clip;
    for (const i of usedIdx) {
      const z = Math.abs(residual[i]) / sigma[i] / scale;
      if (z > worstZ) { worstZ = z; worst = i; }
    }
    if (worst < 0) break;
    use[worst] = false;
    rejected++;
  }
  const dof = fit.degreesOfFreedom;
  const factor = dof > 0 ? Math.max(1, fit.chiSquare / dof) : 1;
  return {
    coefficients: fit.coefficients,
    covariance: fit.covariance.map((v) => v * factor),
    order,
    domain,
    used: use,
    residualAngstrom: residual,
    residualPixels: residualPx,
    sigmaAngstrom: sigma,
    residualScale: scale,
    chiSquare: fit.chiSquare,
    degreesOfFreedom: dof,
  };
}

/** Unweighted least-squares Chebyshev fit of order k through (x, y); internal helper for identification. */
export function quickFit(x: readonly number[], y: readonly number[], order: number, domain: Domain): Float64Array {
  const n = order + 1;
  const a = new Float64Array(x.length * n);
  const row = new Float64Array(n);
  for (let r = 0; r < x.length; r++) {
    chebyshevRow(x[r], order, domain, row);
    a.set(row, r * n);
  }
  return solveLinearLeastSquares(a, x.length, n, y).coefficients;
}
