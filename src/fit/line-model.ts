/**
 * The model fitted to a spectral window: a polynomial continuum (order 0–2, in powers of
 * x − x_ref) plus N line components of one profile shape, each amplitude · S(x − centre).
 *
 * Parameter vector layout (and names):
 *   continuumConstant, [continuumSlope], [continuumCurvature],
 *   then per component k = 1…N: centerk, fwhmk (or fwhmGaussiank, fwhmLorentziank), amplitudek.
 * Centres and widths are in the unit of x (Å for calibrated spectra), widths are FWHM;
 * amplitudes are in flux units, negative for absorption; the continuum is
 * c₀ + c₁(x − x_ref) + c₂(x − x_ref)² with x_ref the middle of the window.
 */
import { PROFILE_WIDTH_NAMES, profileAndGradient, profileArea, profileFwhm, type LineProfile } from './profiles.js';

/** Polynomial order of the continuum under a line. */
export type ContinuumOrder = 0 | 1 | 2;

const CONTINUUM_NAMES = ['continuumConstant', 'continuumSlope', 'continuumCurvature'] as const;

/** The shape of a line model: which profile, how many components, which continuum. */
export interface LineModelShape {
  readonly profile: LineProfile;
  readonly components: number;
  readonly continuumOrder: ContinuumOrder;
  /** x_ref of the continuum polynomial. */
  readonly continuumReference: number;
}

/** Number of parameters of one component (centre, widths, amplitude). */
export function componentSize(profile: LineProfile): number {
  return PROFILE_WIDTH_NAMES[profile].length + 2;
}

/**
 * Names of a line model's parameters in vector order: the continuum coefficients, then
 * per component (numbered from 1) its centre, FWHM(s) and amplitude. These are the names
 * that `initial`, `bounds`, `fixed` and `ties` of the line fits accept.
 *
 * @param shape profile, number of components, continuum order (the reference point is not used).
 * @returns the names, e.g. `continuumConstant, continuumSlope, center1, fwhm1, amplitude1`.
 * @example
 * lineModelParameterNames({ profile: 'voigt', components: 1, continuumOrder: 0, continuumReference: 0 });
 * // ['continuumConstant', 'center1', 'fwhmGaussian1', 'fwhmLorentzian1', 'amplitude1']
 */
export function lineModelParameterNames(shape: LineModelShape): string[] {
  const names: string[] = CONTINUUM_NAMES.slice(0, shape.continuumOrder + 1);
  for (let k = 1; k <= shape.components; k++) {
    names.push(`center${k}`, ...PROFILE_WIDTH_NAMES[shape.profile].map((w) => `${w}${k}`), `amplitude${k}`);
  }
  return names;
}

/** Index of component k's first parameter (its centre) in the vector; k from 0. */
export function componentOffset(shape: LineModelShape, k: number): number {
  return shape.continuumOrder + 1 + k * componentSize(shape.profile);
}

/** The continuum at x, with ∂/∂cⱼ in grad (length order + 1) when given. */
export function continuumAt(shape: LineModelShape, p: ArrayLike<number>, x: number, grad?: Float64Array): number {
  const t = x - shape.continuumReference;
  let v = p[0];
  if (grad) grad[0] = 1;
  if (shape.continuumOrder >= 1) { v += p[1] * t; if (grad) grad[1] = t; }
  if (shape.continuumOrder >= 2) { v += p[2] * t * t; if (grad) grad[2] = t * t; }
  return v;
}

const GRAD = new Float64Array(3);

/**
 * Evaluates the model at every x into `out`, and (when `jacobian` is given, row-major
 * m × n) its derivatives with respect to every parameter.
 */
export function evaluateLineModel(
  shape: LineModelShape, p: ArrayLike<number>, x: ArrayLike<number>, out: Float64Array, jacobian: Float64Array | null,
): void {
  const n = lineModelParameterCount(shape);
  const nc = shape.continuumOrder + 1;
  const cs = componentSize(shape.profile);
  const g = GRAD;
  const ref = shape.continuumReference;
  for (let i = 0; i < x.length; i++) {
    const t = x[i] - ref;
    let v = p[0];
    const row = i * n;
    if (jacobian) jacobian[row] = 1;
    if (nc > 1) { v += p[1] * t; if (jacobian) jacobian[row + 1] = t; }
    if (nc > 2) { v += p[2] * t * t; if (jacobian) jacobian[row + 2] = t * t; }
    for (let k = 0; k < shape.components; k++) {
      const o = nc + k * cs;
      const c = p[o];
      const amp = p[o + cs - 1];
      const s = profileAndGradient(shape.profile, x[i] - c, p[o + 1], cs === 4 ? p[o + 2] : 0, jacobian ? g : null);
      v += amp * s;
      if (jacobian) {
        jacobian[row + o] = amp * g[0];
        jacobian[row + o + 1] = amp * g[1];
        if (cs === 4) jacobian[row + o + 2] = amp * g[2];
        jacobian[row + o + cs - 1] = s;
      }
    }
    out[i] = v;
  }
}

/** Number of parameters of the model. */
export function lineModelParameterCount(shape: LineModelShape): number {
  return shape.continuumOrder + 1 + shape.components * componentSize(shape.profile);
}

/** A derived quantity of one component with its gradient over the whole parameter vector. */
export interface DerivedQuantity {
  value: number;
  gradient: Float64Array;
}

/** Derived quantities of component k (from 0), each with its gradient over the full parameter vector. */
export interface ComponentDerived {
  center: DerivedQuantity;
  fwhm: DerivedQuantity;
  amplitude: DerivedQuantity;
  /** Continuum at the line centre (flux units). */
  continuumAtCenter: DerivedQuantity;
  /** −amplitude / continuum at centre (fraction; positive for absorption). NaN when the continuum is ≤ 0. */
  depth: DerivedQuantity;
  /** ∫ amplitude·S dx over the whole profile (flux × x unit; negative for absorption). */
  integratedFlux: DerivedQuantity;
  /** −integratedFlux / continuum at centre (x unit; positive for absorption). NaN when the continuum is ≤ 0. */
  equivalentWidth: DerivedQuantity;
}

/**
 * Centre, FWHM, amplitude, depth, integrated flux and equivalent width of component k,
 * each with its analytic gradient, for propagating the covariance (σ² = gᵀ C g).
 */
export function componentDerived(shape: LineModelShape, p: ArrayLike<number>, k: number): ComponentDerived {
  const n = lineModelParameterCount(shape);
  const nc = shape.continuumOrder + 1;
  const cs = componentSize(shape.profile);
  const o = componentOffset(shape, k);
  const voigt = cs === 4;
  const vec = () => new Float64Array(n);
  const c = p[o];
  const w0 = p[o + 1];
  const w1 = voigt ? p[o + 2] : 0;
  const amp = p[o + cs - 1];

  const center = { value: c, gradient: vec() };
  center.gradient[o] = 1;
  const amplitude = { value: amp, gradient: vec() };
  amplitude.gradient[o + cs - 1] = 1;

  const wg = new Float64Array(2);
  const fwhm = { value: profileFwhm(shape.profile, w0, w1, wg), gradient: vec() };
  fwhm.gradient[o + 1] = wg[0];
  if (voigt) fwhm.gradient[o + 2] = wg[1];

  // Continuum at the centre: depends on the continuum coefficients and on the centre.
  const cg = new Float64Array(3);
  const cont = continuumAt(shape, p, c, cg);
  const continuumAtCenter = { value: cont, gradient: vec() };
  for (let j = 0; j < nc; j++) continuumAtCenter.gradient[j] = cg[j];
  const t = c - shape.continuumReference;
  continuumAtCenter.gradient[o] = (nc > 1 ? p[1] : 0) + (nc > 2 ? 2 * p[2] * t : 0);

  const ag = new Float64Array(2);
  const area = profileArea(shape.profile, w0, w1, ag);
  const integratedFlux = { value: amp * area, gradient: vec() };
  integratedFlux.gradient[o + 1] = amp * ag[0];
  if (voigt) integratedFlux.gradient[o + 2] = amp * ag[1];
  integratedFlux.gradient[o + cs - 1] = area;

  const ratio = (num: DerivedQuantity): DerivedQuantity => {
    if (!(cont > 0)) return { value: NaN, gradient: vec().fill(NaN) };
    const g = vec();
    for (let j = 0; j < n; j++) g[j] = -(num.gradient[j] / cont - (num.value * continuumAtCenter.gradient[j]) / (cont * cont));
    return { value: -num.value / cont, gradient: g };
  };
  return {
    center, fwhm, amplitude, continuumAtCenter,
    depth: ratio(amplitude),
    integratedFlux,
    equivalentWidth: ratio(integratedFlux),
  };
}

/** √(gᵀ C g): the 1-σ uncertainty of a derived quantity with gradient g and covariance C. */
export function propagate(gradient: ArrayLike<number>, covariance: readonly (readonly number[])[]): number {
  let s = 0;
  for (let i = 0; i < gradient.length; i++) {
    const gi = gradient[i];
    if (gi === 0) continue;
    for (let j = 0; j < gradient.length; j++) if (gradient[j] !== 0) s += gi * covariance[i][j] * gradient[j];
  }
  return Math.sqrt(Math.max(0, s));
}
