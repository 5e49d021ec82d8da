import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { repoPath } from '../helpers/paths.js';

const distIndex = repoPath('dist', 'index.js');
const cwd = mkdtempSync(join(tmpdir(), 'lineshift-dist-'));
afterAll(() => rmSync(cwd, { recursive: true, force: true }));

describe('line lists from the built package (dist/)', () => {
  beforeAll(() => {
    // `npm test` builds before running the tests; build here when dist/ is missing or older than the module.
    const stale = !existsSync(repoPath('dist', 'lines', 'linelist.js')) || statSync(repoPath('dist', 'lines', 'linelist.js')).mtimeMs < statSync(repoPath('src', 'lines', 'linelist.ts')).mtimeMs;
    if (stale) execFileSync(process.execPath, [repoPath('node_modules', 'typescript', 'bin', 'tsc'), '-p', repoPath('tsconfig.build.json')], { stdio: 'inherit' });
  }, 180_000);

  it('load data/linelists relative to the module file, from any working directory', () => {
    const script = `
      const m = await import(${JSON.stringify(pathToFileURL(distIndex).href)});
      const ne = m.loadLineList('Ne I');
      const lamp = m.lampLineList('neon,argon');
      console.log(JSON.stringify({ dir: m.LINE_LIST_DIR, ne: ne.entries.length, lamp: lamp.entries.length, first: lamp.entries[0].wavelengthAngstrom, species: m.availableSpecies().length }));
    `;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { cwd, encoding: 'utf8' });
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ ne: 160, lamp: 270, species: 24 });
    expect(out.dir.replace(/\/$/, '')).toBe(repoPath('data', 'linelists'));
  });

  it('work through require() as the notebook kernel loads the package', () => {
    const script = `const m = require(${JSON.stringify(distIndex)}); console.log(m.loadLineList('H I').entries.length);`;
    const r = spawnSync(process.execPath, ['-e', script], { cwd, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.trim()).toBe('20');
  });
});
