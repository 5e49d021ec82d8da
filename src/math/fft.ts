import { UsageError } from '../errors.js';

/**
 * In-place iterative radix-2 complex FFT (Cooley & Tukey 1965), forward with e^{−2πikn/N}.
 * `re` and `im` must have the same power-of-two length.
 */
function fftRadix2(re: Float64Array, im: Float64Array, inverse: boolean): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i]; re[i] = re[j]; re[j] = t;
      t = im[i]; im[i] = im[j]; im[j] = t;
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const ang = ((inverse ? 2 : -2) * Math.PI) / len;
    const wr = Math.cos(ang);
    const wi = Math.sin(ang);
    const half = len >> 1;
    for (let i = 0; i < n; i += len) {
      let cr = 1;
      let ci = 0;
      for (let k = 0; k < half; k++) {
        const a = i + k;
        const b = a + half;
        const xr = re[b] * cr - im[b] * ci;
        const xi = re[b] * ci + im[b] * cr;
        re[b] = re[a] - xr; im[b] = im[a] - xi;
        re[a] += xr; im[a] += xi;
        const t = cr * wr - ci * wi;
        ci = cr * wi + ci * wr;
        cr = t;
      }
    }
  }
}

/**
 * In-place complex FFT of a power-of-two length (radix-2 Cooley–Tukey, 1965): `forward`
 * computes X[k] = Σₙ x[n]·e^{−2πikn/N}; `inverse` computes Σₖ X[k]·e^{+2πikn/N} WITHOUT the
 * 1/N factor. O(N log N). For spectra of real sequences (cross-power spectra, Fourier
 * interpolation and derivatives of a cross-correlation).
 *
 * @param re real parts (overwritten with the result).
 * @param im imaginary parts (overwritten), the same power-of-two length as `re`.
 * @param direction `forward` or `inverse`.
 * @throws {UsageError} when the lengths differ or are not a power of two.
 * @example
 * const re = Float64Array.of(1, 0, 0, 0), im = new Float64Array(4);
 * fftInPlace(re, im, 'forward'); // re = [1, 1, 1, 1], im = [0, 0, 0, 0]
 */
export function fftInPlace(re: Float64Array, im: Float64Array, direction: 'forward' | 'inverse'): void {
  const n = re.length;
  if (im.length !== n) throw new UsageError('fft.length-mismatch', `real and imaginary parts need equal lengths (got ${n} and ${im.length})`);
  if (n === 0 || (n & (n - 1)) !== 0) throw new UsageError('fft.not-power-of-two', `FFT length must be a power of two (got ${n})`);
  fftRadix2(re, im, direction === 'inverse');
}

/** The smallest power of two ≥ n. */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p <<= 1;
  return p;
}

/**
 * Circular cross-correlation of two real sequences of equal length N by FFT:
 * out[k] = Σₘ a[m]·b[(m − k) mod N], for lags k = 0…N−1 (negative lags wrap to the end).
 * N must be a power of two (zero-pad the inputs to avoid wrap-around). O(N log N).
 *
 * @throws {UsageError} when the lengths differ or are not a power of two.
 * @example
 * circularCrossCorrelation(Float64Array.of(0, 1, 0, 0), Float64Array.of(1, 0, 0, 0)); // peak at lag 1
 */
export function circularCrossCorrelation(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const n = a.length;
  if (b.length !== n) throw new UsageError('fft.length-mismatch', `cross-correlation needs equal lengths (got ${n} and ${b.length})`);
  if (n === 0 || (n & (n - 1)) !== 0) throw new UsageError('fft.not-power-of-two', `FFT length must be a power of two (got ${n})`);
  // Pack both real sequences into one complex FFT: z = a + i·b.
  const re = Float64Array.from(a);
  const im = Float64Array.from(b);
  fftRadix2(re, im, false);
  // A[k] = (Z[k] + conj Z[N−k])/2, B[k] = (Z[k] − conj Z[N−k])/(2i); product P = A·conj(B).
  const pr = new Float64Array(n);
  const pi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const j = (n - k) & (n - 1);
    const ar = 0.5 * (re[k] + re[j]);
    const ai = 0.5 * (im[k] - im[j]);
    const br = 0.5 * (im[k] + im[j]);
    const bi = -0.5 * (re[k] - re[j]);
    pr[k] = ar * br + ai * bi;
    pi[k] = ai * br - ar * bi;
  }
  fftRadix2(pr, pi, true);
  for (let k = 0; k < n; k++) pr[k] /= n;
  return pr;
}
