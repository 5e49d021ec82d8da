/**
 * Starting values for a line fit, from the data in the window alone.
 *
 * - Continuum: a straight line through the medians of the first and last 15 % of the
 *   window's pixels (at least 2 each side); curvature starts at 0.
 * - Sign (when not given): the sign of the continuum-subtracted flux summed over the three
 *   pixels nearest each given centre.
 * - Amplitude: the extremum of the continuum-subtracted flux near the centre.
 * - Width: the distance between the half-maximum crossings (linear interpolation), which
 *   unlike the second moment is not inflated by Lorentzian wings or by noise far from the
 *   line; the second moment of the core is the fallback when a crossing is missing.
 * - Centre: the first moment of the flux above half maximum (the centroid).
 * - Several components from one centre: the N highest separate local extrema of the
 *   smoothed flux in the line's extent; when fewer are found, N components spread evenly
 *   over the half-maximum extent with widths FWHM/N.
 * A Voigt starts with equal Gaussian and Lorentzian FWHMs whose total FWHM (Olivero &
 * Longbothum 1977) equals the estimate.
 */
import { componentSize, type LineModelShape } from './line-model.js';

/** Absorption (the line lies below the continuum) or emission. */
export type LineSign = 'absorption' | 'emission';

/** The half-maximum extent of a line around a peak, in x. */
interface LineExtent {
  peakIndex: number;
  amplitude: number;
  left: number;
  right: number;
  centroid: number;
  fwhm: number;
}

function medianOf(a: number[]): number {
  const s = a.slice().sort((p, q) => p - q);
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** Total FWHM of a Voigt with equal Gaussian and Lorentzian FWHM a is a·(0.5346 + √1.2166) (Olivero & Longbothum 1977). */
const VOIGT_EQUAL_WIDTH_FACTOR = 0.5346 + Math.sqrt(0.2166 + 1);

/**
 * Continuum line through the window edges: returns [c0 at x_ref, slope].
 * `x` is increasing.
 */
export function guessContinuum(x: ArrayLike<number>, y: ArrayLike<number>, reference: number): [number, number] {
  const m = x.length;
  const k = Math.max(2, Math.min(Math.floor(m / 3), Math.round(0.15 * m)));
  const xl: number[] = [], yl: number[] = [], xr: number[] = [], yr: number[] = [];
  for (let i = 0; i < k; i++) { xl.push(x[i]); yl.push(y[i]); xr.push(x[m - 1 - i]); yr.push(y[m - 1 - i]); }
  const x0 = medianOf(xl), y0 = medianOf(yl), x1 = medianOf(xr), y1 = medianOf(yr);
  const slope = x1 > x0 ? (y1 - y0) / (x1 - x0) : 0;
  return [y0 + slope * (reference - x0), slope];
}

function smooth3(q: Float64Array): Float64Array {
  const m = q.length;
  const s = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const a = q[Math.max(0, i - 1)], b = q[i], c = q[Math.min(m - 1, i + 1)];
    s[i] = (a + b + c) / 3;
  }
  return s;
}

/** Half-maximum extent around peak index ip of q (positive in the line), stopping at valleys when `stopAtValleys`. */
function extentAt(x: ArrayLike<number>, q: Float64Array, qs: Float64Array, ip: number, stopAtValleys: boolean): LineExtent {
  const m = x.length;
  const amp = Math.max(q[ip], qs[ip]);
  const half = amp / 2;
  let left = NaN, right = NaN;
  for (let i = ip; i > 0; i--) {
    if (qs[i - 1] <= half) { left = x[i - 1] + ((half - qs[i - 1]) / (qs[i] - qs[i - 1])) * (x[i] - x[i - 1]); break; }
    if (stopAtValleys && qs[i - 1] > qs[i] && i < ip) break;
  }
  for (let i = ip; i < m - 1; i++) {
    if (qs[i + 1] <= half) { right = x[i] + ((qs[i] - half) / (qs[i] - qs[i + 1])) * (x[i + 1] - x[i]); break; }
    if (stopAtValleys && qs[i + 1] > qs[i] && i > ip) break;
  }
  let fwhm: number;
  if (Number.isFinite(left) && Number.isFinite(right)) fwhm = right - left;
  else if (Number.isFinite(left)) fwhm = 2 * (x[ip] - left);
  else if (Number.isFinite(right)) fwhm = 2 * (right - x[ip]);
  else {
    // Second moment of q > 0 around the peak (the line is wider than the window).
    let s0 = 0, s1 = 0, s2 = 0;
    for (let i = 0; i < m; i++) if (q[i] > 0) { s0 += q[i]; s1 += q[i] * x[i]; }
    const mu = s0 > 0 ? s1 / s0 : x[ip];
    for (let i = 0; i < m; i++) if (q[i] > 0) s2 += q[i] * (x[i] - mu) ** 2;
    fwhm = s0 > 0 ? 2 * Math.sqrt((2 * Math.LN2 * s2) / s0) : (x[m - 1] - x[0]) / 4;
  }
  const lo = Number.isFinite(left) ? left : x[ip] - fwhm / 2;
  const hi = Number.isFinite(right) ? right : x[ip] + fwhm / 2;
  let w0 = 0, w1 = 0;
  for (let i = 0; i < m; i++) if (x[i] >= lo && x[i] <= hi && q[i] > 0) { w0 += q[i]; w1 += q[i] * x[i]; }
  return { peakIndex: ip, amplitude: amp, left: lo, right: hi, centroid: w0 > 0 ? w1 / w0 : x[ip], fwhm };
}

/** What {@link guessLineParameters} returns. */
export interface LineGuess {
  /** Full parameter vector in the layout of `line-model.ts`. */
  parameters: Float64Array;
  sign: LineSign;
  /** FWHM estimate of the whole feature (x unit), used to size the default window. */
  featureFwhm: number;
}

/**
 * Starting values for the model `shape` from usable pixels (x increasing) of a window.
 * @param centers approximate centres: one for all components, or one per component.
 */
export function guessLineParameters(
  shape: LineModelShape, x: ArrayLike<number>, y: ArrayLike<number>, centers: readonly number[], sign: LineSign | 'auto',
): LineGuess {
  const m = x.length;
  const p = new Float64Array(shape.continuumOrder + 1 + shape.components * componentSize(shape.profile));
  const [c0, slope] = guessContinuum(x, y, shape.continuumReference);
  p[0] = c0;
  if (shape.continuumOrder >= 1) p[1] = slope;
  const spacing = m > 1 ? (x[m - 1] - x[0]) / (m - 1) : 1;
  const r = new Float64Array(m);
  for (let i = 0; i < m; i++) r[i] = y[i] - (c0 + slope * (x[i] - shape.continuumReference));
  const nearest = (c: number) => {
    let best = 0;
    for (let i = 1; i < m; i++) if (Math.abs(x[i] - c) < Math.abs(x[best] - c)) best = i;
    return best;
  };
  let s: LineSign;
  if (sign === 'auto') {
    let sum = 0;
    for (const c of centers) {
      const i = nearest(c);
      for (let j = Math.max(0, i - 1); j <= Math.min(m - 1, i + 1); j++) sum += r[j];
    }
    s = sum < 0 ? 'absorption' : 'emission';
  } else s = sign;
  const sg = s === 'absorption' ? -1 : 1;
  const q = new Float64Array(m);
  for (let i = 0; i < m; i++) q[i] = sg * r[i];
  const qs = smooth3(q);
  const localPeak = (c: number, reach: number) => {
    const i0 = nearest(c);
    let best = i0;
    for (let i = 0; i < m; i++) if (Math.abs(x[i] - c) <= reach && qs[i] > qs[best]) best = i;
    return best;
  };

  const n = shape.components;
  const comps: { center: number; fwhm: number; amplitude: number }[] = [];
  let featureFwhm: number;
  if (centers.length === n && n > 1) {
    for (const c of centers) {
      const e = extentAt(x, q, qs, localPeak(c, 2 * spacing), true);
      comps.push({ center: x[e.peakIndex], fwhm: e.fwhm, amplitude: e.amplitude });
    }
    featureFwhm = Math.max(...centers) - Math.min(...centers) + Math.max(...comps.map((c) => c.fwhm));
  } else {
    const mean = centers.reduce((a, b) => a + b, 0) / centers.length;
    const reach = Math.max(2 * spacing, (x[m - 1] - x[0]) / 4);
    const main = extentAt(x, q, qs, localPeak(mean, reach), false);
    featureFwhm = main.fwhm;
    if (n === 1) {
      comps.push({ center: main.centroid, fwhm: main.fwhm, amplitude: main.amplitude });
    } else {
      // Separate local maxima of the smoothed flux within the feature, highest first.
      const lo = main.left - 1.5 * main.fwhm, hi = main.right + 1.5 * main.fwhm;
      const peaks: number[] = [];
      for (let i = 1; i < m - 1; i++) {
        if (x[i] < lo || x[i] > hi) continue;
        if (qs[i] > qs[i - 1] && qs[i] >= qs[i + 1] && qs[i] > main.amplitude / 4) peaks.push(i);
      }
      peaks.sort((a, b) => qs[b] - qs[a]);
      const chosen: number[] = [];
      for (const i of peaks) if (chosen.every((j) => Math.abs(x[i] - x[j]) >= 2 * spacing)) chosen.push(i);
      if (chosen.length >= n) {
        for (const i of chosen.slice(0, n).sort((a, b) => a - b)) {
          const e = extentAt(x, q, qs, i, true);
          comps.push({ center: x[i], fwhm: Math.min(e.fwhm, main.fwhm), amplitude: e.amplitude });
        }
      } else {
        const span = main.right - main.left;
        for (let k = 0; k < n; k++) {
          const c = main.left + ((k + 0.5) * span) / n;
          comps.push({ center: c, fwhm: Math.max(span / n, 2 * spacing), amplitude: 0.7 * Math.max(qs[nearest(c)], main.amplitude / n) });
        }
      }
    }
  }
  const o0 = shape.continuumOrder + 1;
  const cs = componentSize(shape.profile);
  comps.forEach((c, k) => {
    const o = o0 + k * cs;
    const f = Math.max(c.fwhm, spacing);
    p[o] = c.center;
    if (shape.profile === 'voigt') {
      p[o + 1] = f / VOIGT_EQUAL_WIDTH_FACTOR;
      p[o + 2] = f / VOIGT_EQUAL_WIDTH_FACTOR;
    } else p[o + 1] = f;
    p[o + cs - 1] = sg * c.amplitude;
  });
  return { parameters: p, sign: s, featureFwhm: Math.max(featureFwhm, spacing) };
}
