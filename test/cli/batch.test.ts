/**
 * `lineshift batch` on a small set of invented frames made by the demo generator (three
 * nights of LVAC-7 with their lamps, plus the night whose star file is deliberately
 * truncated), in os.tmpdir(): the velocity table, the failure report, the exit code, the
 * progress bar, worker threads, and that no partial file is ever left, even on Ctrl-C.
 * The velocities are compared with the generator's truth (our own invented values).
 */
import { spawn, spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemo, readScenario, type DemoTruth } from '../../data/demo/generate.js';
import type { BatchReport } from '../../src/cli/commands/batch.js';
import { progressLine } from '../../src/cli/batch/progress.js';
import { runCli } from '../../src/cli/run.js';
import { readSolution } from '../../src/calibrate/solution-json.js';
import { readSpectrum } from '../../src/io/read.js';
import { readVelocityTable } from '../../src/orbit/table.js';
import { distProblem } from '../notebook/run.js';
import { repoPath } from '../helpers/paths.js';
import { captureIO } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-batch-'));
const frames = join(dir, 'frames');
let truth: DemoTruth;
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The set-up options of the invented spectrograph (data/demo/scenario.json). */
const SETUP = ['--lamp', 'neon,argon', '--lines-per-mm', '1200', '--incidence-deg', '17.5', '--grating-center', '6420', '--focal-length-mm', '200', '--pixel-size-um', '5.86'];
const VELOCITY = ['--species', 'H,Si II,Fe II', '--profile', 'voigt'];

beforeAll(() => {
  const scenario = readScenario();
  scenario.binary.season.nights = 3;
  generateDemo(frames, scenario);
  truth = JSON.parse(readFileSync(join(frames, 'truth.json'), 'utf8')) as DemoTruth;
  rmSync(join(frames, 'lvac12'), { recursive: true });
});

const capture = (tty = false) => captureIO({ cwd: dir, isTTY: tty });

/** Every file under a folder, relative to it. */
function filesUnder(root: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.push(relative(root, p));
    }
  };
  if (existsSync(root)) walk(root);
  return out.sort();
}

/** Checks that every output file is whole: FITS files read, JSON files parse, tables read. */
function expectWholeFiles(root: string): void {
  for (const f of filesUnder(root)) {
    expect(f).not.toMatch(/\.tmp$/);
    const p = join(root, f);
    if (f.endsWith('.fits')) expect(readSpectrum(p).unit).toBe('angstrom');
    else if (f.endsWith('.solution.json')) expect(readSolution(p).pixels).toBe(2048);
    else if (f.endsWith('.json')) expect(() => JSON.parse(readFileSync(p, 'utf8'))).not.toThrow();
    else if (f.endsWith('.csv')) expect(readVelocityTable(p).bjdTdb.length).toBeGreaterThan(0);
  }
}

describe('lineshift batch', () => {
  let report: BatchReport;
  let code: number;
  let io: ReturnType<typeof capture>;
  const out = join(dir, 'out-1');

  beforeAll(async () => {
    io = capture();
    code = await runCli(['batch', 'frames/lvac7', '--out', 'out-1', '--workers', '1', '--json', ...SETUP, ...VELOCITY], io);
    report = JSON.parse(io.out) as BatchReport;
  }, 120_000);

  it('reduces every good star, carries on past the truncated file and reports it, with exit code 1', () => {
    expect(code).toBe(1);
    expect(report.filesFound).toBe(12);
    expect(report.results.map((r) => r.label)).toEqual(truth.exposures.filter((e) => !e.damaged).map((e) => `${e.night}/star.fits`));
    expect(report.failures).toHaveLength(1);
    const bad = truth.exposures.find((e) => e.damaged)!;
    expect(report.failures[0]).toMatchObject({ file: `frames/lvac7/${bad.night}/star.fits`, stage: 'read', code: 'fits.data-beyond-end' });
    expect(report.failures[0].message).toBe(
      `frames/lvac7/${bad.night}/star.fits: HDU 0: byte 2880: the header declares 8192 bytes of data (NAXIS1 × 4) but the file has only 4000 bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)`,
    );
    expect(report.unusedLamps).toEqual([`frames/lvac7/${bad.night}/lamp-after.fits`, `frames/lvac7/${bad.night}/lamp-before.fits`]);
    // Every failure again at the end, on stderr, then the summary.
    expect(io.err.trim().split('\n')).toEqual([`lineshift: ${report.failures[0].message}`, 'lineshift: 1 of 12 files failed (listed above); the results of the others were written']);
  });

  it('pairs each star with the lamps before and after it and interpolates their solutions', () => {
    for (const r of report.results) {
      expect(r.calibration).toBe('interpolated');
      expect(r.lamps.map((l) => [l.role, l.file.split('/').at(-1), l.ok])).toEqual([['before', 'lamp-before.fits', true], ['after', 'lamp-after.fits', true]]);
      // The star sits half-way between its lamps (the invented sequence: 30 s lamp, 60 s gap, 900 s star, 45 s gap, 30 s lamp).
      expect(r.weightAfter).toBeCloseTo((60 + 15 + 450) / (60 + 15 + 900 + 45 + 15) , 6);
    }
  });

  it('recovers the invented true velocities within their uncertainties (our own truth, not the world)', () => {
    const pulls = report.results.map((r) => {
      const t = truth.exposures.find((e) => `${e.night}/star.fits` === r.label)!;
      // BJD_TDB from the same header keys and library: equal to rounding (1e-8 d in truth.json).
      expect(Math.abs(r.bjdTdb - t.bjdTdb)).toBeLessThan(2e-8);
      expect(r.barycentricCorrectionKmPerS).toBeCloseTo(t.barycentricCorrectionKmPerS, 5);
      return (r.radialVelocity.value - t.barycentricVelocityKmPerS) / r.radialVelocity.uncertainty;
    });
    console.log(`batch test: pulls (measured − true)/σ = ${pulls.map((p) => p.toFixed(2)).join(', ')}`);
    // 4 σ: a real failure (a wrong lamp identification is ≥ 1 km/s, 2–3 σ per pixel of error) is far beyond; 3 stars.
    for (const p of pulls) expect(Math.abs(p)).toBeLessThan(4);
  });

  it('writes the velocity table (CSV and JSON), batch.json, calibrated spectra and solutions, all whole', () => {
    const table = readVelocityTable(join(out, 'velocities.csv'));
    expect(Array.from(table.bjdTdb)).toEqual(report.results.map((r) => r.bjdTdb));
    expect(Array.from(table.velocityKmPerS)).toEqual(report.results.map((r) => r.radialVelocity.value));
    expect(table.label).toEqual(report.results.map((r) => r.label));
    expect(readVelocityTable(join(out, 'velocities.json')).velocityKmPerS).toEqual(table.velocityKmPerS);
    expect(JSON.parse(readFileSync(join(out, 'batch.json'), 'utf8'))).toMatchObject({ format: 'lineshift-batch', formatVersion: 1, failures: report.failures });
    const files = filesUnder(out);
    const good = truth.exposures.filter((e) => !e.damaged);
    for (const e of good) {
      expect(files).toContain(`spectra/${e.night}/star.fits`);
      expect(files).toContain(`solutions/${e.night}/lamp-before.solution.json`);
      expect(files).toContain(`solutions/${e.night}/lamp-after.solution.json`);
    }
    expect(files).toHaveLength(3 + 3 * good.length);
    expectWholeFiles(out);
    const calibrated = readSpectrum(join(out, 'spectra', good[0].night, 'star.fits'));
    expect(calibrated.header.string('OBJECT')).toBe('LVAC-7');
    expect(calibrated.header.commentary('HISTORY').join(' ')).toContain('apply-dispersion-solution');
  });

  it('prints a table and the failures in plain text, and draws a progress bar only on a terminal', async () => {
    const plain = capture(false);
    await runCli(['batch', 'frames/lvac7', '--out', 'out-plain', '--workers', '1', ...SETUP, ...VELOCITY], plain);
    expect(plain.out).toMatch(/^batch: 3 star exposures among 12 files, 1 worker, /);
    expect(plain.out).toContain('failures (1):');
    expect(plain.out).toMatch(/warning: 2 saturated line\(s\) kept out of the fit \(every star, 3\)/);
    expect(plain.err).not.toContain('\r');
    const tty = capture(true);
    await runCli(['batch', 'frames/lvac7', '--out', 'out-tty', '--workers', '1', ...SETUP, ...VELOCITY], tty);
    expect(tty.err).toContain('\rbatch [' + '#'.repeat(28) + '] 3/3 stars, 1 failed, ');
  }, 120_000);

  it('reports stars without lamps and frames it cannot classify, and still reduces the rest', async () => {
    const mixed = join(dir, 'mixed');
    const night = truth.exposures.find((e) => !e.damaged)!.night;
    cpSync(join(frames, 'lvac7', night), join(mixed, 'good'), { recursive: true });
    mkdirSync(join(mixed, 'alone'), { recursive: true });
    cpSync(join(frames, 'lvac7', night, 'star.fits'), join(mixed, 'alone', 'star.fits'));
    // A frame with no frame-type card and a name that says nothing.
    const bytes = readFileSync(join(frames, 'lvac7', night, 'star.fits')).toString('latin1').replace(/IMAGETYP= 'object  '/, "COMMENT   no type   ");
    writeFileSync(join(mixed, 'alone', 'frame-0001.fits'), Buffer.from(bytes, 'latin1'));
    const m = capture();
    const c = await runCli(['batch', 'mixed', '--out', 'out-mixed', '--workers', '1', '--json', ...SETUP, ...VELOCITY], m);
    const r = JSON.parse(m.out) as BatchReport;
    expect(c).toBe(1);
    expect(r.results.map((x) => x.label)).toEqual(['good/star.fits']);
    expect(r.failures.map((f) => [f.file, f.code])).toEqual([
      ['mixed/alone/frame-0001.fits', 'batch.unknown-frame-type'],
      ['mixed/alone/star.fits', 'batch.no-lamp'],
    ]);
    expect(r.failures[1].message).toBe('mixed/alone/star.fits: no lamp frame in the same folder; put the lamp exposures taken with this star beside it');
  }, 60_000);

  it('leaves its inputs untouched and does not take its own outputs for inputs on a second run', async () => {
    const before = filesUnder(frames).map((f) => [f, readFileSync(join(frames, f)).toString('base64')]);
    // The output folder inside the input folder: its calibrated spectra must not be read as stars.
    await runCli(['batch', 'frames/lvac7', '--out', 'frames/lvac7/reduced', '--workers', '1', '--json', ...SETUP, ...VELOCITY], capture());
    const again = capture();
    await runCli(['batch', 'frames/lvac7', '--out', 'frames/lvac7/reduced', '--workers', '1', '--json', ...SETUP, ...VELOCITY], again);
    const r = JSON.parse(again.out) as BatchReport;
    expect(r.filesFound).toBe(12);
    expect(r.results).toHaveLength(3);
    rmSync(join(frames, 'lvac7', 'reduced'), { recursive: true });
    expect(filesUnder(frames).map((f) => [f, readFileSync(join(frames, f)).toString('base64')])).toEqual(before);
  }, 120_000);

  it('names a missing input in one line', async () => {
    const m = capture();
    expect(await runCli(['batch', 'no-such-folder', '--out', 'out-missing', ...SETUP], m)).toBe(1);
    expect(m.err).toBe('lineshift: no-such-folder: no such file or folder\n');
  });

  it('refuses a bad --workers value and missing options before reading anything', async () => {
    const a = capture();
    expect(await runCli(['batch', 'frames', '--out', 'x', '--workers', '0', ...SETUP], a)).toBe(2);
    expect(a.err).toBe('lineshift: --workers must be a whole number from 1 to 256, got 0\n');
    const b = capture();
    expect(await runCli(['batch', 'frames', '--lamp', 'neon'], b)).toBe(2);
    expect(b.err).toBe('lineshift: "lineshift batch" needs --out DIR\n');
    expect(existsSync(join(dir, 'x'))).toBe(false);
  });

  it('draws the progress line', () => {
    expect(progressLine(6, 24, 1, 14_000)).toBe('batch [#######.....................]  6/24 stars, 1 failed, 0:14');
    expect(progressLine(24, 24, 0, 75_000)).toBe('batch [############################] 24/24 stars, 1:15');
  });
});

const problem = distProblem();
const describeWithDist = problem ? describe.skip : describe;
if (problem) console.warn(`SKIPPED "lineshift batch with worker threads": ${problem}`);

describeWithDist(`lineshift batch with worker threads (built tool)${problem ? ` [SKIPPED: ${problem}]` : ''}`, () => {
  const main = repoPath('dist', 'cli', 'main.js');

  it('gives the same velocities with 2 worker threads as in one thread', () => {
    const r = spawnSync(process.execPath, [main, 'batch', 'frames/lvac7', '--out', 'out-2', '--workers', '2', '--json', ...SETUP, ...VELOCITY], { cwd: dir, encoding: 'utf8' });
    expect(r.status).toBe(1);
    const two = JSON.parse(r.stdout) as BatchReport;
    const one = JSON.parse(readFileSync(join(dir, 'out-1', 'batch.json'), 'utf8')) as BatchReport;
    expect(two.workers).toBe(2);
    expect(two.results.map((x) => x.radialVelocity)).toEqual(one.results.map((x) => x.radialVelocity));
    expect(two.failures).toEqual(one.failures);
    expectWholeFiles(join(dir, 'out-2'));
  }, 120_000);

  it('on Ctrl-C stops, removes its temporary files, writes no table and exits with 130', async () => {
    const outDir = join(dir, 'out-interrupted');
    const child = spawn(process.execPath, [main, 'batch', 'frames/lvac7', '--out', 'out-interrupted', '--workers', '1', ...SETUP, ...VELOCITY], { cwd: dir });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
    // Interrupt as soon as the first star's outputs appear (the run is then in the middle of the second).
    const started = Date.now();
    while (!existsSync(join(outDir, 'spectra')) && Date.now() - started < 60_000) await new Promise((r) => setTimeout(r, 20));
    child.kill('SIGINT');
    const code = await new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    expect(code).toBe(130);
    expect(stderr).toMatch(/lineshift: interrupted after [0-2] of 3 star exposures; no velocity table was written and no partial file was left\n$/);
    expect(existsSync(join(outDir, 'velocities.csv'))).toBe(false);
    expect(existsSync(join(outDir, 'batch.json'))).toBe(false);
    expectWholeFiles(outDir);
    expect(statSync(outDir).isDirectory()).toBe(true);
  }, 120_000);
});
