/**
 * Test helper: seeded synthetic spectra of known composition made from the shipped line lists
 * (invented data, not an observation): Gaussian lines at the rest wavelengths, Doppler-shifted,
 * on a flat continuum, with Gaussian noise, sampled at 2.5 pixels per resolution element.
 *
 * Line strengths: the strongest line of each species has `peakAmplitude` (continuum units;
 * absorption depths are capped at 0.95), the others A0 · r^0.7 with r the list intensity over the
 * species' strongest in range (lists with intensities for fewer than half their lines: every
 * line r = 0.7; lines without intensity in a list that has enough: r = 0.05), as in simulate.ts.
 */
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { scenarioLines, type Scenario } from './simulate.js';

const C_KM_S = 299_792.458; // exact (SI)

/** A synthetic spectrum with its truth. */
export interface SyntheticSpectrum {
  readonly spectrum: Spectrum;
  readonly truth: readonly string[];
  readonly velocityKmPerS: number;
  /** The lines put in: observed wavelength (Å) and peak amplitude (continuum units), by wavelength. */
  readonly lines: readonly { readonly wavelengthAngstrom: number; readonly amplitude: number }[];
}

/**
 * Makes the spectrum of a scenario.
 *
 * @param sc composition, kind, range, strengths.
 * @param resolvingPower λ/FWHM (constant FWHM in velocity; the pixel grid is logarithmic).
 * @param snr continuum S/N per pixel.
 * @param seed random seed.
 */
export function syntheticSpectrum(sc: Scenario, resolvingPower: number, snr: number, seed: number): SyntheticSpectrum {
  const rand = mulberry32(seed);
  const v = (rand() - 0.5) * 200;
  const dop = Math.sqrt((1 + v / C_KM_S) / (1 - v / C_KM_S));
  const lines = scenarioLines(sc, dop, rand);
  const step = 1 / (2.5 * resolvingPower); // Δ ln λ per pixel
  const n = Math.floor(Math.log(sc.endAngstrom / sc.startAngstrom) / step) + 1;
  const wavelength = new Float64Array(n);
  const model = new Float64Array(n).fill(0);
  for (let i = 0; i < n; i++) wavelength[i] = sc.startAngstrom * Math.exp(i * step);
  const k = 4 * Math.LN2;
  let first = 0;
  for (const l of lines) {
    const fwhm = l.w / resolvingPower;
    while (first < n && wavelength[first] < l.w - 3 * fwhm) first++;
    for (let i = first; i < n && wavelength[i] <= l.w + 3 * fwhm; i++) model[i] += l.a * Math.exp(-k * ((wavelength[i] - l.w) / fwhm) ** 2);
  }
  const flux = new Float64Array(n);
  const sigma = 1 / snr;
  for (let i = 0; i < n; i++) {
    const f = sc.kind === 'absorption' ? Math.max(0.05, 1 - model[i]) : 1 + model[i];
    flux[i] = f + sigma * gaussian(rand);
  }
  const spectrum = createSpectrum({ wavelength, flux, uncertainty: new Float64Array(n).fill(sigma), unit: 'angstrom', medium: 'air' });
  return { spectrum, truth: sc.species, velocityKmPerS: v, lines: lines.map((l) => ({ wavelengthAngstrom: l.w, amplitude: l.a })) };
}

/** A pure-noise spectrum (flat continuum 1, S/N `snr`) over a range, same sampling. */
export function noiseOnlySpectrum(startAngstrom: number, endAngstrom: number, resolvingPower: number, snr: number, seed: number): Spectrum {
  const rand = mulberry32(seed);
  const step = 1 / (2.5 * resolvingPower);
  const n = Math.floor(Math.log(endAngstrom / startAngstrom) / step) + 1;
  const wavelength = new Float64Array(n);
  const flux = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    wavelength[i] = startAngstrom * Math.exp(i * step);
    flux[i] = 1 + gaussian(rand) / snr;
  }
  return createSpectrum({ wavelength, flux, uncertainty: new Float64Array(n).fill(1 / snr), unit: 'angstrom', medium: 'air' });
}
