/**
 * Synthetic spectra from physics: lines at their rest wavelengths (air or vacuum) with
 * Gaussian, Lorentzian or Voigt profiles, on a flat, polynomial or Planck continuum,
 * Doppler-shifted, blurred by the instrument to a resolving power R, integrated over each
 * pixel, and given photon and read noise from a seed. For tests and simulations (inject a
 * known velocity, recover it), cross-correlation templates and demo data.
 *
 * How the model is made (noise-free):
 * 1. A fine grid with a constant step in ln λ covers the pixels (at least `oversampling`
 *    points per pixel, 5 per line FWHM and 5 per instrumental FWHM).
 * 2. The line spectrum is the product L(λ) = Πₖ (1 + aₖ Sₖ(λ − λₖ)) of peak-normalised
 *    profiles Sₖ (aₖ = −depth for absorption, +height for emission), each at its observed
 *    wavelength λₖ: the rest wavelength converted to vacuum, times 1 + z (relativistic
 *    Doppler factor of the velocity), converted to the grid's medium (Peck & Reeder 1972).
 *    A product keeps overlapping absorption lines above zero flux; an isolated line has
 *    exactly the depth and equivalent width asked for.
 * 3. L is convolved with a Gaussian of FWHM λ/R (constant in velocity, c/R: symmetric in
 *    ln λ, so a line's centroid in λ moves by about λ·σ²/2 with σ = 1/(2.3548·R), 1 m/s at
 *    R = 8000), then multiplied by the continuum C(λ) (not Doppler-shifted: it is smooth).
 * 4. Each pixel gets the mean of C·L over its bin (edges half-way between pixel centres),
 *    integrated exactly for the piecewise-linear fine model.
 *
 * Noise: the model is scaled so that the continuum's highest pixel holds `peakCounts`
 * photo-electrons; each pixel gets σ = √(electrons + readNoise²) (photon noise of the
 * expected count plus read noise, in electrons) and a Gaussian deviate of that σ (the normal
 * approximation to Poisson noise: within 1 % in σ from about 25 electrons up, common
 * practice). Flux and σ are returned in the model's units. The uncertainty given with the
 * spectrum is σ of the noise-free model, as a simulation knows it exactly.
 */
import { UsageError } from '../errors.js';
import { faddeeva } from '../math/faddeeva.js';
import { circularCrossCorrelation, nextPowerOfTwo } from '../math/fft.js';
import { normalGenerator } from '../math/random.js';
import { airToVacuum, vacuumToAir } from '../spectrum/air-vacuum.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../spectrum/constants.js';
import { binEdges, logLinearGrid } from '../spectrum/grid.js';
import type { Header } from '../spectrum/header.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import { createSpectrum, deriveSpectrum, type Spectrum } from '../spectrum/spectrum.js';
import { filterLineList, loadLineList, type LineEntry, type LineList } from './linelist.js';

/** Profile shape of a synthetic line (the same shapes as the line fitter's). */
export type SyntheticProfile = 'gaussian' | 'lorentzian' | 'voigt';

/** One line of a synthetic spectrum. Give exactly one of `depth` and `equivalentWidthAngstrom`. */
export interface SyntheticLine {
  /** Rest wavelength, Å, in `medium`. */
  readonly wavelengthAngstrom: number;
  /** Medium of `wavelengthAngstrom` (converted to the grid's medium as needed). */
  readonly medium: 'air' | 'vacuum';
  /**
   * Intrinsic peak of the line relative to the continuum, before instrumental blurring:
   * the fractional depth for absorption (0 < depth ≤ 1), the height for emission (> 0).
   */
  readonly depth?: number;
  /** Equivalent width, Å (> 0), of the intrinsic line; blurring keeps it for an isolated line. */
  readonly equivalentWidthAngstrom?: number;
  /** Intrinsic FWHM, Å (> 0): of the Gaussian or Lorentzian, or of a Voigt's Gaussian part. */
  readonly fwhmAngstrom: number;
  /** Voigt only: FWHM of the Lorentzian part, Å (≥ 0). */
  readonly fwhmLorentzianAngstrom?: number;
  /** Default `gaussian`. */
  readonly profile?: SyntheticProfile;
  /** Default `absorption`. */
  readonly kind?: 'absorption' | 'emission';
  /** Label only (e.g. `Fe I`). */
  readonly species?: string;
}

/**
 * The continuum of a synthetic spectrum:
 * - `flat`: `level` everywhere (default 1);
 * - `polynomial`: Σₖ coefficients[k]·(λ − referenceAngstrom)ᵏ with λ in Å (reference default: the middle of the grid);
 * - `planck`: the Planck law B_λ(T) per unit wavelength at the vacuum wavelength (air
 *   wavelengths are converted first), scaled so that its highest pixel is `level` (default 1).
 */
export type SyntheticContinuum =
  | { readonly shape: 'flat'; readonly level?: number }
  | { readonly shape: 'polynomial'; readonly coefficients: readonly number[]; readonly referenceAngstrom?: number }
  | { readonly shape: 'planck'; readonly temperatureK: number; readonly level?: number };

/** Photon and read noise. */
export interface SyntheticNoise {
  /** Photo-electrons per pixel at the continuum's highest pixel (> 0); S/N there is peakCounts/√(peakCounts + readNoise²). */
  readonly peakCounts: number;
  /** Read noise, electrons rms per pixel (≥ 0). Default 0. */
  readonly readNoiseElectrons?: number;
  /** Seed of the generator (its low 32 bits): the same seed gives the same noise. */
  readonly seed: number;
}

/** Options of {@link syntheticSpectrum}. Every default is written once, in {@link SYNTHETIC_DEFAULTS}. */
export interface SyntheticSpectrumOptions {
  /** Pixel centres, Å, strictly increasing, at least 2. */
  readonly wavelengthAngstrom: ArrayLike<number>;
  /** Medium of the pixel wavelengths. */
  readonly medium: 'air' | 'vacuum';
  /** The lines (may be empty; lines outside the grid still contribute their wings). */
  readonly lines: readonly SyntheticLine[];
  /** Default flat at 1. */
  readonly continuum?: SyntheticContinuum;
  /** Line-of-sight velocity of the source, km/s, positive receding (relativistic Doppler factor). Default 0. */
  readonly velocityKmPerS?: number;
  /** Resolving power R = λ/FWHM of the instrument's Gaussian line-spread function (> 0); absent: no blurring. */
  readonly resolvingPower?: number;
  /** Noise; absent: the returned spectrum is the noise-free model (without uncertainty). */
  readonly noise?: SyntheticNoise;
  /** Fine-grid points per pixel (≥ 2). Default 8. */
  readonly oversampling?: number;
  /** Header cards for the spectrum (e.g. DATE-OBS, RA, DEC). */
  readonly header?: Header;
}

/** A synthetic spectrum and what it was made from. */
export interface SyntheticSpectrum {
  /** The noisy spectrum (flux in the model's units, uncertainty σ), or the noise-free model when no noise was asked for. */
  readonly spectrum: Spectrum;
  /** Noise-free flux per pixel. */
  readonly model: Float64Array;
  /** Noise-free continuum per pixel (the model without lines). */
  readonly continuum: Float64Array;
  /** 1-σ noise per pixel in flux units, or null without noise. */
  readonly sigma: Float64Array | null;
  /** Photo-electrons per flux unit (peakCounts / highest continuum pixel), or null without noise. */
  readonly electronsPerFluxUnit: number | null;
  /** S/N per pixel at the continuum's highest pixel, or null without noise. */
  readonly peakSignalToNoise: number | null;
}

/** The defaults of {@link syntheticSpectrum} and {@link lineListTemplate}. */
export const SYNTHETIC_DEFAULTS = Object.freeze({
  oversampling: 8,
  velocityKmPerS: 0,
  continuumLevel: 1,
  profile: 'gaussian' as const,
  kind: 'absorption' as const,
  readNoiseElectrons: 0,
  /** Fine-grid points per line FWHM and per instrumental FWHM. */
  pointsPerFwhm: 5,
  /** Template lines: depth, strongest lines kept per species, pixels per resolution element. */
  templateDepth: 0.5,
  maxLinesPerSpecies: 30,
  templatePixelsPerResolutionElement: 3,
});

/** Largest fine model grid (points); a larger one means lines or pixels far narrower than the range is wide. */
export const MAX_MODEL_GRID_POINTS = 1 << 22;

/**
 * Second radiation constant c₂ = hc/k = 1.438 776 877 × 10⁻² m·K, in Å·K. Exact in the SI
 * since 2019, where h, c and k have fixed values (CODATA 2018).
 */
const C2_ANGSTROM_K = 1.438776877e8;
const FOUR_LN2 = 4 * Math.LN2;
const GAUSSIAN_FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
/** Profiles are evaluated out to where they fall below this fraction of their peak. */
const PROFILE_CUTOFF = 1e-6;
/** Instrumental Gaussian kernels reach ±this many σ. */
const KERNEL_HALF_WIDTH_SIGMA = 6;
/** Direct convolution up to this many taps each side; FFT beyond. */
const DIRECT_CONVOLUTION_MAX_HALF_WIDTH = 40;

const wbuf = new Float64Array(2);

interface PreparedLine {
  centre: number;
  amplitude: number;
  profile: SyntheticProfile;
  fwhm: number;
  fwhmL: number;
  /** Voigt: σ√2 and Re w(iy₀). */
  s2: number;
  peak: number;
  halfWindow: number;
}

/** Peak-normalised profile value at `u` = λ − centre. */
function profileAt(l: PreparedLine, u: number): number {
  switch (l.profile) {
    case 'gaussian':
      return Math.exp((-FOUR_LN2 * u * u) / (l.fwhm * l.fwhm));
    case 'lorentzian': {
      const q = (2 * u) / l.fwhm;
      return 1 / (1 + q * q);
    }
    case 'voigt':
      faddeeva(u / l.s2, l.fwhmL / 2 / l.s2, wbuf);
      return wbuf[0] / l.peak;
  }
}

/** ∫ S du of a peak-normalised profile (Å). */
function profileArea(profile: SyntheticProfile, fwhm: number, fwhmL: number): number {
  if (profile === 'gaussian') return fwhm * Math.sqrt(Math.PI / FOUR_LN2);
  if (profile === 'lorentzian') return (Math.PI / 2) * fwhm;
  const sigma = fwhm / GAUSSIAN_FWHM_PER_SIGMA;
  faddeeva(0, fwhmL / 2 / (sigma * Math.SQRT2), wbuf);
  return (sigma * Math.sqrt(2 * Math.PI)) / wbuf[0];
}

/** Total FWHM of a Voigt profile, Olivero & Longbothum 1977 (JQSRT 17, 233), good to 0.02 %. */
function approximateVoigtFwhm(fG: number, fL: number): number {
  return 0.5346 * fL + Math.sqrt(0.2166 * fL * fL + fG * fG);
}

function redshiftOf(velocityKmPerS: number): number {
  const beta = velocityKmPerS / SPEED_OF_LIGHT_KM_PER_S;
  if (!Number.isFinite(beta) || Math.abs(beta) >= 1) {
    throw new UsageError('synthetic.bad-velocity', `the velocity must be a finite number of km/s below the speed of light in size (got ${velocityKmPerS})`);
  }
  return Math.sqrt((1 + beta) / (1 - beta)) - 1;
}

/** Observed wavelength in the grid's medium of a rest wavelength: Doppler factor applied to the vacuum wavelength. */
function observedWavelength(rest: number, restMedium: 'air' | 'vacuum', z: number, gridMedium: 'air' | 'vacuum'): number {
  if (z === 0 && restMedium === gridMedium) return rest;
  const vac = (restMedium === 'vacuum' ? rest : airToVacuum(rest)) * (1 + z);
  return gridMedium === 'vacuum' ? vac : vacuumToAir(vac);
}

function prepareLine(line: SyntheticLine, index: number, z: number, gridMedium: 'air' | 'vacuum'): PreparedLine {
  const what = `line ${index} (${line.wavelengthAngstrom} Å)`;
  const profile = line.profile ?? SYNTHETIC_DEFAULTS.profile;
  if (profile !== 'gaussian' && profile !== 'lorentzian' && profile !== 'voigt') {
    throw new UsageError('synthetic.bad-profile', `${what}: profile must be gaussian, lorentzian or voigt (got ${String(profile)})`);
  }
  const kind = line.kind ?? SYNTHETIC_DEFAULTS.kind;
  if (kind !== 'absorption' && kind !== 'emission') throw new UsageError('synthetic.bad-kind', `${what}: kind must be absorption or emission (got ${String(kind)})`);
  if (line.medium !== 'air' && line.medium !== 'vacuum') throw new UsageError('synthetic.bad-medium', `${what}: medium must be air or vacuum (got ${String(line.medium)})`);
  if (!(line.wavelengthAngstrom > 0) || !Number.isFinite(line.wavelengthAngstrom)) {
    throw new UsageError('synthetic.bad-line', `${what}: the rest wavelength must be a positive number of Å`);
  }
  const fwhm = line.fwhmAngstrom;
  const fwhmL = profile === 'voigt' ? (line.fwhmLorentzianAngstrom ?? 0) : 0;
  if (!(fwhm > 0) || !Number.isFinite(fwhm) || !(fwhmL >= 0) || !Number.isFinite(fwhmL)) {
    throw new UsageError('synthetic.bad-width', `${what}: the FWHM must be a positive number of Å (a Voigt's Lorentzian FWHM may be 0)`);
  }
  if ((line.depth === undefined) === (line.equivalentWidthAngstrom === undefined)) {
    throw new UsageError('synthetic.depth-or-width', `${what}: give exactly one of depth and equivalentWidthAngstrom`);
  }
  const stretch = 1 + z;
  const fw = fwhm * stretch;
  const fwL = fwhmL * stretch;
  let strength: number;
  if (line.depth !== undefined) {
    strength = line.depth;
  } else {
    const ew = line.equivalentWidthAngstrom!;
    if (!(ew > 0) || !Number.isFinite(ew)) throw new UsageError('synthetic.bad-strength', `${what}: the equivalent width must be a positive number of Å`);
    strength = ew / profileArea(profile, fwhm, fwhmL);
  }
  if (!(strength > 0) || !Number.isFinite(strength) || (kind === 'absorption' && strength > 1)) {
    throw new UsageError(
      'synthetic.bad-strength',
      kind === 'absorption'
        ? `${what}: an absorption line's depth must lie in (0, 1] (got ${strength.toPrecision(4)}${line.depth === undefined ? ' from its equivalent width' : ''})`
        : `${what}: an emission line's height must be a positive number`,
    );
  }
  const s2 = (fw / GAUSSIAN_FWHM_PER_SIGMA) * Math.SQRT2;
  let peak = 1;
  if (profile === 'voigt') {
    faddeeva(0, fwL / 2 / s2, wbuf);
    peak = wbuf[0];
  }
  const gaussianReach = fw * Math.sqrt(Math.log(1 / PROFILE_CUTOFF) / FOUR_LN2);
  const lorentzReach = (w: number) => (w / 2) * Math.sqrt(1 / PROFILE_CUTOFF);
  const halfWindow = profile === 'gaussian' ? gaussianReach : profile === 'lorentzian' ? lorentzReach(fw) : Math.max(gaussianReach, lorentzReach(fwL));
  return {
    centre: observedWavelength(line.wavelengthAngstrom, line.medium, z, gridMedium),
    amplitude: kind === 'absorption' ? -strength : strength,
    profile, fwhm: fw, fwhmL: fwL, s2, peak, halfWindow,
  };
}

/** Planck B_λ up to a constant factor, for a vacuum wavelength in Å. */
function planckShape(vacuumAngstrom: number, temperatureK: number): number {
  const x = C2_ANGSTROM_K / (vacuumAngstrom * temperatureK);
  const l = vacuumAngstrom / 1e4;
  return 1 / (l * l * l * l * l * Math.expm1(x));
}

function continuumFunction(c: SyntheticContinuum, medium: 'air' | 'vacuum', middle: number): (x: number) => number {
  switch (c.shape) {
    case 'flat': {
      const level = c.level ?? SYNTHETIC_DEFAULTS.continuumLevel;
      if (!Number.isFinite(level)) throw new UsageError('synthetic.bad-continuum', `the continuum level must be a finite number (got ${level})`);
      return () => level;
    }
    case 'polynomial': {
      const k = c.coefficients;
      const ref = c.referenceAngstrom ?? middle;
      if (k.length === 0 || !k.every(Number.isFinite) || !Number.isFinite(ref)) {
        throw new UsageError('synthetic.bad-continuum', 'a polynomial continuum needs at least one finite coefficient and a finite reference wavelength');
      }
      return (x) => {
        const t = x - ref;
        let s = 0;
        for (let i = k.length - 1; i >= 0; i--) s = s * t + k[i];
        return s;
      };
    }
    case 'planck': {
      const T = c.temperatureK;
      if (!(T > 0) || !Number.isFinite(T)) throw new UsageError('synthetic.bad-continuum', `the Planck continuum needs a positive temperature in K (got ${T})`);
      return medium === 'vacuum' ? (x) => planckShape(x, T) : (x) => planckShape(airToVacuum(x), T);
    }
    default:
      throw new UsageError('synthetic.bad-continuum', `unknown continuum shape "${String((c as { shape: unknown }).shape)}" (flat, polynomial or planck)`);
  }
}

/** Convolves `a` with a symmetric kernel `k` (taps −K…K stored as k[0..2K]), ends extended with the edge values. */
function convolveSymmetric(a: Float64Array, k: Float64Array): Float64Array {
  const n = a.length;
  const K = (k.length - 1) / 2;
  const out = new Float64Array(n);
  if (K <= DIRECT_CONVOLUTION_MAX_HALF_WIDTH) {
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let t = -K; t <= K; t++) {
        const i = j + t;
        s += k[t + K] * a[i < 0 ? 0 : i >= n ? n - 1 : i];
      }
      out[j] = s;
    }
    return out;
  }
  // FFT: for a symmetric kernel the circular cross-correlation is the convolution.
  const size = nextPowerOfTwo(n + 2 * K);
  const ext = new Float64Array(size);
  for (let i = 0; i < n + 2 * K; i++) {
    const src = i - K;
    ext[i] = a[src < 0 ? 0 : src >= n ? n - 1 : src];
  }
  const ker = new Float64Array(size);
  for (let t = -K; t <= K; t++) ker[(t + size) % size] = k[t + K];
  const c = circularCrossCorrelation(ext, ker);
  for (let j = 0; j < n; j++) out[j] = c[j + K];
  return out;
}

/**
 * A synthetic spectrum on a given wavelength grid: lines at rest wavelengths (air or
 * vacuum), Doppler-shifted, blurred to a resolving power, on a continuum, integrated over
 * the pixels, with seeded photon and read noise (see the module notes for the method).
 *
 * @param options the grid (Å, medium), lines, continuum, velocity (km/s, positive
 *   receding), resolving power, noise (peak photo-electrons, read noise, seed).
 * @returns the spectrum (noisy, with uncertainty σ, when `noise` is given), the noise-free
 *   model, its continuum and σ per pixel. Provenance step `synthetic-spectrum`.
 * @throws {UsageError} for a grid that is not strictly increasing or has fewer than 2
 *   pixels, a line with a bad wavelength, width, depth or equivalent width (an absorption
 *   depth above 1), a velocity of c or more, a bad continuum or noise setting, a model
 *   that is negative where noise is asked for, or a fine grid of more than
 *   {@link MAX_MODEL_GRID_POINTS} points; `airvac.out-of-range` when an air/vacuum
 *   conversion is needed outside 2000–25 000 Å.
 * @example
 * const wl = Array.from({ length: 400 }, (_, i) => 6500 + 0.25 * i);
 * const s = syntheticSpectrum({
 *   wavelengthAngstrom: wl, medium: 'air', velocityKmPerS: 30, resolvingPower: 10000,
 *   lines: [{ wavelengthAngstrom: 6562.795, medium: 'air', depth: 0.6, fwhmAngstrom: 3 }],
 *   noise: { peakCounts: 10000, readNoiseElectrons: 5, seed: 1 },
 * });
 * s.peakSignalToNoise; // 99.9 (10000/√(10000 + 25))
 */
export function syntheticSpectrum(options: SyntheticSpectrumOptions): SyntheticSpectrum {
  const wl = Float64Array.from(options.wavelengthAngstrom);
  const n = wl.length;
  if (n < 2) throw new UsageError('synthetic.bad-grid', `the wavelength grid needs at least 2 pixels (got ${n})`);
  for (let i = 0; i < n; i++) {
    if (!(wl[i] > 0) || !Number.isFinite(wl[i]) || (i > 0 && !(wl[i] > wl[i - 1]))) {
      throw new UsageError('synthetic.bad-grid', `the wavelength grid must hold positive, finite, strictly increasing values in Å (pixel ${i}: ${wl[i]})`);
    }
  }
  const medium = options.medium;
  if (medium !== 'air' && medium !== 'vacuum') throw new UsageError('synthetic.bad-medium', `the grid's medium must be air or vacuum (got ${String(medium)})`);
  const oversampling = options.oversampling ?? SYNTHETIC_DEFAULTS.oversampling;
  if (!(oversampling >= 2) || !Number.isFinite(oversampling)) throw new UsageError('synthetic.bad-oversampling', `oversampling must be a number ≥ 2 (got ${oversampling})`);
  const R = options.resolvingPower;
  if (R !== undefined && (!(R > 0) || !Number.isFinite(R))) throw new UsageError('synthetic.bad-resolving-power', `the resolving power must be a positive number (got ${R})`);
  const velocity = options.velocityKmPerS ?? SYNTHETIC_DEFAULTS.velocityKmPerS;
  const z = redshiftOf(velocity);
  const lines = options.lines.map((l, i) => prepareLine(l, i, z, medium));

  // Fine grid, constant step in ln λ.
  const edges = binEdges(wl);
  if (!(edges[0] > 0)) throw new UsageError('synthetic.bad-grid', 'the first pixel is so wide that its bin reaches below 0 Å');
  let minLogStep = Infinity;
  for (let i = 0; i < n; i++) minLogStep = Math.min(minLogStep, Math.log(edges[i + 1] / edges[i]));
  let step = minLogStep / oversampling;
  const lsfFwhmLog = R === undefined ? 0 : 1 / R;
  if (R !== undefined) step = Math.min(step, lsfFwhmLog / SYNTHETIC_DEFAULTS.pointsPerFwhm);
  const lnLo = Math.log(edges[0]);
  const lnHi = Math.log(edges[n]);
  for (const l of lines) {
    if (l.centre + l.halfWindow < edges[0] || l.centre - l.halfWindow > edges[n]) continue;
    const f = l.profile === 'voigt' ? approximateVoigtFwhm(l.fwhm, l.fwhmL) : l.fwhm;
    step = Math.min(step, f / l.centre / SYNTHETIC_DEFAULTS.pointsPerFwhm);
  }
  const lsfSigmaSteps = lsfFwhmLog / GAUSSIAN_FWHM_PER_SIGMA / step;
  const K = R === undefined ? 0 : Math.ceil(KERNEL_HALF_WIDTH_SIGMA * lsfSigmaSteps);
  const lnStart = lnLo - (K + 2) * step;
  const count = Math.ceil((lnHi - lnStart) / step + K + 3);
  if (count > MAX_MODEL_GRID_POINTS) {
    throw new UsageError('synthetic.grid-too-fine', `the model would need ${count} fine-grid points (limit ${MAX_MODEL_GRID_POINTS}): the lines or pixels are too narrow for the range; use fewer pixels, a lower oversampling or wider lines`);
  }
  const x = new Float64Array(count);
  for (let j = 0; j < count; j++) x[j] = Math.exp(lnStart + j * step);

  // Line spectrum, then the instrument.
  let L: Float64Array = new Float64Array(count).fill(1);
  for (const l of lines) {
    const lo = l.centre - l.halfWindow;
    const hi = l.centre + l.halfWindow;
    if (hi < x[0] || lo > x[count - 1]) continue;
    const j0 = Math.max(0, Math.floor((Math.log(Math.max(lo, x[0])) - lnStart) / step));
    const j1 = Math.min(count - 1, Math.ceil((Math.log(hi) - lnStart) / step));
    for (let j = j0; j <= j1; j++) L[j] *= 1 + l.amplitude * profileAt(l, x[j] - l.centre);
  }
  if (K > 0) {
    const kernel = new Float64Array(2 * K + 1);
    let sum = 0;
    for (let t = -K; t <= K; t++) sum += kernel[t + K] = Math.exp(-0.5 * (t / lsfSigmaSteps) ** 2);
    for (let t = 0; t < kernel.length; t++) kernel[t] /= sum;
    L = convolveSymmetric(L, kernel);
  }

  // Continuum and pixel integration.
  const cont = options.continuum ?? { shape: 'flat' as const };
  const cf = continuumFunction(cont, medium, 0.5 * (wl[0] + wl[n - 1]));
  const C = new Float64Array(count);
  for (let j = 0; j < count; j++) C[j] = cf(x[j]);
  const M = new Float64Array(count);
  for (let j = 0; j < count; j++) M[j] = C[j] * L[j];
  const model = binAverages(x, M, edges, lnStart, step);
  const continuum = binAverages(x, C, edges, lnStart, step);
  if (cont.shape === 'planck') {
    let top = -Infinity;
    for (let i = 0; i < n; i++) top = Math.max(top, continuum[i]);
    const k = (cont.level ?? SYNTHETIC_DEFAULTS.continuumLevel) / top;
    for (let i = 0; i < n; i++) {
      model[i] *= k;
      continuum[i] *= k;
    }
  }

  const parameters: Record<string, unknown> = {
    lines: options.lines.length,
    medium,
    velocityKmPerS: velocity,
    ...(R !== undefined ? { resolvingPower: R } : {}),
    continuum: cont,
    oversampling,
  };
  let flux = model;
  let sigma: Float64Array | null = null;
  let gain: number | null = null;
  let peakSnr: number | null = null;
  if (options.noise) {
    const noise = noiseLevels(model, continuum, options.noise);
    sigma = noise.sigma;
    gain = noise.gain;
    peakSnr = noise.peakSnr;
    flux = addNoise(model, sigma, options.noise.seed);
    parameters.noise = { peakCounts: options.noise.peakCounts, readNoiseElectrons: options.noise.readNoiseElectrons ?? SYNTHETIC_DEFAULTS.readNoiseElectrons, seed: options.noise.seed };
  }
  const spectrum = createSpectrum({
    wavelength: wl,
    flux,
    uncertainty: sigma ?? undefined,
    unit: 'angstrom',
    medium,
    header: options.header,
    provenance: [provenanceEntry('synthetic-spectrum', parameters)],
  });
  return { spectrum, model, continuum, sigma, electronsPerFluxUnit: gain, peakSignalToNoise: peakSnr };
}

/** Mean of the piecewise-linear fine model over each pixel bin (exact for that model). */
function binAverages(x: Float64Array, y: Float64Array, edges: Float64Array, lnStart: number, step: number): Float64Array {
  const count = x.length;
  const cum = new Float64Array(count);
  for (let j = 1; j < count; j++) cum[j] = cum[j - 1] + 0.5 * (y[j] + y[j - 1]) * (x[j] - x[j - 1]);
  const at = (e: number): number => {
    let j = Math.floor((Math.log(e) - lnStart) / step);
    j = Math.max(0, Math.min(count - 2, j));
    while (j > 0 && x[j] > e) j--;
    while (j < count - 2 && x[j + 1] < e) j++;
    const h = x[j + 1] - x[j];
    const d = e - x[j];
    return cum[j] + y[j] * d + ((y[j + 1] - y[j]) * d * d) / (2 * h);
  };
  const n = edges.length - 1;
  const out = new Float64Array(n);
  let prev = at(edges[0]);
  for (let i = 0; i < n; i++) {
    const next = at(edges[i + 1]);
    out[i] = (next - prev) / (edges[i + 1] - edges[i]);
    prev = next;
  }
  return out;
}

function noiseLevels(model: Float64Array, continuum: Float64Array, noise: SyntheticNoise): { sigma: Float64Array; gain: number; peakSnr: number } {
  const peak = noise.peakCounts;
  const rn = noise.readNoiseElectrons ?? SYNTHETIC_DEFAULTS.readNoiseElectrons;
  if (!(peak > 0) || !Number.isFinite(peak)) throw new UsageError('synthetic.bad-noise', `peakCounts must be a positive number of electrons (got ${peak})`);
  if (!(rn >= 0) || !Number.isFinite(rn)) throw new UsageError('synthetic.bad-noise', `the read noise must be a number of electrons ≥ 0 (got ${rn})`);
  if (!Number.isFinite(noise.seed)) throw new UsageError('synthetic.bad-noise', `the noise seed must be a finite number (got ${noise.seed})`);
  let top = -Infinity;
  for (let i = 0; i < continuum.length; i++) top = Math.max(top, continuum[i]);
  if (!(top > 0)) throw new UsageError('synthetic.negative-model', 'photon noise needs a continuum that is positive somewhere');
  const gain = peak / top;
  const sigma = new Float64Array(model.length);
  for (let i = 0; i < model.length; i++) {
    const e = model[i] * gain;
    if (e < 0) throw new UsageError('synthetic.negative-model', `the model is negative at pixel ${i} (${model[i]}); photon noise needs a non-negative model`);
    sigma[i] = Math.sqrt(e + rn * rn) / gain;
  }
  return { sigma, gain, peakSnr: peak / Math.sqrt(peak + rn * rn) };
}

function addNoise(model: Float64Array, sigma: Float64Array, seed: number): Float64Array {
  const g = normalGenerator(seed);
  const out = new Float64Array(model.length);
  for (let i = 0; i < model.length; i++) out[i] = model[i] + sigma[i] * g();
  return out;
}

/**
 * Another noisy realisation of a synthetic spectrum: the same noise-free model and σ,
 * noise from a new seed (for simulations: make the model once, draw many spectra).
 *
 * @param synthetic a result of {@link syntheticSpectrum} made with `noise`.
 * @param seed seed of the generator (its low 32 bits).
 * @returns a new Spectrum (provenance step `redraw-noise` with the seed).
 * @throws {UsageError} when the synthetic spectrum was made without noise.
 * @example
 * const again = drawSyntheticNoise(s, 2); // same model, different noise
 */
export function drawSyntheticNoise(synthetic: SyntheticSpectrum, seed: number): Spectrum {
  if (!synthetic.sigma) throw new UsageError('synthetic.no-noise', 'this synthetic spectrum was made without noise; give options.noise to syntheticSpectrum');
  if (!Number.isFinite(seed)) throw new UsageError('synthetic.bad-noise', `the noise seed must be a finite number (got ${seed})`);
  return deriveSpectrum(synthetic.spectrum, { flux: addNoise(synthetic.model, synthetic.sigma, seed), uncertainty: synthetic.sigma.slice() }, provenanceEntry('redraw-noise', { seed }));
}

/** Options of {@link selectStrongestLines}. */
export interface StrongestLinesOptions {
  /** Keep lines at or above this wavelength, Å (in the list's medium). */
  minWavelengthAngstrom?: number;
  /** Keep lines at or below this wavelength, Å. */
  maxWavelengthAngstrom?: number;
  /** Lines kept per species (≥ 1). Default 30. */
  maxLinesPerSpecies?: number;
}

/**
 * The strongest lines of each species of a list within a wavelength range: by the list's
 * relative intensity, highest first (lines without an intensity come after those with
 * one; a species without any intensities keeps its lines in wavelength order). The
 * laboratory intensities of the shipped lists (emission, per element) only rank lines
 * within a species; they are not stellar line strengths.
 *
 * @param list the line list (not modified).
 * @param options range (Å, list medium) and the number kept per species (default 30).
 * @returns a new list, sorted by wavelength, in the list's medium.
 * @throws {UsageError} for a bad count or range.
 * @example
 * selectStrongestLines(loadLineList('Fe I'), { minWavelengthAngstrom: 4000, maxWavelengthAngstrom: 5000, maxLinesPerSpecies: 5 }).entries.length; // 5
 */
export function selectStrongestLines(list: LineList, options: StrongestLinesOptions = {}): LineList {
  const max = options.maxLinesPerSpecies ?? SYNTHETIC_DEFAULTS.maxLinesPerSpecies;
  if (!Number.isInteger(max) || max < 1) throw new UsageError('linelist.bad-count', `maxLinesPerSpecies must be a whole number ≥ 1 (got ${max})`);
  const inRange = filterLineList(list, { minWavelengthAngstrom: options.minWavelengthAngstrom, maxWavelengthAngstrom: options.maxWavelengthAngstrom });
  const bySpecies = new Map<string, LineEntry[]>();
  for (const e of inRange.entries) {
    const a = bySpecies.get(e.species) ?? [];
    a.push(e);
    bySpecies.set(e.species, a);
  }
  const kept: LineEntry[] = [];
  for (const entries of bySpecies.values()) {
    const ranked = entries
      .map((e, i) => [e, i] as const)
      .sort((a, b) => (b[0].relativeIntensity ?? -Infinity) - (a[0].relativeIntensity ?? -Infinity) || a[1] - b[1]);
    kept.push(...ranked.slice(0, max).map((r) => r[0]));
  }
  kept.sort((a, b) => a.wavelengthAngstrom - b.wavelengthAngstrom);
  return Object.freeze({ species: inRange.species, medium: list.medium, entries: Object.freeze(kept) });
}

/** Options of {@link lineListTemplate}. Give `species` or `list`. */
export interface LineListTemplateOptions {
  /** Shipped line lists by species, e.g. `['H I', 'Fe I']`. */
  readonly species?: string | readonly string[];
  /** Or a line list of one's own (air or vacuum). */
  readonly list?: LineList;
  /** First pixel, Å (in `medium`). */
  readonly startAngstrom: number;
  /** Last pixel (upper limit), Å. */
  readonly endAngstrom: number;
  /** Medium of the template's wavelengths. */
  readonly medium: 'air' | 'vacuum';
  /** Resolving power: every line is a Gaussian of FWHM λ/R (> 0). */
  readonly resolvingPower: number;
  /** Lines kept per species, strongest first (see {@link selectStrongestLines}). Default 30. */
  readonly maxLinesPerSpecies?: number;
  /** Depth of every line, 0 < depth ≤ 1. Default 0.5. */
  readonly depth?: number;
  /** Pixels per resolution element λ/R (≥ 1): the template's velocity step is c/(R·this). Default 3. */
  readonly pixelsPerResolutionElement?: number;
}

/**
 * A cross-correlation template from a line list: the strongest lines of the chosen
 * species in a range, each an absorption Gaussian of the same depth and of FWHM λ/R, on a
 * flat continuum of 1, on a log-linear grid, at rest (velocity 0).
 *
 * Real stellar line strengths depend on temperature and gravity; a template of equal
 * depths only says where lines are. It locates a velocity well; its CCF peak shape is not
 * that of the star.
 *
 * @param options species or list, range (Å), medium, resolving power, lines per species,
 *   depth, sampling.
 * @returns a continuum-normalised Spectrum (provenance step `line-list-template` with the
 *   lines used).
 * @throws {UsageError} for an unknown species, an empty range, bad R, depth or sampling,
 *   or when no line of the list falls in the range.
 * @example
 * const t = lineListTemplate({ species: ['H I'], startAngstrom: 4000, endAngstrom: 7000, medium: 'air', resolvingPower: 5000 });
 * t.flux.length; // 8395 (3 pixels per λ/R)
 */
export function lineListTemplate(options: LineListTemplateOptions): Spectrum {
  if ((options.species === undefined) === (options.list === undefined)) throw new UsageError('synthetic.species-or-list', 'give exactly one of species and list');
  const list = options.list ?? loadLineList(options.species!);
  const R = options.resolvingPower;
  if (!(R > 0) || !Number.isFinite(R)) throw new UsageError('synthetic.bad-resolving-power', `the resolving power must be a positive number (got ${R})`);
  const perElement = options.pixelsPerResolutionElement ?? SYNTHETIC_DEFAULTS.templatePixelsPerResolutionElement;
  if (!(perElement >= 1) || !Number.isFinite(perElement)) throw new UsageError('synthetic.bad-sampling', `pixelsPerResolutionElement must be a number ≥ 1 (got ${perElement})`);
  const depth = options.depth ?? SYNTHETIC_DEFAULTS.templateDepth;
  const grid = logLinearGrid({ start: options.startAngstrom, end: options.endAngstrom, velocityStepKmPerS: SPEED_OF_LIGHT_KM_PER_S / (R * perElement) });
  // Lines a few resolution elements beyond the ends still reach in; the list's medium differs from the grid's by < 0.03 %.
  const margin = 1e-3 + 5 / R;
  const chosen = selectStrongestLines(list, {
    minWavelengthAngstrom: options.startAngstrom * (1 - margin),
    maxWavelengthAngstrom: options.endAngstrom * (1 + margin),
    maxLinesPerSpecies: options.maxLinesPerSpecies,
  });
  if (chosen.entries.length === 0) {
    throw new UsageError('synthetic.no-lines', `no line of ${list.species.join(', ') || 'the list'} falls between ${options.startAngstrom.toFixed(1)} and ${options.endAngstrom.toFixed(1)} Å`);
  }
  const made = syntheticSpectrum({
    wavelengthAngstrom: grid.wavelength,
    medium: options.medium,
    lines: chosen.entries.map((e) => ({ wavelengthAngstrom: e.wavelengthAngstrom, medium: e.medium, depth, fwhmAngstrom: e.wavelengthAngstrom / R, species: e.species })),
    oversampling: SYNTHETIC_DEFAULTS.oversampling,
  });
  return deriveSpectrum(made.spectrum, {}, provenanceEntry('line-list-template', {
    species: list.species,
    resolvingPower: R,
    depth,
    lines: chosen.entries.map((e) => [e.species, e.wavelengthAngstrom]),
  }));
}
