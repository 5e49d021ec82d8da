/**
 * Keplerian orbit fits of single- and double-lined spectroscopic binaries.
 *
 * Method:
 * 1. Starting periods: the best peaks of the generalised Lomb–Scargle periodogram
 *    ({@link velocityPeriodogram}) plus twice the best period (an eccentric orbit often puts
 *    most power in its first harmonic), or the caller's period guess.
 * 2. For each starting period, a grid in eccentricity (0 to 0.9) and time of periastron
 *    (16 phases): at fixed P, e and T the velocity γ + K cos ω (cos ν + e) − K sin ω sin ν
 *    is linear in (γ, K cos ω, K sin ω), so ω, K and γ come from a weighted linear fit and
 *    every grid point is the best orbit for its (P, e, T). The best grid points start
 *    Levenberg–Marquardt fits (src/fit/least-squares.ts) and the lowest χ² wins, so the fit
 *    does not stall in a local minimum of e, ω or T.
 * 3. Parametrisation of the fit: P, λ₀ (mean longitude λ = M + ω at a reference time, the
 *    weighted mean of the observation times), h = e cos ω, k = e sin ω, K, γ (and K₂). The
 *    model and its analytic Jacobian are computed through the eccentric longitude (the
 *    equinoctial form, {@link trueLongitude}), which is smooth at e = 0 where ω and T are
 *    undefined; (√e cos ω, √e sin ω) would make the Jacobian vanish at e = 0. The fit is
 *    kept to e < `maxEccentricity` (trial steps beyond are rejected).
 * 4. Uncertainties: the covariance of the fitted parameters, (JᵀWJ)⁻¹ with W = 1/(σ² + s²)
 *    (s the jitter), not rescaled by the reduced χ², is transformed to (P, T, e, ω, K, γ, K₂)
 *    with the Jacobian of e = √(h² + k²), ω = atan2(k, h), T = t_ref + P (ω − λ₀)/(2π)
 *    (first order). When e is comparable to its uncertainty the distribution of e is not
 *    Gaussian (Lucy & Sweeney 1971) and the linear uncertainties of e, ω and T are only
 *    indicative; the circular-orbit test below says whether e is significant at all.
 * 5. Lucy & Sweeney 1971 (AJ 76, 544) test of the eccentricity: the circular orbit (h = k = 0
 *    held fixed) is fitted too, and p₁ = (χ²_e / χ²_c)^{(N − m)/2}, with m the number of free
 *    parameters of the eccentric fit, is the probability of an F(2, N − m) statistic at least
 *    as large, i.e. that the fitted eccentricity is spurious; a circular orbit is preferred
 *    when p₁ > 0.05.
 * 6. Jitter (optional): an extra velocity scatter s added in quadrature to every
 *    uncertainty; `'estimate'` chooses s so that χ²/(N − m) = 1 and refits (repeated until s
 *    settles); its own uncertainty is not computed.
 */
import { leastSquares, type LeastSquaresResult } from '../fit/least-squares.js';
import { InputError, UsageError } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { trueAnomalyFromEccentric, solveKepler } from './kepler.js';
import { trueLongitude, type KeplerianOrbit } from './keplerian.js';
import { massFunction, minimumMasses, projectedSemiMajorAxisKm, propagateUncertainty, type Measured } from './mass-function.js';
import { messages } from './messages.js';
import { velocityPeriodogram } from './periodogram.js';
import { createVelocityTable, isDoubleLined, type VelocityTable } from './table.js';

/** Options of {@link fitOrbit}. Every default is stated once, here. */
export interface OrbitFitOptions {
  /** Start near this period (days) instead of searching the periodogram. Default: search. */
  periodGuessDays?: number;
  /** Fit both stars (needs the table's second velocity column). Default false. */
  doubleLined?: boolean;
  /** Shortest period searched, days (periodogram option). Default: the periodogram's (0.5 d). */
  minPeriodDays?: number;
  /** Longest period searched, days (periodogram option). Default: the periodogram's (time span). */
  maxPeriodDays?: number;
  /** Number of periodogram peaks tried as starting periods. Default 5. */
  periodCandidates?: number;
  /** Jitter s added in quadrature to the uncertainties, km/s, or `'estimate'`. Default 0. */
  jitterKmPerS?: number | 'estimate';
  /** Largest eccentricity the fit may reach. Default 0.98. */
  maxEccentricity?: number;
  /** Receives warnings (large χ², period longer than the data). Default: silent. */
  logger?: Logger;
}

const DEFAULTS = {
  periodCandidates: 5,
  jitterKmPerS: 0,
  maxEccentricity: 0.98,
};

/** Eccentricities of the starting grid. */
const E_GRID = [0, 0.15, 0.3, 0.45, 0.6, 0.75, 0.9];
/** Periastron phases of the starting grid (per eccentricity > 0). */
const PHASES = 16;
/** Levenberg–Marquardt runs started from the best grid points of each candidate period. */
const STARTS_PER_PERIOD = 2;
/** Lucy & Sweeney (1971) significance level for adopting an eccentric orbit. */
const LUCY_SWEENEY_LEVEL = 0.05;

/** The Lucy & Sweeney (1971) test of whether the eccentricity is real. */
export interface CircularOrbitTest {
  /** p₁: probability that an eccentricity this large arises from a circular orbit by chance. */
  readonly probability: number;
  /** True when p₁ > 0.05: the eccentricity is not significant and a circular orbit is preferred. */
  readonly circularPreferred: boolean;
  /** The F statistic [(χ²_c − χ²_e)/2] / [χ²_e/(N − m)]. */
  readonly fStatistic: number;
  /** χ² of the eccentric and circular fits. */
  readonly chiSquareEccentric: number;
  readonly chiSquareCircular: number;
  /** The circular fit: period, time of maximum velocity of star 1 (BJD_TDB), K, γ (and K₂). */
  readonly circular: {
    readonly periodDays: Measured;
    readonly maximumVelocityTimeBjdTdb: Measured;
    readonly semiAmplitudeKmPerS: Measured;
    readonly systemicVelocityKmPerS: Measured;
    readonly semiAmplitude2KmPerS?: Measured;
    readonly converged: boolean;
  };
}

/** Result of {@link fitOrbit}. Every measured parameter is {value, uncertainty} (1 σ). */
export interface OrbitFit {
  /** True when the fit met a convergence criterion and has a covariance. */
  readonly converged: boolean;
  /** The least-squares stop reason (e.g. `chi-square-converged`, `max-iterations`). */
  readonly reason: string;
  /** One readable sentence about the outcome. */
  readonly message: string;
  /** True for a double-lined fit. */
  readonly doubleLined: boolean;
  /** The best-fitting orbit as plain values (for {@link radialVelocityKmPerS}). */
  readonly orbit: KeplerianOrbit;
  /** Period P, days. */
  readonly periodDays: Measured;
  /** Time of periastron T, BJD_TDB days: the passage nearest `referenceTimeBjdTdb`. */
  readonly periastronTimeBjdTdb: Measured;
  /** Eccentricity e. */
  readonly eccentricity: Measured;
  /** Argument of periastron ω of star 1, degrees in [0, 360). */
  readonly omegaDeg: Measured;
  /** Semi-amplitude K of star 1, km/s (> 0). */
  readonly semiAmplitudeKmPerS: Measured;
  /** Systemic velocity γ, km/s. */
  readonly systemicVelocityKmPerS: Measured;
  /** Mean longitude λ = M + ω at the reference time, degrees (well defined at e = 0). */
  readonly meanLongitudeDeg: Measured;
  /** Reference time of λ and of the choice of T: weighted mean of the times, BJD_TDB. */
  readonly referenceTimeBjdTdb: number;
  /** Mass function f(m) = m₂³ sin³i/(m₁ + m₂)², nominal solar masses. */
  readonly massFunctionSolarMass: Measured;
  /** a₁ sin i, km. */
  readonly projectedSemiMajorAxisKm: Measured;
  /** Double-lined only: K₂ (km/s), q = m₂/m₁ = K₁/K₂, m₁ sin³i and m₂ sin³i (solar masses). */
  readonly semiAmplitude2KmPerS?: Measured;
  readonly massRatio?: Measured;
  readonly m1SinI3SolarMass?: Measured;
  readonly m2SinI3SolarMass?: Measured;
  /** Jitter used, km/s (0 when none). */
  readonly jitterKmPerS: number;
  /** χ² with weights 1/(σ² + s²), degrees of freedom N − m, and χ²/dof. */
  readonly chiSquare: number;
  readonly degreesOfFreedom: number;
  readonly reducedChiSquare: number;
  /** Root mean square of the residuals of star 1 (and star 2), km/s, unweighted. */
  readonly rmsKmPerS: number;
  readonly rms2KmPerS?: number;
  /** Observed minus computed velocity of star 1 per row, km/s. */
  readonly residualKmPerS: Float64Array;
  /** Observed minus computed velocity of star 2 per row, km/s (NaN where not measured). */
  readonly residual2KmPerS?: Float64Array;
  /** The Lucy & Sweeney (1971) eccentricity test. */
  readonly circularTest: CircularOrbitTest;
  /** Names of the rows and columns of `covariance` (P d, T d, e, ω deg, K km/s, γ km/s, K₂ km/s). */
  readonly covarianceNames: readonly string[];
  /** Covariance of (P, T, e, ω, K, γ[, K₂]) in the units above. */
  readonly covariance: readonly (readonly number[])[];
  /**
   * Other local minima found from other starting periods (distinct by more than half a
   * resolution element 1/(2T) in frequency), best χ² first, at most 3: a period with a χ²
   * close to the best one (typically a 1 d⁻¹ alias) means the data cannot tell them apart.
   */
  readonly alternatives: readonly { readonly periodDays: number; readonly chiSquare: number }[];
  /** The periods tried as starting points, days. */
  readonly startingPeriodsDays: readonly number[];
  /** Number of Levenberg–Marquardt runs made. */
  readonly fitsRun: number;
  /** Input provenance plus an `orbit-fit` entry. */
  readonly provenance: readonly ProvenanceEntry[];
}

/** The data as one list of velocities (star 1 rows then star 2 rows). */
interface Data {
  t: Float64Array;
  v: Float64Array;
  sigma: Float64Array;
  /** 0 for star 1, 1 for star 2. */
  star: Uint8Array;
  /** Table row of each velocity. */
  row: Int32Array;
  tRef: number;
  n1: number;
  n2: number;
}

function collect(table: VelocityTable, doubleLined: boolean): Data {
  const n = table.bjdTdb.length;
  const idx: [number, number][] = [];
  for (let i = 0; i < n; i++) idx.push([i, 0]);
  if (doubleLined) for (let i = 0; i < n; i++) if (!Number.isNaN(table.velocity2KmPerS![i])) idx.push([i, 1]);
  const m = idx.length;
  const d: Data = {
    t: new Float64Array(m), v: new Float64Array(m), sigma: new Float64Array(m), star: new Uint8Array(m), row: new Int32Array(m),
    tRef: 0, n1: n, n2: m - n,
  };
  let W = 0;
  idx.forEach(([i, s], j) => {
    d.t[j] = table.bjdTdb[i];
    d.v[j] = s ? table.velocity2KmPerS![i] : table.velocityKmPerS[i];
    d.sigma[j] = s ? table.uncertainty2KmPerS![i] : table.uncertaintyKmPerS[i];
    d.star[j] = s;
    d.row[j] = i;
    const w = 1 / (d.sigma[j] * d.sigma[j]);
    W += w;
    d.tRef += w * d.t[j];
  });
  d.tRef /= W;
  return d;
}

/** Parameters of the fit: [P, λ₀, h, k, K, γ, (K₂)]. */
const IP = 0, IL = 1, IH = 2, IK = 3, IK1 = 4, IG = 5, IK2 = 6;

/** Fills residuals (data − model) and the Jacobian of the residuals. */
function evaluate(d: Data, q: Float64Array, res: Float64Array, jac: Float64Array, np: number, eMax: number): void {
  const P = q[IP], h = q[IH], k = q[IK], K1 = q[IK1], g = q[IG], K2 = np > 6 ? q[IK2] : 0;
  if (!(P > 0) || Math.hypot(h, k) >= eMax) {
    res.fill(NaN);
    return;
  }
  const u = new Float64Array(5);
  const n = (2 * Math.PI) / P;
  for (let i = 0; i < d.t.length; i++) {
    const tau = d.t[i] - d.tRef;
    trueLongitude(n * tau + q[IL], h, k, u);
    const [cu, su, uL, uH, uK] = u;
    const second = d.star[i] === 1;
    const amp = second ? -K2 : K1;
    const shape = cu + h;
    res[i] = d.v[i] - (g + amp * shape);
    const row = i * np;
    // residual derivatives are minus the model's
    const dShapeDL = -su * uL;
    jac[row + IP] = -amp * dShapeDL * (-n * tau / P);
    jac[row + IL] = -amp * dShapeDL;
    jac[row + IH] = -amp * (-su * uH + 1);
    jac[row + IK] = -amp * (-su * uK);
    jac[row + IK1] = second ? 0 : -shape;
    jac[row + IG] = -1;
    if (np > 6) jac[row + IK2] = second ? shape : 0;
  }
}

interface Start {
  q: number[];
  chi2: number;
}

/** Best grid starts for one period (see the module comment, step 2). */
function gridStarts(d: Data, P: number, w: Float64Array, keep: number): Start[] {
  const out: Start[] = [];
  const m = d.t.length;
  const c = new Float64Array(m);
  const s = new Float64Array(m);
  for (const e of E_GRID) {
    const phases = e === 0 ? 1 : PHASES;
    for (let j = 0; j < phases; j++) {
      const phi = j / phases; // periastron phase at the reference time
      // weighted normal equations for v = γ + A (cos ν + e) + B sin ν over star-1 rows
      let S = 0, Sc = 0, Ss = 0, Scc = 0, Sss = 0, Scs = 0, Sv = 0, Scv = 0, Ssv = 0, Svv = 0;
      for (let i = 0; i < m; i++) {
        if (d.star[i] !== 0) continue;
        const M = 2 * Math.PI * ((d.t[i] - d.tRef) / P - phi);
        const nu = trueAnomalyFromEccentric(solveKepler(M, e), e);
        c[i] = Math.cos(nu) + e;
        s[i] = Math.sin(nu);
        const wi = w[i], vi = d.v[i];
        S += wi; Sc += wi * c[i]; Ss += wi * s[i];
        Scc += wi * c[i] * c[i]; Sss += wi * s[i] * s[i]; Scs += wi * c[i] * s[i];
        Sv += wi * vi; Scv += wi * c[i] * vi; Ssv += wi * s[i] * vi; Svv += wi * vi * vi;
      }
      const sol = solve3([S, Sc, Ss, Sc, Scc, Scs, Ss, Scs, Sss], [Sv, Scv, Ssv]);
      if (!sol) continue;
      const [gamma, A, B] = sol;
      const chi2 = Svv - (gamma * Sv + A * Scv + B * Ssv);
      const K = Math.hypot(A, B);
      const omega = Math.atan2(-B, A);
      const lambda0 = -2 * Math.PI * phi + omega;
      out.push({ q: [P, lambda0, e * Math.cos(omega), e * Math.sin(omega), K, gamma], chi2 });
    }
  }
  out.sort((a, b) => a.chi2 - b.chi2);
  return out.slice(0, keep);
}

/** Solves a 3×3 system (row-major) by Cramer's rule; null when singular. */
function solve3(a: number[], b: number[]): number[] | null {
  const det = (m: number[]) => m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
  const D = det(a);
  if (!(Math.abs(D) > 1e-300) || !Number.isFinite(D)) return null;
  const out: number[] = [];
  for (let c = 0; c < 3; c++) {
    const m = a.slice();
    for (let r = 0; r < 3; r++) m[r * 3 + c] = b[r];
    out.push(det(m) / D);
  }
  return out;
}

/** K₂ that best fits star-2 velocities for a given start (linear in K₂). */
function startK2(d: Data, q: number[], w: Float64Array): number {
  const u = new Float64Array(5);
  let num = 0, den = 0;
  for (let i = 0; i < d.t.length; i++) {
    if (d.star[i] !== 1) continue;
    trueLongitude((2 * Math.PI / q[IP]) * (d.t[i] - d.tRef) + q[IL], q[IH], q[IK], u);
    const shape = -(u[0] + q[IH]);
    num += w[i] * shape * (d.v[i] - q[IG]);
    den += w[i] * shape * shape;
  }
  return den > 0 ? num / den : q[IK1];
}

function runFit(d: Data, start: number[], w: Float64Array, eMax: number, circular: boolean): LeastSquaresResult {
  const np = start.length;
  const initial = start.slice();
  if (circular) { initial[IH] = 0; initial[IK] = 0; }
  const fixed = initial.map((_, j) => circular && (j === IH || j === IK));
  return leastSquares(
    { residualCount: d.t.length, evaluate: (p, r, j) => evaluate(d, p, r, j, np, eMax) },
    {
      initial,
      fixed,
      weights: w,
      lower: initial.map((v, j) => (j === IP ? v * 0.5 : -Infinity)),
      upper: initial.map((v, j) => (j === IP ? v * 2 : Infinity)),
      uncertaintySource: 'data',
      parameterNames: ['P', 'lambda0', 'h', 'k', 'K1', 'gamma', 'K2'].slice(0, np),
    },
  );
}

function weightsFor(d: Data, jitter: number): Float64Array {
  const w = new Float64Array(d.t.length);
  for (let i = 0; i < w.length; i++) w[i] = 1 / (d.sigma[i] * d.sigma[i] + jitter * jitter);
  return w;
}

/** Jitter s with Σ r²/(σ² + s²) = dof (0 when χ² ≤ dof already), by bisection. */
function jitterFor(d: Data, residuals: Float64Array, dof: number): number {
  const chi2 = (s: number) => {
    let c = 0;
    for (let i = 0; i < residuals.length; i++) c += (residuals[i] * residuals[i]) / (d.sigma[i] * d.sigma[i] + s * s);
    return c;
  };
  if (chi2(0) <= dof) return 0;
  let lo = 0, hi = 1;
  while (chi2(hi) > dof && hi < 1e9) hi *= 2;
  for (let it = 0; it < 100; it++) {
    const mid = 0.5 * (lo + hi);
    if (chi2(mid) > dof) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Lucy & Sweeney (1971) probability that an orbit's eccentricity is spurious.
 *
 * Method: Lucy & Sweeney 1971 (AJ 76, 544): p₁ = (χ²_e / χ²_c)^{(N − m)/2}, the probability
 * that the F(2, N − m) statistic [(χ²_c − χ²_e)/2] / [χ²_e/(N − m)] is at least as large when
 * the orbit is circular (the two extra parameters of the eccentric orbit are e cos ω and
 * e sin ω). A circular orbit is preferred when p₁ > 0.05.
 *
 * @param chiSquareEccentric χ² of the eccentric fit, ≥ 0.
 * @param chiSquareCircular χ² of the circular fit (clipped to at least χ²_e).
 * @param pointCount N, the number of velocities fitted.
 * @param eccentricParameterCount m, free parameters of the eccentric fit (6, or 7 double-lined).
 * @returns p₁ in [0, 1].
 * @throws {UsageError} when N ≤ m or a χ² is negative or not finite.
 * @example
 * lucySweeneyProbability(20, 30, 26, 6); // (20/30)^10 ≈ 0.0173: the eccentricity is significant at 5 %
 */
export function lucySweeneyProbability(chiSquareEccentric: number, chiSquareCircular: number, pointCount: number, eccentricParameterCount: number): number {
  const dof = pointCount - eccentricParameterCount;
  if (!(dof >= 1)) throw new UsageError('orbit.bad-option', messages.badOption('pointCount', pointCount, `more than ${eccentricParameterCount} (the eccentric parameters)`));
  if (!(chiSquareEccentric >= 0 && Number.isFinite(chiSquareEccentric)) || !(chiSquareCircular >= 0 && Number.isFinite(chiSquareCircular))) {
    throw new UsageError('orbit.bad-option', messages.badOption('chiSquare', [chiSquareEccentric, chiSquareCircular], 'finite numbers ≥ 0'));
  }
  const chiC = Math.max(chiSquareCircular, chiSquareEccentric);
  if (chiC === 0) return 1;
  return Math.min(1, Math.pow(chiSquareEccentric / chiC, dof / 2));
}

const wrap2pi = (x: number) => ((x % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
const DEG = 180 / Math.PI;

/**
 * Fits a Keplerian orbit to a velocity table: period, time of periastron, eccentricity,
 * argument of periastron, semi-amplitude(s) and systemic velocity, with uncertainties,
 * the mass function (or minimum masses), and the Lucy & Sweeney test of the eccentricity.
 *
 * Method: periodogram and grid starts, Levenberg–Marquardt in (P, λ₀, e cos ω, e sin ω, K, γ),
 * covariance transformed to (P, T, e, ω, K, γ); see the module comment for each step and
 * its reference. Conventions: v = γ + K [cos(ν + ω) + e cos ω] for star 1, ω of star 1,
 * T in BJD_TDB (the passage nearest the weighted mean time), K > 0.
 *
 * @param table velocities: at least 7 rows (single-lined) or 8 velocities in all (double-lined).
 * @param options period guess or search range, double-lined, jitter (see {@link OrbitFitOptions}).
 * @returns the fit; `converged: false` with a `reason` when no run converged (the best
 *   point reached is still reported).
 * @throws {InputError} for too few velocities, zero time span, or `doubleLined` without a second velocity column.
 * @throws {UsageError} for a non-positive period guess or jitter, or a bad option.
 * @example
 * const fit = fitOrbit(readVelocityTable('lvac7-velocities.csv')); // invented demo data
 * fit.periodDays; // { value: 12.37…, uncertainty: 0.00… }
 */
export function fitOrbit(table: VelocityTable, options: OrbitFitOptions = {}): OrbitFit {
  const logger = options.logger ?? silentLogger;
  const doubleLined = options.doubleLined ?? false;
  const eMax = options.maxEccentricity ?? DEFAULTS.maxEccentricity;
  const jitterOption = options.jitterKmPerS ?? DEFAULTS.jitterKmPerS;
  const periodCandidates = options.periodCandidates ?? DEFAULTS.periodCandidates;
  if (!(eMax > 0 && eMax < 1)) throw new UsageError('orbit.bad-option', messages.badOption('maxEccentricity', eMax, 'a number in (0, 1)'));
  if (jitterOption !== 'estimate' && !(jitterOption >= 0 && Number.isFinite(jitterOption))) {
    throw new UsageError('orbit.bad-option', messages.badOption('jitterKmPerS', jitterOption, "a number ≥ 0 or 'estimate'"));
  }
  if (!(Number.isInteger(periodCandidates) && periodCandidates >= 1)) throw new UsageError('orbit.bad-option', messages.badOption('periodCandidates', periodCandidates, 'a positive integer'));
  if (options.periodGuessDays !== undefined && !(options.periodGuessDays > 0 && Number.isFinite(options.periodGuessDays))) {
    throw new UsageError('orbit.bad-period', messages.badPeriod(options.periodGuessDays));
  }
  if (doubleLined && !isDoubleLined(table)) throw new InputError('orbit.no-secondary', messages.noSecondary(), table.source ? { file: table.source.file } : {});
  const d = collect(table, doubleLined);
  const np = doubleLined ? 7 : 6;
  const needed = np + 1;
  if (d.t.length < needed) throw new InputError('orbit.too-few-points', messages.tooFewPoints(d.t.length, needed, doubleLined ? 'a double-lined orbit fit' : 'an orbit fit'));
  let tMin = Infinity, tMax = -Infinity;
  for (const t of table.bjdTdb) { tMin = Math.min(tMin, t); tMax = Math.max(tMax, t); }
  const span = tMax - tMin;
  if (!(span > 0)) throw new InputError('orbit.zero-span', messages.zeroSpan());

  // 1. starting periods
  let periods: number[];
  if (options.periodGuessDays !== undefined) {
    periods = [options.periodGuessDays];
  } else {
    const primary = createVelocityTable({ bjdTdb: table.bjdTdb, velocityKmPerS: table.velocityKmPerS, uncertaintyKmPerS: table.uncertaintyKmPerS });
    const pg = velocityPeriodogram(primary, {
      ...(options.minPeriodDays !== undefined ? { minPeriodDays: options.minPeriodDays } : {}),
      ...(options.maxPeriodDays !== undefined ? { maxPeriodDays: options.maxPeriodDays } : {}),
      peakCount: periodCandidates,
    });
    periods = pg.peaks.map((p) => p.periodDays);
    const twice = 2 * pg.best.periodDays;
    if (twice <= pg.maxPeriodDays) periods.push(twice);
  }

  // 2–3. grid starts and Levenberg–Marquardt fits
  let jitter = jitterOption === 'estimate' ? 0 : jitterOption;
  let w = weightsFor(d, jitter);
  let fitsRun = 0;
  const runs: LeastSquaresResult[] = [];
  const fitFrom = (starts: number[][]): LeastSquaresResult => {
    let best: LeastSquaresResult | undefined;
    for (const s of starts) {
      const r = runFit(d, s, w, eMax, false);
      runs.push(r);
      fitsRun++;
      const better = !best || (r.converged && !best.converged) || (r.converged === best.converged && r.chiSquare < best.chiSquare);
      if (better && Number.isFinite(r.chiSquare)) best = r;
    }
    return best ?? runFit(d, starts[0], w, eMax, false);
  };
  const starts: number[][] = [];
  for (const P of periods) {
    for (const s of gridStarts(d, P, w, STARTS_PER_PERIOD)) {
      const q = s.q.slice();
      if (doubleLined) q.push(startK2(d, q, w));
      starts.push(q);
    }
  }
  if (starts.length === 0) throw new InputError('orbit.too-few-points', messages.tooFewPoints(d.t.length, needed, 'an orbit fit'));
  let fit = fitFrom(starts);
  const alternatives: { periodDays: number; chiSquare: number }[] = [];
  for (const r of [...runs].sort((a, b) => a.chiSquare - b.chiSquare)) {
    if (!r.converged) continue;
    const f = 1 / r.parameters[IP];
    const distinct = (p: number) => Math.abs(1 / p - f) > 0.5 / span;
    if (!distinct(fit.parameters[IP]) || !alternatives.every((a) => distinct(a.periodDays))) continue;
    alternatives.push({ periodDays: r.parameters[IP], chiSquare: r.chiSquare });
    if (alternatives.length === 3) break;
  }

  // 6. jitter estimate: refit until s settles
  if (jitterOption === 'estimate') {
    for (let it = 0; it < 20; it++) {
      const res = new Float64Array(d.t.length);
      evaluate(d, Float64Array.from(fit.parameters), res, new Float64Array(d.t.length * np), np, eMax);
      const next = jitterFor(d, res, fit.degreesOfFreedom);
      const settled = Math.abs(next - jitter) <= 1e-4 * Math.max(next, 1e-3);
      jitter = next;
      w = weightsFor(d, jitter);
      fit = fitFrom([fit.parameters]);
      if (settled) break;
    }
  }

  // normalise: K₁ > 0, λ₀ in [0, 2π)
  const q = fit.parameters.slice();
  const flip = q[IK1] < 0;
  if (flip) {
    q[IK1] = -q[IK1]; q[IH] = -q[IH]; q[IK] = -q[IK]; q[IL] += Math.PI;
    if (np > 6) q[IK2] = -q[IK2];
  }
  q[IL] = wrap2pi(q[IL]);
  const signs = [1, 1, flip ? -1 : 1, flip ? -1 : 1, flip ? -1 : 1, 1, flip ? -1 : 1];
  const covQ = fit.covariance.map((row, i) => row.map((c, j) => c * signs[i] * signs[j]));

  // 4. transform to (P, T, e, ω, K, γ, K₂)
  const P = q[IP], h = q[IH], k = q[IK];
  const e = Math.hypot(h, k);
  const omega = wrap2pi(Math.atan2(k, h));
  const cycles = Math.round((omega - q[IL]) / (2 * Math.PI));
  const T = d.tRef + (P * (omega - q[IL] - 2 * Math.PI * cycles)) / (2 * Math.PI);
  const J: number[][] = [];
  const row = (entries: Record<number, number>) => { const r = new Array<number>(np).fill(0); for (const [j, v] of Object.entries(entries)) r[Number(j)] = v; return r; };
  const e2 = e * e;
  const dwdh = e > 0 ? -k / e2 : NaN, dwdk = e > 0 ? h / e2 : NaN;
  J.push(row({ [IP]: 1 }));
  J.push(row({ [IP]: (T - d.tRef) / P, [IL]: -P / (2 * Math.PI), [IH]: (P / (2 * Math.PI)) * dwdh, [IK]: (P / (2 * Math.PI)) * dwdk }));
  J.push(row({ [IH]: e > 0 ? h / e : NaN, [IK]: e > 0 ? k / e : NaN }));
  J.push(row({ [IH]: DEG * dwdh, [IK]: DEG * dwdk }));
  J.push(row({ [IK1]: 1 }));
  J.push(row({ [IG]: 1 }));
  if (np > 6) J.push(row({ [IK2]: 1 }));
  const cov = J.map((ri) => J.map((rj) => {
    let s = 0;
    for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) if (ri[a] !== 0 && rj[b] !== 0) s += ri[a] * covQ[a][b] * rj[b];
    return s;
  }));
  const sd = (i: number) => Math.sqrt(Math.max(0, cov[i][i]));
  const meas = (value: number, uncertainty: number): Measured => ({ value, uncertainty });
  const K1 = q[IK1], K2 = np > 6 ? q[IK2] : undefined;

  // derived quantities (gradients with respect to P, T, e, ω, K, γ, K₂)
  const grad = (entries: Record<number, number>) => { const r = new Array<number>(np).fill(0); for (const [j, v] of Object.entries(entries)) r[Number(j)] = v; return r; };
  const eOk = e < 1;
  const fm = eOk ? massFunction(P, K1, e) : NaN;
  const fmUnc = propagateUncertainty(grad({ 0: fm / P, 2: (-3 * e * fm) / (1 - e2), 4: (3 * fm) / K1 }), cov);
  const asini = eOk ? projectedSemiMajorAxisKm(P, K1, e) : NaN;
  const asiniUnc = propagateUncertainty(grad({ 0: asini / P, 2: (-e * asini) / (1 - e2), 4: asini / K1 }), cov);
  let sb2: Partial<Pick<OrbitFit, 'semiAmplitude2KmPerS' | 'massRatio' | 'm1SinI3SolarMass' | 'm2SinI3SolarMass'>> = {};
  if (K2 !== undefined) {
    const mm = minimumMasses(P, K1, K2, e);
    const m1 = mm.m1SinI3SolarMass, m2 = mm.m2SinI3SolarMass;
    const de = (-3 * e) / (1 - e2);
    const S = K1 + K2;
    sb2 = {
      semiAmplitude2KmPerS: meas(K2, sd(6)),
      massRatio: meas(K1 / K2, propagateUncertainty(grad({ 4: 1 / K2, 6: -K1 / (K2 * K2) }), cov)),
      m1SinI3SolarMass: meas(m1, propagateUncertainty(grad({ 0: m1 / P, 2: m1 * de, 4: (2 * m1) / S, 6: (2 * m1) / S + m1 / K2 }), cov)),
      m2SinI3SolarMass: meas(m2, propagateUncertainty(grad({ 0: m2 / P, 2: m2 * de, 4: (2 * m2) / S + m2 / K1, 6: (2 * m2) / S }), cov)),
    };
  }

  // residuals and rms
  const res = new Float64Array(d.t.length);
  evaluate(d, Float64Array.from(q), res, new Float64Array(d.t.length * np), np, 1);
  const residual = new Float64Array(table.bjdTdb.length);
  const residual2 = doubleLined ? new Float64Array(table.bjdTdb.length).fill(NaN) : undefined;
  let ss1 = 0, ss2 = 0;
  for (let i = 0; i < d.t.length; i++) {
    if (d.star[i] === 0) { residual[d.row[i]] = res[i]; ss1 += res[i] * res[i]; }
    else { residual2![d.row[i]] = res[i]; ss2 += res[i] * res[i]; }
  }

  // 5. Lucy & Sweeney test: circular fit from the eccentric solution
  const circ = runFit(d, q, w, eMax, true);
  fitsRun++;
  const dofE = d.t.length - np;
  const chiE = fit.chiSquare;
  const chiC = Math.max(circ.chiSquare, chiE);
  const pLS = Number.isFinite(chiE) && Number.isFinite(circ.chiSquare) ? lucySweeneyProbability(chiE, chiC, d.t.length, np) : NaN;
  const F = chiE > 0 ? ((chiC - chiE) / 2) / (chiE / dofE) : Infinity;
  const cq = circ.parameters.slice();
  const cflip = cq[IK1] < 0;
  if (cflip) { cq[IK1] = -cq[IK1]; cq[IL] += Math.PI; if (np > 6) cq[IK2] = -cq[IK2]; }
  cq[IL] = wrap2pi(cq[IL]);
  // time of maximum velocity of star 1: λ = 0 (u = λ when e = 0); nearest the reference time
  const cP = cq[IP];
  const cCycles = Math.round(-cq[IL] / (2 * Math.PI));
  const tMaxV = d.tRef + (cP * (-cq[IL] - 2 * Math.PI * cCycles)) / (2 * Math.PI);
  const cu = (i: number) => Math.sqrt(Math.max(0, circ.covariance[i][i]));
  const ccov = circ.covariance;
  const tMaxUnc = Math.sqrt(Math.max(0,
    ((tMaxV - d.tRef) / cP) ** 2 * ccov[IP][IP] + (cP / (2 * Math.PI)) ** 2 * ccov[IL][IL] - 2 * ((tMaxV - d.tRef) / cP) * (cP / (2 * Math.PI)) * ccov[IP][IL]));
  const circularTest: CircularOrbitTest = {
    probability: pLS,
    circularPreferred: pLS > LUCY_SWEENEY_LEVEL,
    fStatistic: F,
    chiSquareEccentric: chiE,
    chiSquareCircular: circ.chiSquare,
    circular: {
      periodDays: meas(cP, cu(IP)),
      maximumVelocityTimeBjdTdb: meas(tMaxV, tMaxUnc),
      semiAmplitudeKmPerS: meas(cq[IK1], cu(IK1)),
      systemicVelocityKmPerS: meas(cq[IG], cu(IG)),
      ...(np > 6 ? { semiAmplitude2KmPerS: meas(cq[IK2], cu(IK2)) } : {}),
      converged: circ.converged,
    },
  };

  if (!fit.converged) logger.warn({ code: 'orbit.fit-not-converged', message: messages.fitNotConverged(fit.message) });
  if (jitterOption !== 'estimate' && fit.reducedChiSquare > 3) logger.warn({ code: 'orbit.large-chi-square', message: messages.fitLargeChi2(fit.reducedChiSquare) });
  if (P > span) logger.warn({ code: 'orbit.period-beyond-span', message: messages.periodBeyondSpan(P, span) });

  const orbit: KeplerianOrbit = {
    periodDays: P, periastronTimeBjdTdb: T, eccentricity: e, omegaDeg: omega * DEG, semiAmplitudeKmPerS: K1, systemicVelocityKmPerS: q[IG],
    ...(K2 !== undefined ? { semiAmplitude2KmPerS: K2 } : {}),
  };
  const names = ['P (d)', 'T (BJD_TDB)', 'e', 'omega (deg)', 'K (km/s)', 'gamma (km/s)', 'K2 (km/s)'].slice(0, np);
  const parameters = {
    doubleLined, jitterKmPerS: jitterOption, maxEccentricity: eMax, startingPeriodsDays: periods,
    parametrisation: 'P, mean longitude at reference time, e cos(omega), e sin(omega), K, gamma',
    method: 'Levenberg-Marquardt from periodogram and (e, T) grid starts; Lucy & Sweeney 1971 eccentricity test',
  };
  return Object.freeze({
    converged: fit.converged,
    reason: fit.reason,
    message: fit.message,
    doubleLined,
    orbit,
    periodDays: meas(P, sd(0)),
    periastronTimeBjdTdb: meas(T, sd(1)),
    eccentricity: meas(e, sd(2)),
    omegaDeg: meas(omega * DEG, sd(3)),
    semiAmplitudeKmPerS: meas(K1, sd(4)),
    systemicVelocityKmPerS: meas(q[IG], sd(5)),
    meanLongitudeDeg: meas(q[IL] * DEG, Math.sqrt(Math.max(0, covQ[IL][IL])) * DEG),
    referenceTimeBjdTdb: d.tRef,
    massFunctionSolarMass: meas(fm, fmUnc),
    projectedSemiMajorAxisKm: meas(asini, asiniUnc),
    ...sb2,
    jitterKmPerS: jitter,
    chiSquare: fit.chiSquare,
    degreesOfFreedom: fit.degreesOfFreedom,
    reducedChiSquare: fit.reducedChiSquare,
    rmsKmPerS: Math.sqrt(ss1 / d.n1),
    ...(doubleLined ? { rms2KmPerS: Math.sqrt(ss2 / d.n2), residual2KmPerS: residual2 } : {}),
    residualKmPerS: residual,
    circularTest,
    covarianceNames: names,
    covariance: cov,
    alternatives: Object.freeze(alternatives),
    startingPeriodsDays: periods,
    fitsRun,
    provenance: Object.freeze([...table.provenance, provenanceEntry('orbit-fit', parameters)]),
  });
}
