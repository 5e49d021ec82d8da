/**
 * Small statistical helpers for the evidence of a species: the normal distribution's upper
 * tail and its inverse (to quote a false-alarm probability as an equivalent number of
 * Gaussian sigmas), and the upper tail of a weighted sum of independent Bernoulli variables
 * (the chance distribution of the evidence statistic).
 */

const SQRT_PI = Math.sqrt(Math.PI);

/**
 * Complementary error function erfc(x) for real x, to about 1e-15 relative accuracy.
 *
 * Method: the Maclaurin series of erf for |x| < 2 (Abramowitz & Stegun 7.1.5) and, for
 * x ≥ 2, the continued fraction erfc(x) = exp(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …))))
 * (A&S 7.1.14) evaluated with the modified Lentz algorithm; erfc(−x) = 2 − erfc(x).
 *
 * @param x any real number; NaN gives NaN.
 * @returns erfc(x) in [0, 2].
 * @example erfc(0); // 1
 */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < 2) {
    // erf(x) = 2/√π Σ (−1)^n x^(2n+1) / (n! (2n+1))
    let term = x;
    let sum = x;
    const x2 = x * x;
    for (let n = 1; n < 200; n++) {
      term *= -x2 / n;
      const add = term / (2 * n + 1);
      sum += add;
      if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
    }
    return 1 - (2 / SQRT_PI) * sum;
  }
  if (x > 27) return 0; // below the smallest double
  // Continued fraction b0 + a1/(b1 + a2/(b2 + …)) with b_n = x, a_n = n/2.
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let n = 1; n < 500; n++) {
    const a = n / 2;
    d = x + a * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = x + a / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / SQRT_PI / f;
}

/**
 * Upper tail of the standard normal distribution, Q(x) = P(Z > x) = erfc(x/√2)/2.
 *
 * @param x number of standard deviations.
 * @returns the one-sided tail probability.
 * @example normalUpperTail(0); // 0.5
 */
export function normalUpperTail(x: number): number {
  return 0.5 * erfc(x / Math.SQRT2);
}

/**
 * The one-sided Gaussian-equivalent significance of a probability: the x with
 * P(Z > x) = probability. A false-alarm probability of 0.00135 is about 3 sigma.
 *
 * Method: bisection on {@link normalUpperTail} (monotonic), to 1e-12 in x.
 *
 * @param probability tail probability in (0, 1]; 0 gives Infinity, values ≥ 0.5 give x ≤ 0.
 * @returns x in sigma (NaN for a probability outside [0, 1] or NaN).
 * @example sigmaFromTailProbability(0.00135); // ≈ 3.0 (one-sided 3 sigma)
 */
export function sigmaFromTailProbability(probability: number): number {
  if (!(probability >= 0 && probability <= 1)) return NaN;
  if (probability === 0) return Infinity;
  if (probability === 1) return -Infinity;
  let lo = -40;
  let hi = 40;
  for (let i = 0; i < 200 && hi - lo > 1e-12; i++) {
    const mid = 0.5 * (lo + hi);
    if (normalUpperTail(mid) > probability) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Upper tail of a weighted sum of independent Bernoulli variables:
 * P(Σ_j w_j X_j ≥ threshold) with X_j = 1 with probability p_j, else 0, weights w_j ≥ 0.
 *
 * Method: dynamic programming over the sum on a grid of step h = threshold / max(`minBins`,
 * 1000·n) (sums at or above the threshold are pooled). Each weight is rounded up and the threshold
 * down to the grid, so the result is never below the exact tail (conservative) and never above
 * the exact tail at the threshold lowered by (n + 1)·h ≤ 0.2% of it; it is exact when the weights
 * are multiples of h.
 *
 * @param weights non-negative weights w_j.
 * @param probabilities success probabilities p_j in [0, 1], same length.
 * @param threshold the sum to reach.
 * @param minBins least number of grid steps up to the threshold (default 4000).
 * @returns the tail probability in [0, 1].
 * @example bernoulliSumUpperTail([1, 1], [0.5, 0.5], 2); // 0.25
 */
export function bernoulliSumUpperTail(
  weights: readonly number[],
  probabilities: readonly number[],
  threshold: number,
  minBins = 4000,
): number {
  if (threshold <= 0) return 1;
  let total = 0;
  for (const w of weights) total += w;
  if (total < threshold) return 0;
  const h = threshold / Math.max(minBins, 1000 * weights.length);
  const k = Math.max(1, Math.floor(threshold / h + 1e-9));
  const dist = new Float64Array(k + 1);
  dist[0] = 1;
  for (let j = 0; j < weights.length; j++) {
    const p = probabilities[j];
    if (p <= 0 || weights[j] <= 0) continue;
    const step = Math.ceil(weights[j] / h - 1e-9);
    if (p >= 1) {
      // certain success: shift everything
      for (let i = k; i >= 0; i--) {
        const v = dist[i];
        dist[i] = 0;
        const t = Math.min(k, i + step);
        dist[t] += v;
      }
      continue;
    }
    const q = 1 - p;
    // pooled top bin first (it stays pooled), then the others in descending order
    let toTop = 0;
    for (let i = k - 1; i >= 0; i--) {
      const v = dist[i];
      if (v === 0) continue;
      const t = i + step;
      if (t >= k) toTop += v * p;
      else dist[t] += v * p;
      dist[i] = v * q;
    }
    dist[k] += toTop;
  }
  return Math.min(1, Math.max(0, dist[k]));
}
