// Public API of the velocity area; each module of the area is re-exported here.
export * from './constants.js';
export * from './doppler.js';
export * from './time.js';
export * from './coordinates.js';
export * from './site.js';
export * from './barycentric.js';
export * from './observation.js';
export * from './photon-noise.js';
export * from './calibration-error.js';
export * from './ccf.js';
export * from './combine.js';
export * from './lines.js';
