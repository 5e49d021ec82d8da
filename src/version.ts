/** The library version, recorded in every provenance entry. Kept equal to package.json by a test. */
export const VERSION = '0.1.0';

/** The library name, as written into FITS HISTORY cards and JSON outputs. */
export const LIBRARY_NAME = 'lineshift';
