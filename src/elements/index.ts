// Public API of the elements area: line identification and the evidence for each species.
export * from './types.js';
export * from './identify.js';
export * from './species.js';
export * from './statistics.js';
export * from './telluric.js';
export * from './spectrum.js';
