/**
 * The dispersion solution: a Chebyshev polynomial λ(p) over a pixel domain with its
 * covariance, the table of lines it was fitted to, its statistics and acceptance, and how
 * it was made. Plain data (JSON-serialisable); see `solution-json.ts` for the file format.
 */
import { UsageError } from '../errors.js';
import type { Domain } from '../math/basis.js';
import type { ProvenanceEntry } from '../spectrum/provenance.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../spectrum/constants.js';
import type { GratingSetup } from './grating.js';
import type { CalibrationFailure } from './messages.js';
import { listAccuracyAngstrom } from './list-accuracy.js';
import { derivativePolynomial, evaluatePolynomial, fitPolynomial, polynomialSigma, type FitPoint } from './polynomial.js';

/** How a solution was made. */
export type SolutionMethod = 'lamp' | 'grating-equation' | 'star-lines' | 'interpolated';

/** Why a line was not used in the solution. */
export type CalibrationLineRejection =
  /** Clipped: its residual exceeded the clipping threshold. */
  | 'sigma-clipped'
  /** A flat-topped (saturated) line: its centre is unreliable. */
  | 'saturated'
  /** Several list lines closer than the resolution: the blend's wavelength depends on their intensity ratio. */
  | 'blend'
  /** The profile fit failed. */
  | 'fit-failed'
  /** Measured but matched to no list line. */
  | 'unidentified';

/** One row of a solution's line table. Pixels in the spectrum's pixel coordinate. */
export interface SolutionLine {
  readonly pixel: number;
  /** 1-σ of the centre, pixels (null when unknown). */
  readonly pixelUncertainty: number | null;
  readonly fwhmPixels: number | null;
  /** Brightness from the profile fit (flux units). */
  readonly strength: number | null;
  /** List wavelength, Å (null when unidentified). */
  readonly wavelengthAngstrom: number | null;
  readonly species: string | null;
  readonly relativeIntensity: number | null;
  /** λ of the solution at the line's pixel, Å. */
  readonly fittedWavelengthAngstrom: number;
  /** List − fitted, Å (null when unidentified). */
  readonly residualAngstrom: number | null;
  readonly residualPixels: number | null;
  /** c × residual / λ, km/s. */
  readonly residualKmPerS: number | null;
  /** λ / (FWHM in Å) of this line (null when unknown). */
  readonly resolvingPower: number | null;
  readonly used: boolean;
  /** Why not used (null when used). */
  readonly rejection: CalibrationLineRejection | null;
}

/** Resolving power measured from the lines used: median and robust spread (1.4826 × MAD). */
export interface MeasuredResolvingPower {
  readonly median: number;
  readonly spread: number;
  readonly lines: number;
}

/** A dispersion solution (see DEVELOPERS.md, "Wavelength calibration", for the JSON format). */
export interface DispersionSolution {
  /** True when the solution passed the acceptance criteria. */
  readonly ok: boolean;
  readonly reason: CalibrationFailure | null;
  /** One sentence: the summary when ok, what went wrong otherwise. */
  readonly message: string;
  readonly method: SolutionMethod;
  /** True for a lamp (or interpolated lamp) solution; false for the grating equation alone or a star's own lines. */
  readonly calibratedByLamp: boolean;
  /** False when the star's own lines set the zero point (its radial velocity is absorbed). */
  readonly velocityZeroPointMeaningful: boolean;
  readonly medium: 'air' | 'vacuum';
  /** Polynomial order (1–5). */
  readonly order: number;
  /** Pixel range onto which the Chebyshev basis is scaled ([−1, 1]). */
  readonly domain: Domain;
  /** Chebyshev coefficients c₀…c_order, Å. */
  readonly coefficients: readonly number[];
  /** Covariance of the coefficients (order+1)², Å², scaled by max(1, χ²/dof). */
  readonly covariance: readonly (readonly number[])[];
  /** Number of pixels of the frame the solution is for (null when unknown). */
  readonly pixels: number | null;
  readonly rmsAngstrom: number | null;
  readonly rmsPixels: number | null;
  readonly rmsKmPerS: number | null;
  readonly linesMeasured: number;
  readonly linesIdentified: number;
  readonly linesUsed: number;
  readonly linesRejected: number;
  readonly resolvingPower: MeasuredResolvingPower | null;
  /** 1-σ wavelength error of the solution (from the covariance, or the geometry for the grating equation), Å: at the middle pixel and the largest over the domain. */
  readonly wavelengthUncertaintyAngstrom: { readonly middle: number; readonly max: number } | null;
  readonly lines: readonly SolutionLine[];
  /** Lamp name and the spectra of its list, when a lamp was used. */
  readonly lamp: { readonly name: string; readonly species: readonly string[] } | null;
  /** The grating set-up, when the solution came from it or it served as the hint. */
  readonly grating: GratingSetup | null;
  /** Mid-exposure time of the lamp frame (UTC), when known. */
  readonly observation: { readonly midpointUtc: string; readonly mjdUtc: number } | null;
  readonly warnings: readonly string[];
  readonly provenance: readonly ProvenanceEntry[];
}

/**
 * Wavelength of a pixel under a solution.
 *
 * @param solution a dispersion solution.
 * @param pixel pixel coordinate (as the lamp spectrum's axis; usually the 0-based index).
 * @returns λ in Å, in the solution's medium (air for the shipped lists).
 * @example solutionWavelength(solution, 1023.5); // Å at the middle of a 2048-pixel frame
 */
export function solutionWavelength(solution: DispersionSolution, pixel: number): number {
  return evaluatePolynomial(solution.coefficients, solution.domain, pixel);
}

/**
 * Dispersion dλ/dpixel of a solution at a pixel.
 *
 * @param solution a dispersion solution.
 * @param pixel pixel coordinate.
 * @returns Å per pixel (negative when λ decreases with the pixel).
 * @example solutionDispersion(solution, 1023.5); // ≈ 0.55
 */
export function solutionDispersion(solution: DispersionSolution, pixel: number): number {
  return derivativePolynomial(solution.coefficients, solution.domain, pixel);
}

/**
 * 1-σ error of the solution's wavelength at a pixel, √(rᵀCr) with r the Chebyshev row
 * at the pixel and C the coefficients' covariance (scaled by max(1, χ²/dof)). It says how
 * well the curve is pinned down, not how far one line may lie from it.
 *
 * @param solution a dispersion solution.
 * @param pixel pixel coordinate.
 * @returns Å.
 * @example solutionWavelengthUncertainty(solution, 0); // largest near the ends
 */
export function solutionWavelengthUncertainty(solution: DispersionSolution, pixel: number): number {
  return polynomialSigma(solution.covariance.flat(), solution.order, solution.domain, pixel);
}

/**
 * Pixel of a wavelength under a solution (the inverse of {@link solutionWavelength}), by
 * Newton's method from a linear first guess, within the domain.
 *
 * @param solution a dispersion solution (monotonic over its domain).
 * @param wavelengthAngstrom λ in Å in the solution's medium.
 * @returns the pixel, or NaN when λ lies outside the solution's range.
 * @example solutionPixel(solution, solutionWavelength(solution, 812.3)); // 812.3
 */
export function solutionPixel(solution: DispersionSolution, wavelengthAngstrom: number): number {
  const { min, max } = solution.domain;
  const w0 = solutionWavelength(solution, min), w1 = solutionWavelength(solution, max);
  if ((wavelengthAngstrom - w0) * (wavelengthAngstrom - w1) > 0) return NaN;
  let p = min + ((wavelengthAngstrom - w0) / (w1 - w0)) * (max - min);
  for (let k = 0; k < 50; k++) {
    const step = (solutionWavelength(solution, p) - wavelengthAngstrom) / solutionDispersion(solution, p);
    p = Math.min(max, Math.max(min, p - step));
    if (Math.abs(step) < 1e-10) break;
  }
  return p;
}

/**
 * Wavelengths of every pixel coordinate given.
 *
 * @param solution a dispersion solution.
 * @param pixels pixel coordinates.
 * @returns Float64Array of λ in Å.
 * @example solutionWavelengths(solution, [0, 1, 2]);
 */
export function solutionWavelengths(solution: DispersionSolution, pixels: ArrayLike<number>): Float64Array {
  return Float64Array.from({ length: pixels.length }, (_, i) => solutionWavelength(solution, pixels[i]));
}

/**
 * The solution's own 1-σ error at the middle of the domain and its largest value over 201
 * evenly spaced pixels.
 *
 * @param coefficientsCovariance covariance of the Chebyshev coefficients, Å².
 * @param order polynomial order.
 * @param domain pixel domain.
 * @returns `{ middle, max }` in Å.
 * @example uncertaintySummary(solution.covariance, solution.order, solution.domain).max;
 */
export function uncertaintySummary(coefficientsCovariance: readonly (readonly number[])[], order: number, domain: Domain): { middle: number; max: number } {
  const flat = coefficientsCovariance.flat();
  let mx = 0;
  for (let k = 0; k <= 200; k++) mx = Math.max(mx, polynomialSigma(flat, order, domain, domain.min + ((domain.max - domain.min) * k) / 200));
  return { middle: polynomialSigma(flat, order, domain, (domain.min + domain.max) / 2), max: mx };
}

/** A line offered to {@link fitDispersionSolution}. */
export interface SolutionInputLine {
  readonly pixel: number;
  readonly pixelUncertainty: number;
  readonly fwhmPixels?: number;
  readonly strength?: number;
  /** List wavelength, Å; null for a line that was not identified (kept in the table only). */
  readonly wavelengthAngstrom: number | null;
  readonly species?: string;
  readonly relativeIntensity?: number | null;
  /** 1-σ accuracy of the list wavelength, Å. Default: {@link listAccuracyAngstrom} of `species`. */
  readonly listUncertaintyAngstrom?: number;
  /** A reason to keep the line out of the fit from the start. */
  readonly exclude?: Exclude<CalibrationLineRejection, 'sigma-clipped'> | null;
}

/** The fitted part of a solution, before acceptance. */
export interface SolutionFit {
  readonly coefficients: number[];
  readonly covariance: number[][];
  readonly lines: SolutionLine[];
  readonly rmsAngstrom: number;
  readonly rmsPixels: number;
  readonly rmsKmPerS: number;
  readonly linesUsed: number;
  readonly linesRejected: number;
  readonly resolvingPower: MeasuredResolvingPower | null;
  readonly wavelengthUncertaintyAngstrom: { middle: number; max: number };
}

const robustSpread = (v: number[]) => {
  const s = [...v].sort((a, b) => a - b);
  const med = s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
  const dev = s.map((x) => Math.abs(x - med)).sort((a, b) => a - b);
  const mad = dev.length % 2 ? dev[(dev.length - 1) / 2] : (dev[dev.length / 2 - 1] + dev[dev.length / 2]) / 2;
  return { median: med, spread: 1.4826 * mad };
};

/**
 * Fits a dispersion solution to identified lines: a Chebyshev polynomial of the given
 * order over the pixel domain, weighted by √(σ_centre² + σ_list²) (the centre's uncertainty
 * carried into wavelength and the list's accuracy, {@link listAccuracyAngstrom}), with
 * iterative clipping of lines whose residual exceeds 3 times that (see `polynomial.ts`), and builds the line
 * table with residuals in Å, pixels and km/s, the RMS in the three units over the lines
 * used, weighted like the fit (√(Σwᵢrᵢ²/Σwᵢ · n/(n − order − 1)), wᵢ = 1/σᵢ²: the plain RMS
 * when all σ are equal; a faint line known to ±0.1 pixel does not swamp it), the resolving power λ/FWHM of the lines used (median and 1.4826 × MAD), and the
 * solution's own 1-σ error over the domain.
 *
 * @param lines measured lines with their list wavelengths (null = unidentified) and reasons to exclude.
 * @param options polynomial order (1–5), pixel domain, clipping threshold in robust σ (default 3).
 * @returns the fit and the line table.
 * @throws {UsageError} when fewer fit-able lines than order + 1, or the order is outside 1–5.
 * @example fitDispersionSolution(lines, { order: 3, domain: { min: 0, max: 2047 } }).rmsPixels;
 */
export function fitDispersionSolution(lines: readonly SolutionInputLine[], options: { order: number; domain: Domain; clipSigma?: number }): SolutionFit {
  const fitIdx = lines.map((l, i) => i).filter((i) => lines[i].wavelengthAngstrom !== null);
  const points: FitPoint[] = fitIdx.map((i) => ({
    pixel: lines[i].pixel,
    pixelUncertainty: lines[i].pixelUncertainty,
    wavelengthAngstrom: lines[i].wavelengthAngstrom!,
    wavelengthUncertaintyAngstrom: lines[i].listUncertaintyAngstrom ?? listAccuracyAngstrom(lines[i].species),
  }));
  const exclude = fitIdx.map((i) => Boolean(lines[i].exclude));
  const fit = fitPolynomial(points, { order: options.order, domain: options.domain, clipSigma: options.clipSigma, exclude });
  const c = SPEED_OF_LIGHT_KM_PER_S;
  const table: SolutionLine[] = [];
  const usedRes: number[] = [], usedPx: number[] = [], usedKm: number[] = [], usedW: number[] = [], rp: number[] = [];
  let rejected = 0;
  const pos = new Map(fitIdx.map((i, k) => [i, k]));
  lines.forEach((l, i) => {
    const fitted = evaluatePolynomial(fit.coefficients, options.domain, l.pixel);
    const disp = derivativePolynomial(fit.coefficients, options.domain, l.pixel);
    const k = pos.get(i);
    const res = l.wavelengthAngstrom !== null ? l.wavelengthAngstrom - fitted : null;
    let rejection: CalibrationLineRejection | null = null;
    let used = false;
    if (l.wavelengthAngstrom === null) rejection = 'unidentified';
    else if (l.exclude) rejection = l.exclude;
    else if (k !== undefined && !fit.used[k]) { rejection = 'sigma-clipped'; rejected++; }
    else used = true;
    const R = l.fwhmPixels !== undefined && l.fwhmPixels > 0 ? fitted / (l.fwhmPixels * Math.abs(disp)) : null;
    if (used && res !== null) {
      usedRes.push(res);
      usedPx.push(res / disp);
      usedKm.push((c * res) / fitted);
      usedW.push(k !== undefined ? 1 / fit.sigmaAngstrom[k] ** 2 : 1);
      if (R !== null && Number.isFinite(R)) rp.push(R);
    }
    table.push({
      pixel: l.pixel,
      pixelUncertainty: Number.isFinite(l.pixelUncertainty) ? l.pixelUncertainty : null,
      fwhmPixels: l.fwhmPixels ?? null,
      strength: l.strength ?? null,
      wavelengthAngstrom: l.wavelengthAngstrom,
      species: l.species ?? null,
      relativeIntensity: l.relativeIntensity ?? null,
      fittedWavelengthAngstrom: fitted,
      residualAngstrom: res,
      residualPixels: res !== null ? res / disp : null,
      residualKmPerS: res !== null ? (c * res) / fitted : null,
      resolvingPower: R !== null && Number.isFinite(R) ? R : null,
      used,
      rejection,
    });
  });
  // weighted like the fit: √(Σwr²/Σw · n/(n − order − 1)), the plain RMS when all σ are equal
  const sumW = usedW.reduce((a, w) => a + w, 0);
  const rms = (v: number[]) => Math.sqrt((v.reduce((a, x, j) => a + usedW[j] * x * x, 0) / sumW) * (v.length / Math.max(1, v.length - (options.order + 1))));
  const n = options.order + 1;
  const cov: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => fit.covariance[i * n + j]));
  return {
    coefficients: [...fit.coefficients],
    covariance: cov,
    lines: table,
    rmsAngstrom: rms(usedRes),
    rmsPixels: rms(usedPx),
    rmsKmPerS: rms(usedKm),
    linesUsed: usedRes.length,
    linesRejected: rejected,
    resolvingPower: rp.length ? { ...robustSpread(rp), lines: rp.length } : null,
    wavelengthUncertaintyAngstrom: uncertaintySummary(cov, options.order, options.domain),
  };
}

/**
 * Checks a polynomial order.
 *
 * @param order the order asked.
 * @returns the order, when a whole number from 1 to 5.
 * @throws {UsageError} `calibrate.bad-order` otherwise.
 * @example checkOrder(3); // 3
 */
export function checkOrder(order: number): number {
  if (!Number.isInteger(order) || order < 1 || order > 5) throw new UsageError('calibrate.bad-order', `the polynomial order must be a whole number from 1 to 5, got ${order}`);
  return order;
}
