export * from './header.js';
export * from './provenance.js';
export * from './spectrum.js';
export * from './units.js';
