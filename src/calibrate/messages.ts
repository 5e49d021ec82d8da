/**
 * Every user-facing message of the calibrate area, in one place and one format: a
 * sentence saying what happened and, where useful, what to try. Tests assert them.
 */

/** Why a dispersion solution was not accepted (`ok: false`). */
export type CalibrationFailure =
  /** No line reached the detection threshold (a spectrum of noise, or no light). */
  | 'no-lines-found'
  /** Fewer usable identified lines than the order needs (order + 3). */
  | 'too-few-lines'
  /** No arrangement of the measured lines matches the list (wrong lamp, wrong hint, or too few lines). */
  | 'no-pattern'
  /** Too small a fraction of the measured lines was identified: most likely the wrong lamp or list. */
  | 'few-identified'
  /** The residuals are too large to trust the identification. */
  | 'large-residuals';

export const calibrationMessages = {
  ok: (used: number, order: number, rmsAngstrom: number, rmsPixels: number) =>
    `dispersion solution of order ${order} from ${used} lines: RMS ${rmsAngstrom.toPrecision(3)} Å (${rmsPixels.toPrecision(3)} pixel)`,
  noLines: (threshold: number) =>
    `no lamp line reached the detection threshold of ${threshold} σ; check that the spectrum is a lamp exposure with light in it`,
  tooFewMeasured: (found: number) =>
    `only ${found} line${found === 1 ? '' : 's'} found; at least 4 are needed to recognise a pattern`,
  noPattern: (lamp: string, hinted: boolean) =>
    `the measured lines match no pattern of the ${lamp} list${hinted ? ' within the hint' : ''}; check the lamp name${hinted ? ' and the hint' : ', or give a hint (--range, --center with --dispersion, or the grating set-up)'}`,
  tooFewLines: (used: number, order: number, needed: number = order + 3) =>
    `only ${used} usable identified line${used === 1 ? '' : 's'} for a polynomial of order ${order}, which needs at least ${needed}; lower the order or add lines`,
  fewIdentified: (identified: number, measured: number, fraction: number) =>
    `only ${identified} of ${measured} measured lines (${(100 * fraction).toFixed(0)} %, below ${(100 * MIN_IDENTIFIED_FRACTION).toFixed(0)} %) were identified; is the lamp the one named?`,
  largeResiduals: (rmsPixels: number, limitPixels: number) =>
    `the residuals (RMS ${rmsPixels.toPrecision(3)} pixel) exceed the limit of ${limitPixels.toPrecision(3)} pixel; the identification is not trustworthy`,
  starLinesWarning: () =>
    "calibrated on the star's own lines: the star's radial velocity is absorbed into the zero point, so velocities measured with this solution are not meaningful",
  gratingOnlyWarning: (accuracy: number | null) =>
    `approximate solution from the grating equation and the set-up's geometry, not calibrated by a lamp${accuracy !== null ? ` (estimated error up to ${accuracy.toPrecision(3)} Å)` : ' (error unknown: no uncertainties of the geometry were given)'}`,
  extrapolatedTime: (fraction: number) =>
    `the star's mid-exposure time lies outside the two lamp exposures (at ${fraction.toFixed(2)} of the interval); the solutions are extrapolated linearly`,
  notOk: (reason: string) => `the dispersion solution was not accepted (${reason}); it cannot be applied`,
} as const;

/** Smallest fraction of the measured (unflagged) lines that must be identified (see DEVELOPERS.md, acceptance criteria). */
export const MIN_IDENTIFIED_FRACTION = 0.5;
