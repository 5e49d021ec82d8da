// Public API of the orbit area; each module of the area is re-exported here.
export * from './table.js';
export * from './kepler.js';
export * from './periodogram.js';
export { radialVelocityKmPerS, type BinaryStar, type KeplerianOrbit } from './keplerian.js';
export * from './constants.js';
export * from './mass-function.js';
export { lnGamma } from './special.js';
export { fitOrbit, lucySweeneyProbability, type CircularOrbitTest, type OrbitFit, type OrbitFitOptions } from './orbit-fit.js';
