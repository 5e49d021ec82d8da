/**
 * Element identification of a whole spectrum: find the lines, fit them, and identify them
 * with the shipped line lists (or the caller's).
 */
import { InputError, isLineshiftError } from '../errors.js';
import { silentLogger } from '../logger.js';
import { fitWindow } from '../fit/line-fit.js';
import type { LineProfile } from '../fit/profiles.js';
import { findLines } from '../lines/find.js';
import { availableSpecies, loadLineList } from '../lines/linelist.js';
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import { angstromPerUnit } from '../spectrum/units.js';
import { identifyLines, type IdentificationResult, type IdentifyOptions } from './identify.js';
import { mediumAssumedMessage, notCalibratedMessage, notFittedMessage } from './messages.js';
import { isAtomicSpecies, selectSpecies } from './species.js';
import { telluricBandsFromLines } from './telluric.js';
import type { LineKind, ObservedLine, ReferenceLine, WavelengthInterval } from './types.js';

/** A found and measured line, as used for the identification. */
export interface MeasuredLine extends ObservedLine {
  /** Line FWHM in Å (fitted, or the finder's estimate). */
  readonly fwhmAngstrom: number;
  /** Depth (absorption) or height (emission) in units of the continuum; NaN where the continuum is ≤ 0. */
  readonly strength: number;
  /** Equivalent width in Å (positive for absorption), NaN when not fitted. */
  readonly equivalentWidthAngstrom: number;
  /** Detection significance (matched filter), σ. */
  readonly significance: number;
  /** True when the centre and uncertainty come from a converged profile fit; false when from the finder. */
  readonly fitted: boolean;
}

/** Options of {@link identifySpectrum}. */
export interface IdentifySpectrumOptions extends Omit<IdentifyOptions, 'coverage' | 'medium' | 'telluricBands'> {
  /** Finder threshold in σ (default: the finder's, 5). */
  readonly significance?: number;
  /** Profile fitted to each window. Default `gaussian`. */
  readonly profile?: LineProfile;
  /** Fit the found lines (default true); false uses the finder's centres and widths (faster, cruder). */
  readonly fit?: boolean;
  /** Spectra to consider, as typed by a user: elements (`Fe`), spectra (`Fe II`). Default every shipped atomic list. */
  readonly species?: readonly string[];
  /** List lines to use instead of the shipped lists (then `species` filters these). */
  readonly reference?: readonly ReferenceLine[];
  /** Telluric bands: `auto` (default) applies the shipped O2 and H2O bands when most found lines are absorption lines; `on`; `off`. */
  readonly telluric?: 'auto' | 'on' | 'off';
}

/** Result of {@link identifySpectrum}. */
export interface SpectrumIdentification extends IdentificationResult {
  /** The found lines in wavelength order (the `index` of each identification points here). */
  readonly found: readonly MeasuredLine[];
  /** Spectra whose lists were used. */
  readonly speciesConsidered: readonly string[];
  /** Whether telluric bands were applied. */
  readonly telluricApplied: boolean;
}

/** Rough 1-σ centre uncertainty of an unfitted detection: 0.6·FWHM/S (common practice for a Gaussian line of matched-filter significance S). */
const DETECTION_CENTRE_FACTOR = 0.6;
/** Windows with more lines than this are not fitted (the fitter's own limit is 20 components; big blends are slow and poorly constrained). */
const MAX_FIT_COMPONENTS = 12;

/**
 * The covered wavelength ranges of a spectrum: runs of usable pixels, each widened by half a
 * pixel on both sides, in Å.
 *
 * @param spectrum a wavelength-calibrated spectrum.
 * @returns intervals in increasing order (empty when no pixel is usable).
 * @throws {UsageError} `units.pixel` for a spectrum without a wavelength scale.
 * @example usableCoverage(createSpectrum({ wavelength: [5000, 5001, 5002, 5003], flux: [1, NaN, 1, 1] }));
 * // [{ startAngstrom: 4999.5, endAngstrom: 5000.5 }, { startAngstrom: 5001.5, endAngstrom: 5003.5 }]
 */
export function usableCoverage(spectrum: Spectrum): WavelengthInterval[] {
  const scale = angstromPerUnit(spectrum.unit);
  const w = spectrum.wavelength;
  const n = w.length;
  const out: WavelengthInterval[] = [];
  let start = -1;
  const half = (i: number) => 0.5 * Math.abs(i + 1 < n ? w[i + 1] - w[i] : w[i] - w[i - 1]) * scale;
  for (let i = 0; i <= n; i++) {
    const ok = i < n && isUsablePixel(spectrum, i);
    if (ok && start < 0) start = i;
    if (!ok && start >= 0) {
      const a = Math.min(w[start], w[i - 1]) * scale;
      const b = Math.max(w[start], w[i - 1]) * scale;
      out.push({ startAngstrom: a - (n > 1 ? half(start) : 0.5), endAngstrom: b + (n > 1 ? half(i - 1) : 0.5) });
      start = -1;
    }
  }
  return out.sort((x, y) => x.startAngstrom - y.startAngstrom);
}

/**
 * Finds, fits and identifies the lines of a calibrated spectrum.
 *
 * Method: `findLines` (matched filter, threshold `significance`), `fitWindow` on each window of
 * at most 12 lines (profile `profile`; a component's centre ± 1 σ comes from the fit when it
 * converged with σ below half the fitted FWHM and a FWHM within a factor 4 of the finder's,
 * otherwise from the detection with σ ≈ 0.6·FWHM/S, common practice; a warning counts such
 * lines), then {@link identifyLines} with the spectrum's
 * medium (air assumed, with a warning, when the spectrum does not say), its usable range as
 * coverage (gaps and masked pixels excluded) and, for absorption spectra, the shipped telluric
 * bands.
 *
 * @param spectrum a wavelength-calibrated spectrum (Å, nm or µm).
 * @param options finder threshold, profile, species, velocity, resolving power and the other
 *   {@link IdentifyOptions}.
 * @returns the identification with the measured lines.
 * @throws {InputError} `elements.not-calibrated` for a spectrum without a wavelength scale.
 * @throws {UsageError} for bad options or unknown species (see {@link identifyLines}, {@link selectSpecies}).
 * @example
 * const r = identifySpectrum(spectrum, { species: ['H', 'Na'], resolvingPower: 2000 });
 * r.elements.map((e) => `${e.species}: ${e.verdict}`);
 */
export function identifySpectrum(spectrum: Spectrum, options: IdentifySpectrumOptions = {}): SpectrumIdentification {
  if (spectrum.unit === 'pixel') {
    throw new InputError('elements.not-calibrated', notCalibratedMessage(), spectrum.source ? { file: spectrum.source.file } : {});
  }
  const logger = options.logger ?? silentLogger;
  const found = findLines(spectrum, options.significance !== undefined ? { significance: options.significance } : {});
  const measured: MeasuredLine[] = [];
  let notFitted = 0;
  for (const win of found.windows) {
    let fit: ReturnType<typeof fitWindow> | null = null;
    if ((options.fit ?? true) && win.lines.length <= MAX_FIT_COMPONENTS) {
      try {
        fit = fitWindow(spectrum, win, { profile: options.profile ?? 'gaussian' });
      } catch (e) {
        if (!isLineshiftError(e)) throw e;
      }
    }
    const useFit = fit !== null && fit.converged && fit.components.length === win.lines.length;
    win.lines.forEach((d, k) => {
      const c = useFit && fit ? fit.components[k] : undefined;
      // a fitted component is used when its centre is determined (σ below half its FWHM) and its
      // width agrees with the finder's within a factor 4; otherwise the detection stands
      const ok =
        c !== undefined &&
        Number.isFinite(c.center.uncertainty) && c.center.uncertainty > 0 &&
        Number.isFinite(c.fwhm.value) && c.fwhm.value > 0 &&
        c.center.uncertainty < 0.5 * c.fwhm.value &&
        c.fwhm.value < 4 * d.fwhm && c.fwhm.value > d.fwhm / 4;
      const kind: LineKind = ok ? (c.amplitude.value < 0 ? 'absorption' : 'emission') : d.sign;
      measured.push(
        Object.freeze({
          wavelengthAngstrom: ok ? c.center.value : d.center,
          wavelengthUncertaintyAngstrom: ok ? c.center.uncertainty : (DETECTION_CENTRE_FACTOR * d.fwhm) / Math.max(d.significance, 1),
          kind,
          fwhmAngstrom: ok ? c.fwhm.value : d.fwhm,
          strength: ok ? Math.abs(c.depth.value) : NaN,
          ...(ok && kind === 'absorption' && Number.isFinite(c.depth.value) ? { depth: c.depth.value } : {}),
          equivalentWidthAngstrom: ok ? c.equivalentWidth.value : NaN,
          significance: d.significance,
          fitted: ok,
        }),
      );
      if (!ok) notFitted++;
    });
  }
  measured.sort((a, b) => a.wavelengthAngstrom - b.wavelengthAngstrom);
  if (notFitted > 0 && (options.fit ?? true)) {
    logger.warn({ code: 'elements.not-fitted', message: notFittedMessage(notFitted, measured.length) });
  }

  let medium = spectrum.medium;
  if (medium === null) {
    logger.warn({ code: 'elements.medium-assumed', message: mediumAssumedMessage() });
    medium = 'air';
  }
  const atomicShipped = availableSpecies().filter(isAtomicSpecies);
  let reference: readonly ReferenceLine[];
  let considered: string[];
  if (options.reference) {
    const names = [...new Set(options.reference.map((r) => r.species))];
    considered = options.species ? selectSpecies(names, options.species) : names;
    const keep = new Set(considered);
    reference = options.reference.filter((r) => keep.has(r.species));
  } else {
    considered = options.species ? selectSpecies(atomicShipped, options.species) : atomicShipped;
    reference = considered.length ? loadLineList(considered).entries : [];
  }
  const absorption = measured.filter((m) => m.kind === 'absorption').length;
  const telluricApplied = options.telluric === 'on' || ((options.telluric ?? 'auto') === 'auto' && measured.length > 0 && absorption >= measured.length - absorption);
  const bands = telluricApplied
    ? telluricBandsFromLines(loadLineList(availableSpecies().filter((s) => /telluric/i.test(s))).entries)
    : [];
  const { significance, profile, species, telluric, reference: _r, fit: _f, ...identifyOptions } = options;
  void significance; void profile; void species; void telluric; void _r; void _f;
  const result = identifyLines(measured, reference, {
    ...identifyOptions,
    medium,
    coverage: usableCoverage(spectrum),
    telluricBands: bands,
    logger,
  });
  return Object.freeze({ ...result, found: Object.freeze(measured), speciesConsidered: Object.freeze(considered), telluricApplied });
}
