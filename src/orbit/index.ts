// Public API of the orbit area; each module of the area is re-exported here.
export * from './table.js';
export * from './kepler.js';
export * from './periodogram.js';
export { lnGamma } from './special.js';
