/**
 * Doppler shifts: wavelength ratio ↔ line-of-sight velocity, and the combination of a
 * measured velocity with a barycentric correction.
 *
 * Sign convention: positive velocity = receding (redshift, observed wavelength longer).
 * Wavelengths may be in any unit as long as observed and rest use the same one and the same
 * medium (air or vacuum); the ratio is what matters.
 */
import { InputError, type ErrorLocation } from '../errors.js';
import { SPEED_OF_LIGHT_KM_PER_S as C } from './constants.js';

/**
 * Which Doppler formula links a velocity to a wavelength ratio r = λ_obs/λ_rest:
 * - `'relativistic'`: special-relativistic, purely radial motion, r = √((1 + β)/(1 − β)),
 *   β = v/c;
 * - `'classical'`: the "optical" convention v = c·z, z = r − 1 (what astropy's barycentric
 *   correction uses; exact as a definition of "velocity" from z, approximate as physics).
 */
export type DopplerFormula = 'relativistic' | 'classical';

/** Options of the Doppler functions. */
export interface DopplerOptions {
  /** The formula (default `'relativistic'`). */
  formula?: DopplerFormula;
  /** Location for error messages. */
  where?: ErrorLocation;
}

const DEFAULT_FORMULA: DopplerFormula = 'relativistic';

function checkPositive(value: number, name: string, where: ErrorLocation): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new InputError('doppler.bad-wavelength', `${name} ${value} must be a positive finite number`, where);
  }
}

/**
 * Redshift z = λ_obs/λ_rest − 1 of a line-of-sight velocity.
 *
 * @param velocityKmPerS km/s, positive receding; |v| < c for the relativistic formula, v > −c for the classical one.
 * @returns z (dimensionless).
 * @throws {InputError} `doppler.bad-velocity` for a velocity outside that range.
 * @example
 * redshiftFromVelocity(299.792458, { formula: 'classical' }); // 0.001
 */
export function redshiftFromVelocity(velocityKmPerS: number, options: DopplerOptions = {}): number {
  const formula = options.formula ?? DEFAULT_FORMULA;
  const beta = velocityKmPerS / C;
  if (!Number.isFinite(beta) || beta <= -1 || (formula === 'relativistic' && beta >= 1)) {
    throw new InputError('doppler.bad-velocity', `velocity ${velocityKmPerS} km/s is not below the speed of light in size`, options.where ?? {});
  }
  return formula === 'classical' ? beta : Math.sqrt((1 + beta) / (1 - beta)) - 1;
}

/**
 * Line-of-sight velocity of a redshift z.
 *
 * Method: classical v = c·z; relativistic v = c·((1 + z)² − 1)/((1 + z)² + 1).
 *
 * @param z redshift, > −1.
 * @returns km/s, positive receding.
 * @throws {InputError} `doppler.bad-redshift` for z ≤ −1 or not finite.
 * @example
 * velocityFromRedshift(0.001, { formula: 'relativistic' }); // 299.642...
 */
export function velocityFromRedshift(z: number, options: DopplerOptions = {}): number {
  if (!Number.isFinite(z) || z <= -1) throw new InputError('doppler.bad-redshift', `redshift ${z} must be a finite number above -1`, options.where ?? {});
  if ((options.formula ?? DEFAULT_FORMULA) === 'classical') return C * z;
  const r2 = (1 + z) * (1 + z);
  // (r² − 1)/(r² + 1) written as z(2 + z)/(r² + 1) to keep precision for small z.
  return C * (z * (2 + z)) / (r2 + 1);
}

/**
 * Line-of-sight velocity from an observed and a rest wavelength.
 *
 * Method: z = λ_obs/λ_rest − 1, then {@link velocityFromRedshift} with the chosen formula
 * (relativistic by default). Both wavelengths in the same unit and medium.
 *
 * @param observedWavelength observed wavelength, > 0 (any unit).
 * @param restWavelength rest wavelength, > 0 (same unit and medium).
 * @param options.formula `'relativistic'` (default) or `'classical'`.
 * @returns km/s, positive receding.
 * @throws {InputError} `doppler.bad-wavelength` for a non-positive or non-finite wavelength.
 * @example
 * dopplerVelocityKmPerS(6564, 6563); // 45.6757 km/s (relativistic); classical gives 45.6792
 */
export function dopplerVelocityKmPerS(observedWavelength: number, restWavelength: number, options: DopplerOptions = {}): number {
  const where = options.where ?? {};
  checkPositive(observedWavelength, 'observed wavelength', where);
  checkPositive(restWavelength, 'rest wavelength', where);
  const z = (observedWavelength - restWavelength) / restWavelength;
  return velocityFromRedshift(z, options);
}

/**
 * The wavelength at which a line of rest wavelength `restWavelength` is seen from a source
 * moving at `velocityKmPerS` (inverse of {@link dopplerVelocityKmPerS}).
 *
 * @param restWavelength > 0 (any unit; the result is in the same unit and medium).
 * @param velocityKmPerS km/s, positive receding.
 * @returns the shifted wavelength.
 * @throws {InputError} `doppler.bad-wavelength`, `doppler.bad-velocity`.
 * @example
 * shiftWavelength(6563, 45.679); // 6564.00007 (relativistic)
 */
export function shiftWavelength(restWavelength: number, velocityKmPerS: number, options: DopplerOptions = {}): number {
  checkPositive(restWavelength, 'rest wavelength', options.where ?? {});
  return restWavelength * (1 + redshiftFromVelocity(velocityKmPerS, options));
}

/**
 * Combines two redshifts along the same line of sight: 1 + z = (1 + z₁)(1 + z₂).
 *
 * This is how Doppler factors compose (e.g. the star's motion and the observer's motion, or a
 * measured redshift and a barycentric correction redshift z_B; Wright & Eastman 2014, PASP
 * 126, 838, as cited in astropy 5.2.1's `radial_velocity_correction` documentation).
 *
 * @returns the combined z.
 * @example
 * combineRedshifts(0.001, 0.0001); // 0.0011001
 */
export function combineRedshifts(z1: number, z2: number): number {
  return z1 + z2 + z1 * z2;
}

/**
 * Applies a barycentric (or heliocentric) correction to a measured velocity.
 *
 * The correction `correctionKmPerS` is c·z_B in the classical ("optical") convention, as
 * {@link barycentricCorrection} and astropy's `radial_velocity_correction` return it. The
 * measured velocity is turned into z with `formula`, combined multiplicatively with z_B
 * ({@link combineRedshifts}) and turned back with the same formula. With the classical formula
 * this is v_true = v_meas + v_bc + v_meas·v_bc/c (the application formula in astropy 5.2.1's
 * `radial_velocity_correction` documentation, which attributes it to Wright & Eastman 2014,
 * eq. 11).
 *
 * @param measuredKmPerS velocity measured in the observer's frame, km/s, positive receding.
 * @param correctionKmPerS barycentric correction c·z_B, km/s (add-to-measured convention).
 * @param options.formula the formula the measured velocity was made with (default `'relativistic'`).
 * @returns the barycentric velocity, km/s, in the same formula.
 * @throws {InputError} `doppler.bad-velocity` for |v| ≥ c.
 * @example
 * applyVelocityCorrection(10, 20, { formula: 'classical' }); // 30.000667... (10 + 20 + 10·20/c)
 */
export function applyVelocityCorrection(measuredKmPerS: number, correctionKmPerS: number, options: DopplerOptions = {}): number {
  const zMeasured = redshiftFromVelocity(measuredKmPerS, options);
  const zCorrection = redshiftFromVelocity(correctionKmPerS, { formula: 'classical', where: options.where });
  return velocityFromRedshift(combineRedshifts(zMeasured, zCorrection), options);
}
