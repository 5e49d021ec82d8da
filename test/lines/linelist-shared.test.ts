import { spawnSync } from 'node:child_process';
import { readFileSync, readdirSync } from 'node:fs';
import { expect, it } from 'vitest';
import { describeWithShared, repoPath, sharedPath } from '../helpers/paths.js';

describeWithShared('shipped line lists against ../shared/reference/linelists', () => {
  it('are byte-for-byte copies of the reference CSV files and CHECKS.md', () => {
    const names = readdirSync(sharedPath('linelists')).filter((f) => f.endsWith('.csv'));
    expect(names.length).toBe(24);
    for (const f of [...names, 'CHECKS.md']) {
      expect(readFileSync(repoPath('data', 'linelists', f)).equals(readFileSync(sharedPath('linelists', f))), f).toBe(true);
    }
    expect(readdirSync(repoPath('data', 'linelists')).filter((f) => f.endsWith('.csv')).sort()).toEqual(names.sort());
  });

  it('are what data/linelists/build.ts --check accepts', () => {
    const r = spawnSync(process.execPath, [repoPath('node_modules', 'tsx', 'dist', 'cli.mjs'), repoPath('data', 'linelists', 'build.ts'), '--check'], {
      encoding: 'utf8',
      env: { ...process.env, LINESHIFT_SHARED_REFERENCE: sharedPath() },
    });
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('all 25 files match');
  });

  it('copy the PR1972 coefficients that src/spectrum/air-vacuum.ts uses', () => {
    // Source: ../shared/reference/linelists/SOURCES.md, row PR1972.
    const sources = readFileSync(sharedPath('linelists', 'SOURCES.md'), 'utf8');
    expect(sources).toContain('n−1 = 8.06051e-5 + 2.480990e-2/(132.274 − σ²) + 1.74557e-4/(39.32957 − σ²)');
    const code = readFileSync(repoPath('src', 'spectrum', 'air-vacuum.ts'), 'utf8');
    expect(code).toContain("'peck-reeder-1972': { c0: 8.06051e-5, terms: [[2.48099e-2, 132.274], [1.74557e-4, 39.32957]] }");
  });
});
