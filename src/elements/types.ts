/**
 * Input and output shapes of element identification. The inputs are plain structures so that
 * the identification does not depend on how lines were found or lists were loaded: the
 * entries of a loaded line list and the results of line fitting fit these shapes.
 */

/** Absorption (a dip below the continuum) or emission (a peak above it). */
export type LineKind = 'absorption' | 'emission';

/** A line found in a spectrum, as identification needs it. */
export interface ObservedLine {
  /** Fitted centre in Å, in the spectrum's medium (see `IdentifyOptions.medium`). */
  readonly wavelengthAngstrom: number;
  /** 1-σ uncertainty of the centre in Å (0 when unknown; the other tolerance terms remain). */
  readonly wavelengthUncertaintyAngstrom: number;
  /** Absorption or emission. */
  readonly kind: LineKind;
  /** FWHM in Å, if measured (used to estimate the resolving power when it is not given). */
  readonly fwhmAngstrom?: number;
  /** Line strength on any positive scale (depth, amplitude or equivalent width); reported, not used for matching. */
  readonly strength?: number;
  /** Detection significance in sigma; reported, not used for matching. */
  readonly significance?: number;
  /**
   * Depth below the continuum as a fraction of it (absorption lines, 0–1), if measured. With
   * `fwhmAngstrom` it decides whether a line inside a weak telluric band can be that band's.
   */
  readonly depth?: number;
}

/**
 * A laboratory line. The entries of a loaded line list (`LineEntry`) have this shape.
 * Lists are in standard air unless `medium` says `vacuum`.
 */
export interface ReferenceLine {
  /** Rest wavelength in Å. */
  readonly wavelengthAngstrom: number;
  /** Spectrum, e.g. `Fe I`, `O III` (forbidden lines included; the note says `forbidden`). */
  readonly species: string;
  /** Relative intensity on the list's own per-element scale, or null when the list gives none. */
  readonly relativeIntensity: number | null;
  /** `air` (default) or `vacuum`. */
  readonly medium?: 'air' | 'vacuum';
  /** Transition and remarks; `forbidden` marks lines seen only in emission, `multiplet centroid` marks summary rows. */
  readonly note?: string;
}

/** An interval of wavelength, Å. */
export interface WavelengthInterval {
  /** Blue end, Å. */
  readonly startAngstrom: number;
  /** Red end, Å. */
  readonly endAngstrom: number;
}

/** How sure the identification of a species is. */
export type Verdict = 'present' | 'possible' | 'not detected';

/**
 * A condition of the next better verdict that a species does not meet (see
 * `DEFAULT_EVIDENCE_THRESHOLDS`). For a `possible` species, the conditions of `present`:
 * `too-few-expected-lines` (fewer expected lines in range than `present` needs, e.g. one
 * Balmer line), `too-few-matched-lines`, `strongest-line-missing`, `weak-evidence` (log-
 * likelihood ratio below the threshold), `false-alarm-too-likely` (adjusted false-alarm
 * probability above it), `shift-test-failed`. For a `not detected` species, those of
 * `possible`: `no-expected-lines`, `no-line-matched`, `weak-evidence` (not above 0),
 * `false-alarm-too-likely` (unadjusted probability above the threshold).
 */
export type VerdictReason =
  | 'no-expected-lines'
  | 'no-line-matched'
  | 'too-few-expected-lines'
  | 'too-few-matched-lines'
  | 'strongest-line-missing'
  | 'weak-evidence'
  | 'false-alarm-too-likely'
  | 'shift-test-failed'
  | 'explained-by-present-species';

/** One candidate identification of a found line. */
export interface LineCandidate {
  /** Spectrum (`Fe I`) or telluric list (`O2 telluric`). */
  readonly species: string;
  /** True for a telluric band (then the wavelengths are the band's limits' midpoint and `band` names it). */
  readonly telluric: boolean;
  /** Telluric band name, or null. */
  readonly band: string | null;
  /** Laboratory wavelength from the list (intensity-weighted mean when several list lines blend at this resolution), Å, list medium. */
  readonly restWavelengthAngstrom: number;
  /** Where the line should appear: rest wavelength in the spectrum's medium, Doppler-shifted by the given velocity, Å. */
  readonly expectedWavelengthAngstrom: number;
  /** Found minus expected wavelength, Å. */
  readonly deltaAngstrom: number;
  /** `deltaAngstrom` in units of the combined 1-σ tolerance scale. */
  readonly deltaSigma: number;
  /** Number of list lines blended into this candidate at the resolving power. */
  readonly components: number;
  /** List intensity (summed over blended lines), or null. */
  readonly relativeIntensity: number | null;
  /** Share of this candidate among the line's candidates (sums to 1 over them). */
  readonly score: number;
  /** The species' verdict. */
  readonly verdict: Verdict | 'telluric';
}

/** Identifications of one found line. */
export interface LineIdentification {
  /** Index of the line in the input. */
  readonly index: number;
  /** Found centre, Å. */
  readonly wavelengthAngstrom: number;
  /** Absorption or emission. */
  readonly kind: LineKind;
  /** Match tolerance used at this line (k·σ with the line's own centre uncertainty), Å. */
  readonly toleranceAngstrom: number;
  /** True when the line is an absorption line inside a telluric band (whether or not the band is among its candidates). */
  readonly telluric: boolean;
  /** True when the centre's uncertainty exceeds one resolution element λ/R: the line is not used and gets no candidates. */
  readonly centreTooUncertain: boolean;
  /** Ranked candidates, best first (empty when nothing lies within the tolerance). */
  readonly candidates: readonly LineCandidate[];
}

/** A list line (or blend) matched in the spectrum, for the evidence of a species. */
export interface MatchedFeature {
  /** List wavelength (blend mean), Å. */
  readonly restWavelengthAngstrom: number;
  /** Expected position in the spectrum, Å. */
  readonly expectedWavelengthAngstrom: number;
  /** Found line's centre, Å. */
  readonly foundWavelengthAngstrom: number;
  /** Index of the found line in the input. */
  readonly index: number;
}

/** The evidence for one spectrum (species). */
export interface SpeciesEvidence {
  /** Spectrum name, e.g. `Fe I`. */
  readonly species: string;
  /** Element symbol, e.g. `Fe`. */
  readonly element: string;
  /** Verdict by the thresholds in `IdentificationResult.thresholds`. */
  readonly verdict: Verdict;
  /** Expected strong lines (blends counted once) that lie in the covered range, outside gaps and strong telluric bands. */
  readonly linesExpected: number;
  /** How many of the expected lines have a found line within the tolerance. */
  readonly linesMatched: number;
  /** Expected lines with no found line within the tolerance: their expected wavelengths, strongest first. */
  readonly missingWavelengthsAngstrom: readonly number[];
  /** Whether the strongest expected line is matched (null when the list has no intensities to rank by, or nothing is expected). */
  readonly strongestMatched: boolean | null;
  /** Weaker list lines (not among the expected ones) that also have a found line within the tolerance. */
  readonly otherLinesMatched: number;
  /** True when the expected lines were chosen by list intensity; false when the list has too few intensities and every visible line counts equally. */
  readonly rankedByIntensity: boolean;
  /** Log-likelihood ratio (natural log) of "present" against "chance coincidences" over the expected lines. */
  readonly logLikelihoodRatio: number;
  /** Probability that chance coincidences with the found lines give a log-likelihood ratio at least this large (this species alone). */
  readonly falseAlarmProbability: number;
  /** `falseAlarmProbability` times the number of species tested (Bonferroni), at most 1. */
  readonly adjustedFalseAlarmProbability: number;
  /** Fraction of shifted copies of the found-line list that do at least as well (the shift test), or null when not run. */
  readonly shiftFalseAlarmProbability: number | null;
  /** One-sided Gaussian-equivalent of `adjustedFalseAlarmProbability`, sigma (0 when it is ≥ 0.5). */
  readonly significanceSigma: number;
  /** The matched expected lines. */
  readonly matched: readonly MatchedFeature[];
  /**
   * Species called `present` whose own expected lines are the found lines this species matched
   * (e.g. He II 4859 on Hβ), when discounting those lines decided the verdict; otherwise empty.
   */
  readonly explainedBy: readonly string[];
  /** Why the verdict is not the next better one: the unmet conditions, most basic first; empty for `present`. */
  readonly reasons: readonly VerdictReason[];
  /** The reasons in words, joined by `; ` (e.g. `only 1 expected line in range (present needs 2)`), or null for `present`. */
  readonly reason: string | null;
}

/** Thresholds of the verdicts (see DEVELOPERS.md, "Element identification"). */
export interface EvidenceThresholds {
  /** `present` needs `adjustedFalseAlarmProbability` at or below this. */
  readonly presentFalseAlarm: number;
  /** `present` needs `logLikelihoodRatio` at or above this (natural log). */
  readonly presentLogLikelihoodRatio: number;
  /** `present` needs at least this many matched expected lines. */
  readonly presentMinLines: number;
  /** `present` needs `shiftFalseAlarmProbability` (when computed) at or below this. */
  readonly presentShiftFalseAlarm: number;
  /** `possible` needs `falseAlarmProbability` (unadjusted) at or below this, a positive log-likelihood ratio and one matched line. */
  readonly possibleFalseAlarm: number;
}
