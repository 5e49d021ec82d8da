/**
 * The radial velocity of a star in a Keplerian orbit.
 *
 * Conventions (the same everywhere in this library):
 * - v(t) = γ + K [cos(ν + ω) + e cos ω] for the star whose velocities are given (star 1);
 *   star 2 of a double-lined binary moves as γ − K₂ [cos(ν + ω) + e cos ω];
 * - ω is the argument of periastron of star 1, measured in the direction of motion from
 *   the ascending node, where the star recedes fastest from us (positive radial velocity =
 *   moving away); ω of star 2 is ω + 180°;
 * - T is a time of periastron passage in BJD_TDB days; ν is the true anomaly from
 *   M = 2π (t − T)/P through Kepler's equation;
 * - K > 0.
 */
import { UsageError } from '../errors.js';
import { solveKepler, trueAnomalyFromEccentric } from './kepler.js';
import { messages } from './messages.js';

/** The elements of a spectroscopic-binary orbit (see the module comment for conventions). */
export interface KeplerianOrbit {
  /** Orbital period P, days. */
  readonly periodDays: number;
  /** A time of periastron passage T, BJD_TDB days. */
  readonly periastronTimeBjdTdb: number;
  /** Eccentricity e, 0 ≤ e < 1. */
  readonly eccentricity: number;
  /** Argument of periastron ω of star 1, degrees. */
  readonly omegaDeg: number;
  /** Semi-amplitude K of star 1, km/s (> 0). */
  readonly semiAmplitudeKmPerS: number;
  /** Systemic velocity γ, km/s. */
  readonly systemicVelocityKmPerS: number;
  /** Semi-amplitude K₂ of star 2 of a double-lined binary, km/s (> 0). */
  readonly semiAmplitude2KmPerS?: number;
}

/** Which star of the binary. */
export type BinaryStar = 'primary' | 'secondary';

/**
 * Radial velocities of one star of a binary at given times.
 *
 * Method: M = 2π(t − T)/P, E from Kepler's equation ({@link solveKepler}), ν from E
 * ({@link trueAnomalyFromEccentric}), v = γ ± K [cos(ν + ω) + e cos ω].
 *
 * @param orbit the orbit; `semiAmplitude2KmPerS` is needed for the secondary.
 * @param bjdTdb times, BJD_TDB days.
 * @param star `primary` (star 1, default) or `secondary` (star 2).
 * @returns velocities, km/s, one per time.
 * @throws {UsageError} for P ≤ 0, e outside [0, 1), or a secondary without K₂.
 * @example
 * const orbit = { periodDays: 12.37, periastronTimeBjdTdb: 2461140.63, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8 }; // LVAC-7 (invented)
 * radialVelocityKmPerS(orbit, [2461140.63])[0]; // γ + K (cos ω + e cos ω) ≈ −37.6 at periastron
 */
export function radialVelocityKmPerS(orbit: KeplerianOrbit, bjdTdb: ArrayLike<number>, star: BinaryStar = 'primary'): Float64Array {
  const { periodDays: P, eccentricity: e } = orbit;
  if (!(P > 0 && Number.isFinite(P))) throw new UsageError('orbit.bad-period', messages.badPeriod(P));
  if (!(e >= 0 && e < 1)) throw new UsageError('orbit.bad-eccentricity', messages.badEccentricity(e));
  let K = orbit.semiAmplitudeKmPerS;
  if (star === 'secondary') {
    if (orbit.semiAmplitude2KmPerS === undefined) throw new UsageError('orbit.no-k2', messages.noK2());
    K = -orbit.semiAmplitude2KmPerS;
  }
  const w = (orbit.omegaDeg * Math.PI) / 180;
  const ecw = e * Math.cos(w);
  const out = new Float64Array(bjdTdb.length);
  for (let i = 0; i < out.length; i++) {
    const phase = (bjdTdb[i] - orbit.periastronTimeBjdTdb) / P;
    const M = 2 * Math.PI * (phase - Math.floor(phase));
    const nu = trueAnomalyFromEccentric(solveKepler(M, e), e);
    out[i] = orbit.systemicVelocityKmPerS + K * (Math.cos(nu + w) + ecw);
  }
  return out;
}

/**
 * The true longitude u = ν + ω and its partial derivatives with respect to the mean
 * longitude λ = M + ω and to h = e cos ω, k = e sin ω, computed through the eccentric
 * longitude F = E + ω (λ = F − h sin F + k cos F) in the equinoctial form of the
 * two-body problem (e.g. Broucke & Cefola 1972, Celest. Mech. 5, 303, from memory), which
 * stays smooth at e = 0 where ω is undefined.
 *
 * Fills `out` with [cos u, sin u, ∂u/∂λ, ∂u/∂h, ∂u/∂k]. Returns false when h² + k² ≥ 1.
 * Exported for the orbit fit and its tests; not part of the package's API.
 * @internal
 */
export function trueLongitude(lambda: number, h: number, k: number, out: Float64Array): boolean {
  const e = Math.hypot(h, k);
  if (!(e < 1)) return false;
  const w = Math.atan2(k, h);
  const F = solveKepler(lambda - w, e) + w;
  const cF = Math.cos(F);
  const sF = Math.sin(F);
  const s = Math.sqrt((1 - e) * (1 + e));
  const beta = 1 / (1 + s);
  const bh = (beta * beta * h) / s;
  const bk = (beta * beta * k) / s;
  const X = (1 - k * k * beta) * cF + h * k * beta * sF - h;
  const Y = h * k * beta * cF + (1 - h * h * beta) * sF - k;
  const rho = 1 - h * cF - k * sF;
  const XF = -(1 - k * k * beta) * sF + h * k * beta * cF;
  const YF = -h * k * beta * sF + (1 - h * h * beta) * cF;
  const Fh = sF / rho;
  const Fk = -cF / rho;
  const Xh = -k * k * bh * cF + k * beta * sF + h * k * bh * sF - 1 + XF * Fh;
  const Xk = -2 * k * beta * cF - k * k * bk * cF + h * beta * sF + h * k * bk * sF + XF * Fk;
  const Yh = k * beta * cF + h * k * bh * cF - 2 * h * beta * sF - h * h * bh * sF + YF * Fh;
  const Yk = h * beta * cF + h * k * bk * cF - h * h * bk * sF - 1 + YF * Fk;
  const r2 = X * X + Y * Y;
  const r = Math.sqrt(r2);
  out[0] = X / r;
  out[1] = Y / r;
  out[2] = (X * YF - Y * XF) / (r2 * rho);
  out[3] = (X * Yh - Y * Xh) / r2;
  out[4] = (X * Yk - Y * Xk) / r2;
  return true;
}
