/**
 * Signal-to-noise ratio of a spectrum estimated from the flux alone (DER_SNR).
 */
import { isUsablePixel, type Spectrum } from '../spectrum/spectrum.js';

/** DER_SNR result: median signal, noise per pixel, and their ratio. */
export interface SignalToNoise {
  /** Median of the flux values used (flux units). */
  readonly signal: number;
  /** Estimated 1-σ noise per pixel (flux units). */
  readonly noise: number;
  /** signal / noise; NaN when fewer than 5 values were usable or the noise is 0. */
  readonly snr: number;
  /** Number of flux values used. */
  readonly pixelsUsed: number;
}

/** 1.482602/√6: converts the median absolute second difference into a Gaussian σ (Stoehr et al. 2008). */
const DER_SNR_FACTOR = 1.482602 / Math.sqrt(6);

/**
 * Median of numeric values (of a sorted copy: the input is not modified).
 *
 * @param values any numbers; NaN values sort last and so bias the result: remove them first.
 * @returns the middle value, or the mean of the two middle values; NaN for no values.
 * @example
 * median([3, 1, 2, 10]); // 2.5
 */
export function median(values: ArrayLike<number>): number {
  const a = new Float64Array(values).sort();
  const n = a.length;
  if (n === 0) return NaN;
  return n % 2 ? a[(n - 1) / 2] : (a[n / 2 - 1] + a[n / 2]) / 2;
}

/**
 * S/N from flux values alone by DER_SNR: signal = median(f), noise = 1.482602/√6 ·
 * median(|2fᵢ − fᵢ₋₂ − fᵢ₊₂|).
 *
 * Method: Stoehr, Williams, Valdes et al. 2008, "DER_SNR: A Simple & General Spectroscopic
 * Signal-to-Noise Measurement Algorithm", ASP Conf. Ser. 394, 505. The estimate assumes
 * noise uncorrelated between pixels two apart and a spectrum smooth over five pixels; it
 * is robust to a minority of lines. As in the authors' reference code (from memory), values
 * exactly 0 are dropped first (they usually mark missing data), and so are non-finite values.
 *
 * @param flux flux values in order along the spectral axis.
 * @returns signal, noise and their ratio; `snr` is NaN when fewer than 5 values remain.
 * @example
 * derSnr([10, 11, 9, 10, 11, 9, 10, 11, 9, 10]).signal; // 10
 */
export function derSnr(flux: ArrayLike<number>): SignalToNoise {
  const f: number[] = [];
  for (let i = 0; i < flux.length; i++) if (Number.isFinite(flux[i]) && flux[i] !== 0) f.push(flux[i]);
  const n = f.length;
  if (n < 5) return { signal: n ? median(f) : NaN, noise: NaN, snr: NaN, pixelsUsed: n };
  const d = new Float64Array(n - 4);
  for (let i = 2; i < n - 2; i++) d[i - 2] = Math.abs(2 * f[i] - f[i - 2] - f[i + 2]);
  const signal = median(f);
  const noise = DER_SNR_FACTOR * median(d);
  return { signal, noise, snr: noise > 0 ? signal / noise : NaN, pixelsUsed: n };
}

/**
 * DER_SNR of a spectrum over its usable pixels (see {@link derSnr}). Missing-data policy:
 * unusable pixels (NaN flux, bad uncertainty, masked; see `isUsablePixel`) are skipped.
 *
 * @param spectrum any spectrum; only the flux is used.
 * @returns signal, noise per pixel and S/N.
 * @example
 * spectrumSnr(createSpectrum({ wavelength: [1, 2, 3, 4, 5, 6], flux: [1, 1, 1, 1, 1, 1] })).noise; // 0
 */
export function spectrumSnr(spectrum: Spectrum): SignalToNoise {
  const f: number[] = [];
  for (let i = 0; i < spectrum.flux.length; i++) if (isUsablePixel(spectrum, i)) f.push(spectrum.flux[i]);
  return derSnr(f);
}
