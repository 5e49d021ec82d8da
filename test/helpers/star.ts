/**
 * Synthetic stellar spectra for the velocity tests: lines of the shipped line lists (NIST
 * ASD / NIST SRD 108 air wavelengths, data/linelists/) on a 9000 K Planck continuum.
 * Balmer lines are Gaussians of depth 0.5 and intrinsic FWHM 6 Å (broad, as in A-type stars);
 * metal lines have equivalent width 0.25 Å and intrinsic FWHM 0.3 Å. Line strengths are
 * invented; only the rest wavelengths are real.
 */
import { loadLineList, type LineList } from '../../src/lines/linelist.js';
import { selectStrongestLines, syntheticSpectrum, type SyntheticLine, type SyntheticSpectrum } from '../../src/lines/synthetic.js';
import type { Header } from '../../src/spectrum/header.js';

export interface StarOptions {
  /** First and last pixel, Å (linear grid), and pixel count. */
  lo: number;
  hi: number;
  n: number;
  resolvingPower: number;
  velocityKmPerS: number;
  /** Photo-electrons at the continuum peak. */
  peakCounts: number;
  /** Shipped species and strongest lines kept per species. */
  species: readonly string[];
  perSpecies: number;
  seed?: number;
  medium?: 'air' | 'vacuum';
  /** Leave out lines closer than this many λ/R to another (so that every line is resolved). */
  resolvedOnly?: number;
  header?: Header;
}

export interface Star {
  readonly synthetic: SyntheticSpectrum;
  /** The lines the star holds, as a line list (air wavelengths). */
  readonly list: LineList;
  readonly lines: readonly SyntheticLine[];
  readonly wavelength: Float64Array;
}

/** The star's lines: the strongest of each species in range, optionally only resolved ones. */
export function starList(o: StarOptions): LineList {
  const chosen = selectStrongestLines(loadLineList(o.species), { minWavelengthAngstrom: o.lo, maxWavelengthAngstrom: o.hi, maxLinesPerSpecies: o.perSpecies });
  if (!o.resolvedOnly) return chosen;
  const k = o.resolvedOnly;
  const entries = chosen.entries.filter((e) => !chosen.entries.some((f) => f !== e && Math.abs(f.wavelengthAngstrom - e.wavelengthAngstrom) < (k * e.wavelengthAngstrom) / o.resolvingPower));
  return Object.freeze({ ...chosen, entries: Object.freeze(entries) });
}

/** Builds the star (noise from `seed`, default 1). */
export function makeStar(o: StarOptions): Star {
  const list = starList(o);
  const lines: SyntheticLine[] = list.entries.map((e) => (e.species === 'H I'
    ? { wavelengthAngstrom: e.wavelengthAngstrom, medium: e.medium, depth: 0.5, fwhmAngstrom: 6, species: e.species }
    : { wavelengthAngstrom: e.wavelengthAngstrom, medium: e.medium, equivalentWidthAngstrom: 0.25, fwhmAngstrom: 0.3, species: e.species }));
  const wavelength = Float64Array.from({ length: o.n }, (_, i) => o.lo + (i * (o.hi - o.lo)) / (o.n - 1));
  const synthetic = syntheticSpectrum({
    wavelengthAngstrom: wavelength, medium: o.medium ?? 'air', lines, resolvingPower: o.resolvingPower, velocityKmPerS: o.velocityKmPerS,
    continuum: { shape: 'planck', temperatureK: 9000 }, noise: { peakCounts: o.peakCounts, readNoiseElectrons: 5, seed: o.seed ?? 1 },
    header: o.header,
  });
  return { synthetic, list, lines, wavelength };
}
