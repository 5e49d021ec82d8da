/**
 * Line identification and the evidence for each species: which elements are present.
 *
 * Every found line is compared with the line lists (shifted by the object's velocity) within a
 * tolerance set by the centre uncertainty, the calibration RMS and the resolving power. Each
 * species then gets a likelihood-ratio statistic over its expected strong lines (matches raise
 * it, missing lines lower it), the probability that chance coincidences with the found lines
 * would do as well, and a verdict. See DEVELOPERS.md, "Element identification".
 */
import { UsageError } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import { airToVacuum, vacuumToAir } from '../spectrum/air-vacuum.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { buildFeatures, isSummaryRow, type Feature, type PlacedLine } from './features.js';
import {
  badCoverageMessage,
  badKindMessage,
  badObservedLineMessage,
  badReferenceLineMessage,
  noResolutionMessage,
  notFiniteMessage,
  notPositiveMessage,
  resolutionEstimatedMessage,
  shiftTestSkippedMessage,
  velocityOffsetMessage,
  velocityTooLargeMessage,
  verdictReasonMessage,
} from './messages.js';
import { elementOfSpecies, isAtomicSpecies } from './species.js';
import { bernoulliSumUpperTail, sigmaFromTailProbability } from './statistics.js';
import { telluricBandAt, type TelluricBand } from './telluric.js';
import type {
  EvidenceThresholds,
  LineCandidate,
  LineIdentification,
  LineKind,
  MatchedFeature,
  ObservedLine,
  ReferenceLine,
  SpeciesEvidence,
  Verdict,
  VerdictReason,
  WavelengthInterval,
} from './types.js';

/** Speed of light in vacuum, km/s: exact by the SI definition of the metre (same value as the velocity area's constant). */
const SPEED_OF_LIGHT_KM_PER_S = 299_792.458;

/** Default verdict thresholds (reasons in DEVELOPERS.md, "Element identification"). */
export const DEFAULT_EVIDENCE_THRESHOLDS: EvidenceThresholds = Object.freeze({
  presentFalseAlarm: 0.01,
  presentLogLikelihoodRatio: Math.log(20),
  presentMinLines: 2,
  presentShiftFalseAlarm: 0.05,
  possibleFalseAlarm: 0.05,
});

/** Defaults of {@link IdentifyOptions}, each written once. */
export const IDENTIFY_DEFAULTS = Object.freeze({
  /** k: the tolerance is k times the combined 1-σ scale. */
  toleranceSigmas: 3,
  /**
   * c: an unresolved neighbour can move a centre by about c·λ/R (1 σ). 0.15 makes the default
   * 3-σ window ±0.45 of a resolution element: lines closer than about 0.7 λ/R merge, moving the
   * centroid by up to a third of a resolution element. Chosen on the simulations in
   * test/elements (0.25 lost recall at R ≤ 2000 with no gain in precision).
   */
  blendFraction: 0.15,
  /** Number of offsets in the shift test (0 switches it off). */
  shiftTrials: 200,
  /** Half-width of the window for the local density of found lines, Å. */
  densityWindowAngstrom: 200,
  /** A list line is expected when its intensity is at least this fraction of the species' strongest visible line. */
  expectedFraction: 0.1,
  /** At most this many expected lines per species (the strongest). */
  maxExpected: 20,
  /**
   * A found line at least this many resolution elements (λ/R) wide (Ca II H and K, Balmer lines)
   * hides the list lines inside its core (within half its FWHM, beyond their own tolerance):
   * they are neither found nor missing. Chosen on simulated spectra (8 seeds × 4 scenarios at
   * S/N 50, seeds apart from the tests'): recall of `present` at R = 2000 went from 0.78 to
   * 0.82 with 2.5 or 3, at R = 500 from 0.29 to 0.31 with 2.5 (0.30 with 3, 0.33 with 2, which
   * lost "present or possible" recall at R = 2000); precision stayed 1.00.
   */
  broadLineResolutionElements: 2.5,
  /** Chance of finding the strongest expected line when the species is present. */
  detectStrongest: 0.95,
  /** Chance of finding an expected line at the intensity limit when the species is present. */
  detectWeakest: 0.6,
  /** Chance of finding a line of a list without usable intensities when the species is present. */
  detectUnranked: 0.6,
  /**
   * A weak telluric band (its list note says weak: scattered water lines of a few per cent,
   * from memory) cannot make an absorption line deeper than this fraction of the continuum.
   */
  weakTelluricMaxDepth: 0.1,
  /**
   * Telluric lines are far narrower than amateur resolution (pressure-broadened water and
   * oxygen lines, ~0.05–0.1 Å, from memory), so one appears at the instrumental width λ/R: a
   * line in a weak band broader than this many λ/R (two blended lines and fit scatter) and
   * narrower than half the band is not the band's.
   */
  telluricMaxWidthResolutionElements: 2.5,
  /** A telluric candidate's raw score is at most this fraction of the best candidate of a present or possible species. */
  telluricShareBelowAtomic: 0.5,
});

/** Options of {@link identifyLines}. */
export interface IdentifyOptions {
  /** λ/Δλ (FWHM) of the spectrum. Default: median λ/FWHM of the found lines that have a FWHM (a warning says so). */
  readonly resolvingPower?: number;
  /** Radial velocity of the object, km/s, positive receding (relativistic Doppler shift of the lists). Default 0. */
  readonly velocityKmPerS?: number;
  /** 1-σ uncertainty of that velocity, km/s. Default 0. */
  readonly velocityUncertaintyKmPerS?: number;
  /** RMS of the wavelength calibration, Å. Default 0. */
  readonly calibrationRmsAngstrom?: number;
  /** Medium of the found wavelengths; lists are converted to it. Default `air`. */
  readonly medium?: 'air' | 'vacuum';
  /** Wavelength ranges the spectrum covers, without gaps or masked parts, in the spectrum's frame. Default: the found lines' range widened by one resolution element. */
  readonly coverage?: readonly WavelengthInterval[];
  /** Telluric bands (observer's frame): found absorption lines inside get a telluric candidate, and list lines inside strong bands are left out of the evidence. Default none (lamps, nebulae). */
  readonly telluricBands?: readonly TelluricBand[];
  /** Velocity of the telluric frame relative to the spectrum's frame, km/s (e.g. minus the barycentric correction for a corrected spectrum). Default 0. */
  readonly telluricVelocityKmPerS?: number;
  /** k of the tolerance k·σ. */
  readonly toleranceSigmas?: number;
  /** c of the blend term c·λ/R. */
  readonly blendFraction?: number;
  /** Offsets of the shift test; 0 to skip it. */
  readonly shiftTrials?: number;
  /** Verdict thresholds; missing fields take {@link DEFAULT_EVIDENCE_THRESHOLDS}. */
  readonly thresholds?: Partial<EvidenceThresholds>;
  /** Receives warnings (estimated resolving power, skipped shift test). */
  readonly logger?: Logger;
}

/** Result of {@link identifyLines}. */
export interface IdentificationResult {
  /** One entry per found line, in input order. */
  readonly lines: readonly LineIdentification[];
  /** One entry per species with at least one list line in range, most certain first. */
  readonly elements: readonly SpeciesEvidence[];
  /** Resolving power used. */
  readonly resolvingPower: number;
  /** `given`, or `line widths` when estimated. */
  readonly resolvingPowerSource: 'given' | 'line widths';
  /** Velocity applied to the lists, km/s. */
  readonly velocityKmPerS: number;
  /** Medium of the found wavelengths. */
  readonly medium: 'air' | 'vacuum';
  /** Coverage used. */
  readonly coverage: readonly WavelengthInterval[];
  /** Species with at least one expected line (the Bonferroni factor). */
  readonly speciesTested: number;
  /** Offsets actually used in the shift test (0 when skipped). */
  readonly shiftTrials: number;
  /** Thresholds used. */
  readonly thresholds: EvidenceThresholds;
  /**
   * How far the found lines sit, on average, from their identifications, as a velocity on top
   * of `velocityKmPerS`: see {@link residualVelocity}. Null with fewer than 3 usable lines.
   */
  readonly residualVelocity: ResidualVelocity | null;
  /** How the result was made. */
  readonly provenance: ProvenanceEntry;
}

/** The found lines' mean offset from their identifications, as a velocity (km/s). */
export interface ResidualVelocity {
  /** Weighted mean of c·Δλ/λ, km/s (positive: the lines sit redward of where the lists were placed). */
  readonly valueKmPerS: number;
  /** Its standard error, km/s (scaled up by √(χ²/ν) when the lines scatter more than their σ). */
  readonly uncertaintyKmPerS: number;
  /** Lines used. */
  readonly lines: number;
}

/** Fewest lines for {@link residualVelocity}. */
const RESIDUAL_VELOCITY_MIN_LINES = 3;

/**
 * {@link identifyLines} warns when the residual velocity exceeds 3 of its σ and this fraction of
 * c/R: then it eats a good part of the match tolerance (±0.45 λ/R by default).
 */
const RESIDUAL_VELOCITY_WARN_FRACTION = 0.2;

/**
 * The found lines' mean offset from their identifications: over lines whose best candidate is
 * a single list line of a species called present, the weighted mean of c·Δλ/λ (weights from
 * each match's σ, its tolerance over k, which includes the blend term), with its standard
 * error, scaled up by √(χ²/ν) when χ²/ν > 1. A value several times its error says that the
 * velocity given to place the lists (0 when none) is off by about that much.
 */
function residualVelocity(lines: readonly LineIdentification[], k: number): ResidualVelocity | null {
  let sw = 0, swx = 0, n = 0;
  const xs: { x: number; w: number }[] = [];
  for (const l of lines) {
    const c = l.candidates[0];
    if (!c || c.telluric || c.verdict !== 'present' || c.components !== 1) continue;
    const x = (SPEED_OF_LIGHT_KM_PER_S * c.deltaAngstrom) / c.expectedWavelengthAngstrom;
    const sigma = (SPEED_OF_LIGHT_KM_PER_S * (l.toleranceAngstrom / k)) / c.expectedWavelengthAngstrom;
    const w = 1 / (sigma * sigma);
    xs.push({ x, w });
    sw += w;
    swx += w * x;
    n++;
  }
  if (n < RESIDUAL_VELOCITY_MIN_LINES) return null;
  const mean = swx / sw;
  const chi2 = xs.reduce((acc, { x, w }) => acc + w * (x - mean) ** 2, 0);
  const scale = Math.max(1, Math.sqrt(chi2 / (n - 1)));
  return Object.freeze({ valueKmPerS: mean, uncertaintyKmPerS: scale / Math.sqrt(sw), lines: n });
}

/** Inputs of {@link matchToleranceAngstrom}. */
export interface ToleranceInputs {
  /** Wavelength of the line, Å. */
  readonly wavelengthAngstrom: number;
  /** 1-σ uncertainty of the found centre, Å. */
  readonly centreUncertaintyAngstrom: number;
  /** Calibration RMS, Å. */
  readonly calibrationRmsAngstrom: number;
  /** λ/Δλ. */
  readonly resolvingPower: number;
  /** Spread of blended list lines (weighted standard deviation), Å. */
  readonly blendSpreadAngstrom?: number;
  /** 1-σ velocity uncertainty, km/s. */
  readonly velocityUncertaintyKmPerS?: number;
  /** k (default {@link IDENTIFY_DEFAULTS}.toleranceSigmas). */
  readonly toleranceSigmas?: number;
  /** c (default {@link IDENTIFY_DEFAULTS}.blendFraction). */
  readonly blendFraction?: number;
}

/**
 * The match tolerance between a found line and a list line:
 * τ = k·σ, σ² = σ_centre² + rms² + (c·λ/R)² + s_blend² + (λ·σ_v/c_light)².
 * σ_centre is the fitted centre's uncertainty, rms the calibration RMS, c·λ/R how far an
 * unresolved neighbour can pull a centre (c = 0.15 of a resolution element by default), s_blend the spread of list lines merged into one feature, σ_v the velocity
 * uncertainty.
 *
 * @param t the terms; wavelengths in Å, R > 0.
 * @returns `sigmaAngstrom` (σ) and `toleranceAngstrom` (k·σ).
 * @example
 * matchToleranceAngstrom({ wavelengthAngstrom: 5000, centreUncertaintyAngstrom: 0, calibrationRmsAngstrom: 0, resolvingPower: 1000 });
 * // { sigmaAngstrom: 0.75, toleranceAngstrom: 2.25 }
 */
export function matchToleranceAngstrom(t: ToleranceInputs): { sigmaAngstrom: number; toleranceAngstrom: number } {
  const k = t.toleranceSigmas ?? IDENTIFY_DEFAULTS.toleranceSigmas;
  const c = t.blendFraction ?? IDENTIFY_DEFAULTS.blendFraction;
  const res = (c * t.wavelengthAngstrom) / t.resolvingPower;
  const vel = (t.wavelengthAngstrom * (t.velocityUncertaintyKmPerS ?? 0)) / SPEED_OF_LIGHT_KM_PER_S;
  const s = t.blendSpreadAngstrom ?? 0;
  const sigma = Math.sqrt(t.centreUncertaintyAngstrom ** 2 + t.calibrationRmsAngstrom ** 2 + res * res + s * s + vel * vel);
  return { sigmaAngstrom: sigma, toleranceAngstrom: k * sigma };
}

// ---------------------------------------------------------------- internal structures

interface SortedLines {
  /** found wavelengths, ascending */
  readonly w: Float64Array;
  /** their centre uncertainties */
  readonly s: Float64Array;
  /** their input indices */
  readonly idx: Int32Array;
  /** largest centre uncertainty */
  readonly sMax: number;
}

interface SpeciesWork {
  readonly species: string;
  readonly features: Feature[];
  readonly ranked: boolean;
  /** expected features (strongest first) */
  readonly expected: Feature[];
  readonly q: number[];
  readonly p: number[];
  /** weights of a match over a miss: ln(q/p) − ln((1−q)/(1−p)) */
  readonly gain: number[];
  /** miss terms ln((1−q)/(1−p)), per expected feature */
  readonly miss: number[];
  /** their sum */
  readonly missSum: number;
  readonly wMax: number | null;
}

function lowerBound(a: Float64Array, x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function sortLines(entries: { w: number; s: number; i: number }[]): SortedLines {
  entries.sort((a, b) => a.w - b.w);
  const w = new Float64Array(entries.length);
  const s = new Float64Array(entries.length);
  const idx = new Int32Array(entries.length);
  let sMax = 0;
  entries.forEach((e, k) => {
    w[k] = e.w;
    s[k] = e.s;
    idx[k] = e.i;
    if (e.s > sMax) sMax = e.s;
  });
  return { w, s, idx, sMax };
}

function positiveOption(name: string, v: number | undefined, dflt: number, allowZero = false): number {
  if (v === undefined) return dflt;
  if (!Number.isFinite(v) || v < 0 || (!allowZero && v === 0)) {
    throw new UsageError('elements.bad-option', notPositiveMessage(name, v), { keyword: name });
  }
  return v;
}

function mergeIntervals(list: readonly WavelengthInterval[]): WavelengthInterval[] {
  const sorted = [...list].sort((a, b) => a.startAngstrom - b.startAngstrom);
  const out: { startAngstrom: number; endAngstrom: number }[] = [];
  for (const iv of sorted) {
    const last = out[out.length - 1];
    if (last && iv.startAngstrom <= last.endAngstrom) last.endAngstrom = Math.max(last.endAngstrom, iv.endAngstrom);
    else out.push({ startAngstrom: iv.startAngstrom, endAngstrom: iv.endAngstrom });
  }
  return out.map((o) => Object.freeze(o));
}

function insideCoverage(cov: readonly WavelengthInterval[], x: number, margin: number): boolean {
  for (const iv of cov) if (x >= iv.startAngstrom + margin && x <= iv.endAngstrom - margin) return true;
  return false;
}

function coveredLength(cov: readonly WavelengthInterval[], a: number, b: number): number {
  let len = 0;
  for (const iv of cov) len += Math.max(0, Math.min(b, iv.endAngstrom) - Math.max(a, iv.startAngstrom));
  return len;
}

function median(values: number[]): number {
  const v = [...values].sort((a, b) => a - b);
  const n = v.length;
  return n % 2 ? v[(n - 1) / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

// ---------------------------------------------------------------- the main function

/**
 * Identifies found lines with list lines and weighs the evidence for each species.
 *
 * Method (details and thresholds in DEVELOPERS.md, "Element identification"):
 * 1. List lines are converted to the spectrum's medium (`airToVacuum`/`vacuumToAir`, Peck &
 *    Reeder 1972, the formula of the shipped lists), Doppler-shifted
 *    (relativistic) by `velocityKmPerS`, and merged per species into features where closer than
 *    λ/R. Multiplet-centroid summary rows are dropped (their components are listed).
 * 2. A found line matches a feature when |Δλ| ≤ τ ({@link matchToleranceAngstrom}). Forbidden
 *    lines match only emission lines. A found line whose centre uncertainty exceeds one
 *    resolution element λ/R is not used (`centreTooUncertain`).
 * 3. Expected lines of a species: visible features (inside the coverage, one resolution element
 *    from its edges, outside strong telluric bands) with list intensity ≥ 10% of the species' strongest
 *    visible feature (at most 20, strongest first); when fewer than half the visible features have
 *    an intensity, every visible feature counts, equally.
 * 4. Evidence: Λ = Σ ln(q_j/p_j) over matched plus Σ ln((1−q_j)/(1−p_j)) over missing expected
 *    lines, where p_j = 1 − exp(−μ_j) is the chance that an unrelated found line falls within its
 *    tolerance (μ_j = Σ 2τ_i / covered length over the found lines of an allowed kind within
 *    ±200 Å, each with its own τ_i) and
 *    q_j the chance to find the line if the species is present (0.95 for the strongest, falling
 *    with √(intensity) to 0.6 at the 10% limit; 0.6 when unranked). A missing strong line costs
 *    up to ln(0.05) ≈ −3. The false-alarm probability is P(Λ ≥ Λ_obs) when each expected line is
 *    matched independently with probability p_j (exact up to a conservative grid). The shift
 *    test repeats Λ with the found lines circularly shifted along the coverage by offsets larger
 *    than the tolerance.
 * 5. Verdicts (defaults): `present` when at least 2 expected lines match, Λ ≥ ln 20, the
 *    Bonferroni-adjusted FAP ≤ 0.01, the shift-test FAP ≤ 0.05, and (for ranked lists) the
 *    strongest expected line is matched; `possible` when at least one matches, Λ > 0 and the
 *    unadjusted FAP ≤ 0.05; otherwise `not detected`. Each species lists the unmet conditions
 *    of the next better verdict (`reasons`, most basic first) and says them in words (`reason`).
 * 6. Candidates of each found line: the list features within its tolerance, scored by closeness,
 *    list intensity and the species' verdict; for an absorption line inside a telluric band
 *    also the band, when the line can be the band's (any line in a strong band; in a weak band
 *    one at most 10 % deep and unresolved or half the band wide), ranked below the best
 *    candidate of a present or possible species.
 *
 * Nothing here modifies its inputs.
 *
 * @param observed found lines (wavelength in Å in `options.medium`, 1-σ centre uncertainty, kind).
 * @param reference list lines of every species to consider (rest wavelengths; molecular and
 *   telluric lists are ignored here: pass bands through `options.telluricBands`).
 * @param options see {@link IdentifyOptions}.
 * @returns per-line candidates and per-species evidence.
 * @throws {UsageError} `elements.bad-line` for a found line with a non-finite or non-positive
 *   wavelength, a negative or non-finite uncertainty or an unknown kind (location: index);
 *   `elements.bad-reference` for a list line with an impossible wavelength;
 *   `elements.bad-option` for a non-positive resolving power, tolerance factor or trial count,
 *   a bad coverage interval or a velocity not below c; `elements.no-resolution` when R is
 *   neither given nor estimable.
 * @example
 * const lines = [6562.80, 4861.33, 4340.47].map((w) => ({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: 0.05, kind: 'absorption' as const }));
 * const list = [6562.795, 4861.325, 4340.463, 4101.735].map((w) => ({ wavelengthAngstrom: w, species: 'H I', relativeIntensity: null }));
 * identifyLines(lines, list, { resolvingPower: 5000, coverage: [{ startAngstrom: 4200, endAngstrom: 6700 }] }).elements[0].verdict; // 'present'
 */
export function identifyLines(
  observed: readonly ObservedLine[],
  reference: readonly ReferenceLine[],
  options: IdentifyOptions = {},
): IdentificationResult {
  const logger = options.logger ?? silentLogger;
  const k = positiveOption('toleranceSigmas', options.toleranceSigmas, IDENTIFY_DEFAULTS.toleranceSigmas);
  const blendFraction = positiveOption('blendFraction', options.blendFraction, IDENTIFY_DEFAULTS.blendFraction, true);
  const rms = positiveOption('calibrationRmsAngstrom', options.calibrationRmsAngstrom, 0, true);
  const sigmaV = positiveOption('velocityUncertaintyKmPerS', options.velocityUncertaintyKmPerS, 0, true);
  const trialsWanted = Math.floor(positiveOption('shiftTrials', options.shiftTrials, IDENTIFY_DEFAULTS.shiftTrials, true));
  const medium = options.medium ?? 'air';
  const thresholds: EvidenceThresholds = Object.freeze({ ...DEFAULT_EVIDENCE_THRESHOLDS, ...(options.thresholds ?? {}) });
  const v = options.velocityKmPerS ?? 0;
  if (!Number.isFinite(v)) throw new UsageError('elements.bad-option', notFiniteMessage('velocityKmPerS', v), { keyword: 'velocityKmPerS' });
  if (Math.abs(v) >= SPEED_OF_LIGHT_KM_PER_S) throw new UsageError('elements.bad-option', velocityTooLargeMessage(v), { keyword: 'velocityKmPerS' });
  const vt = options.telluricVelocityKmPerS ?? 0;
  if (!Number.isFinite(vt) || Math.abs(vt) >= SPEED_OF_LIGHT_KM_PER_S) {
    throw new UsageError('elements.bad-option', velocityTooLargeMessage(vt), { keyword: 'telluricVelocityKmPerS' });
  }

  // ---- found lines
  observed.forEach((o, i) => {
    if (!(Number.isFinite(o.wavelengthAngstrom) && o.wavelengthAngstrom > 0)) {
      throw new UsageError('elements.bad-line', badObservedLineMessage('wavelength', o.wavelengthAngstrom), { index: i });
    }
    if (!(Number.isFinite(o.wavelengthUncertaintyAngstrom) && o.wavelengthUncertaintyAngstrom >= 0)) {
      throw new UsageError('elements.bad-line', badObservedLineMessage('wavelength uncertainty', o.wavelengthUncertaintyAngstrom), { index: i });
    }
    if (o.kind !== 'absorption' && o.kind !== 'emission') {
      throw new UsageError('elements.bad-line', badKindMessage(o.kind), { index: i });
    }
  });
  reference.forEach((r, i) => {
    if (!(Number.isFinite(r.wavelengthAngstrom) && r.wavelengthAngstrom > 0)) {
      throw new UsageError('elements.bad-reference', badReferenceLineMessage(r.wavelengthAngstrom), { index: i });
    }
  });

  // ---- resolving power
  let resolvingPower: number;
  let resolvingPowerSource: 'given' | 'line widths';
  if (options.resolvingPower !== undefined) {
    resolvingPower = positiveOption('resolvingPower', options.resolvingPower, 0);
    resolvingPowerSource = 'given';
  } else {
    const r = observed
      .filter((o) => o.fwhmAngstrom !== undefined && Number.isFinite(o.fwhmAngstrom) && o.fwhmAngstrom > 0)
      .map((o) => o.wavelengthAngstrom / (o.fwhmAngstrom as number));
    if (r.length === 0) throw new UsageError('elements.no-resolution', noResolutionMessage(), { keyword: 'resolvingPower' });
    resolvingPower = median(r);
    resolvingPowerSource = 'line widths';
    logger.warn({ code: 'elements.resolution-estimated', message: resolutionEstimatedMessage(resolvingPower, r.length) });
  }

  // ---- coverage
  let coverage: WavelengthInterval[];
  if (options.coverage !== undefined) {
    for (const iv of options.coverage) {
      if (!(Number.isFinite(iv.startAngstrom) && Number.isFinite(iv.endAngstrom) && iv.startAngstrom > 0 && iv.endAngstrom > iv.startAngstrom)) {
        throw new UsageError('elements.bad-option', badCoverageMessage(iv.startAngstrom, iv.endAngstrom), { keyword: 'coverage' });
      }
    }
    coverage = mergeIntervals(options.coverage);
  } else if (observed.length > 0) {
    let lo = Infinity;
    let hi = -Infinity;
    for (const o of observed) {
      lo = Math.min(lo, o.wavelengthAngstrom);
      hi = Math.max(hi, o.wavelengthAngstrom);
    }
    coverage = [Object.freeze({ startAngstrom: lo * (1 - 1 / resolvingPower), endAngstrom: hi * (1 + 1 / resolvingPower) })];
  } else {
    coverage = [];
  }
  const covMin = coverage.length ? coverage[0].startAngstrom : 0;
  const covMax = coverage.length ? coverage[coverage.length - 1].endAngstrom : 0;

  // ---- sorted found lines by kind
  // a line whose centre is known worse than one resolution element says nothing about identity
  const tooUncertain = (o: ObservedLine) => o.wavelengthUncertaintyAngstrom > o.wavelengthAngstrom / resolvingPower;
  const byKind: Record<LineKind, SortedLines> = {
    absorption: sortLines(observed.flatMap((o, i) => (o.kind === 'absorption' && !tooUncertain(o) ? [{ w: o.wavelengthAngstrom, s: o.wavelengthUncertaintyAngstrom, i }] : []))),
    emission: sortLines(observed.flatMap((o, i) => (o.kind === 'emission' && !tooUncertain(o) ? [{ w: o.wavelengthAngstrom, s: o.wavelengthUncertaintyAngstrom, i }] : []))),
  };
  const allSigmas = observed.filter((o) => !tooUncertain(o)).map((o) => o.wavelengthUncertaintyAngstrom);
  const typicalSigma = allSigmas.length ? median(allSigmas) : 0;

  const tol = (lambda: number, centreSigma: number, spread: number) =>
    matchToleranceAngstrom({
      wavelengthAngstrom: lambda,
      centreUncertaintyAngstrom: centreSigma,
      calibrationRmsAngstrom: rms,
      resolvingPower,
      blendSpreadAngstrom: spread,
      velocityUncertaintyKmPerS: sigmaV,
      toleranceSigmas: k,
      blendFraction,
    });

  // ---- place list lines and build features
  const beta = v / SPEED_OF_LIGHT_KM_PER_S;
  const doppler = Math.sqrt((1 + beta) / (1 - beta));
  const telluricFactor = Math.sqrt((1 + vt / SPEED_OF_LIGHT_KM_PER_S) / (1 - vt / SPEED_OF_LIGHT_KM_PER_S));
  const bands = options.telluricBands ?? [];
  const inBand = (lambdaSpectrumFrame: number) => telluricBandAt(bands, lambdaSpectrumFrame / telluricFactor);
  const strongBands = bands.filter((b) => b.strength === 'strong');
  const inStrongBand = (lambdaSpectrumFrame: number) => telluricBandAt(strongBands, lambdaSpectrumFrame / telluricFactor);

  const bySpecies = new Map<string, PlacedLine[]>();
  for (const line of reference) {
    if (!isAtomicSpecies(line.species) || isSummaryRow(line)) continue;
    const from = line.medium ?? 'air';
    const inMedium = from === medium ? line.wavelengthAngstrom : medium === 'vacuum' ? airToVacuum(line.wavelengthAngstrom) : vacuumToAir(line.wavelengthAngstrom);
    const placed: PlacedLine = { line, expectedAngstrom: inMedium * doppler };
    const list = bySpecies.get(line.species);
    if (list) list.push(placed);
    else bySpecies.set(line.species, [placed]);
  }

  const kindsOf = (f: Feature): readonly LineKind[] => (f.forbidden ? ['emission'] : ['absorption', 'emission']);

  /** best-matching found line of an allowed kind within tolerance, or null */
  const findMatch = (f: Feature, lines: Record<LineKind, SortedLines>): { index: number; w: number } | null => {
    let best: { index: number; w: number; z: number } | null = null;
    for (const kind of kindsOf(f)) {
      const sl = lines[kind];
      if (sl.w.length === 0) continue;
      const wide = tol(f.expectedAngstrom, sl.sMax, f.spreadAngstrom).toleranceAngstrom;
      for (let j = lowerBound(sl.w, f.expectedAngstrom - wide); j < sl.w.length && sl.w[j] <= f.expectedAngstrom + wide; j++) {
        const t = tol(f.expectedAngstrom, sl.s[j], f.spreadAngstrom).toleranceAngstrom;
        const z = Math.abs(sl.w[j] - f.expectedAngstrom) / t;
        if (z <= 1 && (best === null || z < best.z)) best = { index: sl.idx[j], w: sl.w[j], z };
      }
    }
    return best ? { index: best.index, w: best.w } : null;
  };

  /**
   * Expected number of unrelated found lines (of an allowed kind) within their own tolerance of
   * feature f, if they were spread uniformly over the covered part of the window λ_f ± W:
   * μ = (Σ_i 2τ_i + 2τ_typ/2) / covered length, τ_i with line i's own centre uncertainty (the
   * half-line term keeps μ > 0 where no line is near). The chance of a coincidence is 1 − e^(−μ).
   */
  const chanceOfCoincidence = (f: Feature): number => {
    const W = IDENTIFY_DEFAULTS.densityWindowAngstrom;
    const a = f.expectedAngstrom - W;
    const b = f.expectedAngstrom + W;
    let width = tol(f.expectedAngstrom, typicalSigma, f.spreadAngstrom).toleranceAngstrom; // the half line
    for (const kind of kindsOf(f)) {
      const sl = byKind[kind];
      for (let j = lowerBound(sl.w, a); j < sl.w.length && sl.w[j] < b; j++) {
        width += 2 * tol(f.expectedAngstrom, sl.s[j], f.spreadAngstrom).toleranceAngstrom;
      }
    }
    const len = Math.max(coveredLength(coverage, a, b), 1e-9);
    return 1 - Math.exp(-width / len);
  };

  // Found lines much broader than the resolution (Ca II H and K, Balmer lines at high
  // resolution): a list line inside the core of one cannot be seen on its own.
  const broad = observed.filter((o) => o.fwhmAngstrom !== undefined && Number.isFinite(o.fwhmAngstrom) && o.fwhmAngstrom >= IDENTIFY_DEFAULTS.broadLineResolutionElements * (o.wavelengthAngstrom / resolvingPower));
  /** True when f lies within half the FWHM of a broad found line that is not f itself (not within f's tolerance). */
  const hiddenInBroadLine = (f: Feature): boolean =>
    broad.some((o) => {
      const d = Math.abs(o.wavelengthAngstrom - f.expectedAngstrom);
      return d < 0.5 * (o.fwhmAngstrom as number) && d > tol(f.expectedAngstrom, o.wavelengthUncertaintyAngstrom, f.spreadAngstrom).toleranceAngstrom;
    });

  const work: SpeciesWork[] = [];
  for (const [species, placed] of bySpecies) {
    const features = buildFeatures(placed, resolvingPower);
    const visible = features.filter(
      (f) => insideCoverage(coverage, f.expectedAngstrom, f.expectedAngstrom / resolvingPower) && inStrongBand(f.expectedAngstrom) === null && !hiddenInBroadLine(f),
    );
    if (visible.length === 0 && !features.some((f) => f.expectedAngstrom >= covMin && f.expectedAngstrom <= covMax)) continue;
    const known = visible.filter((f) => f.weight !== null && f.weight > 0);
    const ranked = visible.length > 0 && known.length >= 0.5 * visible.length;
    let expected: Feature[];
    let wMax: number | null = null;
    const q: number[] = [];
    if (ranked) {
      wMax = Math.max(...known.map((f) => f.weight as number));
      expected = known
        .filter((f) => (f.weight as number) >= IDENTIFY_DEFAULTS.expectedFraction * (wMax as number))
        .sort((a, b) => (b.weight as number) - (a.weight as number) || a.expectedAngstrom - b.expectedAngstrom)
        .slice(0, IDENTIFY_DEFAULTS.maxExpected);
      for (const f of expected) {
        const r = Math.sqrt((f.weight as number) / (wMax as number));
        const r0 = Math.sqrt(IDENTIFY_DEFAULTS.expectedFraction);
        const frac = (r - r0) / (1 - r0);
        q.push(IDENTIFY_DEFAULTS.detectWeakest + (IDENTIFY_DEFAULTS.detectStrongest - IDENTIFY_DEFAULTS.detectWeakest) * Math.max(0, Math.min(1, frac)));
      }
    } else {
      expected = [...visible];
      for (let i = 0; i < expected.length; i++) q.push(IDENTIFY_DEFAULTS.detectUnranked);
    }
    const p: number[] = [];
    const gain: number[] = [];
    const missTerms: number[] = [];
    let missSum = 0;
    expected.forEach((f, j) => {
      const pj = Math.min(0.99, Math.max(1e-9, chanceOfCoincidence(f)));
      const qj = Math.max(q[j], Math.min(0.995, pj + 0.01));
      q[j] = qj;
      p.push(pj);
      const hit = Math.log(qj / pj);
      const miss = Math.log((1 - qj) / (1 - pj));
      gain.push(hit - miss);
      missTerms.push(miss);
      missSum += miss;
    });
    work.push({ species, features, ranked, expected, q, p, gain, miss: missTerms, missSum, wMax });
  }

  // ---- evidence on the real data
  const lambdaOf = (w: SpeciesWork, matchedFlags: boolean[]) =>
    w.missSum + w.gain.reduce((s, g, j) => s + (matchedFlags[j] ? g : 0), 0);

  const real = work.map((w) => {
    const matches = w.expected.map((f) => findMatch(f, byKind));
    const flags = matches.map((m) => m !== null);
    return { matches, flags, lambda: lambdaOf(w, flags) };
  });

  // ---- shift test
  const totalLength = coverage.reduce((s, iv) => s + (iv.endAngstrom - iv.startAngstrom), 0);
  let maxTol = 0;
  for (const w of work) for (const f of w.expected) maxTol = Math.max(maxTol, tol(f.expectedAngstrom, Math.max(byKind.absorption.sMax, byKind.emission.sMax), f.spreadAngstrom).toleranceAngstrom);
  const minOffset = Math.max(3 * maxTol, 0.01 * totalLength);
  let trials = trialsWanted;
  if (trials > 0 && (totalLength - 2 * minOffset <= 0 || work.every((w) => w.expected.length === 0))) {
    if (work.some((w) => w.expected.length > 0)) logger.warn({ code: 'elements.shift-test-skipped', message: shiftTestSkippedMessage(totalLength) });
    trials = 0;
  }
  const shiftExceed = new Int32Array(work.length);
  if (trials > 0) {
    const starts: number[] = [];
    let acc = 0;
    for (const iv of coverage) {
      starts.push(acc);
      acc += iv.endAngstrom - iv.startAngstrom;
    }
    const toU = (x: number): number | null => {
      for (let c = 0; c < coverage.length; c++) {
        const iv = coverage[c];
        if (x >= iv.startAngstrom && x <= iv.endAngstrom) return starts[c] + (x - iv.startAngstrom);
      }
      return null;
    };
    const fromU = (u: number): number => {
      for (let c = coverage.length - 1; c >= 0; c--) {
        if (u >= starts[c]) return coverage[c].startAngstrom + (u - starts[c]);
      }
      return coverage[0].startAngstrom;
    };
    const uOf: Record<LineKind, { u: number; s: number; i: number }[]> = { absorption: [], emission: [] };
    for (const kind of ['absorption', 'emission'] as const) {
      const sl = byKind[kind];
      for (let j = 0; j < sl.w.length; j++) {
        const u = toU(sl.w[j]);
        if (u !== null) uOf[kind].push({ u, s: sl.s[j], i: sl.idx[j] });
      }
    }
    for (let t = 0; t < trials; t++) {
      const offset = trials === 1 ? totalLength / 2 : minOffset + (t * (totalLength - 2 * minOffset)) / (trials - 1);
      const shifted: Record<LineKind, SortedLines> = {
        absorption: sortLines(uOf.absorption.map((e) => ({ w: fromU((e.u + offset) % totalLength), s: e.s, i: e.i }))),
        emission: sortLines(uOf.emission.map((e) => ({ w: fromU((e.u + offset) % totalLength), s: e.s, i: e.i }))),
      };
      work.forEach((w, si) => {
        if (w.expected.length === 0) return;
        const flags = w.expected.map((f) => findMatch(f, shifted) !== null);
        if (lambdaOf(w, flags) >= real[si].lambda - 1e-12) shiftExceed[si]++;
      });
    }
  }

  // ---- verdicts
  const speciesTested = work.filter((w) => w.expected.length > 0).length;
  const evidence = work.map((w, si) => {
    const r = real[si];
    const n = w.expected.length;
    const m = r.flags.filter(Boolean).length;
    const fap = n === 0 ? 1 : bernoulliSumUpperTail(w.gain, w.p, r.lambda - w.missSum - 1e-12);
    const adj = Math.min(1, fap * Math.max(1, speciesTested));
    const shiftFap = trials > 0 && n > 0 ? (1 + shiftExceed[si]) / (1 + trials) : null;
    const strongestMatched = w.ranked && n > 0 ? r.flags[0] : null;
    // the conditions of `present`, then of `possible`, most basic first
    const presentUnmet: VerdictReason[] = [];
    if (n < thresholds.presentMinLines) presentUnmet.push(n === 0 ? 'no-expected-lines' : 'too-few-expected-lines');
    else if (m < thresholds.presentMinLines) presentUnmet.push('too-few-matched-lines');
    if (strongestMatched === false) presentUnmet.push('strongest-line-missing');
    if (!(r.lambda >= thresholds.presentLogLikelihoodRatio)) presentUnmet.push('weak-evidence');
    if (!(adj <= thresholds.presentFalseAlarm)) presentUnmet.push('false-alarm-too-likely');
    if (shiftFap !== null && !(shiftFap <= thresholds.presentShiftFalseAlarm)) presentUnmet.push('shift-test-failed');
    const possibleUnmet: VerdictReason[] = [];
    if (n === 0) possibleUnmet.push('no-expected-lines');
    else if (m < 1) possibleUnmet.push('no-line-matched');
    if (n > 0 && !(r.lambda > 0)) possibleUnmet.push('weak-evidence');
    if (n > 0 && !(fap <= thresholds.possibleFalseAlarm)) possibleUnmet.push('false-alarm-too-likely');
    const verdict: Verdict = presentUnmet.length === 0 ? 'present' : possibleUnmet.length === 0 ? 'possible' : 'not detected';
    const reasons = verdict === 'present' ? [] : verdict === 'possible' ? presentUnmet : possibleUnmet;
    const matched: MatchedFeature[] = [];
    const missing: number[] = [];
    w.expected.forEach((f, j) => {
      const mt = r.matches[j];
      if (mt) {
        matched.push(Object.freeze({ restWavelengthAngstrom: f.restAngstrom, expectedWavelengthAngstrom: f.expectedAngstrom, foundWavelengthAngstrom: mt.w, index: mt.index }));
      } else {
        missing.push(f.expectedAngstrom);
      }
    });
    const expectedSet = new Set(w.expected);
    let other = 0;
    for (const f of w.features) {
      if (expectedSet.has(f) || !insideCoverage(coverage, f.expectedAngstrom, 0)) continue;
      if (findMatch(f, byKind)) other++;
    }
    const sig = sigmaFromTailProbability(adj);
    const evidence = {
      species: w.species,
      element: elementOfSpecies(w.species),
      verdict,
      linesExpected: n,
      linesMatched: m,
      missingWavelengthsAngstrom: Object.freeze(missing),
      strongestMatched,
      otherLinesMatched: other,
      rankedByIntensity: w.ranked,
      logLikelihoodRatio: r.lambda,
      falseAlarmProbability: fap,
      adjustedFalseAlarmProbability: adj,
      shiftFalseAlarmProbability: shiftFap,
      significanceSigma: Number.isFinite(sig) ? Math.max(0, sig) : sig > 0 ? Infinity : 0,
      matched: Object.freeze(matched),
      explainedBy: Object.freeze([]) as readonly string[],
      reasons: Object.freeze(reasons) as readonly VerdictReason[],
      reason: null as string | null,
    };
    evidence.reason = reasons.length ? reasons.map((x) => verdictReasonMessage(x, evidence, thresholds)).join('; ') : null;
    return evidence;
  });

  // ---- lines explained by a present species
  // A found line that an expected line of a species called present matches more closely (He
  // II 4859.3 on Hβ at low resolution) is no evidence for another species: for each `possible`
  // species, its expected features matched by such lines are set aside (neither found nor
  // missing) and the conditions of `possible` are checked again on the rest.
  // How far a match lies from its feature, in units of its tolerance (0 = on it, 1 = at the edge).
  const zOf = (f: Feature, mt: { index: number; w: number }) =>
    Math.abs(mt.w - f.expectedAngstrom) / tol(f.expectedAngstrom, observed[mt.index].wavelengthUncertaintyAngstrom, f.spreadAngstrom).toleranceAngstrom;
  const claimedBy = new Map<number, { species: string; z: number }[]>();
  evidence.forEach((e, si) => {
    if (e.verdict !== 'present') return;
    real[si].matches.forEach((mt, j) => {
      if (mt) claimedBy.set(mt.index, [...(claimedBy.get(mt.index) ?? []), { species: e.species, z: zOf(work[si].expected[j], mt) }]);
    });
  });
  evidence.forEach((e, si) => {
    if (e.verdict !== 'possible' || claimedBy.size === 0) return;
    const w = work[si];
    const r = real[si];
    const by = new Set<string>();
    const keep = w.expected.map((f, j) => {
      const mt = r.matches[j];
      if (!mt) return true;
      // only a present species whose own line lies closer to the found line explains it
      const z = zOf(f, mt);
      const owners = (claimedBy.get(mt.index) ?? []).filter((x) => x.species !== e.species && x.z < z);
      owners.forEach((x) => by.add(x.species));
      return owners.length === 0;
    });
    if (by.size === 0) return;
    const kept = <T>(a: readonly T[]) => a.filter((_, j) => keep[j]);
    const miss = kept(w.miss);
    const reduced: SpeciesWork = { ...w, expected: kept(w.expected), q: kept(w.q), p: kept(w.p), gain: kept(w.gain), miss, missSum: miss.reduce((acc, x) => acc + x, 0) };
    const flags = kept(r.flags);
    const matchedLeft = flags.filter(Boolean).length;
    const lambda = lambdaOf(reduced, flags);
    const fap = reduced.gain.length === 0 ? 1 : bernoulliSumUpperTail(reduced.gain, reduced.p, lambda - reduced.missSum - 1e-12);
    if (matchedLeft >= 1 && lambda > 0 && fap <= thresholds.possibleFalseAlarm) return;
    e.verdict = 'not detected';
    e.explainedBy = Object.freeze([...by].sort());
    e.reasons = Object.freeze(['explained-by-present-species'] as VerdictReason[]);
    e.reason = verdictReasonMessage('explained-by-present-species', e, thresholds);
  });
  const frozen: SpeciesEvidence[] = evidence.map((e) => Object.freeze(e));
  const rank: Record<Verdict, number> = { present: 0, possible: 1, 'not detected': 2 };
  frozen.sort(
    (a, b) =>
      rank[a.verdict] - rank[b.verdict] ||
      a.adjustedFalseAlarmProbability - b.adjustedFalseAlarmProbability ||
      b.logLikelihoodRatio - a.logLikelihoodRatio ||
      a.species.localeCompare(b.species),
  );
  const verdictOf = new Map(frozen.map((e) => [e.species, e.verdict] as const));
  const workOf = new Map(work.map((w) => [w.species, w] as const));

  // ---- candidates per found line
  const allFeatures: Feature[] = work.flatMap((w) => w.features).sort((a, b) => a.expectedAngstrom - b.expectedAngstrom);
  const featW = Float64Array.from(allFeatures.map((f) => f.expectedAngstrom));
  let maxSpread = 0;
  for (const f of allFeatures) maxSpread = Math.max(maxSpread, f.spreadAngstrom);
  const speciesFactor: Record<Verdict, number> = { present: 1, possible: 0.3, 'not detected': 0.05 };
  /**
   * Whether a found absorption line inside a band can be that band's: any line in a strong
   * band; in a weak band, a line no deeper than `weakTelluricMaxDepth` and either unresolved
   * (FWHM ≤ `telluricMaxWidthResolutionElements` · λ/R) or as wide as half the band or more
   * (the band seen whole at low resolution). Unknown depth or width does not count against it.
   */
  const telluricPlausible = (o: ObservedLine, band: TelluricBand): boolean => {
    if (band.strength === 'strong') return true;
    if (o.depth !== undefined && Number.isFinite(o.depth) && o.depth > IDENTIFY_DEFAULTS.weakTelluricMaxDepth) return false;
    const f = o.fwhmAngstrom;
    if (f === undefined || !Number.isFinite(f)) return true;
    const element = o.wavelengthAngstrom / resolvingPower;
    const bandWidth = (band.endAngstrom - band.startAngstrom) * telluricFactor;
    return f <= IDENTIFY_DEFAULTS.telluricMaxWidthResolutionElements * element || f >= 0.5 * bandWidth;
  };

  const lines: LineIdentification[] = observed.map((o, index) => {
    const own = tol(o.wavelengthAngstrom, o.wavelengthUncertaintyAngstrom, 0);
    if (tooUncertain(o)) {
      return Object.freeze({ index, wavelengthAngstrom: o.wavelengthAngstrom, kind: o.kind, toleranceAngstrom: own.toleranceAngstrom, telluric: false, centreTooUncertain: true, candidates: Object.freeze([]) });
    }
    const wide = tol(o.wavelengthAngstrom * 1.01, o.wavelengthUncertaintyAngstrom, maxSpread).toleranceAngstrom;
    const raw: { c: Omit<LineCandidate, 'score'>; s: number }[] = [];
    for (let j = lowerBound(featW, o.wavelengthAngstrom - wide); j < featW.length && featW[j] <= o.wavelengthAngstrom + wide; j++) {
      const f = allFeatures[j];
      if (f.forbidden && o.kind !== 'emission') continue;
      const t = tol(f.expectedAngstrom, o.wavelengthUncertaintyAngstrom, f.spreadAngstrom);
      const delta = o.wavelengthAngstrom - f.expectedAngstrom;
      if (Math.abs(delta) > t.toleranceAngstrom) continue;
      const w = workOf.get(f.species) as SpeciesWork;
      const verdict = verdictOf.get(f.species) as Verdict;
      const wf = w.ranked && f.weight !== null && w.wMax ? 0.5 + 0.5 * Math.sqrt(Math.min(1, f.weight / w.wMax)) : 0.75;
      const g = Math.exp(-0.5 * (delta / t.sigmaAngstrom) ** 2);
      raw.push({
        c: {
          species: f.species,
          telluric: false,
          band: null,
          restWavelengthAngstrom: f.restAngstrom,
          expectedWavelengthAngstrom: f.expectedAngstrom,
          deltaAngstrom: delta,
          deltaSigma: delta / t.sigmaAngstrom,
          components: f.components,
          relativeIntensity: f.weight,
          verdict,
        },
        s: g * wf * speciesFactor[verdict],
      });
    }
    const band = o.kind === 'absorption' ? inBand(o.wavelengthAngstrom) : null;
    if (band && telluricPlausible(o, band)) {
      // a telluric band ranks below an atomic line of a species judged present or possible
      let bandScore: number = band.strength === 'weak' ? 0.1 : 0.5;
      const atomic = raw.reduce((m, r) => (r.c.verdict === 'present' || r.c.verdict === 'possible' ? Math.max(m, r.s) : m), 0);
      if (atomic > 0) bandScore = Math.min(bandScore, IDENTIFY_DEFAULTS.telluricShareBelowAtomic * atomic);
      const mid = 0.5 * (band.startAngstrom + band.endAngstrom) * telluricFactor;
      raw.push({
        c: {
          species: band.species,
          telluric: true,
          band: band.name,
          restWavelengthAngstrom: 0.5 * (band.startAngstrom + band.endAngstrom),
          expectedWavelengthAngstrom: mid,
          deltaAngstrom: o.wavelengthAngstrom - mid,
          deltaSigma: 0,
          components: 1,
          relativeIntensity: null,
          verdict: 'telluric',
        },
        s: bandScore,
      });
    }
    const total = raw.reduce((s, r) => s + r.s, 0);
    const candidates = raw
      .map((r) => Object.freeze({ ...r.c, score: total > 0 ? r.s / total : 1 / raw.length }))
      .sort((a, b) => b.score - a.score || Math.abs(a.deltaAngstrom) - Math.abs(b.deltaAngstrom));
    return Object.freeze({
      index,
      wavelengthAngstrom: o.wavelengthAngstrom,
      kind: o.kind,
      toleranceAngstrom: own.toleranceAngstrom,
      telluric: band !== null,
      centreTooUncertain: false,
      candidates: Object.freeze(candidates),
    });
  });

  const offset = residualVelocity(lines, k);
  if (offset && Math.abs(offset.valueKmPerS) > 3 * offset.uncertaintyKmPerS && Math.abs(offset.valueKmPerS) > RESIDUAL_VELOCITY_WARN_FRACTION * (SPEED_OF_LIGHT_KM_PER_S / resolvingPower)) {
    logger.warn({ code: 'elements.velocity-offset', message: velocityOffsetMessage(offset.valueKmPerS, offset.uncertaintyKmPerS, offset.lines, v) });
  }
  return Object.freeze({
    lines: Object.freeze(lines),
    elements: Object.freeze(frozen),
    residualVelocity: offset,
    resolvingPower,
    resolvingPowerSource,
    velocityKmPerS: v,
    medium,
    coverage: Object.freeze(coverage),
    speciesTested,
    shiftTrials: trials,
    thresholds,
    provenance: provenanceEntry('identify-lines', {
      resolvingPower,
      resolvingPowerSource,
      velocityKmPerS: v,
      velocityUncertaintyKmPerS: sigmaV,
      calibrationRmsAngstrom: rms,
      medium,
      toleranceSigmas: k,
      blendFraction,
      shiftTrials: trials,
      telluricBands: bands.length,
      species: work.map((w) => w.species),
    }),
  });
}
