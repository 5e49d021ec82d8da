/**
 * Finding and measuring the emission lines of a calibration-lamp spectrum on its pixel
 * axis: detection by a matched filter, then a Gaussian profile on a linear background
 * fitted to each line (blends fitted together), with the centre's uncertainty from the
 * fit, and flat-topped (saturated) lines flagged.
 */
import { UsageError } from '../errors.js';
import { fitLineArrays } from '../fit/line-fit.js';
import { median } from '../lines/snr.js';
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import type { MeasuredPeak } from './identify.js';

/** Options of {@link measureLampLines}. Every default is stated once, here. */
export interface LampLineOptions {
  /** Detection threshold of the matched filter, in σ. Default 8 (lamp lines are bright; this keeps noise peaks out). */
  readonly significance?: number;
  /** Narrowest and broadest line FWHM searched, pixels. Default [1.5, 12]. */
  readonly fwhmRangePixels?: readonly [number, number];
  /** At most this many lines (the most significant). Default 200. */
  readonly maxLines?: number;
  /** Flux at or above which a pixel is saturated (e.g. 65535 for a 16-bit camera). Default: none; flat tops are still detected. */
  readonly saturationLevel?: number;
  /** Absorption lines (a star's) instead of emission. Default `emission`. */
  readonly kind?: 'emission' | 'absorption';
}

/** Why a measured line should not enter a dispersion solution. */
export type LampLineFlag = 'saturated' | 'fit-failed';

/** One measured line. Lengths in pixels of the spectrum's pixel axis. */
export interface LampLine extends MeasuredPeak {
  /** Centre, pixels. */
  readonly pixel: number;
  /** 1-σ of the centre from the profile fit, pixels. */
  readonly pixelUncertainty: number;
  /** |Peak height| above the background, flux units. */
  readonly strength: number;
  readonly fwhmPixels: number;
  readonly fwhmUncertaintyPixels: number;
  /** Matched-filter significance at detection, σ. */
  readonly significance: number;
  /** Flags that keep the line out of a solution (empty when good). */
  readonly flags: readonly LampLineFlag[];
}

/** What {@link measureLampLines} returns. */
export interface LampLineMeasurement {
  readonly lines: readonly LampLine[];
  /** Noise per pixel used for detection (median of the uncertainties, or from the flux by DER_SNR-like second differences). */
  readonly noisePerPixel: number;
  readonly significance: number;
}

const DEFAULTS = { significance: 8, fwhmRangePixels: [1.5, 12] as const, maxLines: 200 };

/** Lower-quartile background in blocks of `block` pixels, interpolated linearly between block centres. */
function background(y: Float64Array, good: Uint8Array, block: number): Float64Array {
  const n = y.length;
  const centres: number[] = [];
  const levels: number[] = [];
  for (let s = 0; s < n; s += block) {
    const vals: number[] = [];
    for (let i = s; i < Math.min(n, s + block); i++) if (good[i]) vals.push(y[i]);
    if (vals.length < 3) continue;
    vals.sort((a, b) => a - b);
    centres.push(Math.min(n - 1, s + block / 2));
    levels.push(vals[Math.floor(vals.length / 4)]);
  }
  const out = new Float64Array(n);
  if (centres.length === 0) return out;
  let k = 0;
  for (let i = 0; i < n; i++) {
    while (k < centres.length - 2 && i > centres[k + 1]) k++;
    if (centres.length === 1 || i <= centres[0]) out[i] = levels[0];
    else if (i >= centres[centres.length - 1]) out[i] = levels[levels.length - 1];
    else out[i] = levels[k] + ((levels[k + 1] - levels[k]) * (i - centres[k])) / (centres[k + 1] - centres[k]);
  }
  return out;
}

interface Detection { index: number; fwhm: number; significance: number }

/**
 * Emission (or absorption) peaks by a matched filter: at each pixel and for Gaussian
 * shapes of FWHM f (f from the range, steps of √2), the weighted least-squares amplitude A
 * of a Gaussian on the background-subtracted flux and S = A/σ_A; local maxima of S over
 * ±max(2, f/2) pixels with S ≥ the threshold, the largest S over scales kept.
 */
function detect(y: Float64Array, sigma: Float64Array, good: Uint8Array, threshold: number, fwhmRange: readonly [number, number], sign: 1 | -1): Detection[] {
  const n = y.length;
  const best = new Float64Array(n).fill(-Infinity);
  const bestF = new Float64Array(n);
  for (let f = fwhmRange[0]; f <= fwhmRange[1] * 1.0001; f *= Math.SQRT2) {
    const s = f / (2 * Math.sqrt(2 * Math.LN2));
    const h = Math.ceil(2 * f);
    const k = Float64Array.from({ length: 2 * h + 1 }, (_, j) => Math.exp(-0.5 * ((j - h) / s) ** 2));
    for (let i = 0; i < n; i++) {
      let num = 0, den = 0;
      for (let j = -h; j <= h; j++) {
        const q = i + j;
        if (q < 0 || q >= n || !good[q]) continue;
        const w = 1 / (sigma[q] * sigma[q]);
        num += w * k[j + h] * y[q];
        den += w * k[j + h] * k[j + h];
      }
      if (den > 0) {
        const S = (sign * num) / Math.sqrt(den);
        if (S > best[i]) { best[i] = S; bestF[i] = f; }
      }
    }
  }
  const out: Detection[] = [];
  for (let i = 0; i < n; i++) {
    if (!(best[i] >= threshold)) continue;
    const r = Math.max(2, Math.round(bestF[i] / 2));
    let isMax = true;
    for (let j = Math.max(0, i - r); j <= Math.min(n - 1, i + r); j++) {
      if (best[j] > best[i] || (best[j] === best[i] && j < i)) { isMax = false; break; }
    }
    if (isMax) out.push({ index: i, fwhm: bestF[i], significance: best[i] });
  }
  return out;
}

/**
 * Finds and measures the lines of a lamp spectrum (or, with `kind: 'absorption'`, a star's
 * absorption lines) on its pixel axis.
 *
 * Method: a background (lower quartile in blocks of 64 pixels, interpolated) is
 * subtracted; lines are detected by a matched filter at several widths (threshold
 * `significance` σ, noise from the spectrum's uncertainty or, without it, from the
 * median absolute second difference of the flux as in DER_SNR, Stoehr et al. 2008);
 * each line is then fitted with a Gaussian on a linear background ({@link fitLineArrays},
 * weighted least squares with the covariance giving the centre's σ), lines closer than
 * 3 FWHM in one fit. A line is flagged `saturated` when its core holds three or more
 * pixels at exactly the same maximum value (a flat top) or reaches `saturationLevel`, and
 * `fit-failed` when the fit did not converge or its centre left the window.
 *
 * Missing data: unusable pixels (NaN flux, bad uncertainty, masked) are skipped.
 *
 * @param spectrum a lamp spectrum; its axis is taken as pixel coordinates when its unit is
 *   `pixel`, else the 0-based pixel index is used.
 * @param options threshold, width range, saturation level, line count, kind.
 * @returns the lines, by pixel, with their flags, and the noise used.
 * @throws {UsageError} for a non-positive threshold or a bad width range.
 * @example
 * const { lines } = measureLampLines(readSpectrum('lamp-ne-ar.fits'));
 * lines[0].pixel; // centre of the first line, pixels
 */
export function measureLampLines(spectrum: Spectrum, options: LampLineOptions = {}): LampLineMeasurement {
  const threshold = options.significance ?? DEFAULTS.significance;
  const fwhmRange = options.fwhmRangePixels ?? DEFAULTS.fwhmRangePixels;
  const maxLines = options.maxLines ?? DEFAULTS.maxLines;
  if (!(threshold > 0)) throw new UsageError('calibrate.bad-significance', `the detection threshold must be > 0 σ, got ${threshold}`);
  if (!(fwhmRange[0] > 0 && fwhmRange[1] >= fwhmRange[0])) throw new UsageError('calibrate.bad-fwhm-range', `the FWHM range must have 0 < min ≤ max pixels, got ${fwhmRange[0]} to ${fwhmRange[1]}`);
  const sign: 1 | -1 = options.kind === 'absorption' ? -1 : 1;
  const n = spectrum.flux.length;
  const x = spectrum.unit === 'pixel' ? spectrum.wavelength : Float64Array.from({ length: n }, (_, i) => i);
  const good = new Uint8Array(n);
  for (let i = 0; i < n; i++) good[i] = isUsablePixel(spectrum, i) ? 1 : 0;
  const flux = spectrum.flux;
  const bg = sign > 0 ? background(flux, good, 64) : (() => {
    // Absorption: the upper quartile (the continuum) instead.
    const neg = Float64Array.from(flux, (v) => -v);
    return background(neg, good, 64).map((v) => -v);
  })();
  const y = Float64Array.from(flux, (v, i) => (good[i] ? v - bg[i] : 0));
  // Noise: the given uncertainties, else 1.4826/√6 × median |2y_i − y_{i−2} − y_{i+2}| (DER_SNR's estimator).
  let noise: number;
  let sigma: Float64Array;
  if (spectrum.uncertainty) {
    sigma = Float64Array.from(spectrum.uncertainty, (s, i) => (good[i] ? s : Infinity));
    noise = median([...sigma].filter((s) => Number.isFinite(s)));
  } else {
    const d: number[] = [];
    for (let i = 2; i < n - 2; i++) if (good[i] && good[i - 2] && good[i + 2]) d.push(Math.abs(2 * flux[i] - flux[i - 2] - flux[i + 2]));
    noise = (1.482602 / Math.sqrt(6)) * (d.length ? median(d) : NaN);
    if (!(noise > 0)) noise = Number.MIN_VALUE;
    sigma = new Float64Array(n).fill(noise);
  }
  const found = detect(y, sigma, good, threshold, fwhmRange, sign).sort((a, b) => b.significance - a.significance).slice(0, maxLines).sort((a, b) => a.index - b.index);

  // Group lines whose ±1.5 FWHM ranges overlap, and fit each group together.
  const lines: LampLine[] = [];
  let g = 0;
  while (g < found.length) {
    let h = g + 1;
    while (h < found.length && h - g < 4 && found[h].index - found[h - 1].index < 1.5 * (found[h].fwhm + found[h - 1].fwhm)) h++;
    const group = found.slice(g, h);
    g = h;
    const lo = Math.max(0, Math.floor(group[0].index - 3 * group[0].fwhm - 3));
    const hi = Math.min(n - 1, Math.ceil(group[group.length - 1].index + 3 * group[group.length - 1].fwhm + 3));
    const xs = x.subarray(lo, hi + 1);
    const data = {
      x: xs, unit: 'pixel' as const, flux: flux.subarray(lo, hi + 1),
      uncertainty: spectrum.uncertainty?.subarray(lo, hi + 1),
      mask: Uint8Array.from({ length: hi - lo + 1 }, (_, k) => (good[lo + k] ? 0 : 1)),
    };
    let fit: ReturnType<typeof fitLineArrays> | null = null;
    try {
      fit = fitLineArrays(data, {
        center: group.map((d) => x[d.index]),
        profile: 'gaussian',
        continuumOrder: 1,
        sign: sign > 0 ? 'emission' : 'absorption',
        initial: Object.fromEntries(group.map((d, k) => [`fwhm${k + 1}`, d.fwhm * Math.abs(x[Math.min(n - 1, d.index + 1)] - x[Math.max(0, d.index - 1)]) / 2 || d.fwhm])),
      });
    } catch {
      fit = null;
    }
    group.forEach((d, k) => {
      const flags: LampLineFlag[] = [];
      const c = fit?.components[k];
      const centreOk = c !== undefined && Number.isFinite(c.center.value) && c.center.value > xs[0] && c.center.value < xs[xs.length - 1] && Number.isFinite(c.center.uncertainty);
      if (!fit || !fit.converged || !centreOk) flags.push('fit-failed');
      // Saturation: a flat top (≥ 3 pixels at exactly the maximum) or the stated level.
      const r = Math.max(2, Math.round(d.fwhm));
      let top = -Infinity, atTop = 0, reached = false;
      for (let i = Math.max(0, d.index - r); i <= Math.min(n - 1, d.index + r); i++) {
        if (!good[i]) continue;
        const v = sign * flux[i];
        if (v > top) { top = v; atTop = 1; } else if (v === top) atTop++;
        if (options.saturationLevel !== undefined && flux[i] >= options.saturationLevel) reached = true;
      }
      if (sign > 0 && (atTop >= 3 || reached)) flags.push('saturated');
      lines.push({
        pixel: centreOk ? c!.center.value : x[d.index],
        pixelUncertainty: centreOk ? c!.center.uncertainty : NaN,
        strength: c && Number.isFinite(c.amplitude.value) ? Math.abs(c.amplitude.value) : Math.abs(y[d.index]),
        fwhmPixels: c && Number.isFinite(c.fwhm.value) ? c.fwhm.value : d.fwhm,
        fwhmUncertaintyPixels: c ? c.fwhm.uncertainty : NaN,
        significance: d.significance,
        flags,
      });
    });
  }
  lines.sort((a, b) => a.pixel - b.pixel);
  return { lines, noisePerPixel: noise, significance: threshold };
}
