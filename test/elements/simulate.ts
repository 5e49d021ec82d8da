/**
 * Test helper: seeded synthetic found-line lists of known composition, made from the line
 * lists (the stand-in for "spectrum → line finder → fitter" until those exist here).
 *
 * Model (invented for the test, not a stellar atmosphere): each list line of a species in the
 * composition gets a peak amplitude A = A0 · r^0.7 in continuum units, r = intensity / strongest
 * intensity of the species in range (lists with intensities for fewer than half their lines in
 * range: r = 0.7 for every line; lines without intensity in a list that has enough: r = 0.05). Lines closer than 0.7 FWHM blend into one
 * found line at the amplitude-weighted centre. A found line is kept when its significance
 * A · SNR · √1.5 (≈ 1.5 resolution-element pixels of signal, common practice) reaches 5; its centre is
 * jittered by σ = 0.5 · FWHM / significance, which is also the reported uncertainty. Unlisted
 * lines (elements not in the lists) are added at a given density, and spurious detections at a
 * given count.
 */
import type { LineKind, ObservedLine, ReferenceLine } from '../../src/elements/types.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { listsOf } from './lists.js';

/** A composition to simulate. */
export interface Scenario {
  readonly name: string;
  readonly kind: LineKind;
  readonly species: readonly string[];
  readonly startAngstrom: number;
  readonly endAngstrom: number;
  /** A0: amplitude of the strongest line of each species, continuum units. */
  readonly peakAmplitude: number;
  /** Unlisted real lines per Å (stars have many lines of elements not in the lists). */
  readonly unlistedPerAngstrom: number;
}

/** The compositions of the precision/recall test (invented). */
export const SCENARIOS: readonly Scenario[] = [
  { name: 'cool star', kind: 'absorption', species: ['H I', 'Na I', 'Mg I', 'Ca I', 'Ca II', 'Fe I', 'Fe II', 'Ti II'], startAngstrom: 3900, endAngstrom: 6900, peakAmplitude: 0.5, unlistedPerAngstrom: 0.01 },
  { name: 'hot star', kind: 'absorption', species: ['H I', 'He I', 'Si II', 'Mg I'], startAngstrom: 3900, endAngstrom: 6900, peakAmplitude: 0.3, unlistedPerAngstrom: 0.002 },
  { name: 'nebula', kind: 'emission', species: ['H I', 'He I', 'O III', 'N II', 'S II', 'Ne III', 'Ar III'], startAngstrom: 3700, endAngstrom: 7500, peakAmplitude: 3, unlistedPerAngstrom: 0.001 },
  { name: 'neon lamp', kind: 'emission', species: ['Ne I'], startAngstrom: 5800, endAngstrom: 7500, peakAmplitude: 5, unlistedPerAngstrom: 0 },
];

/** One simulated found-line list with its truth. */
export interface SimulatedLines {
  readonly lines: ObservedLine[];
  readonly truth: readonly string[];
  readonly velocityKmPerS: number;
}

const C_KM_S = 299_792.458; // exact (SI)

/**
 * The lines a scenario puts in, by wavelength: each listed line of its species in range at its
 * rest wavelength times the Doppler factor `dop`, with amplitude A0 · r^0.7 (r the list intensity
 * over the species' strongest in range; every line r = 0.7 in lists with intensities for fewer
 * than half their lines; 0.05 for lines without intensity), forbidden lines left out of
 * absorption spectra, plus unlisted lines at random places (shared by the found-line simulator
 * and synthetic-spectrum.ts).
 */
export function scenarioLines(sc: Scenario, dop: number, rand: () => number): { w: number; a: number }[] {
  const truthLines: { w: number; a: number }[] = [];
  for (const s of sc.species) {
    const rows = listsOf([s]).filter(
      (l: ReferenceLine) => l.wavelengthAngstrom >= sc.startAngstrom && l.wavelengthAngstrom <= sc.endAngstrom && !/multiplet centroid/i.test(l.note ?? ''),
    );
    let known = rows.filter((r) => r.relativeIntensity !== null).map((r) => r.relativeIntensity as number);
    // lists with intensities for fewer than half their lines (Fe II, Ti II): all lines equally strong
    if (known.length < 0.5 * rows.length) known = [];
    const iMax = known.length ? Math.max(...known) : 0;
    for (const r of rows) {
      if (/forbidden/i.test(r.note ?? '') && sc.kind === 'absorption') continue;
      const rel = known.length === 0 ? 0.7 : r.relativeIntensity === null ? 0.05 : r.relativeIntensity / iMax;
      truthLines.push({ w: r.wavelengthAngstrom * dop, a: sc.peakAmplitude * Math.pow(rel, 0.7) });
    }
  }
  const span = sc.endAngstrom - sc.startAngstrom;
  for (let i = 0, n = Math.round(sc.unlistedPerAngstrom * span); i < n; i++) truthLines.push({ w: sc.startAngstrom + rand() * span, a: sc.peakAmplitude * 0.3 * rand() });
  return truthLines.sort((a, b) => a.w - b.w);
}

/**
 * Simulates the found lines of a scenario at a resolving power and S/N.
 *
 * @param sc the composition.
 * @param resolvingPower λ/FWHM.
 * @param snr continuum signal-to-noise ratio per pixel.
 * @param seed random seed.
 */
export function simulateFoundLines(sc: Scenario, resolvingPower: number, snr: number, seed: number): SimulatedLines {
  const rand = mulberry32(seed);
  const v = (rand() - 0.5) * 200; // ±100 km/s
  const dop = Math.sqrt((1 + v / C_KM_S) / (1 - v / C_KM_S));
  const truthLines = scenarioLines(sc, dop, rand);
  const span = sc.endAngstrom - sc.startAngstrom;
  // blend what the resolution cannot separate
  const blended: { w: number; a: number }[] = [];
  for (const t of truthLines) {
    const last = blended[blended.length - 1];
    if (last && t.w - last.w < (0.7 * t.w) / resolvingPower) {
      const a = last.a + t.a;
      last.w = (last.w * last.a + t.w * t.a) / a;
      last.a = a;
    } else blended.push({ ...t });
  }
  const lines: ObservedLine[] = [];
  for (const b of blended) {
    const amp = sc.kind === 'absorption' ? Math.min(b.a, 0.95) : b.a;
    const significance = amp * snr * Math.sqrt(1.5);
    if (significance < 5) continue;
    const fwhm = b.w / resolvingPower;
    const sigma = (0.5 * fwhm) / significance;
    lines.push({ wavelengthAngstrom: b.w + sigma * gaussian(rand), wavelengthUncertaintyAngstrom: sigma, kind: sc.kind, fwhmAngstrom: fwhm, strength: amp, significance });
  }
  // spurious detections (noise, continuum ripples): a few per spectrum, more at low S/N
  const nSpurious = Math.round(3 + 60 / snr);
  for (let i = 0; i < nSpurious; i++) {
    const w = sc.startAngstrom + rand() * span;
    lines.push({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: (0.5 * w) / resolvingPower / 5, kind: sc.kind, fwhmAngstrom: w / resolvingPower, strength: 5 / snr, significance: 5 });
  }
  lines.sort((a, b) => a.wavelengthAngstrom - b.wavelengthAngstrom);
  return { lines, truth: sc.species, velocityKmPerS: v };
}

/**
 * Pure-noise found lines: a Poisson-like number (mean `meanCount`) of spurious detections at
 * uniform random positions, all of one kind, with widths of the resolving power.
 */
export function simulateNoiseLines(kind: LineKind, startAngstrom: number, endAngstrom: number, resolvingPower: number, meanCount: number, seed: number): ObservedLine[] {
  const rand = mulberry32(seed);
  // Poisson by inversion
  let n = 0;
  let p = Math.exp(-meanCount);
  let cum = p;
  const u = rand();
  while (u > cum && n < 10 * meanCount + 20) {
    n++;
    p *= meanCount / n;
    cum += p;
  }
  const lines: ObservedLine[] = [];
  for (let i = 0; i < n; i++) {
    const w = startAngstrom + rand() * (endAngstrom - startAngstrom);
    lines.push({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: (0.5 * w) / resolvingPower / 5, kind, fwhmAngstrom: w / resolvingPower, strength: 0.1, significance: 5 });
  }
  return lines.sort((a, b) => a.wavelengthAngstrom - b.wavelengthAngstrom);
}
