/**
 * Small dense linear algebra for the least-squares solver: Cholesky factorisation of
 * symmetric positive-definite matrices and Householder QR with column pivoting.
 * Matrices are row-major `Float64Array`s. Internal to the fit area (not exported from
 * the package); sizes here are a few parameters by a few thousand residuals.
 *
 * Methods: Golub & Van Loan, Matrix Computations (4th ed., 2013), algorithms 4.2.1
 * (Cholesky) and 5.4.1 (Householder QR with column pivoting).
 */

/**
 * Factorises the symmetric n×n matrix `a` (row-major, only the lower triangle is read)
 * in place into its Cholesky factor L (lower triangle of `a`, A = L Lᵀ).
 *
 * @returns false when a pivot is not positive and finite (A not positive-definite).
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k];
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = s / ljj;
    }
  }
  return true;
}

/** Solves L Lᵀ x = b in place in `b`, with L from {@link choleskyInPlace}. */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * b[k];
    b[i] = s / l[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k];
    b[i] = s / l[i * n + i];
  }
}

/** A Householder QR factorisation with column pivoting, A P = Q R. */
export interface PivotedQR {
  /** Rows and columns of A. */
  readonly rows: number;
  readonly cols: number;
  /** R as a cols×cols row-major upper-triangular matrix. */
  readonly r: Float64Array;
  /** Column permutation: column k of A P is column perm[k] of A. */
  readonly perm: Int32Array;
  /** Numerical rank: leading diagonal entries of R above the rank tolerance. */
  readonly rank: number;
  /** Applies Qᵀ to a vector of length `rows` in place. */
  applyQt(b: Float64Array): void;
}

/**
 * Householder QR with column pivoting of the m×n matrix `a` (row-major; copied, not
 * modified), m ≥ n. The rank tolerance is max(m, n)·ε·|R₀₀| (the rule numerical
 * libraries use for pseudo-inverses; common practice).
 */
export function pivotedQR(a: Float64Array, m: number, n: number): PivotedQR {
  // Column-major working copy: column j occupies q[j*m … j*m + m − 1], so every Householder
  // operation runs over contiguous memory.
  const q = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) q[j * m + i] = a[i * n + j];
  const perm = new Int32Array(n);
  for (let j = 0; j < n; j++) perm[j] = j;
  const betas = new Float64Array(n);
  const diag = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // Pivot: the remaining column with the largest norm below row k (recomputed exactly: n is small).
    let best = k;
    let bestNorm = -1;
    for (let j = k; j < n; j++) {
      let s = 0;
      const o = j * m;
      for (let i = k; i < m; i++) s += q[o + i] * q[o + i];
      if (s > bestNorm) { bestNorm = s; best = j; }
    }
    if (best !== k) {
      const ok = k * m, ob = best * m;
      for (let i = 0; i < m; i++) { const t = q[ok + i]; q[ok + i] = q[ob + i]; q[ob + i] = t; }
      const tp = perm[k]; perm[k] = perm[best]; perm[best] = tp;
    }
    const ok = k * m;
    const xnorm = Math.sqrt(bestNorm);
    if (xnorm === 0) { betas[k] = 0; diag[k] = 0; continue; }
    const x0 = q[ok + k];
    const alpha = x0 >= 0 ? -xnorm : xnorm;
    // v = x − alpha e1, stored in column k rows k..m−1; beta = 2 / (vᵀv).
    const v0 = x0 - alpha;
    q[ok + k] = v0;
    const vtv = bestNorm - x0 * x0 + v0 * v0;
    const beta = vtv > 0 ? 2 / vtv : 0;
    betas[k] = beta;
    diag[k] = alpha;
    for (let j = k + 1; j < n; j++) {
      const oj = j * m;
      let s = 0;
      for (let i = k; i < m; i++) s += q[ok + i] * q[oj + i];
      s *= beta;
      for (let i = k; i < m; i++) q[oj + i] -= s * q[ok + i];
    }
  }
  const r = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    r[i * n + i] = diag[i];
    for (let j = i + 1; j < n; j++) r[i * n + j] = q[j * m + i];
  }
  const tol = Math.max(m, n) * Number.EPSILON * Math.abs(diag[0]);
  let rank = 0;
  while (rank < n && Math.abs(diag[rank]) > tol && Number.isFinite(diag[rank])) rank++;
  return {
    rows: m, cols: n, r, perm, rank,
    applyQt(b: Float64Array) {
      for (let k = 0; k < n; k++) {
        const beta = betas[k];
        if (beta === 0) continue;
        const ok = k * m;
        let s = 0;
        for (let i = k; i < m; i++) s += q[ok + i] * b[i];
        s *= beta;
        for (let i = k; i < m; i++) b[i] -= s * q[ok + i];
      }
    },
  };
}

/**
 * Least-squares solution of A x ≈ b by pivoted QR; null when A is rank-deficient.
 * `a` is m×n row-major, `b` has length m (neither is modified).
 */
export function solveLeastSquaresQR(a: Float64Array, m: number, n: number, b: Float64Array): Float64Array | null {
  const f = pivotedQR(a, m, n);
  if (f.rank < n) return null;
  const qtb = Float64Array.from(b);
  f.applyQt(qtb);
  const y = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = qtb[i];
    for (let j = i + 1; j < n; j++) s -= f.r[i * n + j] * y[j];
    y[i] = s / f.r[i * n + i];
  }
  const x = new Float64Array(n);
  for (let k = 0; k < n; k++) x[f.perm[k]] = y[k];
  return x;
}

/**
 * (AᵀA)⁻¹ from the pivoted QR of A, as R⁻¹R⁻ᵀ un-permuted: never forms AᵀA, so the
 * condition number is not squared before inversion. Null when A is rank-deficient.
 */
export function inverseNormalMatrix(f: PivotedQR): Float64Array | null {
  const n = f.cols;
  if (f.rank < n) return null;
  const { r } = f;
  // Rinv: upper triangular inverse of R.
  const rinv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    rinv[j * n + j] = 1 / r[j * n + j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += r[i * n + k] * rinv[k * n + j];
      rinv[i * n + j] = -s / r[i * n + i];
    }
  }
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let k = j; k < n; k++) s += rinv[i * n + k] * rinv[j * n + k];
      const pi = f.perm[i];
      const pj = f.perm[j];
      out[pi * n + pj] = s;
      out[pj * n + pi] = s;
    }
  }
  return out;
}
