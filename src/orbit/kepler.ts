/**
 * Kepler's equation M = E − e sin E for elliptic orbits, and the true anomaly.
 *
 * Method: the mean anomaly is reduced to [0, π] (the equation is odd and 2π-periodic in
 * E − M); a starting value from Markley (1995, Celest. Mech. Dyn. Astron. 63, 101; his
 * cubic starter, recalled from memory — it only affects speed) is refined by Halley
 * iterations inside a bracket [M, min(π, M + e)] that always holds the root; any step
 * that leaves the bracket, or fails to shrink it, is replaced by bisection, so the
 * iteration converges for every 0 ≤ e < 1. The residual is evaluated as
 * (1 − e)E + e(E − sin E) − M with E − sin E from its series for small E, so that it keeps
 * full relative precision near e → 1, M → 0 where E − e sin E cancels.
 *
 * Accuracy (tested, see test/orbit/kepler.test.ts): |E − e sin E − M| ≤ 2e-15 rad over a
 * grid of M and e up to 0.999 999, and E within 2 ulp·(condition 1/(1 − e cos E)) of a
 * 50-digit reference. Beyond e = 0.99 the method is the same and still converges; the
 * conditioning of the problem itself (dE/dM = 1/(1 − e cos E), up to 1/(1 − e)) then
 * limits how well E is determined by a double-precision M. e ≥ 1 (parabolic and
 * hyperbolic orbits) is refused.
 */
import { UsageError } from '../errors.js';
import { messages } from './messages.js';

const TWO_PI = 2 * Math.PI;

/** E − sin E, accurate to full relative precision also for small E. */
function eMinusSinE(E: number): number {
  const a = Math.abs(E);
  if (a > 0.8) return E - Math.sin(E);
  // E³/3! − E⁵/5! + E⁷/7! − …; at |E| = 0.8 the term E^19/19! is below 1e-18 of E³/6.
  const E2 = E * E;
  let term = (E * E2) / 6;
  let sum = term;
  for (let k = 4; k <= 20; k += 2) {
    term *= -E2 / (k * (k + 1));
    sum += term;
    if (Math.abs(term) <= 1e-17 * Math.abs(sum)) break;
  }
  return sum;
}

/** Markley (1995) cubic starter for M in [0, π] (from memory). */
function markleyStart(m: number, e: number): number {
  const pi2 = Math.PI * Math.PI;
  const alpha = (3 * pi2 + (1.6 * Math.PI * (Math.PI - m)) / (1 + e)) / (pi2 - 6);
  const d = 3 * (1 - e) + alpha * e;
  const q = 2 * alpha * d * (1 - e) - m * m;
  const r = 3 * alpha * d * (d - 1 + e) * m + m * m * m;
  const w = Math.pow(Math.abs(r) + Math.sqrt(q * q * q + r * r), 2 / 3);
  return ((2 * r * w) / (w * w + w * q + q * q) + m) / d;
}

/** Solves for m in [0, π]. */
function solveReduced(m: number, e: number): number {
  if (m === 0 || e === 0) return m;
  let lo = m;
  let hi = Math.min(Math.PI, m + e);
  let E = markleyStart(m, e);
  if (!(E > lo && E < hi)) E = 0.5 * (lo + hi);
  const oneMinusE = 1 - e;
  for (let iter = 0; iter < 100; iter++) {
    const s = Math.sin(E);
    const f = oneMinusE * E + e * eMinusSinE(E) - m;
    if (f === 0) return E;
    if (f < 0) lo = E; else hi = E;
    const half = Math.sin(0.5 * E);
    const fp = oneMinusE + 2 * e * half * half; // 1 − e cos E without cancellation
    const fpp = e * s;
    const step = (-2 * f * fp) / (2 * fp * fp - f * fpp);
    let next = E + step;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - E) <= 2e-16 * Math.abs(E) || next === E) return next;
    if (hi - lo <= 4e-16 * hi) return next;
    E = next;
  }
  return E;
}

/**
 * Eccentric anomaly E (radians) from the mean anomaly M and eccentricity e, solving
 * Kepler's equation M = E − e sin E.
 *
 * Method: Markley (1995) starter, Halley iterations safeguarded by bisection inside a
 * bracket that always holds the root (see the module comment); converges for every
 * 0 ≤ e < 1, to |E − e sin E − M| ≲ 2e-15 rad.
 *
 * @param meanAnomalyRad mean anomaly M, radians, any finite value.
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns E in radians, on the same revolution as M (E − M lies in [−e, e]).
 * @throws {UsageError} when M is not finite or e is outside [0, 1).
 * @example
 * // Meeus, Astronomical Algorithms, Example 30.a (from memory): e = 0.1, M = 5° → E = 5.554589°
 * solveKepler(5 * Math.PI / 180, 0.1) * 180 / Math.PI; // 5.554589…
 */
export function solveKepler(meanAnomalyRad: number, eccentricity: number): number {
  if (!Number.isFinite(meanAnomalyRad)) throw new UsageError('orbit.bad-mean-anomaly', messages.badMeanAnomaly(meanAnomalyRad));
  if (!(eccentricity >= 0 && eccentricity < 1)) throw new UsageError('orbit.bad-eccentricity', messages.badEccentricity(eccentricity));
  const k = Math.round(meanAnomalyRad / TWO_PI);
  const m = meanAnomalyRad - k * TWO_PI; // in [−π, π]
  const E = m < 0 ? -solveReduced(-m, eccentricity) : solveReduced(m, eccentricity);
  return E + k * TWO_PI;
}

/**
 * True anomaly ν (radians) from the eccentric anomaly E.
 *
 * Method: ν = 2 atan2(√(1 + e) sin(E/2), √(1 − e) cos(E/2)), which has no division and no
 * loss of precision near E = π or e → 1 (unlike cos ν = (cos E − e)/(1 − e cos E)).
 *
 * @param eccentricAnomalyRad E, radians, any finite value.
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns ν in radians, on the same revolution as E (ν − E in (−π, π)).
 * @throws {UsageError} when e is outside [0, 1).
 * @example
 * trueAnomalyFromEccentric(Math.PI / 2, 0); // π/2 (circular orbit: ν = E)
 */
export function trueAnomalyFromEccentric(eccentricAnomalyRad: number, eccentricity: number): number {
  if (!(eccentricity >= 0 && eccentricity < 1)) throw new UsageError('orbit.bad-eccentricity', messages.badEccentricity(eccentricity));
  const k = Math.round(eccentricAnomalyRad / TWO_PI);
  const E = eccentricAnomalyRad - k * TWO_PI;
  const nu = 2 * Math.atan2(Math.sqrt(1 + eccentricity) * Math.sin(0.5 * E), Math.sqrt(1 - eccentricity) * Math.cos(0.5 * E));
  return nu + k * TWO_PI;
}

/**
 * True anomaly ν (radians) from the mean anomaly: {@link solveKepler} then
 * {@link trueAnomalyFromEccentric}.
 *
 * @param meanAnomalyRad M, radians, finite.
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns ν in radians on the same revolution as M.
 * @throws {UsageError} as {@link solveKepler}.
 * @example
 * trueAnomaly(Math.PI, 0.5); // π (apastron)
 */
export function trueAnomaly(meanAnomalyRad: number, eccentricity: number): number {
  return trueAnomalyFromEccentric(solveKepler(meanAnomalyRad, eccentricity), eccentricity);
}
