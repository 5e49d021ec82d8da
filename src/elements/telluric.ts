/**
 * Telluric absorption bands (O2, H2O): regions of the Earth's atmosphere's absorption, in the
 * observer's frame, used to flag found absorption lines that may not come from the star.
 */
import type { ReferenceLine } from './types.js';

/** A telluric absorption band, observer's frame, air wavelengths. */
export interface TelluricBand {
  /** Band name as in the list, e.g. `O2 A band`, `H2O 7200 band`. */
  readonly name: string;
  /** The list it came from, e.g. `O2 telluric`. */
  readonly species: string;
  /** Blue limit in Å. */
  readonly startAngstrom: number;
  /** Red limit in Å. */
  readonly endAngstrom: number;
  /** `weak` when the list's note says so (such bands only flag lines); otherwise `strong`. */
  readonly strength: 'weak' | 'strong';
}

const LIMIT_NOTE = /^(.+?\bband)\b[^:]*:\s*(blue|red) limit/i;

/**
 * Collects telluric bands from band-limit rows of line lists (`O2_telluric.csv`,
 * `H2O_telluric.csv`): rows whose note reads `<name> band …: blue limit …` and
 * `<name> band …: red limit …` form one band. Other rows (band heads) are ignored, and so is
 * a band with only one limit. A band whose note says `(weak)` or `weak band` is marked weak.
 *
 * @param lines reference lines, e.g. the entries of the telluric lists (any species; rows
 *   without a limit note are skipped).
 * @returns bands sorted by start wavelength.
 * @example
 * telluricBandsFromLines([
 *   { species: 'O2 telluric', wavelengthAngstrom: 7594, relativeIntensity: null, note: 'O2 A band: blue limit' },
 *   { species: 'O2 telluric', wavelengthAngstrom: 7621, relativeIntensity: null, note: 'O2 A band: red limit' },
 * ]); // [{ name: 'O2 A band', species: 'O2 telluric', startAngstrom: 7594, endAngstrom: 7621, strength: 'strong' }]
 */
export function telluricBandsFromLines(lines: readonly ReferenceLine[]): TelluricBand[] {
  const limits = new Map<string, { species: string; blue?: number; red?: number; weak: boolean }>();
  for (const l of lines) {
    const m = LIMIT_NOTE.exec(l.note ?? '');
    if (!m) continue;
    const name = m[1].trim();
    const k = `${l.species}\u0000${name}`;
    const entry = limits.get(k) ?? { species: l.species, weak: false };
    if (/\(weak\)|\bweak(er)? band/i.test(l.note ?? '')) entry.weak = true;
    if (m[2].toLowerCase() === 'blue') entry.blue = l.wavelengthAngstrom;
    else entry.red = l.wavelengthAngstrom;
    limits.set(k, entry);
  }
  const bands: TelluricBand[] = [];
  for (const [k, e] of limits) {
    if (e.blue === undefined || e.red === undefined || !(e.red > e.blue)) continue;
    bands.push(
      Object.freeze({ name: k.split('\u0000')[1], species: e.species, startAngstrom: e.blue, endAngstrom: e.red, strength: e.weak ? ('weak' as const) : ('strong' as const) }),
    );
  }
  return bands.sort((a, b) => a.startAngstrom - b.startAngstrom);
}

/**
 * The telluric band containing a wavelength, or null.
 *
 * @param bands bands (any order).
 * @param wavelengthAngstrom wavelength in the observer's frame, Å, air.
 * @returns the first band (by start) with start ≤ λ ≤ end, or null.
 * @example telluricBandAt([{ name: 'O2 A band', species: 'O2 telluric', startAngstrom: 7594, endAngstrom: 7621, strength: 'strong' }], 7600)?.name; // 'O2 A band'
 */
export function telluricBandAt(bands: readonly TelluricBand[], wavelengthAngstrom: number): TelluricBand | null {
  let best: TelluricBand | null = null;
  for (const b of bands) {
    if (wavelengthAngstrom >= b.startAngstrom && wavelengthAngstrom <= b.endAngstrom) {
      if (best === null || b.startAngstrom < best.startAngstrom) best = b;
    }
  }
  return best;
}
