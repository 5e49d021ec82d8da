/**
 * Calibration on a star's own absorption lines (the Balmer series by default) when there
 * is no lamp frame. The star's radial velocity then sits in the zero point of the solution:
 * velocities measured with it are not meaningful, and the solution says so.
 */
import { UsageError } from '../errors.js';
import { filterLineList, loadLineList, type LineList } from '../lines/linelist.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import type { Spectrum } from '../spectrum/spectrum.js';
import { identifyLampLines, type WavelengthHint } from './identify.js';
import { measureLampLines } from './lamp-lines.js';
import { pixelDomain } from './lamp.js';
import { calibrationMessages } from './messages.js';
import { checkOrder, fitDispersionSolution, type DispersionSolution, type SolutionInputLine } from './solution.js';

/** Options of {@link calibrateOnStarLines}. */
export interface StarLineOptions {
  /** Rough wavelength scale (strongly advised: a star shows many lines besides the ones listed). */
  readonly hint?: WavelengthHint;
  /** Polynomial order 1–5. Default 2 (a handful of lines). */
  readonly order?: number;
  /** The lines to use. Default: the Balmer series Hα to H10 (H I list, air). */
  readonly list?: LineList;
  /** Detection threshold, σ. Default 8. */
  readonly significance?: number;
  /** Broadest line searched, pixels (Balmer lines of A stars are broad). Default 60. */
  readonly maxFwhmPixels?: number;
}

/**
 * The Balmer lines Hα … H10 of the shipped H I list (air wavelengths, NIST; fine-structure
 * blends).
 *
 * @returns a line list of 8 lines between 3797 and 6563 Å.
 * @example balmerLineList().entries.length; // 8
 */
export function balmerLineList(): LineList {
  return filterLineList(loadLineList('H I'), { minWavelengthAngstrom: 3700, maxWavelengthAngstrom: 6600 });
}

/**
 * Calibrates a star spectrum on its own absorption lines.
 *
 * Method: absorption lines measured as lamp lines are ({@link measureLampLines} with
 * `kind: 'absorption'`, Gaussian cores on a linear local continuum), identified against
 * the list ({@link identifyLampLines}, with the hint when given), a Chebyshev polynomial fitted
 * with clipping. Accepted (`ok`) when at least order + 2 lines are used and the RMS is at
 * most 0.5 pixel. The fraction-identified test of lamp calibration does not apply (stars
 * show many lines that are not in the list).
 *
 * @param spectrum a star spectrum on a pixel axis.
 * @param options hint, order, list, detection threshold, widest line.
 * @returns a solution with `method: 'star-lines'`, `velocityZeroPointMeaningful: false`
 *   and the warning that the star's velocity is absorbed into the zero point.
 * @throws {UsageError} for an order outside 1–5 or a malformed hint.
 * @example calibrateOnStarLines(star, { hint: { kind: 'range', minWavelengthAngstrom: 3800, maxWavelengthAngstrom: 6700 } }).velocityZeroPointMeaningful; // false
 */
export function calibrateOnStarLines(spectrum: Spectrum, options: StarLineOptions = {}): DispersionSolution {
  const order = checkOrder(options.order ?? 2);
  const list = options.list ?? balmerLineList();
  const maxFwhm = options.maxFwhmPixels ?? 60;
  if (!(maxFwhm >= 2)) throw new UsageError('calibrate.bad-fwhm-range', `maxFwhmPixels must be ≥ 2, got ${maxFwhm}`);
  const domain = pixelDomain(spectrum);
  const significance = options.significance ?? 8;
  const measured = measureLampLines(spectrum, { kind: 'absorption', significance, fwhmRangePixels: [2, maxFwhm] }).lines.filter((l) => l.flags.length === 0);
  // The deepest lines only: at most three times as many as the list has.
  const strongest = [...measured].sort((a, b) => b.strength * b.fwhmPixels - a.strength * a.fwhmPixels).slice(0, 3 * list.entries.length + 3).sort((a, b) => a.pixel - b.pixel);
  const warning = calibrationMessages.starLinesWarning();
  const base: Omit<DispersionSolution, 'ok' | 'reason' | 'message'> = {
    method: 'star-lines', calibratedByLamp: false, velocityZeroPointMeaningful: false, medium: list.medium, order, domain,
    coefficients: [], covariance: [], pixels: spectrum.flux.length, rmsAngstrom: null, rmsPixels: null, rmsKmPerS: null,
    linesMeasured: strongest.length, linesIdentified: 0, linesUsed: 0, linesRejected: 0, resolvingPower: null,
    wavelengthUncertaintyAngstrom: null, lines: [], lamp: null, grating: options.hint?.kind === 'grating' ? options.hint.setup : null,
    observation: null, warnings: [warning],
    provenance: [...spectrum.provenance, provenanceEntry('calibrate-star-lines', { order, hint: options.hint ?? null, species: list.species, significance })],
  };
  if (strongest.length === 0) return { ...base, ok: false, reason: 'no-lines-found', message: calibrationMessages.noLines(significance) };
  const id = identifyLampLines(strongest, { list, hint: options.hint, order, domain });
  if (!id.ok) return { ...base, ok: false, reason: 'no-pattern', message: calibrationMessages.noPattern(list.species.join('+'), options.hint !== undefined) };
  const byPeak = new Map(id.matches.map((m) => [m.peakIndex, m.line]));
  const input: SolutionInputLine[] = strongest.map((l, i) => {
    const ref = byPeak.get(i);
    return { pixel: l.pixel, pixelUncertainty: l.pixelUncertainty, fwhmPixels: l.fwhmPixels, strength: l.strength, wavelengthAngstrom: ref?.wavelengthAngstrom ?? null, species: ref?.species, relativeIntensity: ref?.relativeIntensity ?? null, exclude: null };
  });
  const identified = byPeak.size;
  if (identified < order + 2) return { ...base, linesIdentified: identified, ok: false, reason: 'too-few-lines', message: calibrationMessages.tooFewLines(identified, order, order + 2) };
  const fit = fitDispersionSolution(input, { order, domain });
  const full = {
    ...base, coefficients: fit.coefficients, covariance: fit.covariance, rmsAngstrom: fit.rmsAngstrom, rmsPixels: fit.rmsPixels, rmsKmPerS: fit.rmsKmPerS,
    linesIdentified: identified, linesUsed: fit.linesUsed, linesRejected: fit.linesRejected, resolvingPower: fit.resolvingPower,
    wavelengthUncertaintyAngstrom: fit.wavelengthUncertaintyAngstrom, lines: fit.lines,
  };
  if (fit.linesUsed < order + 2) return { ...full, ok: false, reason: 'too-few-lines', message: calibrationMessages.tooFewLines(fit.linesUsed, order, order + 2) };
  if (!(fit.rmsPixels <= 0.5)) return { ...full, ok: false, reason: 'large-residuals', message: calibrationMessages.largeResiduals(fit.rmsPixels, 0.5) };
  return { ...full, ok: true, reason: null, message: `${calibrationMessages.ok(fit.linesUsed, order, fit.rmsAngstrom, fit.rmsPixels)}; ${warning}` };
}
