import { InputError, UsageError } from '../errors.js';
import { binEdges, type WavelengthGrid } from './grid.js';
import { provenanceEntry } from './provenance.js';
import { checkSpectralAxis, deriveSpectrum, isUsablePixel, type SpectralUnit, type Spectrum } from './spectrum.js';
import { angstromPerUnit } from './units.js';

/** Options of {@link resampleSpectrum}. */
export interface ResampleOptions {
  /**
   * Largest fraction (0–1) of an output pixel's bin that may lie over unusable input
   * pixels or outside the input's coverage; beyond it the output pixel is NaN and masked.
   * Default 0.5.
   */
  maxBadFraction?: number;
}

/** The defaults of {@link resampleSpectrum}, written once. */
export const RESAMPLE_DEFAULTS = Object.freeze({ maxBadFraction: 0.5 });

/** Reverses a typed array into a new one. */
function reversed<T extends Float64Array | Uint8Array>(a: T): T {
  return a.slice().reverse() as T;
}

/**
 * Resamples a spectrum onto a new wavelength grid, conserving flux.
 *
 * Method: the input is treated as piecewise constant, each pixel's flux density holding
 * over its own bin (edges halfway between pixel centres, see {@link binEdges}). Each output
 * pixel gets the average flux density over its bin, integrated exactly: g_j = Σᵢ oᵢⱼ fᵢ / Σᵢ oᵢⱼ,
 * where oᵢⱼ is the overlap (in wavelength) of input bin i with output bin j and the sums run
 * over usable input pixels. So ∫ g dλ over the output equals ∫ f dλ over the same range
 * (to rounding), a constant spectrum stays constant, and binning n whole pixels into one
 * gives their width-weighted mean.
 *
 * Uncertainty: σ_gⱼ = √(Σᵢ oᵢⱼ² σᵢ²) / Σᵢ oᵢⱼ, the diagonal of the propagated covariance for
 * independent input pixels. Output pixels that share an input pixel are correlated (their
 * covariance Σᵢ oᵢⱼ oᵢₖ σᵢ² / (Wⱼ Wₖ) is not returned): when the output grid is finer than
 * the input, neighbouring output pixels are strongly correlated, and their σ must not be
 * treated as independent in a later χ².
 *
 * Missing data: an input pixel is unusable when its flux is not finite, its uncertainty is
 * NaN, ≤ 0 or infinite, or it is masked. An output pixel whose bin lies over unusable input
 * or outside the input's coverage for more than `maxBadFraction` of its width (default 0.5)
 * is NaN with mask 1; otherwise it is the average over its usable part.
 *
 * Works for increasing or decreasing input axes and for increasing or decreasing output
 * grids (a plain array of centres keeps its order). The result takes the grid's unit (Å,
 * nm, µm; converted exactly from the input's unit); medium, header and source are kept and
 * a `resample` provenance entry is added.
 *
 * @param s the spectrum (not modified), at least 2 pixels, not in pixel units unless the grid is a plain array.
 * @param grid a {@link WavelengthGrid} from {@link linearGrid} or {@link logLinearGrid}, or an
 *   array of output pixel centres (≥ 2, strictly monotonic) in the spectrum's own unit.
 * @param options `maxBadFraction` in [0, 1].
 * @returns a new Spectrum on the grid, with uncertainty when the input has one, and a mask
 *   when the input has one or some output pixel is bad.
 * @throws {UsageError} for a bad `maxBadFraction`, a grid array that is not strictly
 *   monotonic, or unit conversion of a pixel axis.
 * @throws {InputError} `resample.too-few-pixels` for a spectrum of one pixel.
 * @example
 * const s = createSpectrum({ wavelength: [1, 2, 3, 4], flux: [1, 1, 3, 3] });
 * Array.from(resampleSpectrum(s, [1.5, 3.5]).flux); // [1, 3]
 */
export function resampleSpectrum(s: Spectrum, grid: WavelengthGrid | ArrayLike<number>, options: ResampleOptions = {}): Spectrum {
  const maxBad = options.maxBadFraction ?? RESAMPLE_DEFAULTS.maxBadFraction;
  if (!(maxBad >= 0 && maxBad <= 1)) throw new UsageError('resample.bad-option', `maxBadFraction must lie between 0 and 1 (got ${maxBad})`);
  const n = s.wavelength.length;
  if (n < 2) throw new InputError('resample.too-few-pixels', `cannot resample a spectrum of ${n} pixel: its pixel width is unknown`, s.source ? { file: s.source.file } : {});

  // Output grid: centres and edges in the output unit, and edges in the input's unit.
  let centres: Float64Array;
  let outEdges: Float64Array;
  let outUnit: SpectralUnit;
  let gridInfo: Record<string, unknown>;
  if (isGrid(grid)) {
    centres = grid.wavelength.slice();
    outEdges = grid.edges;
    outUnit = grid.unit;
    gridInfo = {
      spacing: grid.spacing,
      unit: grid.unit,
      count: centres.length,
      first: centres[0],
      last: centres[centres.length - 1],
      ...(grid.step !== undefined ? { step: grid.step } : {}),
      ...(grid.velocityStepKmPerS !== undefined ? { velocityStepKmPerS: grid.velocityStepKmPerS } : {}),
    };
  } else {
    centres = Float64Array.from(grid);
    try {
      checkSpectralAxis(centres);
    } catch (e) {
      throw new UsageError('resample.bad-grid', `the output grid is not usable: ${(e as InputError).detail}`);
    }
    outEdges = binEdges(centres);
    outUnit = s.unit;
    gridInfo = { spacing: 'irregular', unit: s.unit, count: centres.length, first: centres[0], last: centres[centres.length - 1] };
  }
  const m = centres.length;
  if (m < 2) throw new UsageError('resample.bad-grid', `the output grid needs at least 2 pixels (got ${m})`);
  const gridDecreasing = centres[m - 1] < centres[0];
  let G = gridDecreasing ? reversed(outEdges) : outEdges.slice();
  if (outUnit !== s.unit) {
    const from = angstromPerUnit(outUnit);
    const to = angstromPerUnit(s.unit);
    G = G.map(from >= to ? (x) => x * (from / to) : (x) => x / (to / from));
  }

  // Input in increasing order.
  const inDecreasing = s.wavelength[n - 1] < s.wavelength[0];
  const E = binEdges(inDecreasing ? reversed(s.wavelength) : s.wavelength);
  const f = inDecreasing ? reversed(s.flux) : s.flux;
  const sig = s.uncertainty ? (inDecreasing ? reversed(s.uncertainty) : s.uncertainty) : undefined;
  const good = new Uint8Array(n);
  for (let i = 0; i < n; i++) good[i] = isUsablePixel(s, inDecreasing ? n - 1 - i : i) ? 1 : 0;

  const flux = new Float64Array(m);
  const unc = sig ? new Float64Array(m) : undefined;
  const mask = new Uint8Array(m);
  let anyBad = false;
  const E0 = E[0];
  const En = E[n];
  let i = 0;
  for (let j = 0; j < m; j++) {
    const lo = G[j];
    const hi = G[j + 1];
    const width = hi - lo;
    // Width outside the input's coverage.
    let badW = Math.max(0, Math.min(hi, E0) - lo) + Math.max(0, hi - Math.max(lo, En));
    let goodW = 0;
    let sumF = 0;
    let sumV = 0;
    while (i < n && E[i + 1] <= lo) i++;
    for (let k = i; k < n && E[k] < hi; k++) {
      const ov = Math.min(E[k + 1], hi) - Math.max(E[k], lo);
      if (!(ov > 0)) continue;
      if (good[k]) {
        goodW += ov;
        sumF += ov * f[k];
        if (sig) sumV += ov * ov * sig[k] * sig[k];
      } else {
        badW += ov;
      }
    }
    if (goodW > 0 && badW <= maxBad * width) {
      flux[j] = sumF / goodW;
      if (unc) unc[j] = Math.sqrt(sumV) / goodW;
    } else {
      flux[j] = NaN;
      if (unc) unc[j] = NaN;
      mask[j] = 1;
      anyBad = true;
    }
  }
  const order = <T extends Float64Array | Uint8Array>(a: T): T => (gridDecreasing ? (a.reverse() as T) : a);
  return deriveSpectrum(
    s,
    {
      wavelength: centres,
      flux: order(flux),
      uncertainty: unc ? order(unc) : undefined,
      mask: anyBad || s.mask ? order(mask) : undefined,
      unit: outUnit,
    },
    provenanceEntry('resample', { grid: gridInfo, maxBadFraction: maxBad, method: 'flux-conserving, piecewise-constant input' }),
  );
}

function isGrid(g: WavelengthGrid | ArrayLike<number>): g is WavelengthGrid {
  return typeof (g as WavelengthGrid).edges === 'object' && (g as WavelengthGrid).edges !== null && 'spacing' in g;
}
