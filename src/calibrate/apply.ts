/**
 * Applying a dispersion solution to a spectrum on the same pixel grid, and interpolating
 * between the solutions of lamp exposures taken before and after a star exposure.
 */
import { InputError, UsageError } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import { checkSpectralAxis, deriveSpectrum, type Spectrum } from '../spectrum/spectrum.js';
import { pixelCoordinates } from './lamp.js';
import { calibrationMessages } from './messages.js';
import { solutionWavelength, uncertaintySummary, type DispersionSolution } from './solution.js';

/** Options of {@link applySolution}. */
export interface ApplySolutionOptions {
  /** Where the solution came from (recorded in the provenance). */
  readonly solutionFile?: string;
  /** Receives warnings (a solution not calibrated by a lamp, or calibrated on the star's own lines). */
  readonly logger?: Logger;
}

/** Pixels a spectrum may reach beyond a solution's domain (half a pixel: the domain runs between pixel centres). */
const DOMAIN_SLACK_PIXELS = 0.5;

/**
 * Puts a wavelength scale on a spectrum: λ = the solution at each pixel coordinate.
 *
 * The spectrum must be on the same pixel grid as the lamp frame the solution was fitted to
 * (same pixel count, pixel coordinates inside the solution's domain). The result has unit
 * Å and the solution's medium (air for the shipped line lists), the flux, uncertainty,
 * mask and header unchanged, and a provenance entry `apply-dispersion-solution` with the
 * solution's summary (method, order, RMS, lines used, whether a lamp calibrated it).
 *
 * @param spectrum a spectrum on a pixel axis (not modified).
 * @param solution an accepted solution (`ok: true`).
 * @param options solution file name for the provenance, logger for warnings.
 * @returns the calibrated spectrum.
 * @throws {InputError} `calibrate.already-calibrated` for a spectrum with a wavelength
 *   axis, `calibrate.pixel-count` when the pixel counts differ, `calibrate.outside-domain`
 *   when its pixels leave the solution's domain, `calibrate.solution-not-ok` for a
 *   solution that was not accepted, `spectrum.not-monotonic` when the solution folds over.
 * @example
 * const calibrated = applySolution(readSpectrum('star.fits'), readSolution('lamp.json'));
 * calibrated.unit; // 'angstrom'
 */
export function applySolution(spectrum: Spectrum, solution: DispersionSolution, options: ApplySolutionOptions = {}): Spectrum {
  const where = { file: spectrum.source?.file };
  if (!solution.ok) throw new InputError('calibrate.solution-not-ok', calibrationMessages.notOk(solution.reason ?? 'no reason given'), options.solutionFile ? { file: options.solutionFile } : {});
  if (spectrum.unit !== 'pixel') {
    throw new InputError('calibrate.already-calibrated', `the spectrum already has a wavelength axis (${spectrum.unit}); a dispersion solution applies to a spectrum on a pixel axis`, where);
  }
  if (solution.pixels !== null && solution.pixels !== spectrum.flux.length) {
    throw new InputError('calibrate.pixel-count', `the spectrum has ${spectrum.flux.length} pixels but the solution is for a frame of ${solution.pixels}; it must come from the same detector rows and binning`, where);
  }
  const x = pixelCoordinates(spectrum);
  const { min, max } = solution.domain;
  for (let i = 0; i < x.length; i++) {
    if (x[i] < min - DOMAIN_SLACK_PIXELS || x[i] > max + DOMAIN_SLACK_PIXELS) {
      throw new InputError('calibrate.outside-domain', `pixel coordinate ${x[i]} at index ${i} lies outside the solution's pixel range ${min} to ${max}`, { ...where, index: i });
    }
  }
  const wavelength = Float64Array.from(x, (p) => solutionWavelength(solution, p));
  checkSpectralAxis(wavelength, where);
  const logger = options.logger ?? silentLogger;
  for (const w of solution.warnings) logger.warn({ code: 'calibrate.solution-warning', message: w });
  return deriveSpectrum(spectrum, { wavelength, unit: 'angstrom', medium: solution.medium }, provenanceEntry('apply-dispersion-solution', {
    file: options.solutionFile ?? null,
    method: solution.method,
    calibratedByLamp: solution.calibratedByLamp,
    velocityZeroPointMeaningful: solution.velocityZeroPointMeaningful,
    order: solution.order,
    rmsAngstrom: solution.rmsAngstrom,
    linesUsed: solution.linesUsed,
    lamp: solution.lamp?.name ?? null,
    lampMidpointUtc: solution.observation?.midpointUtc ?? null,
  }));
}

/**
 * The solution at a time between (or near) two solutions of the same frame layout, linear
 * in time: c(t) = (1 − w) c₁ + w c₂ with w = (t − t₁)/(t₂ − t₁), the lower order padded
 * with zero coefficients (a Chebyshev series of lower order is the same series with zero
 * higher terms, so this equals interpolating the two wavelength arrays pixel by pixel).
 * The covariance is (1 − w)² C₁ + w² C₂ (the two lamps' errors independent).
 *
 * @param before solution of the earlier lamp exposure (ok, with a time).
 * @param after solution of the later lamp exposure (ok, with a time).
 * @param mjdUtc the time to interpolate to (MJD, UTC), usually the star's mid-exposure.
 * @param logger warns when the time lies outside the two lamp times (linear extrapolation).
 * @returns an `interpolated` solution (its lines are those of the nearer lamp).
 * @throws {InputError} when a solution is not ok, has no time, the times are equal, or
 *   the domains, pixel counts or media differ.
 * @example interpolateSolutions(before, after, 61174.1326).method; // 'interpolated'
 */
export function interpolateSolutions(before: DispersionSolution, after: DispersionSolution, mjdUtc: number, logger: Logger = silentLogger): DispersionSolution {
  for (const [s, name] of [[before, 'first'], [after, 'second']] as const) {
    if (!s.ok) throw new InputError('calibrate.solution-not-ok', `the ${name} solution: ${calibrationMessages.notOk(s.reason ?? 'no reason given')}`);
    if (!s.observation) throw new InputError('calibrate.no-time', `the ${name} solution has no lamp exposure time; recalibrate its lamp from a file with DATE-OBS (and EXPTIME), or give the time`);
  }
  if (!Number.isFinite(mjdUtc)) throw new UsageError('calibrate.bad-time', `the time to interpolate to must be a finite MJD, got ${mjdUtc}`);
  const t1 = before.observation!.mjdUtc, t2 = after.observation!.mjdUtc;
  if (t1 === t2) throw new InputError('calibrate.same-time', 'the two lamp solutions have the same time; interpolation needs two different times');
  if (before.domain.min !== after.domain.min || before.domain.max !== after.domain.max || before.pixels !== after.pixels) {
    throw new InputError('calibrate.different-frames', `the two solutions are for different pixel ranges (${before.domain.min}–${before.domain.max} and ${after.domain.min}–${after.domain.max}); they must come from the same detector rows and binning`);
  }
  if (before.medium !== after.medium) throw new InputError('calibrate.different-media', `one solution is in ${before.medium}, the other in ${after.medium}`);
  const w = (mjdUtc - t1) / (t2 - t1);
  if (w < 0 || w > 1) logger.warn({ code: 'calibrate.extrapolated-time', message: calibrationMessages.extrapolatedTime(w) });
  const order = Math.max(before.order, after.order);
  const pad = (c: readonly number[]) => Array.from({ length: order + 1 }, (_, k) => c[k] ?? 0);
  const c1 = pad(before.coefficients), c2 = pad(after.coefficients);
  const coefficients = c1.map((a, k) => (1 - w) * a + w * c2[k]);
  const cov = (s: DispersionSolution, i: number, j: number) => s.covariance[i]?.[j] ?? 0;
  const covariance = Array.from({ length: order + 1 }, (_, i) => Array.from({ length: order + 1 }, (_, j) => (1 - w) ** 2 * cov(before, i, j) + w ** 2 * cov(after, i, j)));
  const nearer = w <= 0.5 ? before : after;
  const mix = (a: number | null, b: number | null) => (a === null || b === null ? null : (1 - w) * a + w * b);
  return {
    ...nearer,
    method: 'interpolated',
    order,
    coefficients,
    covariance,
    rmsAngstrom: mix(before.rmsAngstrom, after.rmsAngstrom),
    rmsPixels: mix(before.rmsPixels, after.rmsPixels),
    rmsKmPerS: mix(before.rmsKmPerS, after.rmsKmPerS),
    wavelengthUncertaintyAngstrom: uncertaintySummary(covariance, order, before.domain),
    message: `interpolated at MJD ${mjdUtc.toFixed(6)} between lamp solutions at ${before.observation!.midpointUtc} and ${after.observation!.midpointUtc} (weight ${w.toFixed(3)} on the second)`,
    observation: null,
    provenance: [...nearer.provenance, provenanceEntry('interpolate-solutions', { mjdUtc, before: before.observation!.midpointUtc, after: after.observation!.midpointUtc, weight: w })],
  };
}
