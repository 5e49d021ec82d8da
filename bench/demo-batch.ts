/**
 * Timing of the demo: `lineshift batch` on the 24 nights of LVAC-7 (data/demo/lvac7, 75
 * files with the damaged one) with 1 and with 2 worker threads, as wall time per star
 * exposure and as the time each star took inside its worker; and the wall time of the whole
 * demo pipeline (the ten commands and the report, without the build). Uses the built tool:
 * run `npm run build` first.
 *
 *     npx tsx bench/demo-batch.ts [ROUNDS]      # default 3 rounds; the fastest is kept
 */
import { spawnSync } from 'node:child_process';
import { availableParallelism, cpus } from 'node:os';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BatchReport } from '../src/cli/commands/batch.js';
import { CLI } from '../scripts/demo/cli.js';
import { REPO } from '../scripts/demo/paths.js';

const rounds = Number(process.argv[2] ?? 3);
const setup = ['--lamp', 'neon,argon', '--lines-per-mm', '1200', '--incidence-deg', '17.5', '--grating-center', '6420', '--focal-length-mm', '200', '--pixel-size-um', '5.86', '--species', 'H,Si II,Fe II', '--profile', 'voigt'];
const work = mkdtempSync(join(tmpdir(), 'lineshift-bench-demo-'));

console.log(`machine: ${cpus()[0]?.model ?? 'unknown CPU'}, ${availableParallelism()} cores available (shared with other work); Node ${process.version}; fastest of ${rounds} rounds`);
for (const workers of [1, 2]) {
  let best: { wall: number; report: BatchReport } | null = null;
  for (let r = 0; r < rounds; r++) {
    const out = join(work, `w${workers}-${r}`);
    const t0 = performance.now();
    const run = spawnSync(process.execPath, [CLI, 'batch', 'data/demo/lvac7', '--out', out, '--workers', String(workers), '--json', ...setup], { cwd: REPO, encoding: 'utf8' });
    const wall = (performance.now() - t0) / 1000;
    if (run.status !== 1) throw new Error(`batch exited with ${run.status}: ${run.stderr}`);
    const report = JSON.parse(run.stdout) as BatchReport;
    if (!best || wall < best.wall) best = { wall, report };
  }
  const { wall, report } = best!;
  const n = report.results.length;
  const inWorker = report.results.map((x) => x.milliseconds).sort((a, b) => a - b);
  const median = inWorker[n >> 1];
  console.log(
    `batch, ${workers} worker${workers === 1 ? ' ' : 's'}: ${n} stars in ${wall.toFixed(2)} s wall (process start included) = ${((1000 * wall) / n).toFixed(0)} ms per star; ` +
    `inside the workers ${median.toFixed(0)} ms per star (median; ${inWorker[0].toFixed(0)}–${inWorker[n - 1].toFixed(0)} ms: 2 lamp calibrations, interpolation, apply, write, velocity)`,
  );
}

// The whole demo pipeline (scripts/demo.ts without the build), once.
{
  const out = `out/bench-demo`;
  const t0 = performance.now();
  const run = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/demo.ts', '--out', out], { cwd: REPO, encoding: 'utf8' });
  const wall = (performance.now() - t0) / 1000;
  if (run.status !== 0) throw new Error(`the demo exited with ${run.status}: ${run.stderr}`);
  console.log(`demo pipeline (10 commands, comparison, report; build excluded): ${wall.toFixed(1)} s wall`);
  rmSync(join(REPO, out), { recursive: true, force: true });
}
rmSync(work, { recursive: true, force: true });
