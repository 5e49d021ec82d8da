/**
 * Finding and measuring the emission lines of a calibration-lamp spectrum on its pixel
 * axis: detection by the line finder (src/lines/find.ts), then a Gaussian profile on a linear background
 * fitted to each line (blends fitted together), with the centre's uncertainty from the
 * fit, and flat-topped (saturated) lines flagged.
 */
import { UsageError } from '../errors.js';
import { fitLineArrays } from '../fit/line-fit.js';
import { findLines } from '../lines/find.js';
import { median } from '../lines/snr.js';
import { createSpectrum, isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
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
  /** Noise per pixel used for detection (the finder's DER_SNR value, or the median uncertainty when the spectrum has uncertainties). */
  readonly noisePerPixel: number;
  readonly significance: number;
}

const DEFAULTS = { significance: 8, fwhmRangePixels: [1.5, 12] as const, maxLines: 200 };

/**
 * Finds and measures the lines of a lamp spectrum (or, with `kind: 'absorption'`, a star's
 * absorption lines) on its pixel axis.
 *
 * Method: lines are found by `findLines` (running-median continuum, matched filter over
 * several widths with peeling, threshold `significance` σ, noise from the spectrum's
 * uncertainty or DER_SNR; see src/lines/find.ts), which groups overlapping lines into
 * windows; each window is then fitted with Gaussians on a linear background
 * ({@link fitLineArrays}, weighted least squares, the covariance giving each centre's σ),
 * the lines of a window together. A line is flagged `saturated` when its core holds three or more
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
  /** The pixel coordinate at a fractional 0-based index (linear between pixels). */
  const atIndex = (f: number) => {
    const i = Math.min(n - 2, Math.max(0, Math.floor(f)));
    return n === 1 ? x[0] : x[i] + (x[i + 1] - x[i]) * (f - i);
  };
  // Work on the 0-based index so that widths and windows are in pixels whatever the axis.
  const indexed = spectrum.unit === 'pixel' && x[0] === 0 && x[n - 1] === n - 1 ? spectrum : createSpectrum({
    wavelength: Float64Array.from({ length: n }, (_, i) => i), flux, uncertainty: spectrum.uncertainty, mask: spectrum.mask, unit: 'pixel',
  });
  const found = findLines(indexed, {
    kind: sign > 0 ? 'emission' : 'absorption', significance: threshold,
    minFwhmPixels: fwhmRange[0], maxFwhmPixels: fwhmRange[1], maxLines,
  });
  const noise = found.noisePerPixel ?? (spectrum.uncertainty ? median([...spectrum.uncertainty].filter((v, i) => good[i] && Number.isFinite(v))) : NaN);

  // Flat tops: runs of ≥ 3 good pixels at one and the same local-maximum value (or at or
  // above the saturation level). The finder may see a flat top as a blend of several lines;
  // its lines inside a run (± 2 pixels) become one saturated line at the run's middle.
  const runs: { from: number; to: number }[] = [];
  if (sign > 0) {
    for (let i = 0; i < n; ) {
      if (!good[i]) { i++; continue; }
      let j = i;
      const sat = (k: number) => options.saturationLevel !== undefined && flux[k] >= options.saturationLevel;
      if (sat(i)) { while (j + 1 < n && good[j + 1] && sat(j + 1)) j++; }
      else { while (j + 1 < n && good[j + 1] && flux[j + 1] === flux[i]) j++; }
      const isMax = (i === 0 || flux[i - 1] < flux[i]) && (j === n - 1 || flux[j + 1] < flux[j]);
      if ((sat(i) && j >= i) || (j - i >= 2 && isMax)) runs.push({ from: i, to: j });
      i = j + 1;
    }
  }
  const runOf = (index: number) => runs.find((r) => index >= r.from - 2 && index <= r.to + 2);

  // Fit each window's lines together (windows of more than 6 lines are split into groups of at most 6).
  const lines: LampLine[] = [];
  const groups: { lines: { index: number; fwhm: number; significance: number }[]; start: number; end: number }[] = [];
  for (const w of found.windows) {
    const raw = w.lines.filter((l) => l.sign === (sign > 0 ? 'emission' : 'absorption')).map((l) => ({ index: l.pixel, fwhm: l.fwhm, significance: l.significance }));
    const ls: typeof raw = [];
    for (const l of raw) {
      const r = runOf(l.index);
      if (!r) { ls.push(l); continue; }
      const mid = (r.from + r.to) / 2;
      const prev = ls.find((q) => q.index === mid);
      if (prev) { prev.fwhm = Math.max(prev.fwhm, l.fwhm); prev.significance = Math.max(prev.significance, l.significance); }
      else ls.push({ index: mid, fwhm: Math.max(l.fwhm, r.to - r.from + 2), significance: l.significance });
    }
    for (let k = 0; k < ls.length; k += 6) {
      const part = ls.slice(k, k + 6);
      groups.push({ lines: part, start: k === 0 ? w.start : part[0].index - 3 * part[0].fwhm, end: k + 6 >= ls.length ? w.end : part[part.length - 1].index + 3 * part[part.length - 1].fwhm });
    }
  }
  for (const grp of groups) {
    const group = grp.lines;
    const lo = Math.max(0, Math.floor(Math.min(grp.start, group[0].index - 3 * group[0].fwhm - 3)));
    const hi = Math.min(n - 1, Math.ceil(Math.max(grp.end, group[group.length - 1].index + 3 * group[group.length - 1].fwhm + 3)));
    const xs = x.subarray(lo, hi + 1);
    const data = {
      x: xs, unit: 'pixel' as const, flux: flux.subarray(lo, hi + 1),
      uncertainty: spectrum.uncertainty?.subarray(lo, hi + 1),
      mask: Uint8Array.from({ length: hi - lo + 1 }, (_, k) => (good[lo + k] ? 0 : 1)),
    };
    let fit: ReturnType<typeof fitLineArrays> | null = null;
    try {
      fit = fitLineArrays(data, {
        center: group.map((d) => atIndex(d.index)),
        profile: 'gaussian',
        continuumOrder: 1,
        sign: sign > 0 ? 'emission' : 'absorption',
        initial: Object.fromEntries(group.map((d, k) => [`fwhm${k + 1}`, d.fwhm * Math.abs(atIndex(Math.min(n - 1, d.index + 1)) - atIndex(Math.max(0, d.index - 1))) / 2 || d.fwhm])),
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
      const ic = Math.round(d.index);
      let top = -Infinity, atTop = 0, reached = false;
      for (let i = Math.max(0, ic - r); i <= Math.min(n - 1, ic + r); i++) {
        if (!good[i]) continue;
        const v = sign * flux[i];
        if (v > top) { top = v; atTop = 1; } else if (v === top) atTop++;
        if (options.saturationLevel !== undefined && flux[i] >= options.saturationLevel) reached = true;
      }
      if (sign > 0 && (atTop >= 3 || reached)) flags.push('saturated');
      lines.push({
        pixel: centreOk ? c!.center.value : atIndex(d.index),
        pixelUncertainty: centreOk ? c!.center.uncertainty : NaN,
        strength: c && Number.isFinite(c.amplitude.value) ? Math.abs(c.amplitude.value) : 0,
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
