// Public API of the fit area; each module of the area is re-exported here.
export {
  leastSquares,
  type LeastSquaresOptions,
  type LeastSquaresProblem,
  type LeastSquaresResult,
  type LeastSquaresStopReason,
  type UncertaintySource,
} from './least-squares.js';
export * from './curve.js';
export {
  GAUSSIAN_FWHM_PER_SIGMA,
  LINE_PROFILES,
  PROFILE_WIDTH_NAMES,
  lineProfileValue,
  voigtDensity,
  voigtFwhm,
  type LineProfile,
  type ProfileWidths,
} from './profiles.js';
export { lineModelParameterNames, type LineModelShape } from './line-model.js';
export * from './line-fit.js';
