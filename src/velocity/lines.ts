/**
 * Radial velocity from the positions of individual lines: match lines of a line list to
 * the spectrum near where an approximate velocity puts them, fit each one's profile, turn
 * each centre into a velocity, and combine them.
 *
 * Method:
 * 1. The spectrum is taken to vacuum wavelengths (Peck & Reeder 1972 from air; its medium
 *    must be stated) and so is the line list; a Doppler shift multiplies vacuum wavelengths,
 *    so each velocity is exact for either medium (computing it from two air wavelengths
 *    would be off by ~1 m/s at 100 km/s). Tables report wavelengths in the spectrum's medium.
 * 2. Lines: the strongest `maxLinesPerSpecies` of each species inside the spectrum's range
 *    (by the list's relative intensity). A line with another listed line closer than
 *    `blendSeparation` × λ/R is not used (an unresolved blend); pixels within
 *    ±`maskHalfWidth` × λ/R of the other listed lines are masked in each line's fit.
 * 3. Approximate velocity: given, or the peak of a cross-correlation with a template made of
 *    the selected lines ({@link lineListTemplate}, {@link crossCorrelationVelocity}), or the
 *    deepest point near the expected position of any selected line.
 * 4. Each line is fitted ({@link fitLineArrays}: profile + linear continuum by weighted least
 *    squares) around its expected position, its centre bounded to ±`matchToleranceKmPerS`
 *    of it, twice: with free widths, then with the narrow lines sharing one width λ/R_eff
 *    (`lineWidths`). It is rejected when the fit fails, the line is not detected (|amplitude|
 *    below `minimumSignificance` × its error), the centre sits at its bound (another line, or
 *    none), or its velocity lies further than `matchToleranceKmPerS` from the median of the
 *    fitted lines.
 * 5. Velocity per line: relativistic Doppler formula (classical on request) from the
 *    observed and rest vacuum wavelengths; its error from the centre's error.
 * 6. Combination: {@link combineVelocities} — weighted mean, leave-one-out 3σ rejection
 *    against a robust scale, error of the mean scaled by √(χ²/ν) only when χ² is improbably
 *    large (p < 0.01).
 * 7. Wavelength calibration: its error is common to all lines of the spectrum (see
 *    `calibration-error.ts`); the weighted mean of the per-line calibration errors is added
 *    in quadrature to the (scaled) statistical error. It does not enter χ².
 */
import { UsageError } from '../errors.js';
import { fitLineArrays, type ContinuumOrder, type MeasuredValue } from '../fit/line-fit.js';
import type { LineProfile } from '../fit/profiles.js';
import { silentLogger, type Logger } from '../logger.js';
import { normalizeContinuum, type ContinuumOptions } from '../lines/continuum.js';
import { lineListToVacuum, loadLineList, type LineEntry, type LineList } from '../lines/linelist.js';
import { lineListTemplate, selectStrongestLines, SYNTHETIC_DEFAULTS } from '../lines/synthetic.js';
import { vacuumToAir } from '../spectrum/air-vacuum.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import { calibrationVelocityErrorKmPerS, type WavelengthCalibrationError } from './calibration-error.js';
import { CCF_DEFAULTS, crossCorrelationVelocity, type VelocityRange } from './ccf.js';
import { combineVelocities, type ChiSquareScaling, type VelocityCombinationOptions } from './combine.js';
import { SPEED_OF_LIGHT_KM_PER_S } from './constants.js';
import { dopplerVelocityKmPerS, shiftWavelength, type DopplerFormula } from './doppler.js';
import { prepareSpectrum } from './prepare.js';

/** How the approximate velocity that places the lines is found. */
export type ApproximateVelocity = number | 'cross-correlation' | 'strongest-line';

/** Options of {@link velocityFromLines}. Give `lines` or `species`. Every default is written once, in {@link LINE_VELOCITY_DEFAULTS}. */
export interface LineVelocityOptions {
  /** Rest wavelengths: a line list of one's own (air or vacuum), e.g. from `readLineList`. */
  lines?: LineList;
  /** Or species of the shipped lists, e.g. `['H I', 'Fe I']`. */
  species?: readonly string[];
  /** Strongest lines kept per species (by the list's relative intensity). Default 30. */
  maxLinesPerSpecies?: number;
  /** km/s, or how to find it. Default `cross-correlation`. */
  approximateVelocity?: ApproximateVelocity;
  /** Where the approximate velocity is searched, km/s. Default −500 to +500. */
  velocityRangeKmPerS?: VelocityRange;
  /** Resolving power λ/FWHM of the spectrum. Default: λ/(2.5·pixel width) at the middle (2.5 pixels per resolution element, common practice). */
  resolvingPower?: number;
  /** Lines closer than this many FWHM to another listed line of comparable width are not used. Default 2. */
  blendSeparation?: number;
  /** Pixels within ± this many FWHM of other listed lines (of comparable width) are masked in a line's fit. Default 2.5. */
  maskHalfWidth?: number;
  /**
   * How far a line's centre may lie from its expected position (a bound of its fit) and its
   * velocity from the median of all fitted lines, km/s. Default c/R (one resolution element).
   */
  matchToleranceKmPerS?: number;
  /** Smallest |amplitude|/σ(amplitude) for a line to count as detected. Default 3. */
  minimumSignificance?: number;
  /** Profile fitted to each line. Default `gaussian`. */
  profile?: LineProfile;
  /**
   * Continuum fit ({@link ContinuumOptions}) the spectrum is divided by before the lines are
   * fitted, or `none` when it is already normalised. Default: {@link fitContinuum}'s
   * defaults. Fitting a line with an additive local continuum on an un-normalised spectrum
   * shifts broad lines on a sloping continuum: the absorbed flux C(λ)·depth·φ is lopsided by
   * C′/C·σ² (measured: −0.11 km/s for a 6 Å-wide Hα on a 9000 K Planck slope).
   */
  continuum?: ContinuumOptions | 'none';
  /** Continuum order under each line (0–2), fitted with the line after normalisation. Default 1. */
  continuumOrder?: ContinuumOrder;
  /**
   * `common` (default): after a first fit with free widths, every narrow line (FWHM below
   * twice λ/R) is refitted with its FWHM fixed at λ/R_eff, R_eff the median of λ/FWHM over
   * the narrow lines (at least 3 of them; otherwise, and for Voigt profiles, widths stay
   * free); broad lines keep free widths. `free`: every width fitted. At S/N 20 free widths
   * made weak lines' centre errors 5–20 % too small (a width that noise narrows also shrinks
   * the centre's error), and the combined error 13–26 % too small; a common width keeps the
   * fits linear.
   */
  lineWidths?: 'common' | 'free';
  /** Full fitting window, Å. Default: the line fitter's (±3 estimated FWHM). */
  windowAngstrom?: number;
  /** Absorption (stars, default) or emission lines. */
  kind?: 'absorption' | 'emission';
  /** Doppler formula. Default relativistic. */
  formula?: DopplerFormula;
  /** Outlier rejection and χ² scaling of the combination. */
  combination?: VelocityCombinationOptions;
  /** Wavelength calibration of the spectrum, to add its error. */
  calibration?: WavelengthCalibrationError;
  /** Medium of the spectrum's wavelengths when the spectrum does not say. */
  spectrumMedium?: 'air' | 'vacuum';
  /** Receives warnings (a failed cross-correlation falling back to the strongest line). */
  logger?: Logger;
}

/** The defaults of {@link velocityFromLines}. */
export const LINE_VELOCITY_DEFAULTS = Object.freeze({
  approximateVelocity: 'cross-correlation' as ApproximateVelocity,
  pixelsPerResolutionElement: 2.5,
  blendSeparation: 2,
  maskHalfWidth: 2.5,
  minimumSignificance: 3,
  profile: 'gaussian' as LineProfile,
  continuumOrder: 1 as ContinuumOrder,
  lineWidths: 'common' as 'common' | 'free',
  kind: 'absorption' as const,
  formula: 'relativistic' as DopplerFormula,
  /** Half-width of the stretch of spectrum handed to each fit: this many λ/R, and at least `minimumSliceAngstrom`. */
  sliceResolutionElements: 60,
  minimumSliceAngstrom: 30,
});

/** Why a line was not used. */
export type LineRejection = 'outside-spectrum' | 'no-usable-pixels' | 'blended' | 'fit-failed' | 'at-window-edge' | 'not-detected' | 'far-from-others' | 'outlier';

/** One line of the per-line table. */
export interface LineVelocityRow {
  readonly species: string;
  /** Rest wavelength, Å, in the spectrum's medium (`medium`). */
  readonly restWavelengthAngstrom: number;
  /** Medium of the wavelengths in this row. */
  readonly medium: 'air' | 'vacuum';
  /** Fitted centre, Å, in `medium`; null when not fitted. */
  readonly observedWavelengthAngstrom: MeasuredValue | null;
  /** Fitted FWHM, Å; null when not fitted. */
  readonly fwhmAngstrom: number | null;
  /** Velocity of this line, km/s (observer's frame); null when not fitted. */
  readonly velocityKmPerS: MeasuredValue | null;
  /** Leave-one-out normalised residual against the other lines used (NaN when not combined). */
  readonly normalizedResidual: number;
  readonly status: 'used' | 'rejected';
  readonly reason: LineRejection | null;
  /** Why, in words (empty for used lines). */
  readonly note: string;
}

/** Result of {@link velocityFromLines}. */
export interface LineVelocityResult {
  readonly method: 'lines';
  /** True when at least one line was used. */
  readonly converged: boolean;
  readonly message: string;
  /** Combined velocity, km/s, observer's frame; uncertainty = scaled statistical ⊕ calibration. */
  readonly velocity: MeasuredValue;
  /** Error of the weighted mean before scaling, km/s. */
  readonly statisticalUncertaintyKmPerS: number;
  /** √(χ²/ν) applied, or 1. */
  readonly uncertaintyScale: number;
  /** Calibration term added in quadrature, km/s (0 without `calibration`). */
  readonly calibrationUncertaintyKmPerS: number;
  readonly chiSquare: number;
  readonly degreesOfFreedom: number;
  readonly reducedChiSquare: number;
  readonly linesUsed: number;
  readonly linesRejected: number;
  /** How the per-line velocities were combined, in words. */
  readonly combination: string;
  readonly chiSquareScaling: ChiSquareScaling;
  readonly approximateVelocityKmPerS: number;
  readonly approximateVelocitySource: 'given' | 'cross-correlation' | 'strongest-line';
  readonly resolvingPower: number;
  /** λ/FWHM shared by the narrow lines in the final fits (`lineWidths: 'common'`), or null when widths were free. */
  readonly commonResolvingPower: number | null;
  readonly formula: DopplerFormula;
  readonly profile: LineProfile;
  /** Medium of the input spectrum (wavelengths in `lines` are in it). */
  readonly medium: 'air' | 'vacuum';
  readonly lines: readonly LineVelocityRow[];
  readonly provenance: readonly ProvenanceEntry[];
}

interface Candidate {
  entry: LineEntry;
  restVacuum: number;
  expected: number;
}

function check(cond: boolean, code: string, message: string): void {
  if (!cond) throw new UsageError(code, message);
}

/**
 * Radial velocity from individual lines (see the module notes for the method, the
 * rejection rules and how the uncertainty is made).
 *
 * Sign convention: positive = receding. The velocity is in the observer's frame; apply the
 * barycentric correction with `applyVelocityCorrection`. Missing data: unusable pixels are
 * skipped by every fit.
 *
 * @param spectrum a wavelength-calibrated spectrum (any unit), air or vacuum (stated by the
 *   spectrum or by `spectrumMedium`), ideally with per-pixel uncertainties (otherwise each
 *   fit scales its errors by its reduced χ²).
 * @param options `lines` or `species`, approximate velocity, resolving power, rejection
 *   settings, profile, formula, calibration error.
 * @returns the combined velocity (km/s) with its uncertainty, χ², and a row per line with
 *   its observed wavelength, velocity and status. No usable line gives `converged: false`
 *   and NaN values, not an exception.
 * @throws {InputError} `velocity.uncalibrated`, `velocity.medium-unknown`.
 * @throws {UsageError} for bad options, an unknown species, or no listed line inside the
 *   spectrum's range.
 * @example
 * const r = velocityFromLines(star, { species: ['H I'], resolvingPower: 5000 });
 * r.velocity;        // { value: -17.2, uncertainty: 0.9 } km/s
 * r.lines[0].status; // 'used'
 */
export function velocityFromLines(spectrum: Spectrum, options: LineVelocityOptions): LineVelocityResult {
  check((options.lines === undefined) !== (options.species === undefined), 'velocity.lines-or-species', 'give exactly one of lines (a line list) and species');
  const D = LINE_VELOCITY_DEFAULTS;
  const formula = options.formula ?? D.formula;
  check(formula === 'relativistic' || formula === 'classical', 'velocity.bad-formula', `formula must be relativistic or classical (got ${String(formula)})`);
  const blendSep = options.blendSeparation ?? D.blendSeparation;
  const maskHalf = options.maskHalfWidth ?? D.maskHalfWidth;
  const minSig = options.minimumSignificance ?? D.minimumSignificance;
  check(blendSep >= 0 && Number.isFinite(blendSep), 'velocity.bad-option', `blendSeparation must be a number ≥ 0 (got ${blendSep})`);
  check(maskHalf >= 0 && Number.isFinite(maskHalf), 'velocity.bad-option', `maskHalfWidth must be a number ≥ 0 (got ${maskHalf})`);
  check(minSig >= 0 && Number.isFinite(minSig), 'velocity.bad-option', `minimumSignificance must be a number ≥ 0 (got ${minSig})`);
  const range = options.velocityRangeKmPerS ?? CCF_DEFAULTS.velocityRangeKmPerS;
  const profile = options.profile ?? D.profile;
  const kind = options.kind ?? D.kind;
  check(kind === 'absorption' || kind === 'emission', 'velocity.bad-option', `kind must be absorption or emission (got ${String(kind)})`);
  const logger = options.logger ?? silentLogger;

  const prepared = prepareSpectrum(spectrum, options.spectrumMedium, 'spectrum', '--medium air|vacuum (options.spectrumMedium)');
  const s = options.continuum === 'none' ? prepared.spectrum : normalizeContinuum(prepared.spectrum, { features: kind, ...(options.continuum ?? {}) }).normalized;
  const medium = prepared.medium;
  const wl = s.wavelength;
  const n = wl.length;
  check(n >= 5, 'velocity.too-short', `the spectrum has ${n} pixels; line velocities need at least 5`);
  const mid = n >> 1;
  const R = options.resolvingPower ?? wl[mid] / (D.pixelsPerResolutionElement * 0.5 * (wl[mid + 1] - wl[mid - 1]));
  check(R > 0 && Number.isFinite(R), 'velocity.bad-resolving-power', `the resolving power must be a positive number (got ${R})`);
  const tolerance = options.matchToleranceKmPerS ?? SPEED_OF_LIGHT_KM_PER_S / R;
  check(tolerance > 0, 'velocity.bad-option', `matchToleranceKmPerS must be positive (got ${tolerance})`);

  // Lines in vacuum, strongest per species, within the spectrum's range.
  const list = lineListToVacuum(options.lines ?? loadLineList(options.species!));
  const chosen = selectStrongestLines(list, {
    minWavelengthAngstrom: wl[0],
    maxWavelengthAngstrom: wl[n - 1],
    maxLinesPerSpecies: options.maxLinesPerSpecies ?? SYNTHETIC_DEFAULTS.maxLinesPerSpecies,
  });
  if (chosen.entries.length === 0) {
    throw new UsageError('velocity.no-lines', `no line of ${list.species.join(', ')} falls inside the spectrum (${wl[0].toFixed(1)}–${wl[n - 1].toFixed(1)} Å, vacuum)`);
  }

  // Approximate velocity.
  let approximate: number;
  let approximateSource: LineVelocityResult['approximateVelocitySource'];
  const how = options.approximateVelocity ?? D.approximateVelocity;
  if (typeof how === 'number') {
    check(Number.isFinite(how) && Math.abs(how) < SPEED_OF_LIGHT_KM_PER_S, 'velocity.bad-option', `the approximate velocity must be a finite number of km/s below c (got ${how})`);
    approximate = how;
    approximateSource = 'given';
  } else if (how === 'cross-correlation') {
    const template = lineListTemplate({ list: chosen, startAngstrom: wl[0], endAngstrom: wl[n - 1], medium: 'vacuum', resolvingPower: R, depth: 0.5 });
    const ccf = crossCorrelationVelocity(s, template, { velocityRangeKmPerS: range, continuum: 'none', templateContinuum: 'none', formula });
    if (ccf.converged) {
      approximate = ccf.velocity.value;
      approximateSource = 'cross-correlation';
    } else {
      logger.warn({ code: 'velocity.approximate-fallback', message: `the cross-correlation found no velocity (${ccf.message}); the strongest line places the lines instead` });
      approximate = strongestLineVelocity(s, chosen.entries, R, range, kind, formula);
      approximateSource = 'strongest-line';
    }
  } else if (how === 'strongest-line') {
    approximate = strongestLineVelocity(s, chosen.entries, R, range, kind, formula);
    approximateSource = 'strongest-line';
  } else {
    throw new UsageError('velocity.bad-option', `approximateVelocity must be a number of km/s, "cross-correlation" or "strongest-line" (got ${String(how)})`);
  }

  const candidates: Candidate[] = chosen.entries.map((e) => ({ entry: e, restVacuum: e.wavelengthAngstrom, expected: shiftWavelength(e.wavelengthAngstrom, approximate, { formula }) }));
  const toMedium = (vac: number): number => (medium === 'air' ? vacuumToAir(vac) : vac);
  interface WorkingRow {
    species: string; restWavelengthAngstrom: number; medium: 'air' | 'vacuum';
    observedWavelengthAngstrom: MeasuredValue | null; fwhmAngstrom: number | null; velocityKmPerS: MeasuredValue | null;
    reason: LineRejection | null; note: string;
  }
  const flux = s.flux;
  const sigma = s.uncertainty;
  const baseMask = new Uint8Array(n);
  for (let i = 0; i < n; i++) baseMask[i] = isUsablePixel(s, i) ? 0 : 1;
  const continuumOrder = options.continuumOrder ?? D.continuumOrder;

  /**
   * Fits every candidate, given the FWHM (Å) expected of each line: neighbours no more than
   * 3× broader than the line are masked over ±maskHalfWidth × their FWHM, but never within
   * ±1 FWHM of the line itself (broader ones, like a Balmer line under a metal line, act as
   * continuum and are left alone); a neighbour whose width is within a factor 3 of the
   * line's and which lies closer than blendSeparation × the larger FWHM makes it a blend.
   */
  const fitAll = (widths: readonly number[], pass: number, fixedWidth: readonly boolean[]): WorkingRow[] => candidates.map((c, k) => {
    const fwhm = widths[k];
    const row: WorkingRow = {
      species: c.entry.species, restWavelengthAngstrom: toMedium(c.restVacuum), medium,
      observedWavelengthAngstrom: null, fwhmAngstrom: null, velocityKmPerS: null, reason: null, note: '',
    };
    const reject = (reason: LineRejection, note: string): WorkingRow => { row.reason = reason; row.note = note; return row; };
    const notBroader = (j: number): boolean => widths[j] <= BROAD_NEIGHBOUR_RATIO * fwhm;
    const comparable = (j: number): boolean => notBroader(j) && fwhm <= BROAD_NEIGHBOUR_RATIO * widths[j];
    const neighbour = candidates.findIndex((o, j) => j !== k && comparable(j) && Math.abs(o.expected - c.expected) < blendSep * Math.max(fwhm, widths[j]));
    if (neighbour >= 0) {
      const o = candidates[neighbour];
      return reject('blended', `blended with ${o.entry.species} ${toMedium(o.restVacuum).toFixed(3)} Å (closer than ${blendSep} FWHM)`);
    }
    const half = Math.max(D.sliceResolutionElements * (c.expected / R), D.minimumSliceAngstrom, 4 * fwhm, options.windowAngstrom ?? 0);
    const i0 = lowerBound(wl, c.expected - half);
    const i1 = lowerBound(wl, c.expected + half);
    if (c.expected - fwhm < wl[0] || c.expected + fwhm > wl[n - 1] || i1 - i0 < 8) return reject('outside-spectrum', 'too close to the end of the spectrum');
    const mask = baseMask.slice(i0, i1);
    candidates.forEach((o, j) => {
      if (j === k || !notBroader(j)) return;
      const w = maskHalf * widths[j];
      if (o.expected + w < wl[i0] || o.expected - w > wl[i1 - 1]) return;
      for (let i = Math.max(i0, lowerBound(wl, o.expected - w)); i < i1 && wl[i] <= o.expected + w; i++) {
        // The line's own core (±1 FWHM) is never masked.
        if (Math.abs(wl[i] - c.expected) > fwhm) mask[i - i0] = 1;
      }
    });
    // The fit needs usable pixels on both sides of the expected centre, within its core
    // (the pixels may be NaN or masked in the input, or where the continuum was not positive).
    let below = 0, above = 0;
    const core = Math.max(fwhm, 2 * Math.abs(wl[Math.min(i1, n - 1)] - wl[i0]) / Math.max(1, i1 - i0));
    for (let i = i0; i < i1; i++) {
      if (mask[i - i0] || Math.abs(wl[i] - c.expected) > core) continue;
      if (wl[i] < c.expected) below++;
      else above++;
    }
    if (below === 0 || above === 0 || below + above < 3) {
      return reject('no-usable-pixels', `only ${below + above} usable pixels within ${core.toFixed(2)} Å of the expected centre (masked, not finite, or where the continuum is not positive)`);
    }
    const fit = fitLineArrays(
      { x: wl.subarray(i0, i1), flux: flux.subarray(i0, i1), uncertainty: sigma?.subarray(i0, i1), mask },
      {
        center: c.expected, window: options.windowAngstrom ?? (pass === 0 ? undefined : 2 * WINDOW_HALF_WIDTH_FWHM * fwhm), profile, continuumOrder, sign: kind,
        // The centre may not leave ±tolerance around the expected position (else it finds a neighbour).
        bounds: { center1: [c.expected * (1 - tolerance / SPEED_OF_LIGHT_KM_PER_S), c.expected * (1 + tolerance / SPEED_OF_LIGHT_KM_PER_S)] },
        ...(fixedWidth[k] ? { fixed: { fwhm1: fwhm } } : {}),
      },
    );
    if (!fit.converged) return reject('fit-failed', `the fit did not converge (${fit.reason})`);
    const comp = fit.components[0];
    if (!(Math.abs(comp.amplitude.value) >= minSig * comp.amplitude.uncertainty)) {
      return reject('not-detected', `not detected: amplitude ${Math.abs(comp.amplitude.value / comp.amplitude.uncertainty).toFixed(1)} σ (below ${minSig} σ)`);
    }
    if (fit.parameters.find((p) => p.name === 'center1')?.atBound) return reject('at-window-edge', `the fitted centre is at the edge of its allowed range (±${tolerance.toFixed(1)} km/s around the expected position)`);
    const centre = comp.center;
    if (!(centre.uncertainty > 0) || !Number.isFinite(centre.uncertainty)) return reject('fit-failed', 'the fit gives no uncertainty for the centre');
    const v = dopplerVelocityKmPerS(centre.value, c.restVacuum, { formula });
    const dv = (dopplerVelocityKmPerS(centre.value + centre.uncertainty, c.restVacuum, { formula }) - dopplerVelocityKmPerS(centre.value - centre.uncertainty, c.restVacuum, { formula })) / 2;
    row.observedWavelengthAngstrom = { value: toMedium(centre.value), uncertainty: centre.uncertainty };
    row.fwhmAngstrom = comp.fwhm.value;
    row.velocityKmPerS = { value: v, uncertainty: Math.abs(dv) };
    return row;
  });
  // Pass 1: free widths, neighbours masked by λ/R. Pass 2: neighbours masked by the widths
  // pass 1 measured; narrow lines (FWHM below twice λ/R) all get the common width λ/R_eff
  // (R_eff the median of λ/FWHM over them), broad ones (Balmer lines) keep a free width.
  const free = candidates.map(() => false);
  const first = fitAll(candidates.map((c) => c.expected / R), 0, free);
  const narrow = first.map((r, k) => r.fwhmAngstrom !== null && r.reason === null && r.fwhmAngstrom < NARROW_LINE_LIMIT * (candidates[k].expected / R));
  const ratios = first.flatMap((r, k) => (narrow[k] ? [candidates[k].expected / r.fwhmAngstrom!] : []));
  const commonR = ratios.length >= MIN_LINES_FOR_COMMON_WIDTH ? medianOf(ratios) : NaN;
  const widthMode = options.lineWidths ?? D.lineWidths;
  const useCommon = widthMode === 'common' && Number.isFinite(commonR) && profile !== 'voigt';
  const widths = first.map((r, k) => (useCommon && (narrow[k] || r.fwhmAngstrom === null) ? candidates[k].expected / commonR
    : r.fwhmAngstrom !== null && r.fwhmAngstrom > 0 ? r.fwhmAngstrom : candidates[k].expected / R));
  const rows = fitAll(widths, 1, first.map((r, k) => useCommon && (narrow[k] || r.fwhmAngstrom === null)));

  // Lines far from the others (a wrong match), then the combination.
  const fitted = rows.filter((r) => r.velocityKmPerS !== null && r.reason === null).map((r) => r.velocityKmPerS!.value);
  const med = fitted.length ? medianOf(fitted) : NaN;
  for (const row of rows) {
    if (row.velocityKmPerS && row.reason === null && Math.abs(row.velocityKmPerS.value - med) > tolerance) {
      row.reason = 'far-from-others';
      row.note = `velocity ${row.velocityKmPerS.value.toFixed(2)} km/s is more than ${tolerance.toFixed(1)} km/s from the median of the fitted lines (${med.toFixed(2)} km/s)`;
    }
  }
  const inputs = rows.map((r) => (r.reason === null && r.velocityKmPerS ? r.velocityKmPerS : { value: NaN, uncertainty: NaN }));
  const comb = combineVelocities(inputs, options.combination);
  const finalRows: LineVelocityRow[] = rows.map((r, i) => {
    let reason = r.reason;
    let note = r.note;
    if (comb.outlier[i]) {
      reason = 'outlier';
      note = `outlier: normalised residual ${comb.normalizedResiduals[i].toFixed(2)} against the other lines (limit ${((options.combination?.clipThreshold ?? 3) * comb.robustScale).toFixed(2)})`;
    }
    return {
      species: r.species, restWavelengthAngstrom: r.restWavelengthAngstrom, medium: r.medium,
      observedWavelengthAngstrom: r.observedWavelengthAngstrom, fwhmAngstrom: r.fwhmAngstrom, velocityKmPerS: r.velocityKmPerS,
      normalizedResidual: comb.normalizedResiduals[i],
      status: comb.used[i] ? 'used' : 'rejected',
      reason: comb.used[i] ? null : reason,
      note: comb.used[i] ? '' : note,
    };
  });
  let calibration = 0;
  if (options.calibration && comb.used.some(Boolean)) {
    let sw = 0, swc = 0;
    finalRows.forEach((r, i) => {
      if (!comb.used[i] || !r.velocityKmPerS) return;
      const w = 1 / r.velocityKmPerS.uncertainty ** 2;
      sw += w;
      swc += w * calibrationVelocityErrorKmPerS(options.calibration!, candidates[i].expected);
    });
    calibration = swc / sw;
  }
  const used = comb.used.filter(Boolean).length;
  const scaling = options.combination?.chiSquareScaling ?? 'when-significant';
  const statistical = comb.statisticalUncertainty * comb.uncertaintyScale;
  return {
    method: 'lines',
    converged: used > 0,
    message: used > 0 ? `${used} line${used === 1 ? '' : 's'} used` : `no line could be used (${reasonCounts(finalRows)})`,
    velocity: { value: comb.value, uncertainty: used > 0 ? Math.hypot(statistical, calibration) : NaN },
    statisticalUncertaintyKmPerS: comb.statisticalUncertainty,
    uncertaintyScale: comb.uncertaintyScale,
    calibrationUncertaintyKmPerS: calibration,
    chiSquare: comb.chiSquare,
    degreesOfFreedom: comb.degreesOfFreedom,
    reducedChiSquare: comb.reducedChiSquare,
    linesUsed: used,
    linesRejected: finalRows.length - used,
    combination: `weighted mean (1/σ²), leave-one-out rejection beyond ${options.combination?.clipThreshold ?? 3} × max(1, robust scale) of the normalised residuals, error scaled by √(χ²/ν) ${scaling === 'when-significant' ? 'when χ² exceeds its 99th percentile' : scaling === 'always' ? 'when χ²/ν > 1' : 'never'}`,
    chiSquareScaling: scaling,
    approximateVelocityKmPerS: approximate,
    approximateVelocitySource: approximateSource,
    resolvingPower: R,
    commonResolvingPower: useCommon ? commonR : null,
    formula,
    profile,
    medium,
    lines: finalRows,
    provenance: Object.freeze([
      ...spectrum.provenance,
      provenanceEntry('line-velocities', {
        species: list.species, lines: candidates.length, approximateVelocityKmPerS: approximate, approximateVelocitySource: approximateSource,
        resolvingPower: R, profile, formula, blendSeparation: blendSep, maskHalfWidth: maskHalf, minimumSignificance: minSig,
        matchToleranceKmPerS: tolerance, chiSquareScaling: scaling, ...(options.calibration ? { calibration: options.calibration } : {}),
      }),
    ]),
  };
}

/** Lines narrower than this many λ/R share the common width (others, like Balmer lines, keep their own). */
const NARROW_LINE_LIMIT = 2;
/** Fewest narrow lines from which a common width is taken. */
const MIN_LINES_FOR_COMMON_WIDTH = 3;
/** Neighbours more than this many times broader than a line are treated as continuum, not masked. */
const BROAD_NEIGHBOUR_RATIO = 3;
/** Second-pass fitting window: ± this many measured FWHM. */
const WINDOW_HALF_WIDTH_FWHM = 3;

/** "3 not-detected, 1 outside-spectrum": why the lines were not used, most common first. */
function reasonCounts(rows: readonly LineVelocityRow[]): string {
  const counts = new Map<string, number>();
  for (const r of rows) counts.set(r.reason ?? 'unused', (counts.get(r.reason ?? 'unused') ?? 0) + 1);
  if (counts.size === 0) return 'no line of the list in range';
  return [...counts].sort((a, b) => b[1] - a[1]).map(([k, n]) => `${n} ${k}`).join(', ');
}

function lowerBound(a: Float64Array, v: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) { const m = (lo + hi) >> 1; if (a[m] < v) lo = m + 1; else hi = m; }
  return lo;
}

function medianOf(a: number[]): number {
  const v = a.slice().sort((x, y) => x - y);
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/**
 * The velocity of the most prominent feature near any selected line: on the
 * (continuum-normalised) spectrum, smoothed over one resolution element, the lowest point
 * (highest for emission) within the velocity range of each line; the line with the deepest
 * one gives the velocity, refined by a parabola through the three points around it.
 */
function strongestLineVelocity(s: Spectrum, entries: readonly LineEntry[], R: number, range: VelocityRange, kind: 'absorption' | 'emission', formula: DopplerFormula): number {
  const wl = s.wavelength;
  const n = wl.length;
  const norm = new Float64Array(n);
  for (let i = 0; i < n; i++) norm[i] = isUsablePixel(s, i) ? s.flux[i] : NaN;
  const sign = kind === 'absorption' ? -1 : 1;
  let best = { score: -Infinity, lambda: NaN, rest: NaN };
  for (const e of entries) {
    const lo = shiftWavelength(e.wavelengthAngstrom, range.min, { formula });
    const hi = shiftWavelength(e.wavelengthAngstrom, range.max, { formula });
    const i0 = lowerBound(wl, lo);
    const i1 = lowerBound(wl, hi);
    for (let i = Math.max(1, i0); i < Math.min(n - 1, i1); i++) {
      const half = e.wavelengthAngstrom / R / 2;
      let sum = 0, count = 0;
      for (let j = i; j >= 0 && wl[i] - wl[j] <= half; j--) if (Number.isFinite(norm[j])) { sum += norm[j]; count++; }
      for (let j = i + 1; j < n && wl[j] - wl[i] <= half; j++) if (Number.isFinite(norm[j])) { sum += norm[j]; count++; }
      if (count === 0) continue;
      const score = sign * (sum / count - 1);
      if (score > best.score) best = { score, lambda: wl[i], rest: e.wavelengthAngstrom };
    }
  }
  if (!Number.isFinite(best.lambda)) return 0;
  return dopplerVelocityKmPerS(best.lambda, best.rest, { formula });
}
