import { UsageError } from '../errors.js';

/** Result of a weighted linear least-squares solve. */
export interface LinearLeastSquaresResult {
  /** Best-fit coefficients (length = number of basis functions). */
  readonly coefficients: Float64Array;
  /** Covariance of the coefficients, (AᵀWA)⁻¹, row-major n×n (not scaled by the residual variance). */
  readonly covariance: Float64Array;
  /** Weighted sum of squared residuals Σ wᵢ (bᵢ − (Ax)ᵢ)². */
  readonly chiSquare: number;
  /** Rows used minus coefficients. */
  readonly degreesOfFreedom: number;
  /** Numerical rank found by the QR factorisation (less than n when the basis is degenerate on the data). */
  readonly rank: number;
}

/**
 * Solves min Σ wᵢ (bᵢ − Σⱼ Aᵢⱼ xⱼ)² by Householder QR of the whitened matrix √w·A
 * (Golub & Van Loan, Matrix Computations, 4th ed., §5.3: the QR route avoids squaring the
 * condition number as the normal equations do).
 *
 * @param design row-major m×n matrix A (m rows, n columns), m ≥ n.
 * @param rows m.
 * @param cols n.
 * @param values b, length m.
 * @param weights wᵢ ≥ 0 (1/σᵢ²); rows with zero or non-finite weight are ignored. Default all 1.
 * @throws {UsageError} when fewer usable rows than columns, or the matrix is rank-deficient.
 * @example
 * // fit y = 1 + 2x through three points
 * solveLinearLeastSquares(Float64Array.of(1, 0, 1, 1, 1, 2), 3, 2, Float64Array.of(1, 3, 5)).coefficients; // [1, 2]
 */
export function solveLinearLeastSquares(
  design: ArrayLike<number>,
  rows: number,
  cols: number,
  values: ArrayLike<number>,
  weights?: ArrayLike<number>,
): LinearLeastSquaresResult {
  // Whitened copy of the usable rows.
  const use: number[] = [];
  for (let i = 0; i < rows; i++) {
    const w = weights ? weights[i] : 1;
    if (w > 0 && Number.isFinite(w) && Number.isFinite(values[i])) use.push(i);
  }
  const m = use.length;
  const n = cols;
  if (m < n) throw new UsageError('lsq.too-few-points', `a fit with ${n} coefficients needs at least ${n} usable points, got ${m}`);
  const a = new Float64Array(m * n);
  const y = new Float64Array(m);
  for (let r = 0; r < m; r++) {
    const i = use[r];
    const sw = Math.sqrt(weights ? weights[i] : 1);
    for (let j = 0; j < n; j++) a[r * n + j] = design[i * n + j] * sw;
    y[r] = values[i] * sw;
  }
  // Column scaling improves the rank test.
  const scale = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let r = 0; r < m; r++) s += a[r * n + j] ** 2;
    scale[j] = s > 0 ? Math.sqrt(s) : 1;
    for (let r = 0; r < m; r++) a[r * n + j] /= scale[j];
  }
  // Householder QR in place: R in the upper triangle, Qᵀy applied to y.
  const rdiag = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let norm = 0;
    for (let r = k; r < m; r++) norm = Math.hypot(norm, a[r * n + k]);
    if (norm === 0) {
      rdiag[k] = 0;
      continue;
    }
    if (a[k * n + k] < 0) norm = -norm;
    for (let r = k; r < m; r++) a[r * n + k] /= norm;
    a[k * n + k] += 1;
    for (let j = k + 1; j < n; j++) {
      let s = 0;
      for (let r = k; r < m; r++) s += a[r * n + k] * a[r * n + j];
      s = -s / a[k * n + k];
      for (let r = k; r < m; r++) a[r * n + j] += s * a[r * n + k];
    }
    let s = 0;
    for (let r = k; r < m; r++) s += a[r * n + k] * y[r];
    s = -s / a[k * n + k];
    for (let r = k; r < m; r++) y[r] += s * a[r * n + k];
    rdiag[k] = -norm;
  }
  let maxDiag = 0;
  for (let k = 0; k < n; k++) maxDiag = Math.max(maxDiag, Math.abs(rdiag[k]));
  let rank = 0;
  for (let k = 0; k < n; k++) if (Math.abs(rdiag[k]) > maxDiag * 1e-12 * Math.max(m, n)) rank++;
  if (rank < n) {
    throw new UsageError('lsq.rank-deficient', `the ${n} basis functions are not independent on the ${m} usable points (rank ${rank}); lower the order or add points`);
  }
  // R (upper triangular, with rdiag on the diagonal).
  const R = (i: number, j: number) => (i === j ? rdiag[i] : a[i * n + j]);
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let j = i + 1; j < n; j++) s -= R(i, j) * x[j];
    x[i] = s / R(i, i);
  }
  let chi2 = 0;
  for (let r = n; r < m; r++) chi2 += y[r] * y[r];
  // Rinv (upper triangular), covariance = Rinv Rinvᵀ, then undo the column scaling.
  const rinv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    rinv[j * n + j] = 1 / R(j, j);
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += R(i, k) * rinv[k * n + j];
      rinv[i * n + j] = -s / R(i, i);
    }
  }
  const cov = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let k = j; k < n; k++) s += rinv[i * n + k] * rinv[j * n + k];
      const v = s / (scale[i] * scale[j]);
      cov[i * n + j] = v;
      cov[j * n + i] = v;
    }
  }
  for (let j = 0; j < n; j++) x[j] /= scale[j];
  return { coefficients: x, covariance: cov, chiSquare: chi2, degreesOfFreedom: m - n, rank };
}
