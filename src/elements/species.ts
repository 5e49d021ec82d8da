/**
 * Names of spectra (`Fe I`, `Ca II`, `O2 telluric`) and the elements they belong to.
 */
import { UsageError } from '../errors.js';
import { unknownSpeciesMessage } from './messages.js';

const SPECTRUM_NAME = /^([A-Z][a-z]?)\s+([IVX]+)$/;

/**
 * The element (or molecule) of a spectrum name: `Fe II` → `Fe`, `O2 telluric` → `O2`.
 *
 * @param species a spectrum name as in the line lists (element symbol, space, Roman stage),
 *   or a molecule name followed by a word.
 * @returns the part before the first space.
 * @example elementOfSpecies('Ca II'); // 'Ca'
 */
export function elementOfSpecies(species: string): string {
  const s = species.trim();
  const i = s.search(/\s/);
  return i < 0 ? s : s.slice(0, i);
}

/**
 * True for the spectrum of an atom or ion (`Fe I`, `O III`), false for molecular or telluric
 * lists (`O2 telluric`, `H2O telluric`).
 *
 * @param species a spectrum name.
 * @returns whether the name is an element symbol followed by a Roman-numeral stage.
 * @example isAtomicSpecies('H2O telluric'); // false
 */
export function isAtomicSpecies(species: string): boolean {
  return SPECTRUM_NAME.test(species.trim());
}

function key(s: string): string {
  return s.trim().replace(/[_\s]+/g, ' ').toLowerCase();
}

/**
 * Chooses spectra from those available by the names a user typed: an element symbol
 * (`Fe` → every `Fe …` spectrum), a spectrum (`Fe II`), or a molecule (`H2O`). Case and `_`
 * versus space do not matter. The order of `available` is kept.
 *
 * @param available spectrum names that have line lists.
 * @param requested names typed by the user (at least one).
 * @returns the chosen spectra, without repeats.
 * @throws {UsageError} `elements.unknown-species` naming every request that matches nothing.
 * @example selectSpecies(['Fe I', 'Fe II', 'Na I'], ['fe']); // ['Fe I', 'Fe II']
 */
export function selectSpecies(available: readonly string[], requested: readonly string[]): string[] {
  const chosen = new Set<string>();
  const unknown: string[] = [];
  for (const r of requested) {
    const k = key(r);
    if (k.length === 0) continue;
    const hits = available.filter((a) => key(a) === k || key(elementOfSpecies(a)) === k);
    if (hits.length === 0) unknown.push(r.trim());
    for (const h of hits) chosen.add(h);
  }
  if (unknown.length > 0) {
    throw new UsageError('elements.unknown-species', unknownSpeciesMessage(unknown, available), { keyword: 'species' });
  }
  return available.filter((a) => chosen.has(a));
}
