/**
 * Combining the velocities of several lines of one spectrum into one: a weighted mean with
 * outlier rejection, and a χ² test of whether the lines agree within their errors.
 */
import type { MeasuredValue } from '../fit/line-fit.js';

/** When the statistical error of the mean is scaled by √(χ²/ν). */
export type ChiSquareScaling =
  /** Only when χ² exceeds the 99th percentile of its distribution for ν degrees of freedom (default). */
  | 'when-significant'
  /** Whenever χ²/ν > 1 (the Birge ratio; never scales down). */
  | 'always'
  /** Never. */
  | 'never';

/** Options of {@link combineVelocities}. Every default is written once, in {@link COMBINE_DEFAULTS}. */
export interface VelocityCombinationOptions {
  /** Reject a value whose leave-one-out normalised residual exceeds this many times the robust scale (> 0). Default 3. */
  clipThreshold?: number;
  /** Default `when-significant`. */
  chiSquareScaling?: ChiSquareScaling;
}

/** The defaults of {@link combineVelocities}. */
export const COMBINE_DEFAULTS = Object.freeze({
  clipThreshold: 3,
  chiSquareScaling: 'when-significant' as ChiSquareScaling,
  /** Fewest values from which outliers are rejected. */
  minimumForRejection: 3,
  /** One-sided significance of the χ² test. */
  significance: 0.01,
});

/** Result of {@link combineVelocities}. */
export interface VelocityCombination {
  /** Weighted mean, in the unit of the inputs (NaN when no value is usable). */
  readonly value: number;
  /** 1/√(Σ 1/σᵢ²) over the values used, before scaling. */
  readonly statisticalUncertainty: number;
  /** The factor applied to it: √(χ²/ν) or 1. */
  readonly uncertaintyScale: number;
  /** Σ ((vᵢ − mean)/σᵢ)² over the values used. */
  readonly chiSquare: number;
  /** Values used − 1. */
  readonly degreesOfFreedom: number;
  /** χ²/ν (NaN for ν = 0). */
  readonly reducedChiSquare: number;
  /** The 99th percentile of χ²/ν for this ν (Wilson & Hilferty 1931), the threshold of `when-significant`. */
  readonly reducedChiSquareThreshold: number;
  /** Per input: used in the mean. */
  readonly used: readonly boolean[];
  /** Per input: (vᵢ − mean of the others)/√(σᵢ² + σ_others²), NaN for unusable inputs. */
  readonly normalizedResiduals: readonly number[];
  /** Per input: rejected as an outlier (unusable inputs are neither used nor outliers). */
  readonly outlier: readonly boolean[];
  /** The robust scale of the normalised residuals used for the last rejection test (≥ 1). */
  readonly robustScale: number;
}

/** Standard normal quantile at 0.99 (Abramowitz & Stegun, table 26.1: 2.326348). */
const Z99 = 2.326348;

/**
 * The 99th percentile of χ²/ν for ν degrees of freedom, the threshold above which
 * {@link combineVelocities} scales its error.
 *
 * Method: the Wilson & Hilferty (1931, PNAS 17, 684) cube-root normal approximation,
 * (1 − 2/(9ν) + z√(2/(9ν)))³ with z = 2.326348; within 1 % of scipy.stats.chi2.ppf for ν ≥ 3
 * and 4 % at ν = 1 (test/velocity/combine.test.ts).
 *
 * @param degreesOfFreedom ν ≥ 1.
 * @returns the reduced χ² exceeded with probability 0.01.
 * @example
 * reducedChiSquareQuantile99(10); // 2.32 (scipy: 2.3209)
 */
export function reducedChiSquareQuantile99(degreesOfFreedom: number): number {
  const a = 2 / (9 * degreesOfFreedom);
  return (1 - a + Z99 * Math.sqrt(a)) ** 3;
}

function median(a: number[]): number {
  const v = a.slice().sort((x, y) => x - y);
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/**
 * Combines measurements of one quantity (e.g. the velocities of the lines of one spectrum).
 *
 * Method:
 * 1. Weighted mean with weights 1/σᵢ² of the usable values (finite value, finite σ > 0).
 * 2. Outlier rejection, one value at a time, while at least 3 values remain: for each
 *    value the leave-one-out normalised residual zᵢ = (vᵢ − v̄₋ᵢ)/√(σᵢ² + σ²(v̄₋ᵢ)) is
 *    computed; the robust scale s is 1.4826 × the median absolute deviation of the zᵢ, but
 *    at least 1 (so that values with honest errors are judged by those errors, and a set
 *    whose errors are all too small by a common factor is judged by its scatter); the value
 *    with the largest |zᵢ| is rejected if |zᵢ| > k·s (k = `clipThreshold`, 3), and the test
 *    repeats on the rest.
 * 3. χ² of the values used about the mean; the error of the mean 1/√(Σ1/σᵢ²) is multiplied
 *    by √(χ²/ν) when `chiSquareScaling` says so — by default only when χ²/ν exceeds its
 *    99th percentile (the lines disagree by more than their errors allow; scaling every time
 *    χ²/ν happens to exceed 1 would overstate the error of honest measurements on average).
 *
 * @param values measurements with 1-σ uncertainties, same unit.
 * @param options clipping threshold and χ² scaling.
 * @returns the mean, its statistical uncertainty and scale, χ², and per input whether it
 *   was used or rejected. No usable input gives NaN values, not an exception; a threshold
 *   that is not > 0 turns rejection off.
 * @example
 * combineVelocities([{ value: 10, uncertainty: 1 }, { value: 12, uncertainty: 1 }, { value: 11, uncertainty: 1 }, { value: 40, uncertainty: 1 }]).value; // 11 (40 rejected)
 */
export function combineVelocities(values: readonly MeasuredValue[], options: VelocityCombinationOptions = {}): VelocityCombination {
  const k = options.clipThreshold ?? COMBINE_DEFAULTS.clipThreshold;
  const scaling = options.chiSquareScaling ?? COMBINE_DEFAULTS.chiSquareScaling;
  const n = values.length;
  const used = values.map((v) => Number.isFinite(v.value) && Number.isFinite(v.uncertainty) && v.uncertainty > 0);
  const outlier = new Array<boolean>(n).fill(false);
  const z = new Array<number>(n).fill(NaN);
  let robustScale = 1;
  const sums = (): { sw: number; swv: number; count: number } => {
    let sw = 0, swv = 0, count = 0;
    for (let i = 0; i < n; i++) {
      if (!used[i]) continue;
      const w = 1 / (values[i].uncertainty * values[i].uncertainty);
      sw += w;
      swv += w * values[i].value;
      count++;
    }
    return { sw, swv, count };
  };
  const residuals = (): void => {
    const { sw, swv } = sums();
    for (let i = 0; i < n; i++) {
      if (!(Number.isFinite(values[i].value) && values[i].uncertainty > 0 && Number.isFinite(values[i].uncertainty))) continue;
      const wi = 1 / (values[i].uncertainty * values[i].uncertainty);
      const swo = used[i] ? sw - wi : sw;
      const swvo = used[i] ? swv - wi * values[i].value : swv;
      z[i] = swo > 0 ? (values[i].value - swvo / swo) / Math.sqrt(values[i].uncertainty ** 2 + 1 / swo) : NaN;
    }
  };
  residuals();
  while (k > 0 && sums().count >= COMBINE_DEFAULTS.minimumForRejection) {
    const zs: number[] = [];
    for (let i = 0; i < n; i++) if (used[i]) zs.push(z[i]);
    const med = median(zs);
    robustScale = Math.max(1, 1.4826 * median(zs.map((x) => Math.abs(x - med))));
    let worst = -1;
    for (let i = 0; i < n; i++) if (used[i] && (worst < 0 || Math.abs(z[i]) > Math.abs(z[worst]))) worst = i;
    if (!(Math.abs(z[worst]) > k * robustScale)) break;
    used[worst] = false;
    outlier[worst] = true;
    residuals();
  }
  const { sw, swv, count } = sums();
  const mean = count > 0 ? swv / sw : NaN;
  let chi2 = 0;
  for (let i = 0; i < n; i++) if (used[i]) chi2 += ((values[i].value - mean) / values[i].uncertainty) ** 2;
  const dof = Math.max(0, count - 1);
  const reduced = dof > 0 ? chi2 / dof : NaN;
  const threshold = dof > 0 ? reducedChiSquareQuantile99(dof) : NaN;
  const scale = dof === 0 || scaling === 'never' ? 1
    : scaling === 'always' ? Math.max(1, Math.sqrt(reduced))
    : reduced > threshold ? Math.sqrt(reduced) : 1;
  return {
    value: mean,
    statisticalUncertainty: count > 0 ? 1 / Math.sqrt(sw) : NaN,
    uncertaintyScale: scale,
    chiSquare: count > 0 ? chi2 : NaN,
    degreesOfFreedom: dof,
    reducedChiSquare: reduced,
    reducedChiSquareThreshold: threshold,
    used,
    normalizedResiduals: z,
    outlier,
    robustScale,
  };
}
