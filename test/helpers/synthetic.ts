/**
 * Seeded synthetic spectra for tests (invented data, no real object): a calibration-lamp
 * spectrum of narrow emission lines and a star-like spectrum with broad Balmer-like
 * absorption and narrow metal-like lines. Rest wavelengths of the Balmer lines are the
 * usual air values (from memory: Hα 6562.8, Hβ 4861.3, Hγ 4340.5, Hδ 4101.7 Å); the
 * metal lines are placed at random.
 */
import { lineProfileValue } from '../../src/fit/profiles.js';
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { normal, uniform } from './random.js';

export interface TrueLine {
  center: number;
  fwhm: number;
  amplitude: number;
  /** Expected matched-filter significance of the line alone (Gaussian lines only). */
  expectedSignificance: number;
}

export interface Synthetic {
  spectrum: Spectrum;
  lines: TrueLine[];
}

const gauss = (u: number, f: number) => Math.exp(-4 * Math.LN2 * (u / f) ** 2);
/** Σ g² over pixels for a Gaussian of FWHM f pixels ≈ f·√(π/(8 ln 2)). */
const sumG2 = (fPix: number) => fPix * Math.sqrt(Math.PI / (8 * Math.LN2));

/** Places n centres in [lo, hi] at least `gap` apart. */
function placeLines(u: () => number, n: number, lo: number, hi: number, gap: number, avoid: number[] = [], avoidGap = 0): number[] {
  const out: number[] = [];
  for (let tries = 0; out.length < n && tries < 100 * n; tries++) {
    const c = lo + (hi - lo) * u();
    if (out.every((d) => Math.abs(d - c) >= gap) && avoid.every((d) => Math.abs(d - c) >= avoidGap)) out.push(c);
  }
  return out.sort((a, b) => a - b);
}

/**
 * A lamp spectrum: `pixels` pixels of 1.5 Å from 4000 Å, `count` emission lines of FWHM 2.5
 * pixels with peak heights log-uniform in [minPeak, maxPeak] counts, at least 5 FWHM apart,
 * on a background of 20 counts, with photon noise plus read noise 5 counts (Gaussian
 * approximation). `withUncertainty` attaches the true σ per pixel.
 */
export function lampSpectrum(seed: number, opts: { pixels?: number; count?: number; minPeak?: number; maxPeak?: number; withUncertainty?: boolean } = {}): Synthetic {
  const pixels = opts.pixels ?? 2000;
  const u = uniform(seed);
  const g = normal(seed + 1);
  const step = 1.5, f = 2.5 * step;
  const wl = Array.from({ length: pixels }, (_, i) => 4000 + step * i);
  const centers = placeLines(u, opts.count ?? 60, wl[10], wl[pixels - 11], 5 * f);
  const lo = Math.log(opts.minPeak ?? 5), hi = Math.log(opts.maxPeak ?? 5000);
  const amps = centers.map(() => Math.exp(lo + (hi - lo) * u()));
  const clean = wl.map((w) => 20 + centers.reduce((s, c, k) => s + amps[k] * gauss(w - c, f), 0));
  const sigma = clean.map((v) => Math.sqrt(v + 25));
  const flux = clean.map((v, i) => v + sigma[i] * g());
  // Expected significance of each line alone: A·√(Σ gᵢ²/σᵢ²) with σᵢ² = background + line + read noise.
  const expected = (c: number, a: number) => {
    let s = 0;
    for (const w of wl) {
      const gi = gauss(w - c, f);
      if (gi > 1e-6) s += (gi * gi) / (20 + a * gi + 25);
    }
    return a * Math.sqrt(s);
  };
  return {
    spectrum: createSpectrum({ wavelength: wl, flux, uncertainty: opts.withUncertainty ? sigma : undefined, medium: 'air' }),
    lines: centers.map((c, k) => ({ center: c, fwhm: f, amplitude: amps[k], expectedSignificance: expected(c, amps[k]) })),
  };
}

export const BALMER_AIR_ANGSTROM = [4101.73, 4340.46, 4861.33, 6562.80];

/**
 * A star-like spectrum: 2000 pixels of 1.5 Å from 3950 Å, a smooth continuum, four Balmer
 * lines (Voigt, Gaussian FWHM 14 Å, Lorentzian FWHM 10 Å, depth 0.55 of the continuum) and
 * `metals` narrow Gaussian lines (FWHM 2 pixels, depth 0.03–0.3) at least 8 Å apart and at
 * least 30 Å from Balmer centres, with Gaussian noise at S/N `snr` on the continuum.
 */
export function starSpectrum(seed: number, snr: number, metals = 30): Synthetic & { balmer: number[] } {
  const u = uniform(seed);
  const g = normal(seed + 1);
  const step = 1.5, f = 2 * step, n = 2000;
  const wl = Array.from({ length: n }, (_, i) => 3950 + step * i);
  const cont = (w: number) => 1 + 0.25 * Math.sin((w - 3950) / 1500) - 0.1 * ((w - 5000) / 2000) ** 2;
  const centers = placeLines(u, metals, wl[20], wl[n - 21], 8, BALMER_AIR_ANGSTROM, 30);
  const depths = centers.map(() => 0.03 + 0.27 * u());
  const flux = wl.map((w) => {
    let line = 1;
    for (const b of BALMER_AIR_ANGSTROM) line -= 0.55 * lineProfileValue(w - b, { profile: 'voigt', fwhmGaussian: 14, fwhmLorentzian: 10 });
    for (let k = 0; k < centers.length; k++) line -= depths[k] * gauss(w - centers[k], f);
    return cont(w) * line + (cont(w) / snr) * g();
  });
  return {
    spectrum: createSpectrum({ wavelength: wl, flux, medium: 'air' }),
    lines: centers.map((c, k) => ({ center: c, fwhm: f, amplitude: -depths[k] * cont(c), expectedSignificance: depths[k] * snr * Math.sqrt(sumG2(2)) })),
    balmer: BALMER_AIR_ANGSTROM,
  };
}

/** Pure white noise around a flat level: the false-alarm check. */
export function noiseSpectrum(seed: number, pixels = 2000): Spectrum {
  const g = normal(seed);
  const wl = Array.from({ length: pixels }, (_, i) => 5000 + i);
  return createSpectrum({ wavelength: wl, flux: wl.map(() => 100 + g()) });
}
