// Public API of the lines area; each module of the area is re-exported here.
export * from './snr.js';
export * from './find.js';
