// Public API of the calibrate area; each module of the area is re-exported here.
export * from './grating.js';
export * from './grating-solution.js';
export {
  identifyLampLines, mergeUnresolvedLines, MIN_IDENTIFIED_LINES, DEFAULT_HINT_ACCURACY_FRACTION, DEFAULT_HINT_DISPERSION_TOLERANCE,
  type MeasuredPeak, type WavelengthHint, type LampReferenceLine, type LampIdentifyOptions, type LineMatch, type IdentifyFailure, type LampIdentifyResult,
} from './identify.js';
export * from './lamp-lines.js';
export * from './list-accuracy.js';
export * from './lamp.js';
export { calibrationMessages, MIN_IDENTIFIED_FRACTION, type CalibrationFailure } from './messages.js';
export { MAX_SOLUTION_ORDER, PIXEL_UNCERTAINTY_FLOOR, DEFAULT_CLIP_SIGMA } from './polynomial.js';
export * from './solution.js';
export * from './solution-json.js';
export * from './apply.js';
export * from './star-lines.js';
