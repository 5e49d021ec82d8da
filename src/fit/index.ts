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
