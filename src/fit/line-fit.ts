/**
 * Fitting spectral lines: one or several blended components of one profile on a
 * polynomial continuum, fitted together by weighted least squares, with every parameter's
 * uncertainty and the derived centre, FWHM, depth, equivalent width and integrated flux
 * with uncertainties propagated through the full covariance.
 */
import { UsageError } from '../errors.js';
import type { LineWindow } from '../lines/find.js';
import { derSnr } from '../lines/snr.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import { angstromPerUnit } from '../spectrum/units.js';
import { guessLineParameters, type LineSign } from './guess.js';
import { leastSquares, type LeastSquaresOptions, type LeastSquaresStopReason, type UncertaintySource } from './least-squares.js';
import {
  componentDerived, componentOffset, componentSize, evaluateLineModel, lineModelParameterNames,
  propagate, type ContinuumOrder, type LineModelShape,
} from './line-model.js';
import { LINE_PROFILES, profileFwhm, type LineProfile } from './profiles.js';

export type { ContinuumOrder } from './line-model.js';
export type { LineSign } from './guess.js';

/** A measured number with its 1-σ uncertainty (NaN when undefined). */
export interface MeasuredValue {
  readonly value: number;
  readonly uncertainty: number;
}

/** A tie: parameter = factor × (the other parameter) + offset. */
export interface ParameterTie {
  /** Name of the parameter this one follows (must not itself be tied), e.g. `fwhm1`. */
  readonly parameter: string;
  /** Default 1. */
  readonly factor?: number;
  /** In the parameter's unit. Default 0. */
  readonly offset?: number;
}

/**
 * Settings shared by {@link fitLine} and {@link fitLineArrays}. Parameter names are those
 * of {@link lineModelParameterNames}: `continuumConstant`, `continuumSlope`,
 * `continuumCurvature`, and per component k (from 1) `centerk`, `fwhmk` (Voigt:
 * `fwhmGaussiank`, `fwhmLorentziank`) and `amplitudek`. Lengths are in the unit of the
 * spectral axis (Å for fitLine), widths are FWHM, amplitudes in flux units.
 */
export interface LineFitSettings {
  /** Profile shape of every component. Default `gaussian`. */
  profile?: LineProfile;
  /** Number of blended components. Default: the number of centres given. */
  components?: number;
  /** Continuum polynomial order 0, 1 or 2 (in x − middle of window). Default 1. */
  continuumOrder?: ContinuumOrder;
  /** Absorption, emission, or decided from the data near the centre. Default `auto`. */
  sign?: LineSign | 'auto';
  /** Starting values by parameter name, replacing the guesses from the data. */
  initial?: Readonly<Record<string, number>>;
  /**
   * Bounds by parameter name, [lower, upper] (±Infinity for open). Defaults: centres
   * within the window; FWHMs ≥ 1 % of the pixel spacing (a Voigt's Lorentzian FWHM ≥ 0).
   */
  bounds?: Readonly<Record<string, readonly [number, number]>>;
  /** Parameters held at the given values, by name. */
  fixed?: Readonly<Record<string, number>>;
  /** Tied parameters by name, e.g. `{ fwhm2: { parameter: 'fwhm1' } }` or a doublet's fixed separation `{ center2: { parameter: 'center1', offset: 5.97 } }`. */
  ties?: Readonly<Record<string, ParameterTie>>;
  /** Default: `data` when the spectrum has uncertainties, otherwise `scaled-by-reduced-chi-square` (all pixels weighted equally). */
  uncertaintySource?: UncertaintySource;
  /** Solver tolerances and iteration limit (defaults of {@link leastSquares}). */
  solver?: Pick<LeastSquaresOptions, 'relativeChiSquareTolerance' | 'relativeStepTolerance' | 'gradientTolerance' | 'maxIterations'>;
}

/** Options of {@link fitLine} (a calibrated spectrum; lengths in Å). */
export interface LineFitOptions extends LineFitSettings {
  /** Approximate line centre in Å: one for all components, or one per component. */
  centerAngstrom: number | readonly number[];
  /**
   * Full width of the fitting window in Å, from the lowest centre − width/2 to the highest
   * centre + width/2. Default: ±3 estimated FWHM around each component's estimated centre
   * (and at least ±8 pixels around the centres given), the components being estimated
   * within ±20 pixels first (more for broad lines).
   */
  windowAngstrom?: number;
}

/** Data for {@link fitLineArrays}. */
export interface LineFitData {
  /** Spectral axis (strictly monotonic), in `unit`. */
  readonly x: ArrayLike<number>;
  /** Unit of x: Å for calibrated data, pixels for uncalibrated (a lamp frame before calibration). Default `angstrom`. */
  readonly unit?: 'angstrom' | 'pixel';
  readonly flux: ArrayLike<number>;
  /** 1-σ flux uncertainties; absent when unknown. */
  readonly uncertainty?: ArrayLike<number>;
  /** Non-zero marks a bad pixel. */
  readonly mask?: ArrayLike<number>;
}

/** Options of {@link fitLineArrays}: as {@link LineFitOptions}, with lengths in the unit of x. */
export interface ArrayLineFitOptions extends LineFitSettings {
  /** Approximate centre(s) in the unit of x. */
  center: number | readonly number[];
  /** Full window width in the unit of x (default as for {@link LineFitOptions.windowAngstrom}). */
  window?: number;
}

/** One fitted line component with derived quantities. Lengths in the result's `unit`. */
export interface LineComponentResult {
  /** Line centre (the profile is symmetric: centre = peak = centroid). */
  readonly center: MeasuredValue;
  /** Full width at half maximum of the component (Voigt: of the whole profile). */
  readonly fwhm: MeasuredValue;
  /** Voigt only: FWHM of the Gaussian part. */
  readonly fwhmGaussian?: MeasuredValue;
  /** Voigt only: FWHM of the Lorentzian part. */
  readonly fwhmLorentzian?: MeasuredValue;
  /** Peak height above the continuum, flux units; negative for absorption. */
  readonly amplitude: MeasuredValue;
  /** Fitted continuum at the line centre, flux units. */
  readonly continuumAtCenter: MeasuredValue;
  /** −amplitude / continuum at centre: fraction of the continuum (positive for absorption); NaN where the continuum is ≤ 0. */
  readonly depth: MeasuredValue;
  /** −∫ line / continuum at centre, over the whole profile (not only the window): positive for absorption; NaN where the continuum is ≤ 0. */
  readonly equivalentWidth: MeasuredValue;
  /** ∫ line dx over the whole profile, flux units × length unit; negative for absorption. */
  readonly integratedFlux: MeasuredValue;
}

/** One model parameter in the result. */
export interface FittedParameter {
  readonly name: string;
  readonly value: number;
  /** 1-σ; 0 for fixed parameters; NaN when the fit gives no covariance. */
  readonly uncertainty: number;
  readonly fixed: boolean;
  /** Name of the parameter it follows, when tied. */
  readonly tiedTo?: string;
  readonly atBound: boolean;
}

/** The outcome of a line fit. */
export interface LineFitResult {
  /** True when the solver met a stopping rule for success and the uncertainties exist. */
  readonly converged: boolean;
  readonly reason: LeastSquaresStopReason;
  readonly message: string;
  readonly profile: LineProfile;
  /** Absorption or emission (as given or as decided from the data). */
  readonly sign: LineSign;
  /** Unit of every length in the result. */
  readonly unit: 'angstrom' | 'pixel';
  /** The fitting window actually used. */
  readonly window: { readonly start: number; readonly end: number; readonly pixelsUsed: number };
  readonly components: readonly LineComponentResult[];
  /** Continuum polynomial: coefficients of (x − reference)^j. */
  readonly continuum: { readonly order: ContinuumOrder; readonly reference: number; readonly coefficients: readonly MeasuredValue[] };
  readonly parameters: readonly FittedParameter[];
  /** Correlation matrix in the order of `parameters`. */
  readonly correlation: readonly (readonly number[])[];
  readonly chiSquare: number;
  readonly degreesOfFreedom: number;
  readonly reducedChiSquare: number;
  readonly uncertaintySource: UncertaintySource;
  readonly iterations: number;
  /** DER_SNR of the whole input spectrum (Stoehr et al. 2008) over its usable pixels. */
  readonly signalToNoise: number;
  /** Pixels of the window with the fitted model, for plots and residuals. */
  readonly curve: { readonly x: readonly number[]; readonly flux: readonly number[]; readonly model: readonly number[]; readonly continuum: readonly number[] };
  readonly provenance: readonly ProvenanceEntry[];
}

interface Prepared {
  x: Float64Array;
  y: Float64Array;
  sigma: Float64Array | null;
  unit: 'angstrom' | 'pixel';
  provenance: readonly ProvenanceEntry[];
  snr: number;
}

/** Pixels per half-window when first estimating the width (default window). */
const FIRST_HALF_WINDOW_PIXELS = 20;
/** The default window spans ±this many estimated FWHM around the centres. */
const WINDOW_HALF_WIDTH_FWHM = 3;
/** …and at least ±this many pixels. */
const MIN_HALF_WINDOW_PIXELS = 8;
/** Lower bound of FWHMs as a fraction of the pixel spacing. */
const MIN_FWHM_PER_PIXEL = 0.01;

/**
 * Fits one line (or a blend of several) in a calibrated spectrum.
 *
 * Method: weighted least squares ({@link leastSquares}, Levenberg–Marquardt with analytic
 * Jacobians) of a polynomial continuum plus N profiles (see `line-model.ts` for the
 * parameters), with weights 1/σᵢ² from the spectrum's uncertainty. Starting values come
 * from the data (see `guess.ts`), so an approximate centre is enough. Derived quantities
 * (FWHM, depth, equivalent width, integrated flux) have analytic gradients and their
 * uncertainties are √(gᵀCg) with C the full covariance.
 *
 * Missing data: unusable pixels (NaN flux, bad uncertainty, masked; see `isUsablePixel`)
 * are skipped. Wavelengths in nm or µm are converted to Å; air or vacuum as in the input.
 * A fit that fails returns `converged: false` with a `reason`; it never throws for
 * numerical trouble.
 *
 * @param spectrum a wavelength-calibrated spectrum.
 * @param options approximate centre(s) in Å (required), window, profile, components,
 *   continuum order, bounds, fixed and tied parameters.
 * @returns the fitted components with uncertainties, χ², reduced χ², correlations and
 *   provenance (the spectrum's, plus a `fit-line` entry).
 * @throws {UsageError} when the spectrum is not calibrated, a centre lies outside it, or
 *   an option is malformed (unknown parameter name, bad order or count).
 * @example
 * const wl = Array.from({ length: 81 }, (_, i) => 6543 + 0.5 * i);
 * const flux = wl.map((w) => 1 - 0.6 * Math.exp(-4 * Math.LN2 * ((w - 6563) / 4) ** 2));
 * const fit = fitLine(createSpectrum({ wavelength: wl, flux }), { centerAngstrom: 6562 });
 * fit.components[0].center.value;           // ≈ 6563
 * fit.components[0].equivalentWidth.value;  // ≈ 0.6 · 4 · 1.0645 = 2.555 Å
 */
export function fitLine(spectrum: Spectrum, options: LineFitOptions): LineFitResult {
  if (spectrum.unit === 'pixel') {
    throw new UsageError('fit.uncalibrated', 'the spectrum has no wavelength scale (its axis is in pixels); calibrate it first, or use fitLineArrays with unit "pixel"');
  }
  const scale = angstromPerUnit(spectrum.unit);
  const m0 = spectrum.flux.length;
  const keep: number[] = [];
  for (let i = 0; i < m0; i++) if (isUsablePixel(spectrum, i)) keep.push(i);
  const flux = pick(spectrum.flux, keep);
  const x = pick(spectrum.wavelength, keep);
  if (scale !== 1) for (let k = 0; k < x.length; k++) x[k] *= scale;
  const prepared = prepare(x, flux, spectrum.uncertainty ? pick(spectrum.uncertainty, keep) : null, 'angstrom', spectrum.provenance, derSnr(flux).snr);
  const { centerAngstrom, windowAngstrom, ...settings } = options;
  return fitPrepared(prepared, { ...settings, center: centerAngstrom, window: windowAngstrom }, { centerAngstrom, windowAngstrom });
}

/**
 * Fits one line (or a blend) in plain arrays: the same as {@link fitLine} with lengths in
 * the unit of `data.x` (Å, or pixels for an uncalibrated lamp spectrum).
 *
 * @param data x (monotonic), flux, optional uncertainty and mask. Unusable pixels are skipped.
 * @param options approximate centre(s) and window in the unit of x, and the shared settings.
 * @returns as {@link fitLine}; provenance holds one `fit-line` entry.
 * @throws {UsageError} for arrays of different lengths, a non-monotonic or non-finite x,
 *   a centre outside the data, or malformed options.
 * @example
 * const x = Array.from({ length: 41 }, (_, i) => i);
 * const flux = x.map((v) => 5 + 100 * Math.exp(-4 * Math.LN2 * ((v - 20.3) / 2.5) ** 2));
 * fitLineArrays({ x, flux, unit: 'pixel' }, { center: 20 }).components[0].center.value; // ≈ 20.3
 */
export function fitLineArrays(data: LineFitData, options: ArrayLineFitOptions): LineFitResult {
  const m0 = data.x.length;
  for (const [name, a] of [['flux', data.flux], ['uncertainty', data.uncertainty], ['mask', data.mask]] as const) {
    if (a && a.length !== m0) throw new UsageError('fit.length-mismatch', `${name} has ${a.length} values but x has ${m0}`);
  }
  for (let i = 0; i < m0; i++) {
    if (!Number.isFinite(data.x[i])) throw new UsageError('fit.bad-x', `x at index ${i} is ${data.x[i]}, not a finite number`);
    if (i > 0 && (data.x[i] - data.x[i - 1]) * (data.x[1] - data.x[0]) <= 0) {
      throw new UsageError('fit.x-not-monotonic', `x is not strictly monotonic at index ${i}`);
    }
  }
  const keep: number[] = [];
  for (let i = 0; i < m0; i++) {
    const s = data.uncertainty ? data.uncertainty[i] : 1;
    if (Number.isFinite(data.flux[i]) && s > 0 && Number.isFinite(s) && !(data.mask && data.mask[i])) keep.push(i);
  }
  const flux = pick(data.flux, keep);
  const prepared = prepare(pick(data.x, keep), flux, data.uncertainty ? pick(data.uncertainty, keep) : null, data.unit ?? 'angstrom', [], derSnr(flux).snr);
  return fitPrepared(prepared, options, { center: options.center, window: options.window, unit: prepared.unit });
}

/** The values of `a` at the indices `idx` (explicit loop: much faster than Float64Array.from with a map function). */
function pick(a: ArrayLike<number>, idx: readonly number[]): Float64Array {
  const out = new Float64Array(idx.length);
  for (let k = 0; k < idx.length; k++) out[k] = a[idx[k]];
  return out;
}

/** A plain array copy of a typed array (explicit loop, for speed). */
function toArray(a: Float64Array): number[] {
  const out = new Array<number>(a.length);
  for (let k = 0; k < a.length; k++) out[k] = a[k];
  return out;
}

/** Usable pixels sorted by increasing x. */
function prepare(x: Float64Array, y: Float64Array, sigma: Float64Array | null, unit: 'angstrom' | 'pixel', provenance: readonly ProvenanceEntry[], snr: number): Prepared {
  if (x.length > 1 && x[0] > x[x.length - 1]) {
    x.reverse(); y.reverse(); sigma?.reverse();
  }
  return { x, y, sigma, unit, provenance, snr };
}

function lowerBound(a: Float64Array, v: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) { const mid = (lo + hi) >> 1; if (a[mid] < v) lo = mid + 1; else hi = mid; }
  return lo;
}

function slice(d: Prepared, start: number, end: number): { x: Float64Array; y: Float64Array; sigma: Float64Array | null } {
  const i0 = lowerBound(d.x, start);
  let i1 = lowerBound(d.x, end);
  if (i1 < d.x.length && d.x[i1] === end) i1++;
  return { x: d.x.subarray(i0, i1), y: d.y.subarray(i0, i1), sigma: d.sigma ? d.sigma.subarray(i0, i1) : null };
}

function fitPrepared(d: Prepared, o: ArrayLineFitOptions, provenanceOptions: Record<string, unknown>): LineFitResult {
  const profile = o.profile ?? 'gaussian';
  if (!LINE_PROFILES.includes(profile)) throw new UsageError('fit.bad-profile', `profile must be one of ${LINE_PROFILES.join(', ')}, got "${profile}"`);
  const centers = typeof o.center === 'number' ? [o.center] : [...o.center];
  if (centers.length === 0 || !centers.every(Number.isFinite)) throw new UsageError('fit.bad-center', 'give at least one finite line centre');
  const components = o.components ?? centers.length;
  if (!Number.isInteger(components) || components < 1 || components > 20) throw new UsageError('fit.bad-components', `components must be a whole number from 1 to 20, got ${components}`);
  if (centers.length > 1 && centers.length !== components) {
    throw new UsageError('fit.bad-components', `${centers.length} centres given for ${components} components: give one centre, or one per component`);
  }
  const continuumOrder = o.continuumOrder ?? 1;
  if (![0, 1, 2].includes(continuumOrder)) throw new UsageError('fit.bad-continuum-order', `continuumOrder must be 0, 1 or 2, got ${continuumOrder}`);
  const sign = o.sign ?? 'auto';
  const m = d.x.length;
  const unitLabel = d.unit === 'angstrom' ? 'Å' : 'pixels';
  if (m === 0) throw new UsageError('fit.no-data', 'the spectrum has no usable pixels');
  for (const c of centers) {
    if (c < d.x[0] || c > d.x[m - 1]) {
      throw new UsageError('fit.center-outside', `line centre ${c} ${unitLabel} is outside the spectrum (${d.x[0]} to ${d.x[m - 1]} ${unitLabel})`);
    }
  }
  if (o.window !== undefined && !(o.window > 0)) throw new UsageError('fit.bad-window', `the window width must be > 0, got ${o.window}`);
  const spacing = m > 1 ? (d.x[m - 1] - d.x[0]) / (m - 1) : 1;
  const cmin = Math.min(...centers), cmax = Math.max(...centers);

  const shapeFor = (w: { x: Float64Array }): LineModelShape => ({
    profile, components, continuumOrder,
    continuumReference: w.x.length ? (w.x[0] + w.x[w.x.length - 1]) / 2 : cmin,
  });
  let win: ReturnType<typeof slice>;
  let start: number, end: number;
  if (o.window !== undefined) {
    start = cmin - o.window / 2;
    end = cmax + o.window / 2;
    win = slice(d, start, end);
  } else {
    // Estimate the components in ±20 pixels around the centres, and take ±3 FWHM around
    // each (at least ±8 pixels around the centres). When that reaches beyond the estimation
    // window (a broad line), estimate again in the larger window; never shrink it, so that
    // the continuum guess always comes from beyond the line.
    let estStart = cmin - FIRST_HALF_WINDOW_PIXELS * spacing;
    let estEnd = cmax + FIRST_HALF_WINDOW_PIXELS * spacing;
    start = estStart;
    end = estEnd;
    for (let pass = 0; pass < 3; pass++) {
      win = slice(d, estStart, estEnd);
      if (win.x.length < 5) break;
      const sh = shapeFor(win);
      const g = guessLineParameters(sh, win.x, win.y, centers, sign);
      start = cmin - MIN_HALF_WINDOW_PIXELS * spacing;
      end = cmax + MIN_HALF_WINDOW_PIXELS * spacing;
      for (let k = 0; k < components; k++) {
        const off = componentOffset(sh, k);
        const f = profileFwhm(profile, g.parameters[off + 1], profile === 'voigt' ? g.parameters[off + 2] : 0, null);
        start = Math.min(start, g.parameters[off] - WINDOW_HALF_WIDTH_FWHM * f);
        end = Math.max(end, g.parameters[off] + WINDOW_HALF_WIDTH_FWHM * f);
      }
      if (start >= estStart && end <= estEnd) break;
      estStart = Math.min(estStart, start);
      estEnd = Math.max(estEnd, end);
    }
    win = slice(d, start, end);
  }
  const shape = shapeFor(win);
  const names = lineModelParameterNames(shape);
  const n = names.length;
  const index = new Map(names.map((nm, j) => [nm, j]));
  const check = (nm: string, what: string) => {
    const j = index.get(nm);
    if (j === undefined) throw new UsageError('fit.unknown-parameter', `unknown parameter "${nm}" in ${what} (parameters: ${names.join(', ')})`);
    return j;
  };
  const mw = win.x.length;
  const uncertaintySource: UncertaintySource = o.uncertaintySource ?? (d.sigma ? 'data' : 'scaled-by-reduced-chi-square');

  // Starting values.
  const p0: { parameters: Float64Array; sign: LineSign } = mw >= 4
    ? guessLineParameters(shape, win.x, win.y, centers, sign)
    : { parameters: new Float64Array(n).fill(1), sign: sign === 'auto' ? 'absorption' : sign };
  const initial = Float64Array.from(p0.parameters);
  for (const [nm, v] of Object.entries(o.initial ?? {})) initial[check(nm, 'initial')] = v;
  const fixed = new Array<boolean>(n).fill(false);
  for (const [nm, v] of Object.entries(o.fixed ?? {})) {
    const j = check(nm, 'fixed');
    if (!Number.isFinite(v)) throw new UsageError('fit.bad-fixed', `fixed value of ${nm} is ${v}, not a finite number`);
    fixed[j] = true;
    initial[j] = v;
  }
  const lower = new Float64Array(n).fill(-Infinity);
  const upper = new Float64Array(n).fill(Infinity);
  const cs = componentSize(profile);
  for (let k = 0; k < components; k++) {
    const off = componentOffset(shape, k);
    lower[off] = mw ? win.x[0] : -Infinity;
    upper[off] = mw ? win.x[mw - 1] : Infinity;
    lower[off + 1] = MIN_FWHM_PER_PIXEL * spacing;
    if (cs === 4) lower[off + 2] = 0;
  }
  for (const [nm, b] of Object.entries(o.bounds ?? {})) {
    const j = check(nm, 'bounds');
    if (!Array.isArray(b) || b.length !== 2 || Number.isNaN(b[0]) || Number.isNaN(b[1]) || b[0] > b[1]) {
      throw new UsageError('fit.bad-bounds', `bounds of ${nm} must be [lower, upper] with lower ≤ upper, got ${JSON.stringify(b)}`);
    }
    lower[j] = b[0];
    upper[j] = b[1];
  }
  // Ties: full[j] = factor · full[to] + offset, with `to` not itself tied.
  const tieTo = new Int32Array(n).fill(-1);
  const tieFactor = new Float64Array(n).fill(1);
  const tieOffset = new Float64Array(n);
  for (const [nm, t] of Object.entries(o.ties ?? {})) {
    const j = check(nm, 'ties');
    const to = check(t.parameter, `the tie of ${nm}`);
    if (to === j) throw new UsageError('fit.bad-tie', `parameter ${nm} cannot be tied to itself`);
    tieTo[j] = to;
    tieFactor[j] = t.factor ?? 1;
    tieOffset[j] = t.offset ?? 0;
    if (!Number.isFinite(tieFactor[j]) || !Number.isFinite(tieOffset[j])) throw new UsageError('fit.bad-tie', `the tie of ${nm} needs a finite factor and offset`);
    if (fixed[j]) throw new UsageError('fit.bad-tie', `parameter ${nm} is both fixed and tied`);
  }
  for (let j = 0; j < n; j++) {
    if (tieTo[j] >= 0 && tieTo[tieTo[j]] >= 0) {
      throw new UsageError('fit.bad-tie', `parameter ${names[j]} is tied to ${names[tieTo[j]]}, which is itself tied; tie both to the same free parameter`);
    }
  }
  const base: number[] = [];
  for (let j = 0; j < n; j++) if (tieTo[j] < 0) base.push(j);
  const baseIndex = new Int32Array(n).fill(-1);
  base.forEach((j, b) => { baseIndex[j] = b; });
  const nr = base.length;
  const expand = (red: ArrayLike<number>, full: Float64Array) => {
    for (let b = 0; b < nr; b++) full[base[b]] = red[b];
    for (let j = 0; j < n; j++) if (tieTo[j] >= 0) full[j] = tieFactor[j] * full[tieTo[j]] + tieOffset[j];
  };

  const full = new Float64Array(n);
  const model = new Float64Array(mw);
  const jfull = new Float64Array(mw * n);
  let invSigma: Float64Array | null = null;
  if (win.sigma) {
    invSigma = new Float64Array(mw);
    for (let i = 0; i < mw; i++) invSigma[i] = 1 / win.sigma[i];
  }
  const ls = leastSquares({
    residualCount: mw,
    evaluate(red, res, jac) {
      if (nr === n) {
        // No ties: the model's Jacobian is the solver's, row-scaled by 1/σ.
        evaluateLineModel(shape, red, win.x, model, jac);
        for (let i = 0; i < mw; i++) {
          const w = invSigma ? invSigma[i] : 1;
          res[i] = (model[i] - win.y[i]) * w;
          if (w !== 1) for (let j = i * n, e = j + n; j < e; j++) jac[j] *= w;
        }
        return;
      }
      expand(red, full);
      evaluateLineModel(shape, full, win.x, model, jfull);
      jac.fill(0);
      for (let i = 0; i < mw; i++) {
        const w = invSigma ? invSigma[i] : 1;
        res[i] = (model[i] - win.y[i]) * w;
        const rowF = i * n, rowR = i * nr;
        for (let j = 0; j < n; j++) {
          const v = jfull[rowF + j];
          if (tieTo[j] >= 0) jac[rowR + baseIndex[tieTo[j]]] += tieFactor[j] * v * w;
          else jac[rowR + baseIndex[j]] += v * w;
        }
      }
    },
  }, {
    initial: base.map((j) => initial[j]),
    lower: base.map((j) => lower[j]),
    upper: base.map((j) => upper[j]),
    fixed: base.map((j) => fixed[j]),
    parameterNames: base.map((j) => names[j]),
    uncertaintySource,
    ...o.solver,
  });

  // Back to the full parameter space: p = T·red + offset, C = T C_red Tᵀ.
  expand(ls.parameters, full);
  // Each full parameter j is factor_j × reduced parameter src_j (+ offset), so C_ij = f_i f_j C_red[src_i][src_j].
  const src = Array.from({ length: n }, (_, j) => (tieTo[j] >= 0 ? baseIndex[tieTo[j]] : baseIndex[j]));
  const fac = Array.from({ length: n }, (_, j) => (tieTo[j] >= 0 ? tieFactor[j] : 1));
  const cov: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => fac[i] * fac[j] * ls.covariance[src[i]][src[j]]));
  const unc = cov.map((row, j) => Math.sqrt(row[j]));
  const corr = cov.map((row, i) => row.map((v, j) => (i === j ? (Number.isNaN(v) ? NaN : 1) : unc[i] > 0 && unc[j] > 0 ? v / (unc[i] * unc[j]) : Number.isNaN(v) ? NaN : 0)));
  const mv = (g: { value: number; gradient: Float64Array }): MeasuredValue => ({ value: g.value, uncertainty: propagate(g.gradient, cov) });
  const comps: LineComponentResult[] = [];
  for (let k = 0; k < components; k++) {
    const dq = componentDerived(shape, full, k);
    const off = componentOffset(shape, k);
    const c: LineComponentResult = {
      center: mv(dq.center),
      fwhm: mv(dq.fwhm),
      ...(profile === 'voigt' ? {
        fwhmGaussian: { value: full[off + 1], uncertainty: unc[off + 1] },
        fwhmLorentzian: { value: full[off + 2], uncertainty: unc[off + 2] },
      } : {}),
      amplitude: mv(dq.amplitude),
      continuumAtCenter: mv(dq.continuumAtCenter),
      depth: mv(dq.depth),
      equivalentWidth: mv(dq.equivalentWidth),
      integratedFlux: mv(dq.integratedFlux),
    };
    comps.push(c);
  }
  const curveModel = new Float64Array(mw);
  evaluateLineModel(shape, full, win.x, curveModel, null);
  const contOnly = Array.from(win.x, (xv) => {
    const t = xv - shape.continuumReference;
    return full[0] + (continuumOrder >= 1 ? full[1] * t : 0) + (continuumOrder >= 2 ? full[2] * t * t : 0);
  });
  const atBoundRed = ls.atBound;
  return {
    converged: ls.converged,
    reason: ls.reason,
    message: ls.message,
    profile,
    sign: p0.sign,
    unit: d.unit,
    window: { start, end, pixelsUsed: mw },
    components: comps,
    continuum: {
      order: continuumOrder,
      reference: shape.continuumReference,
      coefficients: Array.from({ length: continuumOrder + 1 }, (_, j) => ({ value: full[j], uncertainty: unc[j] })),
    },
    parameters: names.map((name, j) => ({
      name,
      value: full[j],
      uncertainty: unc[j],
      fixed: fixed[j],
      ...(tieTo[j] >= 0 ? { tiedTo: names[tieTo[j]] } : {}),
      atBound: tieTo[j] < 0 ? atBoundRed[baseIndex[j]] : false,
    })),
    correlation: corr,
    chiSquare: ls.chiSquare,
    degreesOfFreedom: ls.degreesOfFreedom,
    reducedChiSquare: ls.reducedChiSquare,
    uncertaintySource,
    iterations: ls.iterations,
    signalToNoise: d.snr,
    curve: { x: toArray(win.x), flux: toArray(win.y), model: toArray(curveModel), continuum: contOnly },
    provenance: Object.freeze([
      ...d.provenance,
      provenanceEntry('fit-line', {
        ...provenanceOptions,
        profile, components, continuumOrder, sign: p0.sign,
        window: [start, end],
        ...(o.bounds ? { bounds: o.bounds } : {}),
        ...(o.fixed ? { fixed: o.fixed } : {}),
        ...(o.ties ? { ties: o.ties } : {}),
        uncertaintySource,
      }),
    ]),
  };
}

/**
 * Fits one window found by `findLines`: its lines as components, started from the
 * finder's centres, FWHMs and amplitudes, over a window covering the finder's range.
 *
 * Method: {@link fitLine} with `centerAngstrom` = the window's centres, a symmetric window
 * width covering [start, end], and starting values from the detections (a Voigt starts
 * with equal Gaussian and Lorentzian FWHMs). Works on pixel-axis spectra too (lengths in
 * pixels), through {@link fitLineArrays}.
 *
 * @param spectrum the spectrum the window was found in.
 * @param window a window from `findLines(spectrum)` (lengths in its result's unit).
 * @param settings profile, continuum order, bounds, fixed and tied parameters (as for fitLine).
 * @returns the fit, as {@link fitLine}.
 * @throws {UsageError} when the window does not lie in the spectrum, or for malformed settings.
 * @example
 * const found = findLines(spectrum);
 * const fits = found.windows.map((w) => fitWindow(spectrum, w));
 */
export function fitWindow(spectrum: Spectrum, window: LineWindow, settings: LineFitSettings = {}): LineFitResult {
  const profile = settings.profile ?? 'gaussian';
  const cmin = Math.min(...window.centers), cmax = Math.max(...window.centers);
  const width = 2 * Math.max(cmin - window.start, window.end - cmax, 0);
  const initial: Record<string, number> = {};
  window.lines.forEach((l, k) => {
    const j = k + 1;
    if (profile === 'voigt') {
      initial[`fwhmGaussian${j}`] = l.fwhm / VOIGT_EQUAL_WIDTH_FACTOR;
      initial[`fwhmLorentzian${j}`] = l.fwhm / VOIGT_EQUAL_WIDTH_FACTOR;
    } else initial[`fwhm${j}`] = l.fwhm;
    initial[`amplitude${j}`] = l.amplitude;
  });
  const merged: LineFitSettings = {
    ...settings,
    components: window.lines.length,
    sign: settings.sign ?? (window.sign === 'mixed' ? 'auto' : window.sign),
    initial: { ...initial, ...settings.initial },
  };
  const centers = window.lines.map((l) => l.center);
  if (spectrum.unit === 'pixel') {
    return fitLineArrays(
      { x: spectrum.wavelength, unit: 'pixel', flux: spectrum.flux, uncertainty: spectrum.uncertainty, mask: spectrum.mask },
      { ...merged, center: centers, window: width },
    );
  }
  return fitLine(spectrum, { ...merged, centerAngstrom: centers, windowAngstrom: width });
}

/** Total FWHM of a Voigt with equal Gaussian and Lorentzian FWHM a is a·(0.5346 + √1.2166) (Olivero & Longbothum 1977). */
const VOIGT_EQUAL_WIDTH_FACTOR = 0.5346 + Math.sqrt(0.2166 + 1);
