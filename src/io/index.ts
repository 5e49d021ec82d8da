export * from './read.js';
export { parseFitsSpectrum } from './fits/spectrum.js';
export { parseFitsStructure, type FitsHdu, type FitsHduKind, type FitsStructureOptions } from './fits/structure.js';
export { PIXEL_INDEX_ORIGIN } from './fits/wcs.js';
