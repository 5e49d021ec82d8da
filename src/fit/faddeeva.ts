// The Faddeeva function lives in src/math/faddeeva.ts (shared with synthetic spectra in the
// lines area, which may not import the fit area); re-exported here for the fit area.
export { faddeeva } from '../math/faddeeva.js';
