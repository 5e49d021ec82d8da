export * from './read.js';
export * from './text/index.js';
export { parseFitsSpectrum } from './fits/spectrum.js';
export { parseFitsStructure, type FitsHdu, type FitsHduKind, type FitsStructureOptions } from './fits/structure.js';
export { PIXEL_INDEX_ORIGIN } from './fits/wcs.js';
export { encodeFitsSpectrum, writeFitsSpectrum, AXIS_TOLERANCE_PIXELS, type FitsWriteOptions } from './fits/write.js';
export { verifyFitsChecksums, type ChecksumStatus, type FitsChecksumReport } from './fits/checksum.js';
export * from './atomic-write.js';
