/**
 * Test helper: the line lists as plain reference lines. Reads data/linelists/*.csv of this
 * repository; lists that are not (yet) in the repository are read from the shared reference
 * folder (../shared/reference/linelists/), which holds the same files.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import type { ReferenceLine } from '../../src/elements/types.js';
import { repoPath, sharedAvailable, sharedPath } from '../helpers/paths.js';

function splitCsv(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out;
}

/** Parses one list file of the shipped format into reference lines. */
export function readListFile(path: string): ReferenceLine[] {
  const species = basename(path).replace(/\.csv$/, '').replace(/_+/g, ' ');
  const rows = readFileSync(path, 'utf8').split(/\r?\n/).filter((l) => l.trim().length > 0);
  return rows.slice(1).map((r) => {
    const [w, inten, , note] = splitCsv(r);
    return { wavelengthAngstrom: Number(w), species, relativeIntensity: inten === '' ? null : Number(inten), note: note ?? '' };
  });
}

let cached: Map<string, ReferenceLine[]> | undefined;

/** Every list by species name (`Fe I`, `O2 telluric`, …). */
export function allLists(): Map<string, ReferenceLine[]> {
  if (cached) return cached;
  const files = new Map<string, string>();
  const dirs = [sharedAvailable ? sharedPath('linelists') : '', repoPath('data', 'linelists')].filter((d) => d && existsSync(d));
  for (const d of dirs) for (const f of readdirSync(d)) if (f.endsWith('.csv')) files.set(f, join(d, f));
  cached = new Map([...files.values()].sort().map((p) => {
    const lines = readListFile(p);
    return [lines[0]?.species ?? basename(p), lines] as const;
  }));
  return cached;
}

/** The reference lines of the named species, joined. */
export function listsOf(species: readonly string[]): ReferenceLine[] {
  const all = allLists();
  return species.flatMap((s) => {
    const l = all.get(s);
    if (!l) throw new Error(`no test list for ${s}`);
    return l;
  });
}
