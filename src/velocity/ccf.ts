/**
 * Radial velocity by cross-correlation of a spectrum with a template (an observed spectrum
 * of a star at a known velocity, or a synthetic template from a line list).
 *
 * Method (after Tonry & Davis 1979, AJ 84, 1511):
 * 1. Both spectra are taken to vacuum wavelengths in Å (a Doppler shift multiplies vacuum
 *    wavelengths; air ones follow only to ~1 m/s at 100 km/s) and divided by their
 *    continuum ({@link normalizeContinuum}).
 * 2. Both are put on one grid with a constant step Δ in ln λ over the wavelengths both
 *    cover, by local cubic interpolation of the pixel values (Keys 1981; `resampling`); the
 *    step is the spectrum's median native step there divided by `oversampling` (4).
 *    Measured on noise-free synthetic spectra at R = 20 000 (lines 3 pixels wide),
 *    flux-conserving rebinning, whose staircase moves with the sub-pixel phase of each
 *    spectrum's pixels, biased the peak by up to 0.2 σ at S/N 200 (0.07 σ with 4×
 *    oversampling); cubic interpolation with 4× oversampling, below 0.01 σ.
 * 3. Each is made zero-mean over its usable pixels (unusable ones are set to the mean),
 *    apodised at both ends with a cosine bell over `apodizationFraction` of the pixels, and
 *    zero-padded to a power of two ≥ 1.5 × the length (lags up to half the length are free
 *    of wrap-around). A high-pass filter removes variations slower than `highPassKmPerS`
 *    (a continuum normalised differently in the two spectra otherwise pulls the peak).
 * 4. The correlation c(k) = Σₙ f(n)·t(n − k) comes from one FFT of f + i·t and one inverse
 *    FFT ({@link fftInPlace}; the same computation as {@link circularCrossCorrelation},
 *    with the filter applied in between), normalised C = c/√(Σf²·Σt²) (1 for a perfect
 *    match). A shift of k pixels is Δln λ = k·Δ, so 1 + z = exp(k·Δ) exactly; the velocity
 *    follows from z by the relativistic formula (or the classical one), and the template's
 *    own velocity is combined multiplicatively.
 * 5. The peak: the highest C within the velocity range, refined to a fraction of a pixel by
 *    a least-squares fit of a Gaussian + constant to the points above `peakFitLevel` (0.65)
 *    of the way from the CCF's median to its highest point (at least 2 points each side).
 * 6. Two passes: the template is then shifted to the first velocity and the correlation
 *    repeated, so that the final peak lies within a fraction of a pixel of zero lag. Effects
 *    that grow with the shift — lines in the apodised ends weighted differently in the two
 *    spectra, lines entering or leaving the overlap — then vanish: measured on noise-free
 *    spectra, one pass left a bias of about 0.2 % of the velocity with 5 % apodisation.
 *
 * Uncertainty, three estimates (all reported; `uncertaintyMethod` chooses the one in
 * `velocity`):
 * - `propagated` (default): linear propagation of the per-pixel noise of the spectrum's
 *   native pixels through the whole estimator: δv = Σᵢ uᵢ δFᵢ, with uᵢ carrying the
 *   Gaussian fit's sensitivity to each CCF point ((JᵀJ)⁻¹Jᵀ), the correlation with the
 *   (filtered) template, the apodisation, the mean subtraction and the transpose of the
 *   interpolation (so that grid pixels which share native pixels are not counted as
 *   independent); σ² = Σᵢ σᵢ² uᵢ². The continuum fit's own noise is left out (smooth, and
 *   mostly removed by the high-pass filter). Without per-pixel uncertainties the noise is
 *   uniform, from DER_SNR.
 * - `zucker-2003`: Zucker 2003 (MNRAS 342, 1291), σ² = −[N·C″/C·C²/(1 − C²)]⁻¹ with N the
 *   number of usable native pixels in the overlap and C, C″ (per (km/s)²) of the fitted
 *   Gaussian + constant at the peak.
 * - `tonry-davis-1979`: σ = (3/8)·w/(1 + r), w the FWHM of the fitted peak, r = h/(√2·σ_a),
 *   h the peak height and σ_a the rms of the antisymmetric part of C about the peak:
 *   σ_a² = (1/2N)·Σ a(n)² over the N lags of a circular CCF, a(n) = [C(k̂+n) − C(k̂−n)]/2,
 *   taken here as half the mean of a(n)² over lags 1…M/2.
 * What these gave in simulations is recorded in DEVELOPERS.md ("Velocities").
 * A wavelength-calibration error (see `calibration-error.ts`) is added in quadrature, at the
 * information-weighted mean wavelength.
 */
import { InputError, UsageError } from '../errors.js';
import { fitLineArrays, type MeasuredValue } from '../fit/line-fit.js';
import { normalizeContinuum, type ContinuumOptions } from '../lines/continuum.js';
import { spectrumSnr } from '../lines/snr.js';
import { fftInPlace, nextPowerOfTwo } from '../math/fft.js';
import { binEdges, logLinearGrid, type WavelengthGrid } from '../spectrum/grid.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { resampleSpectrum } from '../spectrum/resample.js';
import { deriveSpectrum, isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import { calibrationVelocityErrorKmPerS, type WavelengthCalibrationError } from './calibration-error.js';
import { SPEED_OF_LIGHT_KM_PER_S } from './constants.js';
import { redshiftFromVelocity, velocityFromRedshift, type DopplerFormula } from './doppler.js';
import { prepareSpectrum } from './prepare.js';

/** A velocity interval, km/s (positive receding), `min` < `max`. */
export interface VelocityRange {
  readonly min: number;
  readonly max: number;
}

/** Which estimate of the CCF velocity's uncertainty to report (see the module notes). */
export type CcfUncertaintyMethod = 'propagated' | 'zucker-2003' | 'tonry-davis-1979';

/** How spectra are put on the common grid: local cubic interpolation of the pixel values, or flux-conserving rebinning ({@link resampleSpectrum}). */
export type CcfResampling = 'cubic' | 'flux-conserving';

/** Options of {@link crossCorrelationVelocity}. Every default is written once, in {@link CCF_DEFAULTS}. */
export interface CrossCorrelationOptions {
  /** Velocities searched, km/s (after combining with the template's velocity). Default −500 to +500. */
  velocityRangeKmPerS?: VelocityRange;
  /** Step of the common log-wavelength grid, km/s per pixel. Default: the spectrum's median native step over the overlap / `oversampling`. */
  velocityStepKmPerS?: number;
  /** Grid pixels per native pixel when the step is not given (≥ 1). Default 4. */
  oversampling?: number;
  /** Fraction of the pixels at each end tapered by a cosine bell, 0–0.5. Default 0.05. */
  apodizationFraction?: number;
  /**
   * Variations with periods longer than this (km/s along the spectrum) are filtered out
   * before correlating (a cosine ramp from no removal at this period to full removal at
   * twice it), so that a continuum fitted differently in the two spectra does not pull the
   * peak; 0 turns the filter off. Default 5000.
   */
  highPassKmPerS?: number;
  /** Continuum fit of the spectrum ({@link ContinuumOptions}), or `none` when it is already normalised. */
  continuum?: ContinuumOptions | 'none';
  /** Continuum fit of the template, or `none`. */
  templateContinuum?: ContinuumOptions | 'none';
  /** Doppler formula for the velocity from 1 + z (default relativistic). */
  formula?: DopplerFormula;
  /** The template's own line-of-sight velocity, km/s (default 0: at rest). */
  templateVelocityKmPerS?: number;
  /** Medium of the spectrum when it does not say. */
  spectrumMedium?: 'air' | 'vacuum';
  /** Medium of the template when it does not say. */
  templateMedium?: 'air' | 'vacuum';
  /**
   * Which part of the peak the Gaussian + constant is fitted to: the points above this
   * fraction of the way from the CCF's median level to its highest point (at least 2 each
   * side), in [0, 1). Default 0.65. Higher levels follow narrow lines on top of a CCF
   * dominated by broad Balmer lines more closely (less noise), lower levels use more points
   * and lock less onto the pixel grid; measured on noise-free synthetic spectra, 0.8 left
   * biases up to 0.7 σ at R = 20 000, 0.5 lost 8 % of the precision at R = 1000, 0.65 kept
   * both within 0.07 σ and 5 % (see DEVELOPERS.md).
   */
  peakFitLevel?: number;
  /** How the spectra are put on the common grid. Default `cubic`. */
  resampling?: CcfResampling;
  /** Which uncertainty `velocity` carries. Default `propagated`. */
  uncertaintyMethod?: CcfUncertaintyMethod;
  /** Wavelength calibration of the spectrum, to add its error. */
  calibration?: WavelengthCalibrationError;
}

/** The defaults of {@link crossCorrelationVelocity}. */
export const CCF_DEFAULTS = Object.freeze({
  velocityRangeKmPerS: Object.freeze({ min: -500, max: 500 }),
  oversampling: 4,
  apodizationFraction: 0.05,
  highPassKmPerS: 5000,
  resampling: 'cubic' as CcfResampling,
  peakFitLevel: 0.65,
  formula: 'relativistic' as DopplerFormula,
  templateVelocityKmPerS: 0,
  uncertaintyMethod: 'propagated' as CcfUncertaintyMethod,
  /** Fewest native pixels of overlap worth correlating. */
  minimumOverlapPixels: 32,
});

/** Peak level tried when the fit at `peakFitLevel` fails (too few points, no convergence). */
const FALLBACK_PEAK_LEVEL = 0.4;

/** Why a CCF gave no velocity. */
export type CcfOutcome = 'ok' | 'peak-at-range-edge' | 'no-correlation' | 'peak-fit-failed';

/** A Gaussian + constant fitted to the CCF peak, on the velocity axis (for plots). */
export interface CcfPeakModel {
  /** Constant level. */
  readonly baseline: number;
  /** Gaussian height above the constant. */
  readonly amplitude: number;
  readonly centerKmPerS: number;
  /** Gaussian σ, km/s. */
  readonly sigmaKmPerS: number;
}

/** Result of {@link crossCorrelationVelocity}. */
export interface CrossCorrelationResult {
  readonly method: 'cross-correlation';
  /** True when a peak was found inside the range (not at its edge), above zero, and fitted. */
  readonly converged: boolean;
  readonly reason: CcfOutcome;
  readonly message: string;
  /** Line-of-sight velocity, km/s, in the observer's frame (no barycentric correction); uncertainty of `uncertaintyMethod` ⊕ calibration. */
  readonly velocity: MeasuredValue;
  readonly uncertaintyMethod: CcfUncertaintyMethod;
  /** The statistical estimates (km/s, without calibration) and the calibration term (km/s). */
  readonly uncertainties: {
    readonly propagated: number;
    readonly zucker2003: number;
    readonly tonryDavis1979: number;
    readonly calibration: number;
  };
  readonly peak: {
    /** Normalised CCF at the fitted peak (1 = perfect match). */
    readonly height: number;
    /** FWHM of the fitted peak, km/s. */
    readonly fwhmKmPerS: number;
    /** Tonry & Davis r = h/(√2 σ_a). */
    readonly tonryDavisR: number;
    /** The first pass's Gaussian + constant on the velocity axis of `ccf` (for plots), or null. */
    readonly model: CcfPeakModel | null;
    /** Velocity range of the points that Gaussian was fitted to, km/s. */
    readonly fitRangeKmPerS: readonly [number, number];
  };
  /** The normalised CCF of the first pass (template at its own velocity) over the velocity range, for plotting. */
  readonly ccf: { readonly velocityKmPerS: Float64Array; readonly correlation: Float64Array };
  /** The common grid of the first pass (vacuum wavelengths). */
  readonly grid: { readonly startAngstrom: number; readonly endAngstrom: number; readonly pixels: number; readonly velocityStepKmPerS: number; readonly nativePixels: number; readonly medium: 'vacuum' };
  readonly formula: DopplerFormula;
  readonly templateVelocityKmPerS: number;
  readonly provenance: readonly ProvenanceEntry[];
}

function checkRange(r: VelocityRange, what: string): void {
  if (!r || !Number.isFinite(r.min) || !Number.isFinite(r.max) || !(r.max > r.min) || Math.abs(r.min) >= SPEED_OF_LIGHT_KM_PER_S || Math.abs(r.max) >= SPEED_OF_LIGHT_KM_PER_S) {
    throw new UsageError('velocity.bad-range', `${what} must have finite min < max, below the speed of light in size (got ${JSON.stringify(r)})`);
  }
}

/** Median of c·ln(λᵢ₊₁/λᵢ) over pixels of an increasing axis between lo and hi. */
function medianVelocityStep(wl: Float64Array, lo: number, hi: number): number {
  const steps: number[] = [];
  for (let i = 1; i < wl.length; i++) if (wl[i - 1] >= lo && wl[i] <= hi) steps.push(Math.log(wl[i] / wl[i - 1]));
  if (steps.length === 0) return NaN;
  steps.sort((a, b) => a - b);
  const h = steps.length >> 1;
  return SPEED_OF_LIGHT_KM_PER_S * (steps.length % 2 ? steps[h] : 0.5 * (steps[h - 1] + steps[h]));
}

function median(a: ArrayLike<number>): number {
  const v = Float64Array.from(a).filter(Number.isFinite).sort();
  const h = v.length >> 1;
  return v.length === 0 ? NaN : v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/** One correlation of the spectrum with the template (its wavelengths scaled by `scale`). */
interface Pass {
  readonly grid: WavelengthGrid;
  readonly M: number;
  readonly usable: Uint8Array;
  readonly usableCount: number;
  readonly nativeCount: number;
  readonly apodization: Float64Array;
  /** Cubic interpolation weights of the spectrum (for the propagation of errors), or null for flux-conserving resampling. */
  readonly cubic: CubicInterpolation | null;
  /** Apodised zero-mean template, padded. */
  readonly t: Float64Array;
  readonly P: number;
  readonly c: Float64Array;
  readonly norm: number;
}

function correlate(sn: Spectrum, tn: Spectrum, scale: number, step: number, apod: number, highPass: number, resampling: CcfResampling, where: { file?: string }): Pass {
  const sw = sn.wavelength;
  const tw = tn.wavelength;
  const lo = Math.max(sw[0], tw[0] * scale);
  const hi = Math.min(sw[sw.length - 1], tw[tw.length - 1] * scale);
  let nativeCount = 0;
  for (let i = 0; i < sw.length; i++) if (sw[i] >= lo && sw[i] <= hi && isUsablePixel(sn, i)) nativeCount++;
  if (!(hi > lo) || nativeCount < CCF_DEFAULTS.minimumOverlapPixels) {
    throw new InputError('ccf.no-overlap', `the spectrum (${sw[0].toFixed(1)}–${sw[sw.length - 1].toFixed(1)} Å) and the template (${(tw[0] * scale).toFixed(1)}–${(tw[tw.length - 1] * scale).toFixed(1)} Å, vacuum) share fewer than ${CCF_DEFAULTS.minimumOverlapPixels} usable pixels`, where);
  }
  const grid = logLinearGrid({ start: lo, end: hi, velocityStepKmPerS: step });
  const shifted = scale === 1 ? tn : deriveSpectrum(tn, { wavelength: tn.wavelength.map((w) => w * scale) });
  const M = grid.wavelength.length;
  let fFlux: Float64Array, tFlux: Float64Array, usable: Uint8Array, usableT: Uint8Array;
  let cubic: CubicInterpolation | null = null;
  if (resampling === 'cubic') {
    cubic = cubicInterpolation(sn, grid.wavelength);
    const ct = cubicInterpolation(shifted, grid.wavelength);
    fFlux = cubic.flux; usable = cubic.usable; tFlux = ct.flux; usableT = ct.usable;
  } else {
    const fs = resampleSpectrum(sn, grid);
    const ft = resampleSpectrum(shifted, grid);
    fFlux = fs.flux; tFlux = ft.flux;
    usable = Uint8Array.from({ length: M }, (_, n) => (isUsablePixel(fs, n) ? 1 : 0));
    usableT = Uint8Array.from({ length: M }, (_, n) => (isUsablePixel(ft, n) ? 1 : 0));
  }
  let meanF = 0, meanT = 0, nF = 0, nT = 0;
  for (let n = 0; n < M; n++) {
    if (usable[n]) { meanF += fFlux[n]; nF++; }
    if (usableT[n]) { meanT += tFlux[n]; nT++; }
  }
  if (nF < CCF_DEFAULTS.minimumOverlapPixels || nT < CCF_DEFAULTS.minimumOverlapPixels) {
    throw new InputError('ccf.no-overlap', `only ${Math.min(nF, nT)} usable grid pixels in common between the spectrum and the template`, where);
  }
  meanF /= nF;
  meanT /= nT;
  const taper = Math.floor(apod * M);
  const apodization = new Float64Array(M).fill(1);
  for (let i = 0; i < taper; i++) {
    const w = 0.5 * (1 - Math.cos((Math.PI * (i + 0.5)) / taper));
    apodization[i] = w;
    apodization[M - 1 - i] = w;
  }
  // Lags up to ±M/2 are free of wrap-around (enough for any peak and for σ_a).
  const P = nextPowerOfTwo(M + (M >> 1) + 1);
  const zr = new Float64Array(P);
  const zi = new Float64Array(P);
  for (let n = 0; n < M; n++) {
    zr[n] = usable[n] ? apodization[n] * (fFlux[n] - meanF) : 0;
    zi[n] = usableT[n] ? apodization[n] * (tFlux[n] - meanT) : 0;
  }
  // One complex FFT of f + i·t gives both spectra: F = (Z_k + Z̄_{−k})/2, T = (Z_k − Z̄_{−k})/2i.
  fftInPlace(zr, zi, 'forward');
  // High-pass filter H (real, zero phase): correlating h∗f with h∗t is correlating f with
  // h∗h∗t, so only the template is filtered (by H²); the norm uses the filtered spectra (Parseval).
  const nuPass = highPass > 0 ? step / highPass : 0;
  const xr = new Float64Array(P), xi = new Float64Array(P);
  const tr = new Float64Array(P), ti = new Float64Array(P);
  let sumF2 = 0, sumT2 = 0;
  for (let k = 0; k < P; k++) {
    const j = (P - k) & (P - 1);
    const fr = 0.5 * (zr[k] + zr[j]);
    const fi = 0.5 * (zi[k] - zi[j]);
    const gr = 0.5 * (zi[k] + zi[j]);
    const gi = -0.5 * (zr[k] - zr[j]);
    const nu = Math.min(k, P - k) / P;
    const h = nuPass === 0 || nu >= nuPass ? 1 : nu <= nuPass / 2 ? 0 : 0.5 * (1 - Math.cos(Math.PI * ((2 * nu) / nuPass - 1)));
    const h2 = h * h;
    sumF2 += h2 * (fr * fr + fi * fi);
    sumT2 += h2 * (gr * gr + gi * gi);
    tr[k] = h2 * gr;
    ti[k] = h2 * gi;
    // F · conj(H²T)
    xr[k] = fr * tr[k] + fi * ti[k];
    xi[k] = fi * tr[k] - fr * ti[k];
  }
  fftInPlace(xr, xi, 'inverse');
  const c = new Float64Array(P);
  for (let n = 0; n < P; n++) c[n] = xr[n] / P;
  // The filtered template in the pixel domain, for the propagation of errors.
  fftInPlace(tr, ti, 'inverse');
  const tf = new Float64Array(P);
  for (let n = 0; n < P; n++) tf[n] = tr[n] / P;
  return { grid, M, usable, usableCount: nF, nativeCount, apodization, cubic, t: tf, P, c, norm: Math.sqrt(sumF2 * sumT2) / P };
}

/** Normalised CCF at integer lag k, |k| ≤ M/2 (the lags free of wrap-around); 0 beyond. */
function ccfAt(p: Pass, k: number): number {
  if (Math.abs(k) > p.M >> 1 || !(p.norm > 0)) return 0;
  return p.c[((k % p.P) + p.P) % p.P] / p.norm;
}

/** A Gaussian + constant fitted to the CCF points above `fraction` of the peak around `kBest`, and dμ/dC for each point. */
interface PeakFit {
  readonly center: number;
  readonly sigma: number;
  readonly amplitude: number;
  readonly baseline: number;
  readonly left: number;
  readonly right: number;
  /** ∂(centre)/∂C_k for k = left…right. */
  readonly sensitivity: Float64Array;
}

function fitPeak(p: Pass, kBest: number, kmin: number, kmax: number, level: number, fraction: number): PeakFit | null {
  const halfLevel = level + fraction * (ccfAt(p, kBest) - level);
  let left = kBest, right = kBest;
  while (left > kmin && ccfAt(p, left - 1) > halfLevel) left--;
  while (right < kmax && ccfAt(p, right + 1) > halfLevel) right++;
  left = Math.max(kmin, Math.min(left - 1, kBest - 2));
  right = Math.min(kmax, Math.max(right + 1, kBest + 2));
  if (right - left + 1 < 5) return null;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let k = left; k <= right; k++) { xs.push(k); ys.push(ccfAt(p, k)); }
  const fit = fitLineArrays({ x: xs, flux: ys, unit: 'pixel' }, {
    center: kBest, window: 2 * Math.max(kBest - left, right - kBest) + 1, profile: 'gaussian', continuumOrder: 0, sign: 'emission',
  });
  const comp = fit.components[0];
  const mu = comp.center.value;
  const sigma = comp.fwhm.value / (2 * Math.sqrt(2 * Math.LN2));
  const A = comp.amplitude.value;
  if (!fit.converged || !(sigma > 0) || !(A > 0) || !(Math.abs(mu - kBest) <= Math.max(1.5, 0.5 * sigma))) return null;
  // Jacobian of b + A·exp(−(x−μ)²/2s²) at the solution; sensitivity = row μ of (JᵀJ)⁻¹Jᵀ.
  const m = xs.length;
  const J = new Float64Array(m * 4);
  for (let i = 0; i < m; i++) {
    const d = xs[i] - mu;
    const e = Math.exp((-0.5 * d * d) / (sigma * sigma));
    J[i * 4] = 1;
    J[i * 4 + 1] = e;
    J[i * 4 + 2] = (A * e * d) / (sigma * sigma);
    J[i * 4 + 3] = (A * e * d * d) / (sigma * sigma * sigma);
  }
  const N = new Float64Array(16);
  for (let i = 0; i < m; i++) for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) N[a * 4 + b] += J[i * 4 + a] * J[i * 4 + b];
  const row = invertRow(N, 2);
  if (!row) return null;
  const sensitivity = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = 0;
    for (let b = 0; b < 4; b++) s += row[b] * J[i * 4 + b];
    sensitivity[i] = s;
  }
  return { center: mu, sigma, amplitude: A, baseline: fit.continuum.coefficients[0].value, left, right, sensitivity };
}

/** Row r of the inverse of a symmetric 4×4 matrix (Gauss–Jordan with partial pivoting), or null when singular. */
function invertRow(matrix: Float64Array, r: number): Float64Array | null {
  const n = 4;
  const a = Float64Array.from(matrix);
  const inv = new Float64Array(16);
  for (let i = 0; i < n; i++) inv[i * n + i] = 1;
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let i = col + 1; i < n; i++) if (Math.abs(a[i * n + col]) > Math.abs(a[piv * n + col])) piv = i;
    if (!(Math.abs(a[piv * n + col]) > 0)) return null;
    for (let j = 0; j < n; j++) {
      [a[col * n + j], a[piv * n + j]] = [a[piv * n + j], a[col * n + j]];
      [inv[col * n + j], inv[piv * n + j]] = [inv[piv * n + j], inv[col * n + j]];
    }
    const d = a[col * n + col];
    for (let j = 0; j < n; j++) { a[col * n + j] /= d; inv[col * n + j] /= d; }
    for (let i = 0; i < n; i++) {
      if (i === col) continue;
      const f = a[i * n + col];
      if (f === 0) continue;
      for (let j = 0; j < n; j++) { a[i * n + j] -= f * a[col * n + j]; inv[i * n + j] -= f * inv[col * n + j]; }
    }
  }
  return inv.slice(r * n, r * n + n);
}

/**
 * Radial velocity of a spectrum by cross-correlation with a template (see the module notes
 * for the method and the three uncertainty estimates).
 *
 * Sign convention: positive = receding (the spectrum's lines redder than the template's).
 * The velocity is in the observer's frame; apply the barycentric correction with
 * `applyVelocityCorrection`. Missing data: unusable pixels (NaN, masked, bad uncertainty)
 * of either spectrum are skipped (set to the mean after resampling).
 *
 * @param spectrum the observed spectrum (wavelength-calibrated; any unit; air or vacuum,
 *   stated by the spectrum or by `spectrumMedium`).
 * @param template the template (same conditions); only the wavelengths both cover are used.
 * @param options velocity range (km/s), grid step or oversampling, apodisation, continuum
 *   fits, formula, template velocity, media, uncertainty method, calibration error.
 * @returns the velocity with its uncertainty, the three estimates, the peak and the CCF.
 *   A peak at the edge of the range, a CCF without a positive peak, or a peak that cannot
 *   be fitted gives `converged: false`, a `reason` and a NaN uncertainty.
 * @throws {InputError} `velocity.uncalibrated` (pixel axis), `velocity.medium-unknown`,
 *   `ccf.no-overlap` (fewer than 32 usable pixels in common).
 * @throws {UsageError} for bad options (range, step, oversampling, apodisation, names).
 * @example
 * const r = crossCorrelationVelocity(star, lineListTemplate({ species: ['H I', 'Fe I'],
 *   startAngstrom: 4000, endAngstrom: 7000, medium: 'air', resolvingPower: 5000 }));
 * r.velocity; // { value: 12.3, uncertainty: 0.8 } (km/s, topocentric)
 */
export function crossCorrelationVelocity(spectrum: Spectrum, template: Spectrum, options: CrossCorrelationOptions = {}): CrossCorrelationResult {
  const range = options.velocityRangeKmPerS ?? CCF_DEFAULTS.velocityRangeKmPerS;
  checkRange(range, 'the velocity range');
  const apod = options.apodizationFraction ?? CCF_DEFAULTS.apodizationFraction;
  if (!(apod >= 0 && apod <= 0.5)) throw new UsageError('ccf.bad-apodization', `apodizationFraction must lie between 0 and 0.5 (got ${apod})`);
  const oversampling = options.oversampling ?? CCF_DEFAULTS.oversampling;
  if (!(oversampling >= 1) || !Number.isFinite(oversampling)) throw new UsageError('ccf.bad-oversampling', `oversampling must be a number ≥ 1 (got ${oversampling})`);
  const formula = options.formula ?? CCF_DEFAULTS.formula;
  if (formula !== 'relativistic' && formula !== 'classical') throw new UsageError('velocity.bad-formula', `formula must be relativistic or classical (got ${String(formula)})`);
  const uncertaintyMethod = options.uncertaintyMethod ?? CCF_DEFAULTS.uncertaintyMethod;
  if (!['propagated', 'zucker-2003', 'tonry-davis-1979'].includes(uncertaintyMethod)) {
    throw new UsageError('ccf.bad-uncertainty-method', `uncertaintyMethod must be propagated, zucker-2003 or tonry-davis-1979 (got ${String(uncertaintyMethod)})`);
  }
  if (options.velocityStepKmPerS !== undefined && !(options.velocityStepKmPerS > 0 && Number.isFinite(options.velocityStepKmPerS))) {
    throw new UsageError('ccf.bad-step', `velocityStepKmPerS must be a positive number (got ${options.velocityStepKmPerS})`);
  }
  const peakLevel = options.peakFitLevel ?? CCF_DEFAULTS.peakFitLevel;
  if (!(peakLevel >= 0 && peakLevel < 1)) throw new UsageError('ccf.bad-peak-level', `peakFitLevel must lie in [0, 1) (got ${peakLevel})`);
  const resampling = options.resampling ?? CCF_DEFAULTS.resampling;
  if (resampling !== 'cubic' && resampling !== 'flux-conserving') throw new UsageError('ccf.bad-resampling', `resampling must be cubic or flux-conserving (got ${String(resampling)})`);
  const highPass = options.highPassKmPerS ?? CCF_DEFAULTS.highPassKmPerS;
  if (!(highPass >= 0) || !Number.isFinite(highPass)) throw new UsageError('ccf.bad-high-pass', `highPassKmPerS must be a number ≥ 0 (got ${highPass})`);
  const templateVelocity = options.templateVelocityKmPerS ?? CCF_DEFAULTS.templateVelocityKmPerS;
  const zTemplate = redshiftFromVelocity(templateVelocity, { formula, where: { keyword: 'templateVelocityKmPerS' } });

  const s = prepareSpectrum(spectrum, options.spectrumMedium, 'spectrum', '--medium air|vacuum (options.spectrumMedium)');
  const t = prepareSpectrum(template, options.templateMedium, 'template', '--template-medium air|vacuum (options.templateMedium)');
  const sn = options.continuum === 'none' ? s.spectrum : normalizeContinuum(s.spectrum, options.continuum ?? {}).normalized;
  const tn = options.templateContinuum === 'none' ? t.spectrum : normalizeContinuum(t.spectrum, options.templateContinuum ?? {}).normalized;
  const where = spectrum.source ? { file: spectrum.source.file } : {};
  const sw = sn.wavelength;
  const step = options.velocityStepKmPerS
    ?? medianVelocityStep(sw, Math.max(sw[0], tn.wavelength[0]), Math.min(sw[sw.length - 1], tn.wavelength[tn.wavelength.length - 1])) / oversampling;
  if (!(step > 0)) {
    throw new InputError('ccf.no-overlap', `the spectrum (${sw[0].toFixed(1)}–${sw[sw.length - 1].toFixed(1)} Å) and the template (${tn.wavelength[0].toFixed(1)}–${tn.wavelength[tn.wavelength.length - 1].toFixed(1)} Å, vacuum) do not overlap`, where);
  }

  // Pass 1: template at its own velocity, over the whole range.
  const p1 = correlate(sn, tn, 1, step, apod, highPass, resampling, where);
  const delta = p1.grid.logStep!;
  const velocityOf = (zRelative: number): number => velocityFromRedshift((1 + zTemplate) * (1 + zRelative) - 1, { formula });
  const velocityOfLag = (tau: number): number => velocityOf(Math.expm1(tau * delta));
  const dvdz = (zRelative: number): number => (velocityOf(zRelative + 1e-9) - velocityOf(zRelative - 1e-9)) / 2e-9;
  const lagOf = (v: number): number => Math.log((1 + redshiftFromVelocity(v, { formula })) / (1 + zTemplate)) / delta;
  const kmin = Math.max(-(p1.M >> 1), Math.ceil(lagOf(range.min)));
  const kmax = Math.min(p1.M >> 1, Math.floor(lagOf(range.max)));
  if (kmax - kmin < 4) {
    throw new UsageError('velocity.bad-range', `the velocity range ${range.min} to ${range.max} km/s spans fewer than 5 grid pixels of ${step.toPrecision(4)} km/s within the overlap`);
  }
  const ccfV = new Float64Array(kmax - kmin + 1);
  const ccfC = new Float64Array(kmax - kmin + 1);
  let kBest = kmin;
  for (let k = kmin; k <= kmax; k++) {
    ccfV[k - kmin] = velocityOfLag(k);
    ccfC[k - kmin] = ccfAt(p1, k);
    if (ccfC[k - kmin] > ccfAt(p1, kBest)) kBest = k;
  }
  const gridInfo = {
    startAngstrom: p1.grid.wavelength[0], endAngstrom: p1.grid.wavelength[p1.M - 1], pixels: p1.M,
    velocityStepKmPerS: p1.grid.velocityStepKmPerS!, nativePixels: p1.nativeCount, medium: 'vacuum' as const,
  };
  const provenance = Object.freeze([
    ...spectrum.provenance,
    provenanceEntry('cross-correlation', {
      template: template.source?.file ?? template.provenance[template.provenance.length - 1]?.step ?? 'spectrum',
      grid: gridInfo, velocityRangeKmPerS: range, apodizationFraction: apod, formula, templateVelocityKmPerS: templateVelocity,
      uncertaintyMethod, continuum: options.continuum ?? 'default', templateContinuum: options.templateContinuum ?? 'default',
      ...(options.calibration ? { calibration: options.calibration } : {}),
    }),
  ]);
  const base = { method: 'cross-correlation' as const, uncertaintyMethod, ccf: { velocityKmPerS: ccfV, correlation: ccfC }, grid: gridInfo, formula, templateVelocityKmPerS: templateVelocity, provenance };
  const noAnswer = (reason: CcfOutcome, message: string, model: CcfPeakModel | null = null): CrossCorrelationResult => ({
    ...base, converged: false, reason, message,
    velocity: { value: reason === 'no-correlation' ? NaN : velocityOfLag(kBest), uncertainty: NaN },
    uncertainties: { propagated: NaN, zucker2003: NaN, tonryDavis1979: NaN, calibration: NaN },
    peak: { height: ccfAt(p1, kBest), fwhmKmPerS: NaN, tonryDavisR: NaN, model, fitRangeKmPerS: [ccfV[0], ccfV[ccfV.length - 1]] },
  });
  if (!(ccfAt(p1, kBest) > 0)) return noAnswer('no-correlation', 'the cross-correlation has no positive peak in the velocity range');
  if (kBest === kmin || kBest === kmax) {
    return noAnswer('peak-at-range-edge', `the highest correlation lies at the edge of the velocity range (${velocityOfLag(kBest).toFixed(1)} km/s); widen the range`);
  }
  const level1 = median(ccfC);
  const fit1 = fitPeak(p1, kBest, kmin, kmax, level1, peakLevel) ?? fitPeak(p1, kBest, kmin, kmax, level1, FALLBACK_PEAK_LEVEL);
  if (!fit1) return noAnswer('peak-fit-failed', 'a Gaussian could not be fitted to the cross-correlation peak');
  const jac1 = Math.abs(velocityOfLag(fit1.center + 1e-3) - velocityOfLag(fit1.center - 1e-3)) / 2e-3;
  const model: CcfPeakModel = { baseline: fit1.baseline, amplitude: fit1.amplitude, centerKmPerS: velocityOfLag(fit1.center), sigmaKmPerS: fit1.sigma * jac1 };

  // Pass 2: template shifted to the first estimate; the peak is now within a pixel of lag 0.
  const scale = Math.exp(fit1.center * delta);
  const p2 = correlate(sn, tn, scale, step, apod, highPass, resampling, where);
  const delta2 = p2.grid.logStep!;
  const halfWidth = Math.max(10, Math.ceil(4 * fit1.sigma));
  const k2min = Math.max(-(p2.M >> 1), -halfWidth);
  const k2max = Math.min(p2.M >> 1, halfWidth);
  let k2 = 0;
  for (let k = k2min; k <= k2max; k++) if (ccfAt(p2, k) > ccfAt(p2, k2)) k2 = k;
  const fit2 = k2 > k2min && k2 < k2max ? fitPeak(p2, k2, k2min, k2max, fit1.baseline, peakLevel) ?? fitPeak(p2, k2, k2min, k2max, fit1.baseline, FALLBACK_PEAK_LEVEL) : null;
  if (!fit2) return noAnswer('peak-fit-failed', 'the second (re-centred) cross-correlation peak could not be fitted', model);
  const zRelative = scale * Math.exp(fit2.center * delta2) - 1;
  const value = velocityOf(zRelative);
  // dv/dτ of the second pass: dv/dz · dz/dτ, z = scale·e^{τΔ} − 1.
  const jac = Math.abs(dvdz(zRelative) * (1 + zRelative) * delta2);

  // Propagated: δμ = Σₖ sₖ δCₖ, δCₖ = Σₙ δf̃ₙ t̃ₙ₋ₖ / norm, δf̃ₙ = aₙ(δfₙ − δf̄), δf = R·δF.
  const M = p2.M;
  const q = new Float64Array(M);
  for (let k = fit2.left; k <= fit2.right; k++) {
    const sk = fit2.sensitivity[k - fit2.left] / p2.norm;
    for (let n = Math.max(0, k); n < Math.min(M, M + k); n++) q[n] += sk * p2.t[n - k];
  }
  let sumQ = 0;
  for (let n = 0; n < M; n++) if (p2.usable[n]) { q[n] *= p2.apodization[n]; sumQ += q[n]; } else q[n] = 0;
  for (let n = 0; n < M; n++) if (p2.usable[n]) q[n] -= sumQ / p2.usableCount;
  const u = p2.cubic ? transposeCubic(p2.cubic, q, sn.wavelength.length) : transposeResample(sn, p2.grid.edges, q, p2.usable);
  const sigmaNative = nativeSigma(sn);
  let variance = 0;
  for (let i = 0; i < u.length; i++) if (u[i] !== 0) variance += (sigmaNative[i] * u[i]) ** 2;
  const propagated = Math.sqrt(variance) * jac;

  const height = fit2.baseline + fit2.amplitude;
  const curvaturePerKms2 = -fit2.amplitude / (fit2.sigma * fit2.sigma) / (jac * jac);
  const zucker = height > 0 && height < 1 ? Math.sqrt(-(1 - height * height) / (p2.nativeCount * curvaturePerKms2 * height)) : NaN;
  // σ_a² = (1/2N)·Σ a(n)² over the N lags of a circular CCF (Tonry & Davis 1979), i.e. half
  // the mean square of a(n) over lags 1…N/2; here over 1…M/2 − |k̂| (free of wrap-around).
  let sumA2 = 0;
  const kr = Math.round(fit2.center);
  const lags = (M >> 1) - Math.abs(kr);
  for (let n = 1; n <= lags; n++) {
    const a = 0.5 * (ccfAt(p2, kr + n) - ccfAt(p2, kr - n));
    sumA2 += a * a;
  }
  const r = height / (Math.SQRT2 * Math.sqrt((0.5 * sumA2) / lags));
  const fwhmKmPerS = 2 * Math.sqrt(2 * Math.LN2) * fit2.sigma * jac;
  const tonryDavis = ((3 / 8) * fwhmKmPerS) / (1 + r);
  let calibration = 0;
  if (options.calibration) {
    let sw2 = 0, swl = 0;
    for (let n = 0; n < M; n++) { const w = q[n] * q[n]; sw2 += w; swl += w * p2.grid.wavelength[n]; }
    calibration = calibrationVelocityErrorKmPerS(options.calibration, sw2 > 0 ? swl / sw2 : p2.grid.wavelength[M >> 1]);
  }
  const chosen = uncertaintyMethod === 'propagated' ? propagated : uncertaintyMethod === 'zucker-2003' ? zucker : tonryDavis;
  return {
    ...base,
    converged: true,
    reason: 'ok',
    message: 'peak found and fitted',
    velocity: { value, uncertainty: Math.hypot(chosen, calibration) },
    uncertainties: { propagated, zucker2003: zucker, tonryDavis1979: tonryDavis, calibration },
    peak: { height, fwhmKmPerS, tonryDavisR: r, model, fitRangeKmPerS: [velocityOfLag(fit1.left), velocityOfLag(fit1.right)] },
  };
}

/** Per-pixel σ of a (normalised) spectrum: its uncertainty, or a uniform DER_SNR noise; 0 for unusable pixels. */
function nativeSigma(s: Spectrum): Float64Array {
  const n = s.flux.length;
  const out = new Float64Array(n);
  const uniform = s.uncertainty ? NaN : spectrumSnr(s).noise;
  for (let i = 0; i < n; i++) out[i] = isUsablePixel(s, i) ? (s.uncertainty ? s.uncertainty[i] : uniform) : 0;
  return out;
}

/**
 * The transpose of flux-conserving resampling applied to H: uᵢ = Σₙ (oᵢₙ/Wₙ)·Hₙ, with oᵢₙ
 * the overlap of native bin i with grid bin n and Wₙ the usable overlap of bin n (as in
 * `resampleSpectrum`); H is ignored where the grid pixel is unusable.
 */
function transposeResample(s: Spectrum, gridEdges: Float64Array, H: Float64Array, usableGrid: Uint8Array): Float64Array {
  const n = s.wavelength.length;
  const E = binEdges(s.wavelength);
  const good = new Uint8Array(n);
  for (let i = 0; i < n; i++) good[i] = isUsablePixel(s, i) ? 1 : 0;
  const u = new Float64Array(n);
  const m = gridEdges.length - 1;
  let i0 = 0;
  for (let j = 0; j < m; j++) {
    const lo = gridEdges[j];
    const hi = gridEdges[j + 1];
    while (i0 < n && E[i0 + 1] <= lo) i0++;
    if (!usableGrid[j] || H[j] === 0) continue;
    let W = 0;
    for (let k = i0; k < n && E[k] < hi; k++) {
      const ov = Math.min(E[k + 1], hi) - Math.max(E[k], lo);
      if (ov > 0 && good[k]) W += ov;
    }
    if (!(W > 0)) continue;
    for (let k = i0; k < n && E[k] < hi; k++) {
      const ov = Math.min(E[k + 1], hi) - Math.max(E[k], lo);
      if (ov > 0 && good[k]) u[k] += (ov / W) * H[j];
    }
  }
  return u;
}

/** Local cubic interpolation of a spectrum's pixel values at given wavelengths, with its weights. */
interface CubicInterpolation {
  readonly flux: Float64Array;
  readonly usable: Uint8Array;
  /** First of the four native pixels used by each output pixel (−1 when unusable). */
  readonly first: Int32Array;
  /** Four weights per output pixel. */
  readonly weights: Float64Array;
}

/**
 * Cubic convolution interpolation (Keys 1981, IEEE Trans. ASSP 29, 1153, a = −1/2, i.e. the
 * Catmull–Rom spline) of the pixel values, in the coordinate of the pixel index (the index
 * is taken as linear in wavelength between neighbouring pixels). An output pixel is
 * unusable when any of its four native pixels is.
 */
function cubicInterpolation(s: Spectrum, at: Float64Array): CubicInterpolation {
  const wl = s.wavelength;
  const n = wl.length;
  const m = at.length;
  const good = new Uint8Array(n);
  for (let i = 0; i < n; i++) good[i] = isUsablePixel(s, i) ? 1 : 0;
  const flux = new Float64Array(m);
  const usable = new Uint8Array(m);
  const first = new Int32Array(m).fill(-1);
  const weights = new Float64Array(4 * m);
  let i = 0;
  for (let j = 0; j < m; j++) {
    const x = at[j];
    while (i < n - 2 && wl[i + 1] <= x) i++;
    if (i < 1 || i + 2 > n - 1 || x < wl[i] || x > wl[i + 1]) continue;
    if (!(good[i - 1] && good[i] && good[i + 1] && good[i + 2])) continue;
    const t = (x - wl[i]) / (wl[i + 1] - wl[i]);
    const t2 = t * t, t3 = t2 * t;
    const w0 = -0.5 * t3 + t2 - 0.5 * t;
    const w1 = 1.5 * t3 - 2.5 * t2 + 1;
    const w2 = -1.5 * t3 + 2 * t2 + 0.5 * t;
    const w3 = 0.5 * t3 - 0.5 * t2;
    weights[4 * j] = w0; weights[4 * j + 1] = w1; weights[4 * j + 2] = w2; weights[4 * j + 3] = w3;
    first[j] = i - 1;
    flux[j] = w0 * s.flux[i - 1] + w1 * s.flux[i] + w2 * s.flux[i + 1] + w3 * s.flux[i + 2];
    usable[j] = 1;
  }
  return { flux, usable, first, weights };
}

/** The transpose of {@link cubicInterpolation}: uᵢ = Σⱼ wⱼᵢ·Hⱼ. */
function transposeCubic(c: CubicInterpolation, H: Float64Array, n: number): Float64Array {
  const u = new Float64Array(n);
  for (let j = 0; j < c.first.length; j++) {
    const i = c.first[j];
    if (i < 0 || H[j] === 0) continue;
    for (let k = 0; k < 4; k++) u[i + k] += c.weights[4 * j + k] * H[j];
  }
  return u;
}
