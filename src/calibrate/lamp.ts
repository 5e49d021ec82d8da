/**
 * Lamp calibration end to end: measure the lamp's lines, identify them (with a hint or
 * blind), fit the dispersion solution with clipping, and decide whether to trust it.
 */
import { UsageError } from '../errors.js';
import { lampLineList, type LineList } from '../lines/linelist.js';
import { median } from '../lines/snr.js';
import type { Domain } from '../math/basis.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import type { Spectrum } from '../spectrum/spectrum.js';
import { identifyLampLines, mergeUnresolvedLines, type WavelengthHint } from './identify.js';
import { measureLampLines, type LampLine, type LampLineOptions } from './lamp-lines.js';
import { calibrationMessages, MIN_IDENTIFIED_FRACTION, type CalibrationFailure } from './messages.js';
import { derivativePolynomial } from './polynomial.js';
import { checkOrder, fitDispersionSolution, type DispersionSolution, type SolutionInputLine } from './solution.js';

/** Options of {@link calibrateLamp}. Every default is stated once, here. */
export interface CalibrateLampOptions {
  /** Lamp name(s) as for `lampLineList` (`neon`, `neon,argon` …); ignored for the list when `list` is given, but recorded. */
  readonly lamp: string;
  /** A line list to use instead of the lamp's shipped list. */
  readonly list?: LineList;
  /** Polynomial order 1–5. Default 3. */
  readonly order?: number;
  /** A rough wavelength scale; without it the identification is blind. */
  readonly hint?: WavelengthHint;
  /** Sigma-clipping threshold, robust σ. Default 3. */
  readonly clipSigma?: number;
  /** Line detection and measurement options. */
  readonly lines?: LampLineOptions;
  /** Largest RMS accepted, pixels. Default 0.5 (centroids of real lamp lines scatter by a few hundredths of a pixel; 0.5 pixel is where wrong identifications start to fit). */
  readonly maxRmsPixels?: number;
  /** Lamp mid-exposure time, kept in the solution for interpolation between lamps. */
  readonly observation?: { readonly midpointUtc: string; readonly mjdUtc: number } | null;
}

/** Identification uses at most this many of the brightest measured lines (the rest are matched under the first fit). */
export const IDENTIFY_BRIGHTEST = 60;

/** Default order of a dispersion solution. */
export const DEFAULT_SOLUTION_ORDER = 3;
/** Default largest accepted RMS, pixels (see {@link CalibrateLampOptions.maxRmsPixels}). */
export const DEFAULT_MAX_RMS_PIXELS = 0.5;
/** Fraction of the mean spacing of the lines used that the RMS must stay below (brief's rule of thumb, our own choice of 0.1). */
export const MAX_RMS_FRACTION_OF_SPACING = 0.1;

/**
 * The pixel coordinates a solution uses for a spectrum: its axis when the unit is `pixel`,
 * else the 0-based index.
 *
 * @param spectrum any spectrum.
 * @returns the coordinates (the spectrum's own array when in pixels; do not modify it).
 * @example pixelCoordinates(lamp)[0]; // 0
 */
export function pixelCoordinates(spectrum: Spectrum): Float64Array {
  return spectrum.unit === 'pixel' ? spectrum.wavelength : Float64Array.from({ length: spectrum.flux.length }, (_, i) => i);
}

/**
 * The range of a spectrum's pixel coordinates: the domain of the Chebyshev basis.
 *
 * @param spectrum any spectrum.
 * @returns `{ min, max }` in pixels.
 * @example pixelDomain(lamp); // { min: 0, max: 2047 }
 */
export function pixelDomain(spectrum: Spectrum): Domain {
  const x = pixelCoordinates(spectrum);
  const a = x[0], b = x[x.length - 1];
  return { min: Math.min(a, b), max: Math.max(a, b) };
}

function failed(base: Omit<DispersionSolution, 'ok' | 'reason' | 'message'>, reason: CalibrationFailure, message: string): DispersionSolution {
  return { ...base, ok: false, reason, message };
}

/**
 * Calibrates a lamp spectrum: finds and centroids its lines, identifies them against the
 * lamp's line list (with a hint, or blind by the pattern of line spacings), fits a
 * Chebyshev dispersion polynomial with sigma clipping, measures the resolving power, and
 * applies the acceptance criteria.
 *
 * Method: {@link measureLampLines} (matched filter, Gaussian + linear background fits),
 * {@link identifyLampLines} (triplet ratios, voting, verification by growth), then one more
 * matching pass of every measured line against the list under the fitted solution
 * (within max(0.3, 3 × RMS) pixels, unambiguous), and {@link fitDispersionSolution}.
 * Saturated lines and unresolved list blends are identified but kept out of the fit.
 *
 * Acceptance (`ok: false` with a reason otherwise; see DEVELOPERS.md):
 * 1. at least 4 lines measured (`no-lines-found` when none);
 * 2. a pattern found (`no-pattern`);
 * 3. at least order + 3 lines used (`too-few-lines`);
 * 4. at least half of the measured unflagged lines identified (`few-identified`: a wrong lamp);
 * 5. RMS ≤ min(`maxRmsPixels`, 0.1 × the mean spacing of the used lines) pixels
 *    (`large-residuals`); this is far below the accuracy of any useful hint, so a solution
 *    no better than its hint is never accepted.
 *
 * @param spectrum a lamp spectrum on a pixel axis (a calibrated axis is ignored: the 0-based index is used).
 * @param options lamp name or list, order, hint, clipping, detection options, limits.
 * @returns the solution: coefficients, covariance, line table, statistics, `ok` and `reason`.
 * @throws {UsageError} for an unknown lamp, an order outside 1–5, or a malformed hint.
 * @example
 * const s = calibrateLamp(readSpectrum('lamp.fits'), { lamp: 'neon,argon', hint: { kind: 'range', minWavelengthAngstrom: 5800, maxWavelengthAngstrom: 7000 } });
 * s.ok; s.rmsAngstrom; s.linesUsed;
 */
export function calibrateLamp(spectrum: Spectrum, options: CalibrateLampOptions): DispersionSolution {
  const order = checkOrder(options.order ?? DEFAULT_SOLUTION_ORDER);
  const list = options.list ?? lampLineList(options.lamp);
  const domain = pixelDomain(spectrum);
  const measured = measureLampLines(spectrum, options.lines);
  const all = measured.lines;
  const base: Omit<DispersionSolution, 'ok' | 'reason' | 'message'> = {
    method: 'lamp',
    calibratedByLamp: true,
    velocityZeroPointMeaningful: true,
    medium: list.medium,
    order,
    domain,
    coefficients: [],
    covariance: [],
    pixels: spectrum.flux.length,
    rmsAngstrom: null,
    rmsPixels: null,
    rmsKmPerS: null,
    linesMeasured: all.length,
    linesIdentified: 0,
    linesUsed: 0,
    linesRejected: 0,
    resolvingPower: null,
    wavelengthUncertaintyAngstrom: null,
    lines: [],
    lamp: { name: options.lamp, species: [...list.species] },
    grating: options.hint?.kind === 'grating' ? options.hint.setup : null,
    observation: options.observation ?? null,
    warnings: [],
    provenance: [...spectrum.provenance, provenanceEntry('calibrate-lamp', {
      lamp: options.lamp, order, hint: options.hint ?? null, clipSigma: options.clipSigma ?? null, significance: measured.significance,
    })],
  };
  const maxRms = options.maxRmsPixels ?? DEFAULT_MAX_RMS_PIXELS;
  if (!(maxRms > 0)) throw new UsageError('calibrate.bad-limit', `maxRmsPixels must be > 0, got ${maxRms}`);
  if (all.length === 0) return failed(base, 'no-lines-found', calibrationMessages.noLines(measured.significance));
  const candidates = all.filter((l) => !l.flags.includes('fit-failed'));
  if (candidates.length < 4) return failed(base, 'too-few-lines', calibrationMessages.tooFewMeasured(candidates.length));

  // The pattern is sought among the brightest lines (faint ones are more often spurious
  // or blended); the matching pass below brings in the rest.
  const brightest = [...candidates].sort((a, b) => b.strength - a.strength).slice(0, IDENTIFY_BRIGHTEST);
  const id = identifyLampLines(brightest, { list, hint: options.hint, order, domain });
  if (!id.ok || !id.model) return failed(base, 'no-pattern', calibrationMessages.noPattern(options.lamp, options.hint !== undefined));

  // Assign list lines to every measured line: the identification's matches, then one
  // more pass under a first fit to pick up lines the growth did not reach.
  const assigned = new Map<LampLine, (typeof id.matches)[number]['line']>();
  for (const m of id.matches) assigned.set(brightest[m.peakIndex], m.line);
  const inputOf = (l: LampLine): SolutionInputLine => {
    const ref = assigned.get(l);
    const exclude = l.flags.includes('fit-failed') ? 'fit-failed' : !ref ? null : l.flags.includes('saturated') ? 'saturated' : ref.blend ? 'blend' : null;
    return {
      pixel: l.pixel, pixelUncertainty: l.pixelUncertainty, fwhmPixels: l.fwhmPixels, strength: l.strength,
      wavelengthAngstrom: ref ? ref.wavelengthAngstrom : null, species: ref?.species, relativeIntensity: ref?.relativeIntensity ?? null,
      exclude,
    };
  };
  const fitOrUndefined = () => {
    try {
      return fitDispersionSolution(all.map(inputOf), { order, domain, clipSigma: options.clipSigma });
    } catch (e) {
      if (e instanceof UsageError && (e.code === 'calibrate.too-few-points' || e.code === 'lsq.rank-deficient' || e.code === 'lsq.too-few-points')) return undefined;
      throw e;
    }
  };
  let fit = fitOrUndefined();
  if (fit) {
    const f = fit;
    const centreDispersion = Math.abs(derivativePolynomial(f.coefficients, domain, (domain.min + domain.max) / 2));
    const ref = mergeUnresolvedLines(list, median(candidates.map((l) => l.fwhmPixels)) * centreDispersion);
    const taken = new Set([...assigned.values()].map((r) => r.wavelengthAngstrom));
    const tolPx = Math.max(0.3, 3 * f.rmsPixels);
    let added = 0;
    f.lines.forEach((row, k) => {
      const l = all[k];
      if (assigned.has(l) || l.flags.includes('fit-failed')) return;
      const tolA = tolPx * Math.abs(derivativePolynomial(f.coefficients, domain, l.pixel));
      const within = ref.filter((r) => Math.abs(r.wavelengthAngstrom - row.fittedWavelengthAngstrom) <= tolA);
      if (within.length === 1 && !taken.has(within[0].wavelengthAngstrom)) {
        assigned.set(l, within[0]);
        taken.add(within[0].wavelengthAngstrom);
        added++;
      }
    });
    if (added > 0) fit = fitOrUndefined();
  }
  const identified = all.filter((l) => assigned.has(l)).length;
  const withId = { ...base, linesIdentified: identified };
  if (!fit) {
    const usable = all.filter((l) => assigned.has(l) && inputOf(l).exclude === null).length;
    return failed(withId, 'too-few-lines', calibrationMessages.tooFewLines(usable, order));
  }
  const full: Omit<DispersionSolution, 'ok' | 'reason' | 'message'> = {
    ...withId,
    coefficients: fit.coefficients,
    covariance: fit.covariance,
    rmsAngstrom: fit.rmsAngstrom,
    rmsPixels: fit.rmsPixels,
    rmsKmPerS: fit.rmsKmPerS,
    linesUsed: fit.linesUsed,
    linesRejected: fit.linesRejected,
    resolvingPower: fit.resolvingPower,
    wavelengthUncertaintyAngstrom: fit.wavelengthUncertaintyAngstrom,
    lines: fit.lines,
    warnings: all.some((l) => l.flags.includes('saturated')) ? [`${all.filter((l) => l.flags.includes('saturated')).length} saturated line(s) kept out of the fit`] : [],
  };
  if (fit.linesUsed < order + 3) return failed(full, 'too-few-lines', calibrationMessages.tooFewLines(fit.linesUsed, order));
  const unflagged = all.filter((l) => l.flags.length === 0).length;
  const identifiedUnflagged = all.filter((l) => l.flags.length === 0 && assigned.has(l)).length;
  const fraction = unflagged > 0 ? identifiedUnflagged / unflagged : 0;
  if (fraction < MIN_IDENTIFIED_FRACTION) return failed(full, 'few-identified', calibrationMessages.fewIdentified(identifiedUnflagged, unflagged, fraction));
  const usedPixels = fit.lines.filter((l) => l.used).map((l) => l.pixel).sort((a, b) => a - b);
  const spacing = (usedPixels[usedPixels.length - 1] - usedPixels[0]) / Math.max(1, usedPixels.length - 1);
  const limit = Math.min(maxRms, MAX_RMS_FRACTION_OF_SPACING * spacing);
  if (!(fit.rmsPixels <= limit)) return failed(full, 'large-residuals', calibrationMessages.largeResiduals(fit.rmsPixels, limit));
  return { ...full, ok: true, reason: null, message: calibrationMessages.ok(fit.linesUsed, order, fit.rmsAngstrom, fit.rmsPixels) };
}
