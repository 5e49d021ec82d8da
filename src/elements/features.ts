/**
 * Features: the list lines of one species as they can appear at a given resolving power.
 * Lines closer than one resolution element blend into one feature.
 */
import type { ReferenceLine } from './types.js';

/** A list line placed in the spectrum's frame. */
export interface PlacedLine {
  /** The list line. */
  readonly line: ReferenceLine;
  /** Where it should appear in the spectrum (medium converted, Doppler-shifted), Å. */
  readonly expectedAngstrom: number;
}

/** One feature: a list line, or several that blend at the resolving power. */
export interface Feature {
  readonly species: string;
  /** Weighted mean list wavelength, Å. */
  readonly restAngstrom: number;
  /** Weighted mean expected position, Å. */
  readonly expectedAngstrom: number;
  /** Sum of the known list intensities of the components, or null when none is known. */
  readonly weight: number | null;
  /** Weighted standard deviation of the components' expected positions, Å (0 for one line). */
  readonly spreadAngstrom: number;
  /** Number of list lines in the feature. */
  readonly components: number;
  /** True for forbidden lines (seen in emission only). */
  readonly forbidden: boolean;
}

const CENTROID_NOTE = /multiplet centroid/i;
const FORBIDDEN_NOTE = /forbidden/i;

/** True for summary rows (multiplet centroids) that duplicate their components. */
export function isSummaryRow(line: ReferenceLine): boolean {
  return CENTROID_NOTE.test(line.note ?? '');
}

/** True for forbidden (M1/E2) lines. */
export function isForbidden(line: ReferenceLine): boolean {
  return FORBIDDEN_NOTE.test(line.note ?? '');
}

/**
 * Groups the placed lines of one species into features. The strongest line not yet used
 * takes every unused line within one resolution element (λ/R) of it; lines without an
 * intensity come after those with one, in wavelength order. Forbidden and permitted lines
 * are never merged. The centre is the intensity-weighted mean (lines without intensity
 * count only when no line of the group has one, then equally).
 *
 * @param placed lines of one species (summary rows already removed).
 * @param resolvingPower λ/Δλ of the spectrum.
 * @returns features sorted by expected wavelength.
 */
export function buildFeatures(placed: readonly PlacedLine[], resolvingPower: number): Feature[] {
  const order = placed
    .map((p, i) => ({ p, i }))
    .sort((a, b) => {
      const wa = a.p.line.relativeIntensity;
      const wb = b.p.line.relativeIntensity;
      if (wa !== null && wb !== null && wa !== wb) return wb - wa;
      if (wa !== null && wb === null) return -1;
      if (wa === null && wb !== null) return 1;
      return a.p.expectedAngstrom - b.p.expectedAngstrom;
    });
  const used = new Uint8Array(placed.length);
  const features: Feature[] = [];
  for (const { p: seed, i: si } of order) {
    if (used[si]) continue;
    const width = seed.expectedAngstrom / resolvingPower;
    const forbidden = isForbidden(seed.line);
    const group: PlacedLine[] = [];
    for (let j = 0; j < placed.length; j++) {
      if (used[j]) continue;
      const q = placed[j];
      if (isForbidden(q.line) !== forbidden) continue;
      if (Math.abs(q.expectedAngstrom - seed.expectedAngstrom) <= width) {
        used[j] = 1;
        group.push(q);
      }
    }
    features.push(summarise(group, forbidden));
  }
  return features.sort((a, b) => a.expectedAngstrom - b.expectedAngstrom);
}

function summarise(group: readonly PlacedLine[], forbidden: boolean): Feature {
  const anyKnown = group.some((g) => g.line.relativeIntensity !== null);
  let weights = group.map((g) => (anyKnown ? Math.max(0, g.line.relativeIntensity ?? 0) : 1));
  let sw = weights.reduce((s, w) => s + w, 0);
  if (sw <= 0) {
    // every known intensity is zero: weigh equally
    weights = group.map(() => 1);
    sw = group.length;
  }
  let sRest = 0;
  let sExp = 0;
  let weight = 0;
  group.forEach((g, k) => {
    sRest += weights[k] * g.line.wavelengthAngstrom;
    sExp += weights[k] * g.expectedAngstrom;
    if (g.line.relativeIntensity !== null) weight += g.line.relativeIntensity;
  });
  const expected = sExp / sw;
  let var2 = 0;
  group.forEach((g, k) => {
    var2 += weights[k] * (g.expectedAngstrom - expected) ** 2;
  });
  return {
    species: group[0].line.species,
    restAngstrom: sRest / sw,
    expectedAngstrom: expected,
    weight: anyKnown ? weight : null,
    spreadAngstrom: group.length > 1 ? Math.sqrt(var2 / sw) : 0,
    components: group.length,
    forbidden,
  };
}
