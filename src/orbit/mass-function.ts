/**
 * Mass function, projected semi-major axis and minimum masses of spectroscopic binaries,
 * with uncertainties propagated to first order through the full covariance of the orbit
 * parameters.
 *
 * Formulas (standard; e.g. Hilditch 2001, An Introduction to Close Binary Stars, ch. 2,
 * from memory): with P the period, K the semi-amplitude, e the eccentricity,
 *   f(m) = m₂³ sin³i / (m₁ + m₂)² = P K³ (1 − e²)^{3/2} / (2πG),
 *   a₁ sin i = K P √(1 − e²) / (2π),
 *   m₁ sin³i = P (1 − e²)^{3/2} (K₁ + K₂)² K₂ / (2πG),  m₂ sin³i = … K₁ …,  q = m₂/m₁ = K₁/K₂.
 * Masses are in nominal solar masses: G M is divided by (GM)☉ᴺ (IAU 2015 B3).
 */
import { UsageError } from '../errors.js';
import { GM_SUN_M3_PER_S2, SECONDS_PER_DAY } from '../velocity/constants.js';
import { messages } from './messages.js';

/** A measured value and its 1-σ uncertainty (same unit). */
export interface Measured {
  readonly value: number;
  readonly uncertainty: number;
}

function checkPKE(periodDays: number, kKmPerS: number, e: number): void {
  if (!(periodDays > 0 && Number.isFinite(periodDays))) throw new UsageError('orbit.bad-period', messages.badPeriod(periodDays));
  if (!Number.isFinite(kKmPerS)) throw new UsageError('orbit.bad-semi-amplitude', messages.badSemiAmplitude(kKmPerS));
  if (!(e >= 0 && e < 1)) throw new UsageError('orbit.bad-eccentricity', messages.badEccentricity(e));
}

/**
 * Mass function of a single-lined spectroscopic binary, in solar masses.
 *
 * Method: f(m) = P K³ (1 − e²)^{3/2} / (2π G M☉), with P in seconds (days × 86 400), K in
 * m/s and G M☉ the IAU 2015 nominal solar mass parameter; equivalently
 * f(m) ≈ 1.0361 × 10⁻⁷ (1 − e²)^{3/2} K³ P for K in km/s and P in days.
 *
 * @param periodDays P, days, > 0.
 * @param semiAmplitudeKmPerS K, km/s (its sign is ignored: K³ uses |K|).
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns f(m) in nominal solar masses.
 * @throws {UsageError} for P ≤ 0, non-finite K, or e outside [0, 1).
 * @example
 * massFunction(10, 30, 0); // ≈ 0.027976 M☉
 */
export function massFunction(periodDays: number, semiAmplitudeKmPerS: number, eccentricity: number): number {
  checkPKE(periodDays, semiAmplitudeKmPerS, eccentricity);
  const k = Math.abs(semiAmplitudeKmPerS) * 1000;
  return (periodDays * SECONDS_PER_DAY * k * k * k * Math.pow(1 - eccentricity * eccentricity, 1.5)) / (2 * Math.PI * GM_SUN_M3_PER_S2);
}

/**
 * Projected semi-major axis a sin i of the orbit of the star whose velocities give K, in km.
 *
 * Method: a sin i = |K| P √(1 − e²) / (2π), P in seconds.
 *
 * @param periodDays P, days, > 0.
 * @param semiAmplitudeKmPerS K, km/s.
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns a sin i in km.
 * @throws {UsageError} as {@link massFunction}.
 * @example
 * projectedSemiMajorAxisKm(10, 30, 0); // ≈ 4.125e6 km
 */
export function projectedSemiMajorAxisKm(periodDays: number, semiAmplitudeKmPerS: number, eccentricity: number): number {
  checkPKE(periodDays, semiAmplitudeKmPerS, eccentricity);
  return (Math.abs(semiAmplitudeKmPerS) * periodDays * SECONDS_PER_DAY * Math.sqrt(1 - eccentricity * eccentricity)) / (2 * Math.PI);
}

/**
 * Minimum masses m₁ sin³i and m₂ sin³i of a double-lined binary, in solar masses.
 *
 * Method: m₁ sin³i = P (1 − e²)^{3/2} (K₁ + K₂)² K₂ / (2πG M☉) and m₂ sin³i likewise with
 * K₁; K₁ belongs to star 1 (the `velocityKmPerS` column), K₂ to star 2.
 *
 * @param periodDays P, days, > 0.
 * @param k1KmPerS K₁, km/s, > 0.
 * @param k2KmPerS K₂, km/s, > 0.
 * @param eccentricity e, 0 ≤ e < 1.
 * @returns `{ m1SinI3SolarMass, m2SinI3SolarMass }`.
 * @throws {UsageError} as {@link massFunction}.
 * @example
 * minimumMasses(10, 50, 60, 0).m1SinI3SolarMass; // ≈ 0.752
 */
export function minimumMasses(periodDays: number, k1KmPerS: number, k2KmPerS: number, eccentricity: number): { m1SinI3SolarMass: number; m2SinI3SolarMass: number } {
  checkPKE(periodDays, k1KmPerS, eccentricity);
  checkPKE(periodDays, k2KmPerS, eccentricity);
  const k1 = Math.abs(k1KmPerS) * 1000;
  const k2 = Math.abs(k2KmPerS) * 1000;
  const c = (periodDays * SECONDS_PER_DAY * Math.pow(1 - eccentricity * eccentricity, 1.5) * (k1 + k2) * (k1 + k2)) / (2 * Math.PI * GM_SUN_M3_PER_S2);
  return { m1SinI3SolarMass: c * k2, m2SinI3SolarMass: c * k1 };
}

/**
 * First-order (linear) propagation of a covariance: σ² = gᵀ C g.
 *
 * @param gradient ∂y/∂xᵢ for each parameter.
 * @param covariance covariance of the parameters (square, same order).
 * @returns the standard deviation of y (NaN when the covariance holds NaN).
 * @throws {UsageError} when the sizes differ.
 * @example
 * propagateUncertainty([2], [[0.01]]); // 0.2
 */
export function propagateUncertainty(gradient: ArrayLike<number>, covariance: readonly (readonly number[])[]): number {
  const n = gradient.length;
  if (covariance.length !== n || covariance.some((r) => r.length !== n)) {
    throw new UsageError('orbit.covariance-size', messages.covarianceSize(n));
  }
  let s = 0;
  for (let i = 0; i < n; i++) {
    if (gradient[i] === 0) continue;
    for (let j = 0; j < n; j++) if (gradient[j] !== 0) s += gradient[i] * covariance[i][j] * gradient[j];
  }
  return Math.sqrt(Math.max(0, s));
}
