/**
 * Test helper: the shipped line lists (data/linelists/) as reference lines for identification,
 * loaded with the library's own loader; its entries have the ReferenceLine shape.
 */
import { availableSpecies, loadLineList } from '../../src/lines/linelist.js';
import type { ReferenceLine } from '../../src/elements/types.js';

let cached: Map<string, readonly ReferenceLine[]> | undefined;

/** Every shipped list by species name (`Fe I`, `O2 telluric`, …). */
export function allLists(): Map<string, readonly ReferenceLine[]> {
  if (!cached) cached = new Map(availableSpecies().map((s) => [s, loadLineList(s).entries] as const));
  return cached;
}

/** The reference lines of the named species, joined. */
export function listsOf(species: readonly string[]): ReferenceLine[] {
  const all = allLists();
  return species.flatMap((s) => {
    const l = all.get(s);
    if (!l) throw new Error(`no shipped list for ${s}`);
    return [...l];
  });
}
