/**
 * Finding absorption and emission lines, returned as windows ready to fit.
 *
 * Method (our own combination of standard steps):
 * 1. Continuum: a running median of the flux over `continuumWindowPixels` pixels (the ends
 *    extended by odd reflection, so that a sloping continuum is followed to the last pixel),
 *    moved where lines crowd to the level of the continuum pixels: the mode of the data
 *    about it (densest quarter, then a mean shift within ±2.5 σ) at knots a quarter window
 *    apart, only away from the side the window's lines are on. In a crowded absorption
 *    spectrum the median sits inside the lines and the gaps between them, at the true
 *    continuum, would be found as emission lines (and the other way round in a crowded lamp
 *    spectrum).
 * 2. Noise per pixel: the spectrum's uncertainty when present, otherwise the DER_SNR noise
 *    of the flux (Stoehr et al. 2008) for every pixel.
 * 3. Matched filter: at each pixel and for Gaussian line shapes of FWHM 1.5, 1.5√2, 3, …
 *    pixels up to `maxFwhmPixels`, the weighted least-squares amplitude A of a Gaussian on
 *    the continuum-subtracted flux and its significance S = A/σ_A (for white Gaussian noise
 *    S is a standard normal variable at each pixel and scale).
 * 4. Peeling: the largest |S| over all pixels and scales is a line if |S| ≥ `significance`
 *    (unless a finer filter splits it into two peaks with a significant dip between them:
 *    a blend, of which the stronger fine peak is taken first, split again while a finer
 *    filter still shows a blend there);
 *    its centre (parabola through S), FWHM (the best-fitting Gaussian on a 2^(1/8) grid from
 *    half to twice the filter's, not under `minFwhmPixels`) and amplitude (weighted least squares) are refined, the Gaussian is
 *    subtracted from the flux, S is updated nearby, and the search repeats. Left-overs of
 *    earlier lines (a non-Gaussian shape, a sub-pixel offset, strong wings) are subtracted
 *    but not reported: a detection within the larger of the two FWHMs of an earlier line,
 *    unless it is a much narrower line of the same sign with at least 5 % of its amplitude
 *    (a metal line in a Balmer line, reported);
 *    and, next to a line ten times stronger and within three of its FWHM, one of opposite
 *    sign or at least 0.3 of its FWHM wide; and, within the FWHM of an earlier subtracted
 *    Gaussian that was not reported, one of the opposite sign that is weaker or narrower (the
 *    over-subtraction left by a Gaussian taken for a Voigt line or for a blend's trough).
 *    So a line fainter than a tenth of a close neighbour of similar width is not found (a
 *    known limit).
 * 5. Twice: the second pass takes the continuum of the flux minus the lines of the first,
 *    so that broad lines do not pull the continuum down.
 * 6. Windows: lines whose ±2 FWHM ranges overlap are kept together (a blend); a window spans
 *    ±3 FWHM around its outermost lines.
 *
 * False alarms: with white Gaussian noise the number of detections per spectrum above the
 * threshold t is about (number of pixels × scales / correlation length) × 2Φ(−t); at the
 * default t = 5 this was measured as 0 in 100 spectra of 2000 pixels of pure noise (see
 * test/lines/find.test.ts for the figures at lower thresholds).
 */
import { UsageError } from '../errors.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';
import { angstromPerUnit } from '../spectrum/units.js';
import { derSnr } from './snr.js';

/** Options of {@link findLines}. Every default is stated once, here. */
export interface FindLinesOptions {
  /** Detection threshold on the matched-filter significance S (in σ). Default 5. */
  significance?: number;
  /** Which features to report. Default `both`. */
  kind?: 'absorption' | 'emission' | 'both';
  /** Running-median window for the continuum, in pixels (odd; ≥ 5). Default max(101, pixels/8). */
  continuumWindowPixels?: number;
  /** Narrowest line FWHM searched, in pixels. Default 1.5. */
  minFwhmPixels?: number;
  /** Broadest line FWHM searched, in pixels. Default a quarter of the continuum window. */
  maxFwhmPixels?: number;
  /** Stop after this many reported lines. Default 500. */
  maxLines?: number;
}

/** One detected line. Lengths in the result's `unit`. */
export interface DetectedLine {
  /** Estimated centre. */
  readonly center: number;
  /** Centre as a fractional index into the spectrum's arrays. */
  readonly pixel: number;
  /** Estimated FWHM (from the best-matching filter; a starting value, not a measurement). */
  readonly fwhm: number;
  /** Estimated peak height above the continuum, flux units (negative for absorption). */
  readonly amplitude: number;
  readonly sign: 'absorption' | 'emission';
  /** Matched-filter significance at detection, in σ. */
  readonly significance: number;
}

/** A stretch of spectrum holding one line or a blend, ready for `fitLine`. */
export interface LineWindow {
  /** Window start and end, in the result's `unit`, increasing. */
  readonly start: number;
  readonly end: number;
  /** Number of lines in the window (components to fit). */
  readonly components: number;
  /** Approximate centres of the lines, increasing. */
  readonly centers: readonly number[];
  /** `mixed` when the window holds both absorption and emission lines. */
  readonly sign: 'absorption' | 'emission' | 'mixed';
  /** Largest significance among its lines. */
  readonly significance: number;
  readonly lines: readonly DetectedLine[];
}

/** What {@link findLines} returns. */
export interface FindLinesResult {
  /** `angstrom` for a calibrated spectrum (converted from nm or µm), `pixel` otherwise. */
  readonly unit: 'angstrom' | 'pixel';
  /** The threshold used, in σ. */
  readonly significance: number;
  /** Where the noise came from; `noisePerPixel` is the DER_SNR value when used. */
  readonly noiseSource: 'uncertainty' | 'der-snr';
  readonly noisePerPixel: number | null;
  /** Every reported line, by position. */
  readonly lines: readonly DetectedLine[];
  /** Lines grouped into windows, by position. */
  readonly windows: readonly LineWindow[];
  readonly provenance: readonly ProvenanceEntry[];
}

const DEFAULT_SIGNIFICANCE = 5;
/** The continuum window is at least this many pixels (and an eighth of the spectrum). */
const DEFAULT_MIN_CONTINUUM_WINDOW = 101;
const DEFAULT_MIN_FWHM_PIXELS = 1.5;
const DEFAULT_MAX_LINES = 500;
const FOUR_LN2 = 4 * Math.LN2;
/** Kernel half-extent in FWHM: exp(−4 ln2 · 1.5²) = 0.2 % of the peak. */
const KERNEL_HALF_FWHM = 1.5;
/** Subtracted Gaussians extend ±3 FWHM. */
const MODEL_HALF_FWHM = 3;

interface Scale { fwhm: number; half: number; kernel: Float64Array; s: Float64Array; a: Float64Array }
interface Found { p: number; fwhm: number; amplitude: number; significance: number; reported: boolean }

/**
 * Running median: at each index, the median of the values within ±⌊width/2⌋ (the window
 * is truncated at the ends).
 *
 * Method: a sorted window updated by binary-search insertion and removal, O(n·width).
 *
 * @param values the samples (not modified).
 * @param width window length in samples (≥ 1; odd lengths centre the window).
 * @returns a new array of the same length.
 * @example
 * runningMedian([1, 9, 2, 8, 3], 3); // Float64Array [5, 2, 8, 3, 5.5]
 */
export function runningMedian(values: ArrayLike<number>, width: number): Float64Array {
  const n = values.length;
  const h = Math.max(0, Math.floor(width / 2));
  const out = new Float64Array(n);
  const win = new Float64Array(2 * h + 1);
  let count = 0;
  const insert = (v: number) => {
    let lo = 0, hi = count;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (win[mid] < v) lo = mid + 1; else hi = mid; }
    win.copyWithin(lo + 1, lo, count);
    win[lo] = v;
    count++;
  };
  const remove = (v: number) => {
    let lo = 0, hi = count;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (win[mid] < v) lo = mid + 1; else hi = mid; }
    win.copyWithin(lo, lo + 1, count);
    count--;
  };
  for (let i = 0; i <= Math.min(h, n - 1); i++) insert(values[i]);
  for (let i = 0; i < n; i++) {
    out[i] = count % 2 ? win[(count - 1) / 2] : (win[count / 2 - 1] + win[count / 2]) / 2;
    if (i - h >= 0) remove(values[i - h]);
    if (i + h + 1 < n) insert(values[i + h + 1]);
  }
  return out;
}

/** Fraction of a window's pixels in the densest interval that seeds the continuum level. */
const MODE_FRACTION = 0.25;
/** Half-width of the averaging interval around the level, in units of the noise per pixel. */
const MODE_HALF_WIDTH_SIGMA = 2.5;
/** Knots of the level per continuum window. */
const MODE_KNOTS_PER_WINDOW = 4;

/**
 * Which tail of the values is the longer one (the 10 % quantile's distance below the median
 * against the 90 % quantile's above it): the side the window's lines are on, `low` for
 * absorption lines.
 */
function longerTail(e: Float64Array): 'low' | 'high' {
  const s = Float64Array.from(e).sort();
  const q = (p: number) => s[Math.round(p * (s.length - 1))];
  return q(0.5) - q(0.1) > q(0.9) - q(0.5) ? 'low' : 'high';
}

/**
 * The level of the continuum pixels among values e whose lines lie on side `lines` (a sorted
 * copy is made): the densest quarter of the values among the half away from the lines (the
 * shortest interval holding 25 % of all values, above the median for absorption lines) seeds
 * the level, then the mean of the values within ±2.5 noise (at least the seed interval's
 * width) of it, repeated until it stops moving (a mean shift to the nearest mode). Lines
 * cannot push the flux past the continuum, so the values pile up just inside it (the
 * continuum pixels and the lines' far wings), and the seed finds that pile even where lines
 * cover most of the window.
 */
function modeLevel(e: Float64Array, noise: number, lines: 'low' | 'high'): number {
  const s = Float64Array.from(e).sort();
  const m = s.length;
  const k = Math.max(3, Math.ceil(MODE_FRACTION * m));
  if (m < 2 * k) return s[m >> 1];
  let best = lines === 'low' ? m >> 1 : 0;
  const last = lines === 'low' ? m - k : (m >> 1) - k + 1;
  for (let i = best + 1; i <= last; i++) if (s[i + k - 1] - s[i] < s[best + k - 1] - s[best]) best = i;
  const prefix = new Float64Array(m + 1);
  for (let i = 0; i < m; i++) prefix[i + 1] = prefix[i] + s[i];
  const lower = (x: number) => { let lo = 0, hi = m; while (lo < hi) { const mid = (lo + hi) >> 1; if (s[mid] < x) lo = mid + 1; else hi = mid; } return lo; };
  const upper = (x: number) => { let lo = 0, hi = m; while (lo < hi) { const mid = (lo + hi) >> 1; if (s[mid] <= x) lo = mid + 1; else hi = mid; } return lo; };
  let c = (prefix[best + k] - prefix[best]) / k;
  const b = Math.max(MODE_HALF_WIDTH_SIGMA * noise, s[best + k - 1] - s[best]);
  for (let it = 0; it < 20; it++) {
    const i0 = lower(c - b), i1 = upper(c + b);
    if (i1 <= i0) break;
    const next = (prefix[i1] - prefix[i0]) / (i1 - i0);
    const done = Math.abs(next - c) <= 1e-3 * b;
    c = next;
    if (done) break;
  }
  return c;
}

/** Rounds of the level correction (each on the data less the previous estimate). */
const MODE_ROUNDS = 2;

/**
 * The continuum for line finding: the running median ({@link continuumMedian}), moved to the
 * level of the continuum pixels where lines crowd. Where lines cover much of a window the
 * median sits inside them: below the continuum in a crowded absorption spectrum, above it in
 * a crowded emission spectrum (a lamp at low resolution), and the gaps between lines, which
 * reach the true continuum, would look like lines of the other sign. The continuum pixels
 * still form the densest cluster of values (their spread is the noise; the lines' pixels
 * spread over the line depths), so at knots every quarter of a window the level of that
 * cluster among the data less the current estimate ({@link modeLevel}) corrects it, linearly
 * interpolated between knots, twice (the second round sharpens the cluster). The correction
 * only moves the continuum away from the lines (up where the window's longer tail is low,
 * down where it is high) and never past the median on the lines' side, so a forest of lines
 * without a clear continuum keeps at worst the median. `noise` is the 1-σ noise per pixel.
 */
function continuumLevel(values: Float64Array, noise: Float64Array, width: number): Float64Array {
  const n = values.length;
  const med = continuumMedian(values, width);
  if (n < 5 || width < 5) return med;
  const { knots, windows } = knotWindows(n, width);
  const knotNoise = windows.map(([a, b]) => medianOf(noise.subarray(a, b)));
  const fromMedian = Float64Array.from(values, (v, k) => v - med[k]);
  const tails = windows.map(([a, b]) => longerTail(fromMedian.subarray(a, b)));
  const cont = Float64Array.from(med);
  for (let round = 0; round < MODE_ROUNDS; round++) {
    const e = Float64Array.from(values, (v, k) => v - cont[k]);
    const level = interpolateKnots(knots, windows.map(([a, b], j) => modeLevel(e.subarray(a, b), knotNoise[j], tails[j])), n);
    const up = interpolateKnots(knots, tails.map((t) => (t === 'low' ? 1 : -1)), n);
    for (let k = 0; k < n; k++) {
      // away from the lines only: up where they are absorption lines, down where emission
      const next = cont[k] + level[k];
      cont[k] = up[k] >= 0 ? Math.max(med[k], next) : Math.min(med[k], next);
    }
  }
  return cont;
}

/** Knots a quarter window apart (the last at n − 1) and the window [start, end) around each. */
function knotWindows(n: number, width: number): { knots: number[]; windows: (readonly [number, number])[] } {
  const h = Math.floor(width / 2);
  const step = Math.max(1, Math.floor(width / MODE_KNOTS_PER_WINDOW));
  const knots: number[] = [];
  for (let k = 0; k < n - 1; k += step) knots.push(k);
  knots.push(n - 1);
  return { knots, windows: knots.map((k) => [Math.max(0, k - h), Math.min(n, k + h + 1)] as const) };
}

/** Values at knot indices (increasing, the last n − 1), linearly interpolated to every index 0 … n − 1. */
function interpolateKnots(knots: readonly number[], values: readonly number[], n: number): Float64Array {
  const out = new Float64Array(n);
  for (let j = 0; j < knots.length; j++) {
    const j1 = Math.min(j + 1, knots.length - 1);
    const k0 = knots[j], k1 = knots[j1];
    if (k1 === k0) { out[k0] = values[j]; break; }
    for (let k = k0; k <= k1; k++) out[k] = values[j] + ((k - k0) / (k1 - k0)) * (values[j1] - values[j]);
  }
  return out;
}

/** The minority-sign test's envelope: the 10 % and 90 % quantiles of the flux about the continuum… */
const ENVELOPE_QUANTILE = 0.1;
/** …less the same quantile of Gaussian noise, 1.2816 σ (normal distribution table). */
const ENVELOPE_NOISE_QUANTILE = 1.2816;

/**
 * How far above the continuum the tops of the gaps between absorption lines reach (`raise`,
 * where the window's longer tail is low) or how far below it the floor between emission
 * lines lies (`lower`, where it is high), per pixel, flux units, ≥ 0: the 90 % (10 %)
 * quantile of the flux less the continuum, less the same quantile of the noise, at knots a
 * quarter window apart, linearly interpolated. Where the continuum is well defined both are
 * within the noise of zero; in a forest of lines with no continuum pixels left they measure
 * how far the continuum may be off.
 */
function envelope(d: Float64Array, noise: Float64Array, width: number): { raise: Float64Array; lower: Float64Array } {
  const n = d.length;
  const { knots, windows } = knotWindows(n, width);
  const at = windows.map(([a, b]) => {
    const s = Float64Array.from(d.subarray(a, b)).sort();
    const q = (p: number) => s[Math.round(p * (s.length - 1))];
    const sig = medianOf(noise.subarray(a, b));
    const low = q(0.5) - q(ENVELOPE_QUANTILE) > q(1 - ENVELOPE_QUANTILE) - q(0.5);
    return low
      ? { raise: Math.max(0, q(1 - ENVELOPE_QUANTILE) - ENVELOPE_NOISE_QUANTILE * sig), lower: 0 }
      : { raise: 0, lower: Math.max(0, -q(ENVELOPE_QUANTILE) - ENVELOPE_NOISE_QUANTILE * sig) };
  });
  const raise = interpolateKnots(knots, at.map((a) => a.raise), n);
  const lower = interpolateKnots(knots, at.map((a) => a.lower), n);
  return { raise, lower };
}

/**
 * Running median whose ends follow a sloping continuum: beyond each end the data are
 * extended by odd reflection about a straight line through the medians of the two halves
 * of the first (last) full window, so that a straight continuum continues straight and
 * lines or noise in the end pixels do not set its level. Spectra shorter than 3h + 1
 * (h = half window) keep truncated windows.
 */
function continuumMedian(values: Float64Array, width: number): Float64Array {
  const n = values.length;
  const h = Math.floor(width / 2);
  if (h < 2 || n < 3 * h + 1) return runningMedian(values, width);
  const endLine = (lo: number): [number, number] => {
    // points (lo + h/2, median of [lo, lo+h]) and (lo + 3h/2, median of [lo+h, lo+2h])
    const m1 = medianOf(values.subarray(lo, lo + h + 1));
    const m2 = medianOf(values.subarray(lo + h, lo + 2 * h + 1));
    const slope = (m2 - m1) / h;
    return [m1 - slope * (lo + h / 2), slope]; // value at index 0, slope per pixel
  };
  // Odd reflection about the line's value at the end pixel: ext(j) = 2·L(0) − f(−j) on the
  // left, 2·L(n − 1) − f(2(n − 1) − j) on the right (a straight line maps onto itself).
  const [a0] = endLine(0);
  const [b0, bs] = endLine(n - 2 * h - 1);
  const bEnd = b0 + bs * (n - 1);
  const ext = new Float64Array(n + 2 * h);
  for (let j = -h; j < 0; j++) ext[j + h] = 2 * a0 - values[-j];
  for (let j = n; j < n + h; j++) ext[j + h] = 2 * bEnd - values[2 * (n - 1) - j];
  ext.set(values, h);
  return runningMedian(ext, width).subarray(h, h + n);
}

function medianOf(v: Float64Array): number {
  const s = Float64Array.from(v).sort();
  const k = s.length;
  return k % 2 ? s[(k - 1) / 2] : (s[k / 2 - 1] + s[k / 2]) / 2;
}

function filterRange(sc: Scale, r: Float64Array, w: Float64Array, i0: number, i1: number): void {
  const n = r.length;
  const { half, kernel } = sc;
  for (let i = Math.max(0, i0); i < Math.min(n, i1); i++) {
    let num = 0, den = 0;
    const k0 = Math.max(-half, -i), k1 = Math.min(half, n - 1 - i);
    for (let k = k0; k <= k1; k++) {
      const g = kernel[k + half];
      const wk = w[i + k];
      num += g * r[i + k] * wk;
      den += g * g * wk;
    }
    sc.s[i] = den > 0 ? num / Math.sqrt(den) : 0;
    sc.a[i] = den > 0 ? num / den : 0;
  }
}

/** A narrower line is kept inside a broader one when under this fraction of its FWHM. */
const NARROW_FRACTION = 0.5;
/** A narrower line inside a broader one is reported only if at least this fraction of its amplitude (weaker ones are noise left by the subtraction). */
const INNER_MIN_AMPLITUDE_FRACTION = 0.05;
/** Anything within this fraction of a line's FWHM from its centre is part of that line (a core shape unlike a Gaussian). */
const CORE_FRACTION = 0.25;
/** A neighbour this many times stronger (in amplitude) can leave wings that look like lines… */
const DOMINANCE = 10;
/** …within this many of its FWHM… */
const WING_REACH_FWHM = 3;
/** …for features at least this fraction of its FWHM wide. */
const WING_MIN_WIDTH_FRACTION = 0.3;

/**
 * Whether a detection (pixel p, FWHM f pixels, amplitude amp) is a left-over of the earlier
 * line e rather than a line of its own:
 * - within a quarter of e's FWHM of its centre (e's core is not exactly Gaussian);
 * - within the larger of their FWHMs, unless it is a much narrower line of the same sign
 *   with at least 5 % of e's amplitude (a metal line in a Balmer line);
 * - next to a line ten times stronger: within three of its FWHM, of the opposite sign or at
 *   least 0.3 of its width (its non-Gaussian wings); or within half a continuum window, of
 *   the opposite sign and at least 0.3 of its width (the running median pulled down by its wings).
 */
function isLeftover(e: Found, p: number, f: number, amp: number, continuumHalfWindow: number): boolean {
  const dist = Math.abs(e.p - p);
  const sameSign = Math.sign(e.amplitude) === Math.sign(amp);
  const narrower = f < NARROW_FRACTION * e.fwhm;
  if (dist < CORE_FRACTION * e.fwhm) return true;
  if (dist < Math.max(e.fwhm, f)) return !(sameSign && narrower && Math.abs(amp) >= INNER_MIN_AMPLITUDE_FRACTION * Math.abs(e.amplitude));
  if (Math.abs(e.amplitude) >= DOMINANCE * Math.abs(amp)) {
    if (dist < WING_REACH_FWHM * e.fwhm) return !sameSign || f >= WING_MIN_WIDTH_FRACTION * e.fwhm;
    if (!sameSign && f >= WING_MIN_WIDTH_FRACTION * e.fwhm && dist < continuumHalfWindow + f) return true;
  }
  return false;
}

/**
 * Whether a detection is a correction of an earlier subtracted Gaussian that was not itself
 * reported (a piece of a broad line's non-Gaussian profile, or the trough of a blend taken by a
 * broad filter): of the opposite sign, weaker or narrower, and within the larger of the two
 * FWHMs. A Gaussian subtracted from a line of another shape, or from several lines, over-
 * subtracts somewhere, and the bump left there is not a line of the other kind.
 */
function isCorrection(e: Found, p: number, f: number, amp: number): boolean {
  return Math.sign(e.amplitude) !== Math.sign(amp) && (Math.abs(amp) < Math.abs(e.amplitude) || f < e.fwhm) && Math.abs(e.p - p) < Math.max(e.fwhm, f);
}

/** A blend splits when the dip between two fine-filter peaks is below this fraction of the lower peak… */
const SPLIT_DIP_FRACTION = 0.7;
/** …and at least this many σ below it. */
const SPLIT_DIP_SIGMA = 3;

/**
 * Looks, from the next finer filter down to the finest, for two same-sign peaks above the
 * threshold within ±0.75 FWHM of the broad detection, at least one fine FWHM apart, with a
 * significant dip between them. Returns the stronger peak at the first (coarsest) such scale.
 */
function splitBlend(scales: Scale[], bs: number, bi: number, threshold: number): { scale: number; index: number } | null {
  const n = scales[0].s.length;
  const sign = Math.sign(scales[bs].s[bi]);
  const reach = Math.ceil(0.75 * scales[bs].fwhm);
  for (let t = bs - 1; t >= 0; t--) {
    const v = scales[t].s;
    const lo = Math.max(1, bi - reach), hi = Math.min(n - 2, bi + reach);
    const peaks: number[] = [];
    for (let i = lo; i <= hi; i++) {
      const a = sign * v[i];
      if (a >= threshold && a > sign * v[i - 1] && a >= sign * v[i + 1]) peaks.push(i);
    }
    for (let k = 0; k + 1 < peaks.length; k++) {
      const i = peaks[k], j = peaks[k + 1];
      if (j - i < scales[t].fwhm) continue;
      let dip = Infinity;
      for (let m = i; m <= j; m++) dip = Math.min(dip, sign * v[m]);
      const low = Math.min(sign * v[i], sign * v[j]);
      if (dip <= SPLIT_DIP_FRACTION * low && low - dip >= SPLIT_DIP_SIGMA) {
        let strongest = peaks[0];
        for (const q of peaks) if (sign * v[q] > sign * v[strongest]) strongest = q;
        return { scale: t, index: strongest };
      }
    }
  }
  return null;
}

/**
 * Whether a detection of significance S (filter `sc` at pixel i) stays at or above the
 * threshold measured from the far side of the window's envelope on its own side
 * ({@link envelope}): an emission line must rise above the gap tops of a crowded absorption
 * spectrum, an absorption line dip below the floor between a crowded emission spectrum's
 * lines. Elsewhere the envelope is within the noise of the continuum and changes little.
 */
function clearsEnvelope(sc: Scale, i: number, w: Float64Array, significance: number, threshold: number, env: { raise: Float64Array; lower: Float64Array }): boolean {
  const shift = significance > 0 ? env.raise : env.lower;
  const n = w.length;
  let num = 0, den = 0;
  for (let k = Math.max(-sc.half, -i); k <= Math.min(sc.half, n - 1 - i); k++) {
    const g = sc.kernel[k + sc.half];
    num += g * w[i + k] * shift[i + k];
    den += g * g * w[i + k];
  }
  return den > 0 ? Math.abs(significance) - num / Math.sqrt(den) >= threshold : true;
}

/** One peeling pass over the continuum-subtracted flux r (modified). Returns every subtracted Gaussian. */
function peel(
  r: Float64Array, w: Float64Array, fwhms: number[], threshold: number, maxLines: number, continuumHalfWindow: number,
  env: { raise: Float64Array; lower: Float64Array },
): Found[] {
  const n = r.length;
  const scales: Scale[] = fwhms.map((f) => {
    const half = Math.max(1, Math.ceil(KERNEL_HALF_FWHM * f));
    const kernel = Float64Array.from({ length: 2 * half + 1 }, (_, k) => Math.exp((-FOUR_LN2 * (k - half) ** 2) / (f * f)));
    const sc = { fwhm: f, half, kernel, s: new Float64Array(n), a: new Float64Array(n) };
    filterRange(sc, r, w, 0, n);
    return sc;
  });
  const found: Found[] = [];
  let reported = 0;
  for (let iter = 0; iter < 8 * maxLines && reported < maxLines; iter++) {
    let best = 0, bs = -1, bi = -1;
    for (let s = 0; s < scales.length; s++) {
      const arr = scales[s].s;
      for (let i = 0; i < n; i++) {
        const v = arr[i];
        if (Math.abs(v) > best && Number.isFinite(v)) { best = Math.abs(v); bs = s; bi = i; }
      }
    }
    if (bs < 0 || best < threshold) break;
    // A blend looks like one broad line to a broad filter: if a finer filter shows two
    // separate peaks there, take the stronger fine peak instead (the other comes later).
    // Repeated: a peak of a finer filter may itself be a blend at a finer scale still.
    for (let split = splitBlend(scales, bs, bi, threshold); split; split = splitBlend(scales, bs, bi, threshold)) {
      bs = split.scale; bi = split.index; best = Math.abs(scales[bs].s[bi]);
    }
    const sc = scales[bs];
    const sv = sc.s;
    // Sub-pixel centre: parabola through S at bi−1, bi, bi+1.
    let dp = 0;
    if (bi > 0 && bi < n - 1) {
      const den = sv[bi - 1] - 2 * sv[bi] + sv[bi + 1];
      if (den !== 0) dp = Math.max(-0.5, Math.min(0.5, (0.5 * (sv[bi - 1] - sv[bi + 1])) / den));
      if (!Number.isFinite(dp)) dp = 0;
    }
    const p = bi + dp;
    // Width and amplitude: the Gaussian FWHM (a 2^(1/8) grid from half to twice the best
    // filter's, so beyond the broadest filter too) whose weighted least-squares fit at p
    // explains most of the flux (largest num²/den), and its amplitude num/den.
    let f = sc.fwhm, amp = sc.a[bi], bestGain = -1;
    for (let t = -8; t <= 8; t++) {
      const ft = sc.fwhm * Math.pow(2, t / 8);
      if (ft < scales[0].fwhm) continue; // never narrower than the narrowest filter
      const ext = Math.ceil(MODEL_HALF_FWHM * ft);
      let num = 0, den = 0;
      for (let k = Math.max(0, Math.floor(p) - ext); k <= Math.min(n - 1, Math.ceil(p) + ext); k++) {
        const g = Math.exp((-FOUR_LN2 * (k - p) ** 2) / (ft * ft));
        num += g * r[k] * w[k];
        den += g * g * w[k];
      }
      if (den > 0 && (num * num) / den > bestGain) { bestGain = (num * num) / den; f = ft; amp = num / den; }
    }
    // Absurd data (values near the float range) can overflow the sums: stop rather than
    // subtract a non-finite line.
    if (!Number.isFinite(p) || !Number.isFinite(f) || !Number.isFinite(amp)) break;
    const ext = Math.ceil(MODEL_HALF_FWHM * f);
    const significance = sv[bi];
    const leftover = found.some((e) => (e.reported ? isLeftover(e, p, f, amp, continuumHalfWindow) : isCorrection(e, p, f, amp)));
    const rep = !leftover && Math.sign(amp) === Math.sign(significance) && clearsEnvelope(sc, bi, w, significance, threshold, env);
    found.push({ p, fwhm: f, amplitude: amp, significance, reported: rep });
    if (rep) reported++;
    const k0 = Math.max(0, Math.floor(p) - ext), k1 = Math.min(n - 1, Math.ceil(p) + ext);
    for (let k = k0; k <= k1; k++) r[k] -= amp * Math.exp((-FOUR_LN2 * (k - p) ** 2) / (f * f));
    for (const s2 of scales) filterRange(s2, r, w, k0 - s2.half, k1 + s2.half + 1);
  }
  return found;
}

/**
 * Finds absorption and emission lines above a significance threshold and groups blends
 * into windows ready to fit (see the module notes for the method). Works on calibrated
 * spectra (positions in Å) and on pixel-axis spectra (positions in pixels), on lamp spectra
 * (many narrow emission lines, little continuum) and on star spectra (broad Balmer
 * absorption with narrow metal lines).
 *
 * Missing data: unusable pixels (see `isUsablePixel`) are skipped; the filter runs over
 * the remaining pixels in order.
 *
 * @param spectrum any spectrum with at least 5 usable pixels.
 * @param options threshold (σ), kind of feature, continuum window and FWHM range in pixels.
 * @returns the lines and windows (possibly none), with the threshold and noise source used.
 * @throws {UsageError} for options out of range.
 * @example
 * const wl = Array.from({ length: 400 }, (_, i) => 6000 + i);
 * const flux = wl.map((w, i) => 1 + 0.01 * Math.sin(i * 2.1) - 0.5 * Math.exp(-4 * Math.LN2 * ((w - 6200) / 4) ** 2));
 * findLines(createSpectrum({ wavelength: wl, flux })).windows[0].centers; // ≈ [6200]
 */
export function findLines(spectrum: Spectrum, options: FindLinesOptions = {}): FindLinesResult {
  const threshold = options.significance ?? DEFAULT_SIGNIFICANCE;
  if (!(threshold > 0) || !Number.isFinite(threshold)) throw new UsageError('find.bad-significance', `significance must be a number > 0, got ${threshold}`);
  const kind = options.kind ?? 'both';
  if (!['absorption', 'emission', 'both'].includes(kind)) throw new UsageError('find.bad-kind', `kind must be absorption, emission or both, got "${kind}"`);
  const maxLines = options.maxLines ?? DEFAULT_MAX_LINES;
  if (!(maxLines >= 1)) throw new UsageError('find.bad-max-lines', `maxLines must be ≥ 1, got ${maxLines}`);
  const keep: number[] = [];
  for (let i = 0; i < spectrum.flux.length; i++) if (isUsablePixel(spectrum, i)) keep.push(i);
  const n = keep.length;
  const unit = spectrum.unit === 'pixel' ? 'pixel' : 'angstrom';
  const scale = spectrum.unit === 'pixel' ? 1 : angstromPerUnit(spectrum.unit);
  let cw = options.continuumWindowPixels ?? Math.max(DEFAULT_MIN_CONTINUUM_WINDOW, Math.round(n / 8));
  if (!(cw >= 5) || !Number.isFinite(cw)) throw new UsageError('find.bad-continuum-window', `continuumWindowPixels must be ≥ 5, got ${cw}`);
  cw = Math.round(cw) | 1;
  const minF = options.minFwhmPixels ?? DEFAULT_MIN_FWHM_PIXELS;
  const maxF = options.maxFwhmPixels ?? cw / 4;
  if (!(minF > 0) || !(maxF >= minF)) throw new UsageError('find.bad-fwhm-range', `the FWHM range must satisfy 0 < minFwhmPixels ≤ maxFwhmPixels, got ${minF} and ${maxF}`);

  const flux = Float64Array.from(keep, (i) => spectrum.flux[i]);
  let noiseSource: 'uncertainty' | 'der-snr' = 'uncertainty';
  let noisePerPixel: number | null = null;
  const w = new Float64Array(n);
  if (spectrum.uncertainty) {
    keep.forEach((i, k) => { w[k] = 1 / spectrum.uncertainty![i] ** 2; });
  } else {
    noiseSource = 'der-snr';
    let noise = derSnr(flux).noise;
    // Noise-free data (synthetic): a floor so that weights stay finite.
    let peak = 0;
    for (const v of flux) peak = Math.max(peak, Math.abs(v));
    if (!(noise > 0)) noise = Math.max(1e-9 * peak, Number.MIN_VALUE);
    noisePerPixel = noise;
    w.fill(1 / (noise * noise));
  }
  const fwhms: number[] = [];
  for (let f = minF; f <= maxF * (1 + 1e-9); f *= Math.SQRT2) fwhms.push(f);

  let found: Found[] = [];
  if (n >= 5) {
    // Pass 1: continuum from the flux (running median moved to the continuum pixels' level).
    const noise = Float64Array.from(w, (x) => 1 / Math.sqrt(x));
    let cont = continuumLevel(flux, noise, cw);
    let r = Float64Array.from(flux, (v, k) => v - cont[k]);
    found = peel(r, w, fwhms, threshold, maxLines, cw / 2, envelope(r, noise, cw));
    // Pass 2: the same from the flux minus the lines found.
    const lines = new Float64Array(n);
    for (const e of found) {
      const ext = Math.ceil(MODEL_HALF_FWHM * e.fwhm);
      for (let k = Math.max(0, Math.floor(e.p) - ext); k <= Math.min(n - 1, Math.ceil(e.p) + ext); k++) {
        lines[k] += e.amplitude * Math.exp((-FOUR_LN2 * (k - e.p) ** 2) / (e.fwhm * e.fwhm));
      }
    }
    const lineFree = Float64Array.from(flux, (v, k) => v - lines[k]);
    cont = continuumLevel(lineFree, noise, cw);
    r = Float64Array.from(flux, (v, k) => v - cont[k]);
    found = peel(r, w, fwhms, threshold, maxLines, cw / 2, envelope(r, noise, cw));
  }

  // Positions: compressed index → original index and spectral coordinate.
  const interp = (arr: (k: number) => number, p: number) => {
    const k0 = Math.max(0, Math.min(n - 2, Math.floor(p)));
    const t = p - k0;
    return n === 1 ? arr(0) : arr(k0) * (1 - t) + arr(k0 + 1) * t;
  };
  const xAt = (p: number) => interp((k) => spectrum.wavelength[keep[k]] * scale, Math.max(0, Math.min(n - 1, p)));
  const pixelAt = (p: number) => interp((k) => keep[k], Math.max(0, Math.min(n - 1, p)));
  // Both kinds are always found and subtracted (so that each cleans the other's
  // neighbourhood); `kind` only selects what is reported.
  const wanted = (e: Found) => kind === 'both' || (kind === 'emission' ? e.amplitude > 0 : e.amplitude < 0);
  const detections = found.filter((e) => e.reported && wanted(e)).sort((a, b) => a.p - b.p);
  const lines: DetectedLine[] = detections.map((e) => ({
    center: xAt(e.p),
    pixel: pixelAt(e.p),
    fwhm: Math.abs(xAt(e.p + e.fwhm / 2) - xAt(e.p - e.fwhm / 2)),
    amplitude: e.amplitude,
    sign: e.amplitude < 0 ? 'absorption' : 'emission',
    significance: Math.abs(e.significance),
  }));

  // Windows: lines whose ±2 FWHM ranges (in pixels) overlap stay together.
  const windows: LineWindow[] = [];
  let group: number[] = [];
  const flush = () => {
    if (!group.length) return;
    const ds = group.map((g) => detections[g]);
    const ls = group.map((g) => lines[g]);
    const lo = Math.min(...ds.map((e) => e.p - MODEL_HALF_FWHM * e.fwhm));
    const hi = Math.max(...ds.map((e) => e.p + MODEL_HALF_FWHM * e.fwhm));
    const a = xAt(lo), b = xAt(hi);
    const signs = new Set(ls.map((l) => l.sign));
    windows.push({
      start: Math.min(a, b),
      end: Math.max(a, b),
      components: ls.length,
      centers: ls.map((l) => l.center).sort((p, q) => p - q),
      sign: signs.size > 1 ? 'mixed' : ls[0].sign,
      significance: Math.max(...ls.map((l) => l.significance)),
      lines: [...ls].sort((p, q) => p.center - q.center),
    });
    group = [];
  };
  let reach = -Infinity;
  detections.forEach((e, j) => {
    if (e.p - 2 * e.fwhm > reach) flush();
    group.push(j);
    reach = Math.max(reach, e.p + 2 * e.fwhm);
  });
  flush();
  windows.sort((a, b) => a.start - b.start);
  const sortedLines = [...lines].sort((a, b) => a.center - b.center);
  return {
    unit,
    significance: threshold,
    noiseSource,
    noisePerPixel,
    lines: sortedLines,
    windows,
    provenance: Object.freeze([
      ...spectrum.provenance,
      provenanceEntry('find-lines', { significance: threshold, kind, continuumWindowPixels: cw, minFwhmPixels: minF, maxFwhmPixels: maxF, noiseSource }),
    ]),
  };
}
