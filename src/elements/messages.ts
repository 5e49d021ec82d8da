import type { EvidenceThresholds, SpeciesEvidence, VerdictReason } from './types.js';

/**
 * Every user-facing message of the elements area, in one place and one format: lower-case
 * start, says what is wrong and what is expected, no trailing full stop.
 */

/** A species request that matches no line list. */
export function unknownSpeciesMessage(unknown: readonly string[], available: readonly string[]): string {
  const elements = [...new Set(available.map((a) => a.split(/\s+/)[0]))];
  return `no line list for ${unknown.map((u) => `"${u}"`).join(', ')} (known: ${elements.join(', ')})`;
}

/** An option that must be a positive finite number. */
export function notPositiveMessage(name: string, value: unknown): string {
  return `${name} must be a positive finite number, got ${String(value)}`;
}

/** An option that must be a finite number. */
export function notFiniteMessage(name: string, value: unknown): string {
  return `${name} must be a finite number, got ${String(value)}`;
}

/** An observed line with an impossible field. */
export function badObservedLineMessage(field: string, value: unknown): string {
  return `found line has ${field} ${String(value)}; expected a positive finite number`;
}

/** An observed line whose kind is neither absorption nor emission. */
export function badKindMessage(value: unknown): string {
  return `found line has kind ${JSON.stringify(value)}; expected "absorption" or "emission"`;
}

/** A reference line with an impossible wavelength. */
export function badReferenceLineMessage(value: unknown): string {
  return `reference line has wavelength ${String(value)}; expected a positive finite number of Å`;
}

/** Neither a resolving power nor line widths to estimate it from. */
export function noResolutionMessage(): string {
  return 'give the resolving power: no found line has a FWHM to estimate it from';
}

/** A coverage interval that is empty or reversed. */
export function badCoverageMessage(start: unknown, end: unknown): string {
  return `wavelength coverage ${String(start)}–${String(end)} Å is not an interval of positive wavelengths with start < end`;
}

/** The found lines sit systematically off their identifications: the velocity given is off. */
export function velocityOffsetMessage(offsetKmPerS: number, uncertaintyKmPerS: number, lines: number, givenKmPerS: number): string {
  const sign = (x: number) => `${x < 0 ? '−' : '+'}${Math.abs(x).toFixed(1)}`;
  return `the identified lines sit on average ${sign(offsetKmPerS)} ± ${uncertaintyKmPerS.toFixed(1)} km/s from the list wavelengths placed at ${givenKmPerS} km/s (${lines} lines); give the object's velocity (about ${sign(givenKmPerS + offsetKmPerS)} km/s) with --velocity (velocityKmPerS)`;
}

/** A velocity at or beyond the speed of light. */
export function velocityTooLargeMessage(v: number): string {
  return `velocity ${v} km/s is not below the speed of light in size`;
}

/** Warning: the resolving power was estimated from the found lines' widths. */
export function resolutionEstimatedMessage(r: number, n: number): string {
  return `resolving power not given; using ${Math.round(r)} (median λ/FWHM of ${n} found lines)`;
}

/** Warning: the shift test was skipped because the coverage is too short. */
export function shiftTestSkippedMessage(lengthAngstrom: number): string {
  return `shift test skipped: the covered ${lengthAngstrom.toFixed(1)} Å is too short for offsets larger than the tolerance`;
}

/** A spectrum without a wavelength scale. */
export function notCalibratedMessage(): string {
  return 'spectrum has no wavelength scale (pixel axis); calibrate it before identifying lines';
}

/** Warning: the spectrum does not say air or vacuum. */
export function mediumAssumedMessage(): string {
  return 'spectrum does not say whether its wavelengths are in air or vacuum; assuming air (as the line lists)';
}

/** Warning: some found lines were not fitted. */
export function notFittedMessage(n: number, total: number): string {
  return `${n} of ${total} found lines not fitted (blend too large or fit did not converge); their centres come from the finder`;
}

function probability(p: number): string {
  return p >= 0.001 ? p.toFixed(3) : p.toExponential(1);
}

/**
 * One reason of a verdict in words, e.g. `only 1 expected line in range (present needs 2)`.
 *
 * @param reason the unmet condition.
 * @param e the species' evidence (its verdict decides which verdict's thresholds are meant).
 * @param t the thresholds used.
 * @returns the sentence, lower-case, without a full stop.
 * @example
 * verdictReasonMessage('too-few-expected-lines', hydrogen, DEFAULT_EVIDENCE_THRESHOLDS);
 * // 'only 1 expected line in range (present needs 2)'
 */
export function verdictReasonMessage(reason: VerdictReason, e: SpeciesEvidence, t: EvidenceThresholds): string {
  const lines = (n: number) => `${n} expected line${n === 1 ? '' : 's'}`;
  const forPresent = e.verdict === 'possible';
  switch (reason) {
    case 'no-expected-lines':
      return 'no expected line in the covered range';
    case 'no-line-matched':
      return `none of ${lines(e.linesExpected)} matched`;
    case 'too-few-expected-lines':
      return `only ${lines(e.linesExpected)} in range (present needs ${t.presentMinLines})`;
    case 'too-few-matched-lines':
      return `only ${e.linesMatched} of ${lines(e.linesExpected)} matched (present needs ${t.presentMinLines})`;
    case 'strongest-line-missing':
      return `strongest expected line (${e.missingWavelengthsAngstrom[0]?.toFixed(2) ?? '?'} Å) not found`;
    case 'weak-evidence':
      return forPresent
        ? `log-likelihood ratio ${e.logLikelihoodRatio.toFixed(1)} below ln ${Math.round(Math.exp(t.presentLogLikelihoodRatio))} = ${t.presentLogLikelihoodRatio.toFixed(1)}`
        : `log-likelihood ratio ${e.logLikelihoodRatio.toFixed(1)} not above 0`;
    case 'false-alarm-too-likely':
      return forPresent
        ? `adjusted false-alarm probability ${probability(e.adjustedFalseAlarmProbability)} above ${t.presentFalseAlarm}`
        : `false-alarm probability ${probability(e.falseAlarmProbability)} above ${t.possibleFalseAlarm}`;
    case 'shift-test-failed':
      return `shift-test false-alarm probability ${probability(e.shiftFalseAlarmProbability ?? 1)} above ${t.presentShiftFalseAlarm}`;
    case 'explained-by-present-species':
      return `its matched lines are lines of ${e.explainedBy.join(', ')} (present); without them the evidence falls short of possible`;
  }
}
