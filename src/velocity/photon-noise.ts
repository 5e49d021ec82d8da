import { UsageError } from '../errors.js';
import { SPEED_OF_LIGHT_KM_PER_S } from './constants.js';

/**
 * The photon-noise limit of a radial velocity: the smallest velocity uncertainty any
 * method can reach from a spectrum with these lines and this noise (Bouchy, Pepe & Queloz
 * 2001, A&A 374, 733, eqs. 8–12):
 *
 *   W(i) = λᵢ² (∂A/∂λ)ᵢ² / σᵢ²,    σ_V = c / √(Σᵢ W(i)),
 *
 * where A is the noise-free spectrum (in the same units as σ) and σᵢ the 1-σ noise per
 * pixel (photon and detector noise together: σᵢ² = Aᵢ + σ_D² in electrons). The derivative
 * is taken by central differences on the given noise-free spectrum.
 *
 * @param wavelengthAngstrom spectral axis in Å (strictly monotonic), length ≥ 3.
 * @param noiseFreeFlux the spectrum without noise (e.g. the model used to simulate it).
 * @param sigma per-pixel 1-σ noise in the same units as the flux; pixels with σ ≤ 0 or NaN are skipped.
 * @returns σ_V in km/s (Infinity when the spectrum has no slope anywhere).
 * @throws {UsageError} when the lengths differ or fewer than 3 pixels are given.
 * @example
 * // a Gaussian line 10 000 e⁻ deep on 100 000 e⁻ continuum, σ = √flux: about 0.1 km/s at R ≈ 20 000
 * photonNoiseLimitKmPerS(wl, model, model.map(Math.sqrt));
 */
export function photonNoiseLimitKmPerS(wavelengthAngstrom: ArrayLike<number>, noiseFreeFlux: ArrayLike<number>, sigma: ArrayLike<number>): number {
  const n = wavelengthAngstrom.length;
  if (noiseFreeFlux.length !== n || sigma.length !== n) {
    throw new UsageError('rv.length-mismatch', `wavelength, flux and sigma must have equal lengths (got ${n}, ${noiseFreeFlux.length}, ${sigma.length})`);
  }
  if (n < 3) throw new UsageError('rv.too-short', `the photon-noise limit needs at least 3 pixels (got ${n})`);
  let sum = 0;
  for (let i = 1; i < n - 1; i++) {
    const s = sigma[i];
    if (!(s > 0) || !Number.isFinite(s)) continue;
    const dA = (noiseFreeFlux[i + 1] - noiseFreeFlux[i - 1]) / (wavelengthAngstrom[i + 1] - wavelengthAngstrom[i - 1]);
    const w = (wavelengthAngstrom[i] * dA) / s;
    if (Number.isFinite(w)) sum += w * w;
  }
  return sum > 0 ? SPEED_OF_LIGHT_KM_PER_S / Math.sqrt(sum) : Infinity;
}
