/**
 * The Faddeeva function w(z) = exp(−z²) erfc(−iz) for Im z ≥ 0, by Weideman's rational
 * approximation: J. A. C. Weideman, "Computation of the complex error function",
 * SIAM J. Numer. Anal. 31 (1994) 1497–1518, eq. (38)–(39) with N = 32 terms and
 * L = √(N/√2). Accuracy against scipy.special.wofz is checked in
 * test/fit/profiles.test.ts (reference values in test/fixtures/scipy-fits.json).
 * Shared numerics: used by the line profiles of the fit area and by synthetic spectra
 * (src/lines/synthetic.ts), which may not import the fit area.
 */

/** Number of terms of the rational series. */
const N = 32;
const L = Math.sqrt(N / Math.SQRT2);
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI);

/**
 * Coefficients a₁…a_N of the series (Weideman 1994, eq. 38): the discrete cosine
 * transform of f(t) = exp(−t²)(L² + t²) sampled at t = L tan(θ/2), θ = kπ/M, M = 2N.
 */
const COEFFS: Float64Array = (() => {
  const M = 2 * N;
  const a = new Float64Array(N + 1);
  for (let n = 1; n <= N; n++) {
    let s = 0;
    for (let k = -M + 1; k <= M - 1; k++) {
      const t = L * Math.tan((k * Math.PI) / (2 * M));
      s += Math.exp(-t * t) * (L * L + t * t) * Math.cos((Math.PI * n * k) / M);
    }
    a[n] = s / (2 * M);
  }
  return a;
})();

/**
 * Writes w(x + iy) into out[0] (real) and out[1] (imaginary). Valid for y ≥ 0.
 */
export function faddeeva(x: number, y: number, out: Float64Array | number[]): void {
  // d = L − iz = (L + y) − ix
  const dr = L + y;
  const di = -x;
  // Z = (L + iz)/(L − iz) = ((L − y) + ix)/d
  const nr = L - y;
  const ni = x;
  const dd = dr * dr + di * di;
  const zr = (nr * dr + ni * di) / dd;
  const zi = (ni * dr - nr * di) / dd;
  // p(Z) = Σ a_n Z^(n−1), Horner from a_N down.
  let pr = COEFFS[N];
  let pi = 0;
  for (let n = N - 1; n >= 1; n--) {
    const t = pr * zr - pi * zi + COEFFS[n];
    pi = pr * zi + pi * zr;
    pr = t;
  }
  // 1/d and 1/d²
  const ir = dr / dd;
  const ii = -di / dd;
  const i2r = ir * ir - ii * ii;
  const i2i = 2 * ir * ii;
  out[0] = 2 * (pr * i2r - pi * i2i) + INV_SQRT_PI * ir;
  out[1] = 2 * (pr * i2i + pi * i2r) + INV_SQRT_PI * ii;
}
