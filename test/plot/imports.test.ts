/**
 * Data flows one way (DEVELOPERS.md, "Layout"): the plot area may read every area's
 * results, but only the areas on top of it (notebook, report, cli) and the public index
 * import the plot area.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import { repoPath } from '../helpers/paths.js';

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? sources(p) : p.endsWith('.ts') ? [p] : [];
  });
}

/** Top-level area of a file under src/ (`plot`, `fit`, … or `index.ts`). */
const areaOf = (file: string) => relative(repoPath('src'), file).split(/[\\/]/)[0];

describe('imports', () => {
  it('only notebook, report, cli and the index import the plot area', () => {
    const allowed = new Set(['plot', 'notebook', 'report', 'cli', 'index.ts']);
    const offenders: string[] = [];
    for (const file of sources(repoPath('src'))) {
      const text = readFileSync(file, 'utf8');
      for (const m of text.matchAll(/^\s*(?:import|export)\b[^;]*?from\s+'([^']+)'/gms)) {
        const target = join(file, '..', m[1]);
        if (m[1].startsWith('.') && areaOf(target) === 'plot' && !allowed.has(areaOf(file))) offenders.push(`${relative(repoPath(), file)} imports ${m[1]}`);
      }
    }
    expect(offenders).toEqual([]);
  });
});
