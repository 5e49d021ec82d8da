/**
 * lineshift: wavelength calibration, line fitting, radial velocities and binary orbits
 * from 1-D star and lamp spectra. This module is the whole public API, re-exported by area.
 */
export * from './version.js';
export * from './errors.js';
export * from './logger.js';
export * from './spectrum/index.js';
export * from './io/index.js';
export * from './fit/index.js';
export * from './lines/index.js';
export * from './calibrate/index.js';
export * from './velocity/index.js';
export * from './orbit/index.js';
export * from './plot/index.js';
export * from './notebook/index.js';
export * from './report/index.js';
