/**
 * How the error of a wavelength calibration enters a radial velocity.
 *
 * A dispersion solution is fitted once per spectrum to the lamp lines; its error is the
 * same for every stellar line of that spectrum, so it does not average down over the
 * stellar lines the way their centring errors do. lineshift treats it as a zero-point error
 * common to all lines of one spectrum and adds it in quadrature to the statistical error of
 * the combined velocity (never to each line before averaging).
 *
 * Its size: for a least-squares solution with p coefficients fitted to N_cal lamp lines
 * with residual scatter σ, the mean of the solution's variance over the lamp lines is
 * p·σ²/N_cal (the mean leverage of a linear least-squares fit is p/N; common practice), so
 * the calibration error of a wavelength is taken as rms·√(p/N_cal) in Å, i.e.
 * c·rms·√(p/N_cal)/λ in km/s. Lines at the ends of the range, beyond the lamp lines, are
 * worse off; this does not model that.
 */
import { UsageError } from '../errors.js';
import { SPEED_OF_LIGHT_KM_PER_S } from './constants.js';

/** What is known of a spectrum's wavelength calibration. */
export interface WavelengthCalibrationError {
  /** RMS of the dispersion solution's residuals at the lamp lines, Å (≥ 0). */
  readonly rmsAngstrom: number;
  /** Number of lamp lines the solution was fitted to (≥ 1). */
  readonly lineCount: number;
  /** Number of coefficients of the solution (≥ 1; a polynomial of order k has k + 1), at most `lineCount`. */
  readonly coefficients: number;
}

/**
 * The velocity error that a wavelength calibration contributes at one wavelength:
 * c·rms·√(p/N_cal)/λ (see the module notes for why).
 *
 * @param calibration rms (Å), number of lamp lines N_cal and of solution coefficients p.
 * @param wavelengthAngstrom the wavelength, Å (> 0).
 * @returns km/s (≥ 0).
 * @throws {UsageError} for a negative or non-finite rms, a line count below 1, or a
 *   coefficient count outside 1…N_cal.
 * @example
 * calibrationVelocityErrorKmPerS({ rmsAngstrom: 0.05, lineCount: 16, coefficients: 4 }, 6000); // 1.249 km/s
 */
export function calibrationVelocityErrorKmPerS(calibration: WavelengthCalibrationError, wavelengthAngstrom: number): number {
  const { rmsAngstrom, lineCount, coefficients } = calibration;
  if (!(rmsAngstrom >= 0) || !Number.isFinite(rmsAngstrom)) throw new UsageError('velocity.bad-calibration', `the calibration rms must be a number of Å ≥ 0 (got ${rmsAngstrom})`);
  if (!Number.isInteger(lineCount) || lineCount < 1) throw new UsageError('velocity.bad-calibration', `the number of calibration lines must be a whole number ≥ 1 (got ${lineCount})`);
  if (!Number.isInteger(coefficients) || coefficients < 1 || coefficients > lineCount) {
    throw new UsageError('velocity.bad-calibration', `the number of coefficients of the dispersion solution must be a whole number from 1 to the number of calibration lines, ${lineCount} (got ${coefficients})`);
  }
  if (!(wavelengthAngstrom > 0)) throw new UsageError('velocity.bad-calibration', `the wavelength must be positive (got ${wavelengthAngstrom})`);
  return (SPEED_OF_LIGHT_KM_PER_S * rmsAngstrom * Math.sqrt(coefficients / lineCount)) / wavelengthAngstrom;
}
