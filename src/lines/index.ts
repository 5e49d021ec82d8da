// Public API of the lines area; each module of the area is re-exported here.
export * from './continuum.js';
export * from './linelist.js';
export * from './snr.js';
export * from './find.js';
export * from './synthetic.js';
