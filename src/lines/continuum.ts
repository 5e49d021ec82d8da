import { InputError, UsageError } from '../errors.js';
import { CubicBSplineBasis, chebyshevEvaluate, chebyshevRow, type Domain } from '../math/basis.js';
import { solveLinearLeastSquares } from '../math/linear-least-squares.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import { deriveSpectrum, isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';

/** A wavelength interval in the spectrum's own unit, both ends included. */
export interface WavelengthRange {
  readonly min: number;
  readonly max: number;
}

/** Options of {@link fitContinuum}. Every default is written once, in `CONTINUUM_DEFAULTS`. */
export interface ContinuumOptions {
  /** `spline` (cubic B-spline with evenly spaced knots) or `polynomial` (Chebyshev series). */
  method?: 'spline' | 'polynomial';
  /** Knot spacing of the spline, in the spectrum's spectral unit (Å by default: 250). Ignored for polynomials. */
  knotSpacing?: number;
  /** Polynomial order (0–15). Ignored for splines. */
  order?: number;
  /**
   * Which features the spectrum has: `absorption` (a star: clip low points hard, high points
   * gently), `emission` (a lamp or nebula: the reverse) or `both` (symmetric).
   */
  features?: 'absorption' | 'emission' | 'both';
  /** Clipping threshold below the fit, in units of the noise (default 2 for absorption, 3 otherwise). */
  lowerClip?: number;
  /** Clipping threshold above the fit, in units of the noise (default 3 for absorption, 2 for emission). */
  upperClip?: number;
  /** Maximum number of fit-and-clip rounds. */
  maxIterations?: number;
  /** Ranges (in the spectrum's unit) never used for the continuum, e.g. the cores of strong lines. */
  exclude?: readonly WavelengthRange[];
}

/** The defaults of {@link fitContinuum}. */
export const CONTINUUM_DEFAULTS = Object.freeze({
  method: 'spline' as const,
  knotSpacing: 250,
  order: 3,
  features: 'absorption' as const,
  maxIterations: 20,
  strongClip: 2,
  weakClip: 3,
});

/** Result of {@link fitContinuum}. */
export interface ContinuumResult {
  /** The fitted continuum at every pixel (same length as the spectrum). */
  readonly continuum: Float64Array;
  /** 1 where the pixel was used by the final fit, 0 where clipped, excluded or unusable. */
  readonly used: Uint8Array;
  /** Fit-and-clip rounds done. */
  readonly iterations: number;
  /** True when the set of used pixels stopped changing before `maxIterations`. */
  readonly converged: boolean;
  /** Robust scatter of the used pixels about the continuum, in flux units (1.4826 × MAD). */
  readonly scatter: number;
  /** The options actually used (defaults filled in). */
  readonly parameters: Readonly<Record<string, unknown>>;
}

/** Fraction of a stretch's candidate pixels that clipping may never go below (see {@link fitContinuum}). */
const MIN_KEPT_FRACTION = 0.2;

/**
 * Restores, in every stretch of `width` where clipping left fewer than MIN_KEPT_FRACTION of
 * the candidate pixels, the candidates furthest on the continuum side.
 */
function keepEnvelope(x: Float64Array, y: Float64Array, continuum: Float64Array, candidate: Uint8Array, used: Uint8Array, domain: Domain, width: number, features: 'absorption' | 'emission' | 'both'): void {
  const n = x.length;
  const bins = Math.max(1, Math.ceil((domain.max - domain.min) / width - 1e-9));
  const members: number[][] = Array.from({ length: bins }, () => []);
  for (let i = 0; i < n; i++) if (candidate[i]) members[Math.min(bins - 1, Math.floor((x[i] - domain.min) / width))].push(i);
  for (const m of members) {
    const need = Math.ceil(MIN_KEPT_FRACTION * m.length);
    let have = 0;
    for (const i of m) have += used[i];
    if (have >= need) continue;
    const side = (i: number): number => (features === 'absorption' ? y[i] - continuum[i] : features === 'emission' ? continuum[i] - y[i] : -Math.abs(y[i] - continuum[i]));
    const order = m.filter((i) => !used[i]).sort((a, b) => side(b) - side(a));
    for (let k = 0; k < need - have && k < order.length; k++) used[order[k]] = 1;
  }
}

function median(values: number[]): number {
  if (values.length === 0) return NaN;
  const v = values.slice().sort((a, b) => a - b);
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/**
 * Fits the continuum of a spectrum by iterative, asymmetric sigma clipping: fit a smooth
 * function (cubic B-spline or Chebyshev polynomial) to the usable pixels, drop those
 * further than `lowerClip`/`upperClip` × noise below/above it, and repeat until no pixel
 * changes side (residuals are taken from their median, so a first fit pulled towards
 * strong lines does not clip the continuum itself). For a star with absorption lines, clipping low points hard keeps the
 * continuum on the upper envelope, so broad Balmer wings pull it down only where the
 * knots are closer than the wings are wide: use a knot spacing several times the wing
 * width, or `exclude` the wings. The noise is each pixel's uncertainty when the spectrum
 * has one, otherwise the robust scatter (1.4826 × median absolute deviation) of the
 * currently used pixels (common practice). Clipping never leaves a stretch of a quarter knot
 * interval with fewer than a fifth of its pixels: where lines crowd, the highest ones (for
 * absorption) are kept, so the fit follows the local envelope instead of diving.
 *
 * Missing-data policy: unusable pixels (NaN flux, bad uncertainty, masked) are never used;
 * the continuum is still evaluated there.
 *
 * @param spectrum any spectrum with a spectral axis (Å, nm, µm or pixels).
 * @returns the continuum at every pixel, which pixels were used, and the scatter.
 * @throws {InputError} when fewer usable pixels remain than the fit has coefficients.
 * @throws {UsageError} for an order or knot spacing out of range.
 * @example
 * const c = fitContinuum(star, { knotSpacing: 300, exclude: [{ min: 6520, max: 6600 }] });
 * c.continuum.length === star.flux.length; // true
 */
export function fitContinuum(spectrum: Spectrum, options: ContinuumOptions = {}): ContinuumResult {
  const method = options.method ?? CONTINUUM_DEFAULTS.method;
  const features = options.features ?? CONTINUUM_DEFAULTS.features;
  const lowerClip = options.lowerClip ?? (features === 'absorption' ? CONTINUUM_DEFAULTS.strongClip : CONTINUUM_DEFAULTS.weakClip);
  const upperClip = options.upperClip ?? (features === 'emission' ? CONTINUUM_DEFAULTS.strongClip : CONTINUUM_DEFAULTS.weakClip);
  const maxIterations = options.maxIterations ?? CONTINUUM_DEFAULTS.maxIterations;
  const order = options.order ?? CONTINUUM_DEFAULTS.order;
  const knotSpacing = options.knotSpacing ?? CONTINUUM_DEFAULTS.knotSpacing;
  if (!(lowerClip > 0) || !(upperClip > 0)) throw new UsageError('continuum.bad-clip', `clipping thresholds must be positive (got lower ${lowerClip}, upper ${upperClip})`);
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new UsageError('continuum.bad-iterations', `maxIterations must be a whole number ≥ 1 (got ${maxIterations})`);

  const x = spectrum.wavelength;
  const y = spectrum.flux;
  const n = x.length;
  const domain: Domain = { min: Math.min(x[0], x[n - 1]), max: Math.max(x[0], x[n - 1]) };
  if (!(domain.max > domain.min)) throw new InputError('continuum.too-short', 'a continuum needs at least two pixels');

  let nBasis: number;
  let spline: CubicBSplineBasis | undefined;
  if (method === 'spline') {
    if (!(knotSpacing > 0)) throw new UsageError('continuum.bad-knots', `knotSpacing must be positive (got ${knotSpacing})`);
    spline = new CubicBSplineBasis(domain.min, domain.max, Math.max(1, Math.round((domain.max - domain.min) / knotSpacing)));
    nBasis = spline.size;
  } else {
    if (!Number.isInteger(order) || order < 0 || order > 15) throw new UsageError('continuum.bad-order', `polynomial order must be a whole number from 0 to 15 (got ${order})`);
    nBasis = order + 1;
  }

  const candidate = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    if (!isUsablePixel(spectrum, i)) continue;
    if (options.exclude?.some((r) => x[i] >= Math.min(r.min, r.max) && x[i] <= Math.max(r.min, r.max))) continue;
    candidate[i] = 1;
  }
  const design = new Float64Array(n * nBasis);
  const row = new Float64Array(nBasis);
  for (let i = 0; i < n; i++) {
    if (spline) spline.row(x[i], row);
    else chebyshevRow(x[i], order, domain, row);
    design.set(row, i * nBasis);
  }
  const sigma = spectrum.uncertainty;
  const used = candidate.slice();
  const continuum = new Float64Array(n);
  let iterations = 0;
  let converged = false;
  let scatter = NaN;
  let basisSize = nBasis;
  while (iterations < maxIterations) {
    iterations++;
    const weights = new Float64Array(n);
    let count = 0;
    for (let i = 0; i < n; i++) {
      if (used[i]) {
        weights[i] = sigma ? 1 / (sigma[i] * sigma[i]) : 1;
        count++;
      }
    }
    if (count < basisSize) {
      throw new InputError('continuum.too-few-pixels', `only ${count} usable continuum pixels remain for a fit with ${basisSize} coefficients; lower the order, widen the knot spacing or exclude less`);
    }
    let coefficients: Float64Array;
    try {
      coefficients = solveLinearLeastSquares(design, n, nBasis, y, weights).coefficients;
    } catch (e) {
      if (e instanceof UsageError && e.code === 'lsq.rank-deficient' && spline && spline.intervals > 1) {
        // Gaps left by clipping can leave a spline piece without data: coarsen and retry.
        return fitContinuum(spectrum, { ...options, method: 'spline', knotSpacing: (domain.max - domain.min) / Math.max(1, spline.intervals - 1) + 1e-9 * (domain.max - domain.min) });
      }
      throw e;
    }
    basisSize = nBasis;
    for (let i = 0; i < n; i++) {
      continuum[i] = spline ? spline.evaluate(coefficients, x[i]) : chebyshevEvaluate(coefficients, x[i], domain);
    }
    const residuals: number[] = [];
    for (let i = 0; i < n; i++) if (used[i]) residuals.push(y[i] - continuum[i]);
    const med = median(residuals);
    scatter = 1.4826 * median(residuals.map((r) => Math.abs(r - med)));
    const before = used.slice();
    for (let i = 0; i < n; i++) {
      if (!candidate[i]) continue;
      const noise = sigma ? sigma[i] : scatter;
      // Residuals are measured from their median, not from the fit: in the first rounds the
      // fit is pulled towards the lines, and the median of the residuals is the robust level
      // of the continuum pixels.
      const r = y[i] - continuum[i] - med;
      const keep = noise > 0 ? r >= -lowerClip * noise && r <= upperClip * noise : true;
      used[i] = keep ? 1 : 0;
    }
    // Where lines crowd (a cool star's blue end, a strong line near an edge), clipping can
    // empty a stretch of the spectrum; the fit, no longer held there, dives and clips what
    // was left. Each stretch (a quarter of a knot interval, or of the range over the
    // polynomial's terms) keeps at least MIN_KEPT_FRACTION of its candidate pixels: those
    // furthest on the continuum side (highest for absorption, lowest for emission, nearest
    // for both), i.e. its local envelope.
    keepEnvelope(x, y, continuum, candidate, used, domain, spline ? (domain.max - domain.min) / spline.intervals / 4 : (domain.max - domain.min) / (4 * nBasis), features);
    let changed = 0;
    for (let i = 0; i < n; i++) if (used[i] !== before[i]) changed++;
    if (changed === 0) {
      converged = true;
      break;
    }
  }
  return {
    continuum,
    used,
    iterations,
    converged,
    scatter,
    parameters: Object.freeze({
      method,
      ...(method === 'spline' ? { knotSpacing: spline ? (domain.max - domain.min) / spline.intervals : knotSpacing } : { order }),
      features, lowerClip, upperClip, maxIterations, exclude: options.exclude ?? [],
    }),
  };
}

/**
 * Divides a spectrum by its continuum: flux/continuum and uncertainty/continuum (the
 * continuum's own error is neglected; with hundreds of pixels per knot it is small next
 * to a pixel's). Pixels where the continuum is not positive become NaN.
 *
 * @returns the normalised spectrum (provenance step `normalize-continuum`) and the
 *   continuum fit, so both can be plotted.
 * @example
 * const { normalized, continuum } = normalizeContinuum(star, { knotSpacing: 300 });
 */
export function normalizeContinuum(spectrum: Spectrum, options: ContinuumOptions = {}): { normalized: Spectrum; continuum: ContinuumResult } {
  const fit = fitContinuum(spectrum, options);
  const n = spectrum.flux.length;
  const flux = new Float64Array(n);
  const unc = spectrum.uncertainty ? new Float64Array(n) : undefined;
  for (let i = 0; i < n; i++) {
    const c = fit.continuum[i];
    flux[i] = c > 0 ? spectrum.flux[i] / c : NaN;
    if (unc && spectrum.uncertainty) unc[i] = c > 0 ? spectrum.uncertainty[i] / c : NaN;
  }
  const normalized = deriveSpectrum(spectrum, { flux, uncertainty: unc, fluxUnit: null }, provenanceEntry('normalize-continuum', fit.parameters));
  return { normalized, continuum: fit };
}
