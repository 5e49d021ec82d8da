/**
 * Seeded synthetic calibration-lamp data for the calibration tests and the benchmark:
 * whole lamp spectra (Gaussian lines on a background, photon and read noise, optional
 * saturation) and bare peak lists (pixel ± σ, strength, with spurious peaks and missing
 * lines). Line positions come from the shipped line lists (air wavelengths, NIST Handbook
 * relative intensities); the dispersion curve, widths, noise and the rest are chosen by
 * the caller and returned as the truth. Invented data: not an observation.
 *
 * Run `npx tsx test/calibrate/synthetic-lamp.ts` to print a summary of the standard cases.
 */
import { pathToFileURL } from 'node:url';
import { mergeUnresolvedLines, type MeasuredPeak } from '../../src/calibrate/identify.js';
import { gratingPixelToWavelength, type GratingSetup } from '../../src/calibrate/grating.js';
import { lampLineList } from '../../src/lines/linelist.js';
import { Header } from '../../src/spectrum/header.js';
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { gaussian, mulberry32 } from '../helpers/random.js';

/** A true dispersion curve: λ(p) in Å at a 0-based pixel. */
export type TrueCurve = (pixel: number) => number;

/** A cubic λ(p) = a0 + a1 u + a2 u² + a3 u³ with u = p − centre. */
export function cubicCurve(a: readonly [number, number, number, number], centre: number): TrueCurve {
  return (p) => {
    const u = p - centre;
    return a[0] + u * (a[1] + u * (a[2] + u * a[3]));
  };
}

/** The grating equation as the true curve. */
export function gratingCurve(setup: GratingSetup): TrueCurve {
  return (p) => gratingPixelToWavelength(setup, p);
}

/** Pixel of a wavelength on a monotonic curve (bisection to 1e-10 pixel), NaN outside [lo, hi]. */
export function inverseCurve(curve: TrueCurve, wavelength: number, lo: number, hi: number): number {
  let a = lo, b = hi;
  let fa = curve(a) - wavelength, fb = curve(b) - wavelength;
  if (fa * fb > 0) return NaN;
  for (let k = 0; k < 200 && b - a > 1e-10; k++) {
    const m = (a + b) / 2;
    const fm = curve(m) - wavelength;
    if (fm * fa <= 0) { b = m; fb = fm; } else { a = m; fa = fm; }
  }
  return (a + b) / 2;
}

/** A line placed on the detector. */
export interface PlacedLine {
  readonly wavelengthAngstrom: number;
  readonly pixel: number;
  /** Relative intensity used (list value; unknown → the list's weakest). */
  readonly intensity: number;
  /** Number of list lines merged (closer than the FWHM). */
  readonly components: number;
}

/** Lines of a lamp on a detector: list lines merged at the resolution, with their true pixels. */
export function placeLines(lamp: string, curve: TrueCurve, pixels: number, fwhmPixels: number): PlacedLine[] {
  const list = lampLineList(lamp);
  const l0 = curve(0), l1 = curve(pixels - 1);
  const disp = Math.abs(l1 - l0) / (pixels - 1);
  const merged = mergeUnresolvedLines(list, fwhmPixels * disp);
  const weakest = Math.min(...list.entries.map((e) => e.relativeIntensity ?? Infinity).filter((v) => v > 0));
  const out: PlacedLine[] = [];
  for (const m of merged) {
    const p = inverseCurve(curve, m.wavelengthAngstrom, -0.5, pixels - 0.5);
    if (!Number.isFinite(p)) continue;
    out.push({ wavelengthAngstrom: m.wavelengthAngstrom, pixel: p, intensity: m.relativeIntensity ?? weakest, components: m.components });
  }
  return out.sort((a, b) => a.pixel - b.pixel);
}

/** Options of {@link makeLampSpectrum}. */
export interface LampSpectrumOptions {
  readonly lamp: string;
  readonly pixels: number;
  readonly curve: TrueCurve;
  /** Gaussian FWHM of every line, pixels. */
  readonly fwhmPixels: number;
  /** Peak counts of a line of relative intensity `referenceIntensity`. */
  readonly peakCounts: number;
  /** Relative intensity that gets `peakCounts` (default: the brightest line on the detector). */
  readonly referenceIntensity?: number;
  /** Flat background, counts. Default 100. */
  readonly background?: number;
  /** Read noise, counts. Default 5. */
  readonly readNoise?: number;
  /** Flux is clipped at this level (a saturated, flat-topped line). Default none. */
  readonly saturationCounts?: number;
  /** Keep only this many of the brightest lines (default all). */
  readonly brightest?: number;
  /**
   * 1-σ error of the list, Å: each line sits at its list wavelength plus a Gaussian deviate
   * of this size (its own seeded generator), so that the list is off by that much, as real
   * lists are (data/linelists/CHECKS.md). Default 0.
   */
  readonly listErrorAngstrom?: number;
  readonly seed: number;
}

/** A synthetic lamp spectrum and its truth. */
export interface SyntheticLamp {
  readonly spectrum: Spectrum;
  readonly curve: TrueCurve;
  /** The lines: list wavelength, and the pixel where the line really is. */
  readonly lines: readonly PlacedLine[];
  /** Lines whose true peak exceeds the saturation level. */
  readonly saturated: readonly PlacedLine[];
}

/**
 * A lamp spectrum on a 0-based pixel axis: Gaussian lines (each line's flux integrated over
 * the pixel by 8-point sampling), a flat background, Poisson noise (Gaussian
 * approximation) and read noise, optionally clipped at a saturation level. The
 * uncertainty column holds the true noise σ.
 */
export function makeLampSpectrum(o: LampSpectrumOptions): SyntheticLamp {
  let placed = placeLines(o.lamp, o.curve, o.pixels, o.fwhmPixels);
  if (o.listErrorAngstrom) {
    const err = mulberry32(o.seed + 7919);
    const sd = o.listErrorAngstrom;
    placed = placed.map((l) => ({ ...l, pixel: inverseCurve(o.curve, l.wavelengthAngstrom + sd * gaussian(err), -0.5, o.pixels - 0.5) })).filter((l) => Number.isFinite(l.pixel));
  }
  const lines = o.brightest === undefined ? placed : [...placed].sort((a, b) => b.intensity - a.intensity).slice(0, o.brightest).sort((a, b) => a.pixel - b.pixel);
  const rand = mulberry32(o.seed);
  const ref = o.referenceIntensity ?? Math.max(...lines.map((l) => l.intensity));
  const bg = o.background ?? 100;
  const rn = o.readNoise ?? 5;
  const s = o.fwhmPixels / (2 * Math.sqrt(2 * Math.LN2));
  const flux = new Float64Array(o.pixels).fill(bg);
  for (const l of lines) {
    const amp = (o.peakCounts * l.intensity) / ref;
    const lo = Math.max(0, Math.floor(l.pixel - 6 * s)), hi = Math.min(o.pixels - 1, Math.ceil(l.pixel + 6 * s));
    for (let p = lo; p <= hi; p++) {
      let v = 0;
      for (let k = 0; k < 8; k++) v += Math.exp(-0.5 * ((p - 0.5 + (k + 0.5) / 8 - l.pixel) / s) ** 2);
      flux[p] += (amp * v) / 8;
    }
  }
  const sigma = new Float64Array(o.pixels);
  for (let p = 0; p < o.pixels; p++) {
    sigma[p] = Math.sqrt(Math.max(flux[p], 0) + rn * rn);
    flux[p] += sigma[p] * gaussian(rand);
    if (o.saturationCounts !== undefined && flux[p] > o.saturationCounts) flux[p] = o.saturationCounts;
  }
  const saturated = o.saturationCounts === undefined ? [] : lines.filter((l) => bg + (o.peakCounts * l.intensity) / ref > o.saturationCounts!);
  const spectrum = createSpectrum({
    wavelength: Array.from({ length: o.pixels }, (_, i) => i),
    flux,
    uncertainty: sigma,
    unit: 'pixel',
    fluxUnit: 'adu',
    header: Header.from([
      { keyword: 'OBJECT', value: `${o.lamp} lamp (synthetic)` },
      { keyword: 'COMMENT', text: 'INVENTED synthetic lamp spectrum for lineshift tests' },
    ]),
  });
  return { spectrum, curve: o.curve, lines, saturated };
}

/** Options of {@link makePeakList}. */
export interface PeakListOptions {
  readonly lamp: string;
  readonly pixels: number;
  readonly curve: TrueCurve;
  readonly fwhmPixels: number;
  /** Keep the brightest this many lines on the detector (before removing some). */
  readonly lines: number;
  /** Fraction of the kept lines removed at random. Default 0. */
  readonly missingFraction?: number;
  /** Spurious peaks added, as a fraction of the kept lines, at random pixels with random strengths. Default 0. */
  readonly spuriousFraction?: number;
  /** 1-σ scatter of the centres, pixels. Default 0.03. */
  readonly centroidSigmaPixels?: number;
  readonly seed: number;
}

/** A peak list and, for each peak, the true wavelength (NaN for spurious peaks). */
export interface SyntheticPeaks {
  readonly peaks: readonly MeasuredPeak[];
  readonly trueWavelengthAngstrom: readonly number[];
}

/** A list of measured peaks as a line finder would give it, with known identities. */
export function makePeakList(o: PeakListOptions): SyntheticPeaks {
  const rand = mulberry32(o.seed);
  const all = placeLines(o.lamp, o.curve, o.pixels, o.fwhmPixels).filter((l) => l.pixel > 3 && l.pixel < o.pixels - 4);
  const bright = [...all].sort((a, b) => b.intensity - a.intensity).slice(0, o.lines);
  const sigma = o.centroidSigmaPixels ?? 0.03;
  const kept = bright.filter(() => rand() >= (o.missingFraction ?? 0));
  const maxI = Math.max(...bright.map((l) => l.intensity));
  const minI = Math.min(...bright.map((l) => l.intensity));
  const peaks: MeasuredPeak[] = [];
  const truth: number[] = [];
  for (const l of kept) {
    peaks.push({ pixel: l.pixel + sigma * gaussian(rand), pixelUncertainty: sigma, strength: l.intensity, fwhmPixels: o.fwhmPixels });
    truth.push(l.wavelengthAngstrom);
  }
  const spurious = Math.round((o.spuriousFraction ?? 0) * bright.length);
  for (let k = 0; k < spurious; k++) {
    const logI = Math.log(minI) + rand() * (Math.log(maxI) - Math.log(minI));
    peaks.push({ pixel: 4 + rand() * (o.pixels - 9), pixelUncertainty: sigma * 2, strength: Math.exp(logI), fwhmPixels: o.fwhmPixels });
    truth.push(NaN);
  }
  // Shuffle so that order carries no information.
  const order = peaks.map((_, i) => i);
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [order[i], order[j]] = [order[j], order[i]];
  }
  return { peaks: order.map((i) => peaks[i]), trueWavelengthAngstrom: order.map((i) => truth[i]) };
}

/** The standard set-ups used by the tests (invented instruments). */
export const STANDARD_CASES = {
  /** Ne+Ar, slit spectrograph, red, 2048 pixels, ≈ 0.55 Å/pixel, mild cubic curve. */
  neArRed: { lamp: 'neon,argon', pixels: 2048, fwhmPixels: 3, curve: cubicCurve([6400, 0.55, -1.2e-5, -2.0e-9], 1024) },
  /** Ne+Ar, low resolution, 4096 pixels, ≈ 1.1 Å/pixel (from 4000 to 8600 Å), quadratic. */
  neArWide: { lamp: 'neon,argon', pixels: 4096, fwhmPixels: 4, curve: cubicCurve([6300, 1.12, 1.5e-5, 0], 2048) },
  /** Hg, 3605–5815 Å (from the 3650 Å group to 5804 Å), 2048 pixels, ≈ 1.08 Å/pixel. */
  mercury: { lamp: 'mercury', pixels: 2048, fwhmPixels: 3, curve: cubicCurve([4700, 1.08, 1.0e-5, 0], 1024) },
  /** He, 2048 pixels, ≈ 1.6 Å/pixel. */
  helium: { lamp: 'helium', pixels: 2048, fwhmPixels: 3, curve: cubicCurve([5600, 1.6, -1.0e-5, 0], 1024) },
  /** Ne+Ar through a slit spectrograph described by the grating equation (600 lines/mm, f = 135 mm). */
  neArGrating: {
    lamp: 'neon,argon', pixels: 3000, fwhmPixels: 3.5,
    curve: gratingCurve({ kind: 'slit', linesPerMm: 600, order: 1, incidenceDeg: 12, centerWavelengthAngstrom: 6500, focalLengthMm: 135, pixelSizeUm: 3.76, pixels: 3000 }),
  },
} as const;

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  for (const [name, c] of Object.entries(STANDARD_CASES)) {
    const lines = placeLines(c.lamp, c.curve, c.pixels, c.fwhmPixels);
    console.log(`${name}: ${c.lamp}, ${c.pixels} px, ${c.curve(0).toFixed(1)}–${c.curve(c.pixels - 1).toFixed(1)} Å, ${lines.length} resolved list lines`);
  }
}
