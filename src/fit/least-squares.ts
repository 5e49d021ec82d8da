/**
 * A general nonlinear least-squares solver (Levenberg–Marquardt) with analytic
 * Jacobians, bounds, fixed parameters, per-residual weights, MINPACK-style stopping
 * rules with a stop reason, and the parameter covariance from the QR factorisation of
 * the weighted Jacobian. Not specific to spectral lines: the line fits, the dispersion
 * solutions and the orbit fits all use it.
 *
 * Why our own: ml-levenberg-marquardt 5.1.0 has no covariance, stops only on an
 * iteration count or an absolute error, weights wrongly, and throws on NIST StRD Gauss3
 * from start 2 (figures in DEVELOPERS.md, "Fitting", and `bench/strd-solvers.ts`).
 */
import { UsageError } from '../errors.js';
import { choleskyInPlace, choleskySolveInPlace, inverseNormalMatrix, pivotedQR, solveLeastSquaresQR } from './linalg.js';

/**
 * Where the parameter uncertainties come from:
 * - `data`: the weights are the true inverse variances 1/σᵢ², so the covariance is
 *   (JᵀWJ)⁻¹ as it stands;
 * - `scaled-by-reduced-chi-square`: the weights are only relative (or absent), so the
 *   covariance is (JᵀWJ)⁻¹ multiplied by χ²/(degrees of freedom).
 */
export type UncertaintySource = 'data' | 'scaled-by-reduced-chi-square';

/**
 * Why the solver stopped. The first four mean success (`converged: true`):
 * - `chi-square-converged`: the actual and predicted relative reductions of χ² over the
 *   last step were both at most `relativeChiSquareTolerance` (MINPACK's ftol test);
 * - `step-converged`: every parameter moved by at most `relativeStepTolerance` times
 *   (|value| + `relativeStepTolerance`) (MINPACK's xtol test, per parameter);
 * - `gradient-converged`: the largest cosine between the residual vector and a column of
 *   the Jacobian is at most `gradientTolerance` (MINPACK's gtol test);
 * - `exact-fit`: χ² is exactly zero;
 * - `no-free-parameters`: every parameter is fixed; the model was evaluated once.
 *
 * The others mean failure (`converged: false`); the parameters are the best point reached:
 * - `max-iterations`: `maxIterations` trial steps without meeting a stopping rule;
 * - `non-finite-residuals` / `non-finite-jacobian`: NaN or ±Infinity at the starting
 *   point, or at every trial point near the end;
 * - `evaluation-failed`: the residual callback threw (its message is in `message`);
 * - `too-few-points`: fewer residuals than free parameters (or no degrees of freedom
 *   left when the uncertainties are scaled by the reduced χ²);
 * - `singular-covariance`: the minimum was found but the weighted Jacobian is
 *   rank-deficient there, so the uncertainties are undefined (NaN);
 * - `no-progress`: the damping grew without bound and no step reduced χ².
 */
export type LeastSquaresStopReason =
  | 'chi-square-converged'
  | 'step-converged'
  | 'gradient-converged'
  | 'exact-fit'
  | 'no-free-parameters'
  | 'max-iterations'
  | 'non-finite-residuals'
  | 'non-finite-jacobian'
  | 'evaluation-failed'
  | 'too-few-points'
  | 'singular-covariance'
  | 'no-progress';

const SUCCESS: ReadonlySet<LeastSquaresStopReason> = new Set([
  'chi-square-converged', 'step-converged', 'gradient-converged', 'exact-fit', 'no-free-parameters',
]);

/**
 * A least-squares problem: m residuals rᵢ(p) and their Jacobian Jᵢⱼ = ∂rᵢ/∂pⱼ.
 * The solver minimises χ² = Σ wᵢ rᵢ² (wᵢ = 1 without weights).
 */
export interface LeastSquaresProblem {
  /** Number of residuals m. */
  readonly residualCount: number;
  /**
   * Fills `residuals` (length m) and `jacobian` (m×n, row-major: row i, column j at
   * `i * n + j`, where n = number of parameters, fixed ones included) at `parameters`.
   * Must not keep references to the arrays. May throw; the solver reports
   * `evaluation-failed` at the start and treats a throw at a trial point as a rejected step.
   */
  evaluate(parameters: Float64Array, residuals: Float64Array, jacobian: Float64Array): void;
}

/** Options of {@link leastSquares}. Every default is stated once, here. */
export interface LeastSquaresOptions {
  /** Starting parameter values (n of them, finite). Values outside the bounds are moved onto them. */
  initial: ArrayLike<number>;
  /** Lower bounds (−Infinity for none). Default: none. */
  lower?: ArrayLike<number>;
  /** Upper bounds (+Infinity for none). Default: none. */
  upper?: ArrayLike<number>;
  /** true for parameters held at their initial value. Default: none fixed. */
  fixed?: ArrayLike<boolean>;
  /**
   * Weights wᵢ ≥ 0 per residual (usually 1/σᵢ²), so χ² = Σ wᵢ rᵢ². Default: all 1 —
   * use that when the callback already returns whitened residuals rᵢ/σᵢ.
   */
  weights?: ArrayLike<number>;
  /** See {@link UncertaintySource}. Default `data`. */
  uncertaintySource?: UncertaintySource;
  /** MINPACK ftol: stop when the relative reduction of χ² (actual and predicted) is at most this. Default 1e-10. */
  relativeChiSquareTolerance?: number;
  /** MINPACK xtol: stop when every |Δpⱼ| ≤ tol·(|pⱼ| + tol). Default 1e-10. */
  relativeStepTolerance?: number;
  /** MINPACK gtol: stop when every |cos(residual vector, Jacobian column)| ≤ this. Default 1e-10. */
  gradientTolerance?: number;
  /** Maximum number of trial steps (each costs one evaluation). Default 200. */
  maxIterations?: number;
  /** Names of the parameters, used in error messages only. */
  parameterNames?: readonly string[];
}

/** The outcome of a least-squares fit. Arrays are plain so that the result serialises to JSON. */
export interface LeastSquaresResult {
  /** True when a stopping rule for success was met and the covariance exists. */
  readonly converged: boolean;
  /** Why the solver stopped (see {@link LeastSquaresStopReason}). */
  readonly reason: LeastSquaresStopReason;
  /** One readable sentence about the stop. */
  readonly message: string;
  /** Best parameters found (all n, fixed ones included). */
  readonly parameters: number[];
  /** 1-σ uncertainties: √diag(covariance); 0 for fixed parameters, NaN when no covariance. */
  readonly uncertainties: number[];
  /** n×n covariance matrix (rows and columns of fixed parameters are 0; NaN when undefined). */
  readonly covariance: number[][];
  /** n×n correlation matrix (1 on the diagonal, 0 against fixed parameters; NaN when undefined). */
  readonly correlation: number[][];
  /** How the covariance was scaled. */
  readonly uncertaintySource: UncertaintySource;
  /** χ² = Σ wᵢ rᵢ² at `parameters`. */
  readonly chiSquare: number;
  /** Residuals minus free parameters. */
  readonly degreesOfFreedom: number;
  /** χ² / degrees of freedom (NaN when there are none). */
  readonly reducedChiSquare: number;
  /** Trial steps taken. */
  readonly iterations: number;
  /** Calls of `evaluate`. */
  readonly evaluations: number;
  /** Per parameter: true when a free parameter ended on one of its bounds. */
  readonly atBound: boolean[];
}

// Defaults, stated once.
const DEFAULT_FTOL = 1e-10;
const DEFAULT_XTOL = 1e-10;
const DEFAULT_GTOL = 1e-10;
const DEFAULT_MAX_ITERATIONS = 200;
/** Marquardt's starting damping relative to the diagonal of JᵀJ (Marquardt 1963). */
const INITIAL_DAMPING = 1e-3;
/** A step is accepted when the actual χ² reduction is at least this fraction of the predicted one (MINPACK uses 1e-4). */
const ACCEPT_RATIO = 1e-4;

type EvalStatus = 'ok' | 'evaluation-failed' | 'non-finite-residuals' | 'non-finite-jacobian';

function checkOptionArray(name: string, a: ArrayLike<unknown> | undefined, n: number): void {
  if (a !== undefined && a.length !== n) {
    throw new UsageError('fit.option-length', `option ${name} has ${a.length} values but there are ${n} parameters`);
  }
}

function checkTolerance(name: string, v: number | undefined): number | undefined {
  if (v === undefined) return undefined;
  if (!(v >= 0) || !Number.isFinite(v)) throw new UsageError('fit.bad-tolerance', `option ${name} must be a finite number ≥ 0, got ${v}`);
  return v;
}

/**
 * Minimises χ² = Σ wᵢ rᵢ(p)² by Levenberg–Marquardt and returns the parameters with
 * their covariance.
 *
 * Method: Levenberg (1944) and Marquardt (1963, J. SIAM 11, 431) with Marquardt's
 * diagonal scaling D² = max over iterations of diag(JᵀWJ) (as in MINPACK, Moré 1978);
 * the damped normal equations (JᵀWJ + λD²)δ = −JᵀWr are solved by Cholesky, falling
 * back to Householder QR of the augmented system [√W J; √λ D] when Cholesky fails;
 * the damping follows Nielsen (1999, IMM-REP-1999-05): after a step with gain ratio ρ,
 * λ ← λ·max(1/3, 1 − (2ρ − 1)³), after a rejected step λ ← λ·ν, ν ← 2ν. Bounds are
 * handled by projection with an active set (a parameter on a bound whose gradient points
 * outward is held for that step). Stopping rules follow MINPACK's ftol, xtol and gtol.
 * The covariance is (JᵀWJ)⁻¹ = P R⁻¹R⁻ᵀ Pᵀ from the pivoted QR of √W J at the solution
 * (never forming JᵀWJ), times χ²/dof when `uncertaintySource` is
 * `scaled-by-reduced-chi-square`. For a parameter on a bound, the uncertainty is that of
 * the unconstrained quadratic approximation.
 *
 * Never throws for a numerical failure: NaN/Infinity, a throwing callback or a singular
 * Jacobian give `converged: false` with a `reason`.
 *
 * @param problem residual count and the callback filling residuals and Jacobian.
 * @param options starting values (required), bounds, fixed parameters, weights, tolerances.
 * @returns the best parameters, their 1-σ uncertainties, covariance and correlation,
 *   χ², degrees of freedom, and the stop reason.
 * @throws {UsageError} when option arrays have the wrong length, a starting value is not
 *   finite, a lower bound exceeds its upper bound, a weight is negative or not finite, or
 *   a tolerance is negative.
 * @example
 * // Fit y = a·exp(−b·x) to three points.
 * const x = [0, 1, 2], y = [2, 0.7358, 0.2707];
 * const r = leastSquares({
 *   residualCount: 3,
 *   evaluate(p, res, jac) {
 *     for (let i = 0; i < 3; i++) {
 *       const e = Math.exp(-p[1] * x[i]);
 *       res[i] = p[0] * e - y[i];
 *       jac[i * 2] = e;
 *       jac[i * 2 + 1] = -p[0] * x[i] * e;
 *     }
 *   },
 * }, { initial: [1, 0.5], uncertaintySource: 'scaled-by-reduced-chi-square' });
 * r.converged; // true
 * r.parameters; // ≈ [2.0000, 0.99994]
 */
export function leastSquares(problem: LeastSquaresProblem, options: LeastSquaresOptions): LeastSquaresResult {
  const n = options.initial.length;
  const m = problem.residualCount;
  if (!Number.isInteger(m) || m < 0) throw new UsageError('fit.bad-residual-count', `residualCount must be a whole number ≥ 0, got ${m}`);
  checkOptionArray('lower', options.lower, n);
  checkOptionArray('upper', options.upper, n);
  checkOptionArray('fixed', options.fixed, n);
  if (options.weights !== undefined && options.weights.length !== m) {
    throw new UsageError('fit.option-length', `option weights has ${options.weights.length} values but there are ${m} residuals`);
  }
  if (options.parameterNames !== undefined) checkOptionArray('parameterNames', options.parameterNames, n);
  const name = (j: number) => options.parameterNames?.[j] ?? `parameter ${j}`;
  const ftol = checkTolerance('relativeChiSquareTolerance', options.relativeChiSquareTolerance) ?? DEFAULT_FTOL;
  const xtol = checkTolerance('relativeStepTolerance', options.relativeStepTolerance) ?? DEFAULT_XTOL;
  const gtol = checkTolerance('gradientTolerance', options.gradientTolerance) ?? DEFAULT_GTOL;
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!(maxIterations >= 0)) throw new UsageError('fit.bad-max-iterations', `option maxIterations must be ≥ 0, got ${maxIterations}`);
  const uncertaintySource: UncertaintySource = options.uncertaintySource ?? 'data';

  const lower = new Float64Array(n).fill(-Infinity);
  const upper = new Float64Array(n).fill(Infinity);
  const p = new Float64Array(n);
  const freeList: number[] = [];
  for (let j = 0; j < n; j++) {
    const v = options.initial[j];
    if (!Number.isFinite(v)) throw new UsageError('fit.bad-initial', `starting value of ${name(j)} is ${v}, not a finite number`);
    if (options.lower) lower[j] = options.lower[j];
    if (options.upper) upper[j] = options.upper[j];
    if (Number.isNaN(lower[j]) || Number.isNaN(upper[j]) || lower[j] > upper[j]) {
      throw new UsageError('fit.bad-bounds', `bounds of ${name(j)} are [${lower[j]}, ${upper[j]}]: the lower bound must not exceed the upper`);
    }
    p[j] = Math.min(Math.max(v, lower[j]), upper[j]);
    if (!options.fixed?.[j]) freeList.push(j);
  }
  let sqrtW: Float64Array | null = null;
  if (options.weights) {
    sqrtW = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const w = options.weights[i];
      if (!(w >= 0) || !Number.isFinite(w)) throw new UsageError('fit.bad-weight', `weight of residual ${i} is ${w}; weights must be finite and ≥ 0`);
      sqrtW[i] = Math.sqrt(w);
    }
  }
  const free = Int32Array.from(freeList);
  const nf = free.length;
  const dof = m - nf;

  let r = new Float64Array(m);
  let jac = new Float64Array(m * n);
  let rT = new Float64Array(m);
  let jacT = new Float64Array(m * n);
  let evaluations = 0;
  let iterations = 0;
  let failureDetail = '';

  const evaluateAt = (pp: Float64Array, rr: Float64Array, jj: Float64Array): { status: EvalStatus; chi2: number } => {
    evaluations++;
    try {
      problem.evaluate(pp, rr, jj);
    } catch (e) {
      failureDetail = e instanceof Error ? e.message : String(e);
      return { status: 'evaluation-failed', chi2: Infinity };
    }
    let chi2 = 0;
    for (let i = 0; i < m; i++) {
      if (sqrtW) {
        const s = sqrtW[i];
        rr[i] *= s;
        for (let k = 0; k < nf; k++) jj[i * n + free[k]] *= s;
      }
      const v = rr[i];
      if (!Number.isFinite(v)) {
        failureDetail = `residual ${i} is ${v}`;
        return { status: 'non-finite-residuals', chi2: Infinity };
      }
      chi2 += v * v;
    }
    if (!Number.isFinite(chi2)) {
      failureDetail = 'the sum of squares overflows';
      return { status: 'non-finite-residuals', chi2: Infinity };
    }
    // The Jacobian is checked where it is used: a NaN or infinite entry makes the diagonal
    // of JᵀJ non-finite (see the normal equations below).
    return { status: 'ok', chi2 };
  };

  const finish = (reason: LeastSquaresStopReason, chi2: number, detail = ''): LeastSquaresResult =>
    buildResult(reason, detail, p, jac, m, n, free, chi2, dof, uncertaintySource, iterations, evaluations, lower, upper);

  if (dof < 0 || (dof === 0 && uncertaintySource === 'scaled-by-reduced-chi-square' && nf > 0)) {
    return finish('too-few-points', NaN, `${m} residuals for ${nf} free parameters`);
  }
  const start = evaluateAt(p, r, jac);
  if (start.status !== 'ok') return finish(start.status, NaN, `${failureDetail} at the starting point`);
  let chi2 = start.chi2;
  if (nf === 0) return finish('no-free-parameters', chi2);

  const a = new Float64Array(nf * nf);
  const g = new Float64Array(nf);
  const d = new Float64Array(nf);
  const work = new Float64Array(nf * nf);
  const delta = new Float64Array(nf);
  const pT = new Float64Array(n);
  const active = new Uint8Array(nf);
  const jrow = new Float64Array(nf);
  let lambda = INITIAL_DAMPING;
  let nu = 2;
  let lastTrialFailure: EvalStatus | null = null;

  for (;;) {
    if (chi2 === 0) return finish('exact-fit', chi2);
    // Normal equations over the free parameters: A = JᵀJ, g = Jᵀr (weights already applied),
    // accumulated row by row from a contiguous copy of the free columns.
    a.fill(0);
    g.fill(0);
    const J = jac;
    for (let i = 0; i < m; i++) {
      const row = i * n;
      for (let k = 0; k < nf; k++) jrow[k] = J[row + free[k]];
      const ri = r[i];
      for (let k = 0; k < nf; k++) {
        const jk = jrow[k];
        if (jk === 0) continue;
        g[k] += jk * ri;
        const ak = k * nf;
        for (let l = 0; l <= k; l++) a[ak + l] += jk * jrow[l];
      }
    }
    for (let k = 0; k < nf; k++) for (let l = 0; l < k; l++) a[l * nf + k] = a[k * nf + l];
    for (let k = 0; k < nf; k++) {
      if (!Number.isFinite(a[k * nf + k]) || !Number.isFinite(g[k])) {
        return finish('non-finite-jacobian', chi2, `a derivative with respect to ${name(free[k])} is NaN or infinite${iterations === 0 ? ' at the starting point' : ''}`);
      }
    }
    // Marquardt scaling (MINPACK mode 1): D grows to the largest column norm seen.
    for (let k = 0; k < nf; k++) {
      const cn = Math.sqrt(a[k * nf + k]);
      if (cn > d[k]) d[k] = cn;
      if (d[k] === 0) d[k] = 1;
    }
    // Active set: parameters on a bound whose descent direction points outward.
    let gmax = 0;
    const rnorm = Math.sqrt(chi2);
    for (let k = 0; k < nf; k++) {
      const j = free[k];
      active[k] = (p[j] <= lower[j] && g[k] > 0) || (p[j] >= upper[j] && g[k] < 0) ? 1 : 0;
      const cn = Math.sqrt(a[k * nf + k]);
      if (!active[k] && cn > 0) gmax = Math.max(gmax, Math.abs(g[k]) / (cn * rnorm));
    }
    if (gmax <= gtol) return finish('gradient-converged', chi2);

    for (;;) {
      if (iterations >= maxIterations) return finish('max-iterations', chi2, `after ${iterations} steps`);
      iterations++;
      if (!solveDampedStep(a, g, d, lambda, active, nf, work, delta, jac, r, free, m, n)) {
        lambda *= nu;
        nu *= 2;
        if (!Number.isFinite(lambda) || lambda > 1e300) return finish('no-progress', chi2, 'the damped normal equations could not be solved');
        continue;
      }
      // Trial point, projected onto the bounds; the step actually taken.
      pT.set(p);
      let stepSmall = true;
      let anyMove = false;
      for (let k = 0; k < nf; k++) {
        const j = free[k];
        const v = Math.min(Math.max(p[j] + delta[k], lower[j]), upper[j]);
        pT[j] = v;
        delta[k] = v - p[j];
        if (delta[k] !== 0) anyMove = true;
        if (Math.abs(delta[k]) > xtol * (Math.abs(p[j]) + xtol)) stepSmall = false;
      }
      if (!anyMove) return finish('step-converged', chi2);
      // Predicted reduction of the linear model: −2 gᵀδ − ‖Jδ‖², with ‖Jδ‖² = δᵀ(JᵀJ)δ.
      let gd = 0;
      for (let k = 0; k < nf; k++) gd += g[k] * delta[k];
      let jd2 = 0;
      for (let k = 0; k < nf; k++) {
        if (delta[k] === 0) continue;
        let s = 0;
        for (let l = 0; l < nf; l++) s += a[k * nf + l] * delta[l];
        jd2 += delta[k] * s;
      }
      const predicted = -2 * gd - jd2;
      const trial = evaluateAt(pT, rT, jacT);
      const actual = chi2 - trial.chi2;
      const rho = predicted > 0 && trial.status === 'ok' ? actual / predicted : trial.status === 'ok' ? 0 : -Infinity;
      const accepted = trial.status === 'ok' && actual > 0 && rho > ACCEPT_RATIO;
      const chiSmall = trial.status === 'ok' && Math.abs(actual) <= ftol * chi2 && predicted <= ftol * chi2 && rho <= 2;
      if (trial.status !== 'ok') lastTrialFailure = trial.status;
      if (accepted) {
        p.set(pT);
        [r, rT] = [rT, r];
        [jac, jacT] = [jacT, jac];
        chi2 = trial.chi2;
        const t = 2 * rho - 1;
        lambda *= Math.max(1 / 3, 1 - t * t * t);
        nu = 2;
        lastTrialFailure = null;
      } else {
        lambda *= nu;
        nu *= 2;
      }
      if (chiSmall) return finish('chi-square-converged', chi2);
      if (stepSmall) return finish('step-converged', chi2);
      if (!Number.isFinite(lambda) || lambda > 1e300) {
        return lastTrialFailure ? finish(lastTrialFailure, chi2, `${failureDetail} at every trial point`) : finish('no-progress', chi2, 'no step reduced χ²');
      }
      if (accepted) break;
    }
  }
}

/**
 * Solves (A + λD²)δ = −g over the inactive free parameters (active ones get δ = 0) by
 * Cholesky; when that fails (A + λD² not numerically positive-definite), solves the
 * equivalent least-squares system [J; √λ D] δ ≈ [−r; 0] by Householder QR instead.
 * Exported for tests only (not part of the package's API).
 * @internal
 */
export function solveDampedStep(
  a: Float64Array, g: Float64Array, d: Float64Array, lambda: number, active: Uint8Array, nf: number,
  work: Float64Array, delta: Float64Array, jac: Float64Array, r: Float64Array, free: Int32Array, m: number, n: number,
): boolean {
  const idx: number[] = [];
  for (let k = 0; k < nf; k++) if (!active[k]) idx.push(k);
  const ns = idx.length;
  delta.fill(0);
  if (ns === 0) return true;
  for (let u = 0; u < ns; u++) {
    for (let v = 0; v <= u; v++) work[u * ns + v] = a[idx[u] * nf + idx[v]];
    work[u * ns + u] += lambda * d[idx[u]] * d[idx[u]];
  }
  const b = new Float64Array(ns);
  for (let u = 0; u < ns; u++) b[u] = -g[idx[u]];
  if (choleskyInPlace(work, ns)) {
    choleskySolveInPlace(work, ns, b);
    let ok = true;
    for (let u = 0; u < ns; u++) if (!Number.isFinite(b[u])) ok = false;
    if (ok) {
      for (let u = 0; u < ns; u++) delta[idx[u]] = b[u];
      return true;
    }
  }
  const rows = m + ns;
  const aug = new Float64Array(rows * ns);
  const rhs = new Float64Array(rows);
  for (let i = 0; i < m; i++) {
    for (let u = 0; u < ns; u++) aug[i * ns + u] = jac[i * n + free[idx[u]]];
    rhs[i] = -r[i];
  }
  const sl = Math.sqrt(lambda);
  for (let u = 0; u < ns; u++) aug[(m + u) * ns + u] = sl * d[idx[u]];
  const x = solveLeastSquaresQR(aug, rows, ns, rhs);
  if (!x) return false;
  for (let u = 0; u < ns; u++) {
    if (!Number.isFinite(x[u])) return false;
    delta[idx[u]] = x[u];
  }
  return true;
}

const REASON_TEXT: Readonly<Record<LeastSquaresStopReason, string>> = {
  'chi-square-converged': 'converged: the relative reduction of χ² fell below its tolerance',
  'step-converged': 'converged: the relative parameter step fell below its tolerance',
  'gradient-converged': 'converged: the gradient is orthogonal to the residuals within tolerance',
  'exact-fit': 'converged: the model fits the data exactly (χ² = 0)',
  'no-free-parameters': 'every parameter is fixed; the model was evaluated once',
  'max-iterations': 'did not converge: the iteration limit was reached',
  'non-finite-residuals': 'did not converge: a residual is NaN or infinite',
  'non-finite-jacobian': 'did not converge: a Jacobian entry is NaN or infinite',
  'evaluation-failed': 'did not converge: the model evaluation failed',
  'too-few-points': 'cannot fit: fewer data points than free parameters',
  'singular-covariance': 'no uncertainties: the Jacobian is rank-deficient at the solution',
  'no-progress': 'did not converge: no step reduced χ²',
};

function buildResult(
  reasonIn: LeastSquaresStopReason, detail: string, p: Float64Array, jac: Float64Array,
  m: number, n: number, free: Int32Array, chi2: number, dof: number, uncertaintySource: UncertaintySource,
  iterations: number, evaluations: number, lower: Float64Array, upper: Float64Array,
): LeastSquaresResult {
  let reason = reasonIn;
  const nf = free.length;
  const cov: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const reduced = dof > 0 ? chi2 / dof : NaN;
  let haveCov = false;
  if (SUCCESS.has(reason) && nf > 0) {
    const jf = new Float64Array(m * nf);
    for (let i = 0; i < m; i++) for (let k = 0; k < nf; k++) jf[i * nf + k] = jac[i * n + free[k]];
    const inv = inverseNormalMatrix(pivotedQR(jf, m, nf));
    if (inv) {
      const scale = uncertaintySource === 'scaled-by-reduced-chi-square' ? reduced : 1;
      for (let k = 0; k < nf; k++) for (let l = 0; l < nf; l++) cov[free[k]][free[l]] = inv[k * nf + l] * scale;
      haveCov = true;
    } else {
      reason = 'singular-covariance';
      detail = 'the parameters are not all determined by the data';
    }
  } else if (SUCCESS.has(reason)) {
    haveCov = true;
  }
  const isFree = new Uint8Array(n);
  for (const j of free) isFree[j] = 1;
  if (!haveCov) for (let k = 0; k < nf; k++) for (let l = 0; l < nf; l++) cov[free[k]][free[l]] = NaN;
  const unc = cov.map((row, j) => (isFree[j] ? Math.sqrt(row[j]) : 0));
  const corr = cov.map((row, i) => row.map((v, j) => {
    if (i === j) return isFree[i] && !haveCov ? NaN : 1;
    if (!isFree[i] || !isFree[j]) return 0;
    return v / (unc[i] * unc[j]);
  }));
  const text = REASON_TEXT[reason];
  return {
    converged: SUCCESS.has(reason),
    reason,
    message: detail ? `${text} (${detail})` : text,
    parameters: Array.from(p),
    uncertainties: unc,
    covariance: cov,
    correlation: corr,
    uncertaintySource,
    chiSquare: chi2,
    degreesOfFreedom: dof,
    reducedChiSquare: reduced,
    iterations,
    evaluations,
    atBound: Array.from(p, (v, j) => Boolean(isFree[j]) && (v === lower[j] || v === upper[j])),
  };
}
