/**
 * Where the demo's LVAC-7 velocity errors come from, night by night, against the INVENTED
 * truth (scripts/demo/velocity-budget.ts has the method): the calibration's error at the
 * star's lines, the measurement on the true wavelengths (lines and cross-correlation, per
 * line), the realised noise projected on the velocity derivative, and the noise-free model
 * measured on its true grid. Reads the demo's output: run `npm run demo` first.
 *
 *     npx tsx bench/demo-velocity-budget.ts [--out out/demo] [--seeds 1,2,3]
 *
 * `--seeds` also regenerates the whole data set with other seeds (the scenario otherwise
 * unchanged) into a temporary folder and runs `lineshift batch` on each (lines and
 * cross-correlation; the built tool: `npm run build` first; about 20 s per seed): the mean
 * error over many seasons tells a bias from one season's noise.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateDemo, type DemoTruth, type TrueExposure } from '../data/demo/generate.js';
import { CLI } from '../scripts/demo/cli.js';
import { REPO, scenario as readScenario, truth as readTruth } from '../scripts/demo/paths.js';
import {
  calibrationOffsetsKmPerS, measureLvac7, noiseFreeStar, noiseProjectionKmPerS, onTrueGrid, trueWavelengths,
} from '../scripts/demo/velocity-budget.js';
import type { BatchReport } from '../src/cli/commands/batch.js';
import { readSpectrum } from '../src/io/read.js';
import { createSpectrum } from '../src/spectrum/spectrum.js';

const args = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const outDir = join(REPO, opt('--out') ?? 'out/demo');
const seeds = (opt('--seeds') ?? '').split(',').filter(Boolean).map(Number);
const sc = readScenario();
const truth = readTruth();

const mean = (a: readonly number[]) => a.reduce((s, x) => s + x, 0) / a.length;
const sd = (a: readonly number[]) => Math.sqrt(a.reduce((s, x) => s + (x - mean(a)) ** 2, 0) / (a.length - 1));
const summary = (a: readonly number[], digits = 3) => `${mean(a).toFixed(digits)} ± ${(sd(a) / Math.sqrt(a.length)).toFixed(digits)}`;
const f = (x: number, d = 3) => (x >= 0 ? ' ' : '') + x.toFixed(d);
const grating = ['--lines-per-mm', String(sc.instrument.linesPerMm), '--diffraction-order', String(sc.instrument.order), '--incidence-deg', String(sc.instrument.incidenceDeg),
  '--grating-center', String(sc.instrument.centralWavelengthAngstrom), '--focal-length-mm', String(sc.instrument.focalLengthMm), '--pixel-size-um', String(sc.instrument.pixelSizeUm)];

// ---------------------------------------------------------------------------------------------
// The committed season, with the demo's own output.

const batch = JSON.parse(readFileSync(join(outDir, 'lvac7', 'batch.json'), 'utf8')) as BatchReport;
const good = truth.exposures.filter((e) => !e.damaged);
const cols = {
  batch: [] as number[], batchPull: [] as number[], calib: [] as number[], batchCcf: [] as number[], batchCcfPull: [] as number[],
  lines: [] as number[], linesPull: [] as number[], ccf: [] as number[], ccfPull: [] as number[], noise: [] as number[], limit: [] as number[],
  linesMinusNoise: [] as number[], ccfMinusNoise: [] as number[], freeLines: [] as number[], freeCcf: [] as number[],
};
const perLine = new Map<string, { err: number[]; pull: number[]; free: number[] }>();
console.log('Errors against the truth, km/s, observer\'s frame (measured − true); σ = the pipeline\'s stated error (lines)');
console.log('night       S/N    σ     batch  calib  b.ccf  | true grid: lines  ccf   noise δv | noise-free: lines  ccf');
for (const e of good) {
  const r = batch.results.find((x) => x.label === `${e.night}/star.fits`);
  if (!r) throw new Error(`no batch result for ${e.night}`);
  const vt = e.topocentricVelocityKmPerS;
  const calibrated = readSpectrum(join(REPO, r.calibratedFile));
  const offsets = calibrationOffsetsKmPerS(sc, e, calibrated.wavelength);
  const raw = readSpectrum(join(REPO, 'data/demo', e.files.star));
  const wl = trueWavelengths(e.dispersion.star.setup);
  const onTrue = onTrueGrid(raw, wl);
  const lines = measureLvac7(onTrue, 'lines');
  const ccf = measureLvac7(onTrue, 'ccf');
  const bccf = measureLvac7(calibrated, 'ccf');
  const noise = noiseProjectionKmPerS(sc, e, raw.flux);
  const model = noiseFreeStar(sc, e);
  const g = sc.instrument.gainElectronsPerAdu;
  const free = createSpectrum({ wavelength: wl, flux: model, uncertainty: model.map((m) => Math.sqrt(m * g + sc.instrument.readNoiseElectrons ** 2) / g), unit: 'angstrom', medium: 'air' });
  const fl = measureLvac7(free, 'lines');
  const fc = measureLvac7(free, 'ccf');
  const row = {
    batch: r.measuredVelocity.value - vt, batchPull: (r.measuredVelocity.value - vt) / r.measuredVelocity.uncertainty, calib: mean(offsets.map((o) => o.offsetKmPerS)),
    batchCcf: bccf.velocityKmPerS - vt, batchCcfPull: (bccf.velocityKmPerS - vt) / bccf.uncertaintyKmPerS,
    lines: lines.velocityKmPerS - vt, linesPull: (lines.velocityKmPerS - vt) / lines.uncertaintyKmPerS, ccf: ccf.velocityKmPerS - vt, ccfPull: (ccf.velocityKmPerS - vt) / ccf.uncertaintyKmPerS,
    noise: noise.deltaKmPerS, limit: noise.limitKmPerS, linesMinusNoise: lines.velocityKmPerS - vt - noise.deltaKmPerS, ccfMinusNoise: ccf.velocityKmPerS - vt - noise.deltaKmPerS,
    freeLines: fl.velocityKmPerS - vt, freeCcf: fc.velocityKmPerS - vt,
  };
  for (const k of Object.keys(cols) as (keyof typeof cols)[]) cols[k].push(row[k]);
  lines.lines.forEach((l, i) => {
    const key = `${l.species} ${l.restWavelengthAngstrom.toFixed(2)}`;
    const p = perLine.get(key) ?? { err: [], pull: [], free: [] };
    if (l.status === 'used' && l.velocityKmPerS) {
      p.err.push(l.velocityKmPerS.value - vt);
      p.pull.push((l.velocityKmPerS.value - vt) / l.velocityKmPerS.uncertainty);
    }
    const lf = fl.lines[i];
    if (lf?.status === 'used' && lf.velocityKmPerS) p.free.push(lf.velocityKmPerS.value - vt);
    perLine.set(key, p);
  });
  console.log(`${e.night}  ${e.peakSignalToNoise.toFixed(0).padStart(4)}  ${r.measuredVelocity.uncertainty.toFixed(2)}  ${f(row.batch, 2)}  ${f(row.calib)}  ${f(row.batchCcf, 2)}  |           ${f(row.lines, 2)}  ${f(row.ccf, 2)}  ${f(row.noise, 2)}   |              ${f(row.freeLines, 4)}  ${f(row.freeCcf, 4)}`);
}
console.log(`\n${good.length} nights, mean ± standard error (km/s):`);
console.log(`  pipeline (batch, lines):            ${summary(cols.batch)}   mean pull ${summary(cols.batchPull, 2)}`);
console.log(`  pipeline (calibrated, ccf):         ${summary(cols.batchCcf)}   mean pull ${summary(cols.batchCcfPull, 2)}`);
console.log(`  calibration at the star's lines:    ${summary(cols.calib, 4)}`);
console.log(`  true grid, lines:                   ${summary(cols.lines)}   mean pull ${summary(cols.linesPull, 2)}`);
console.log(`  true grid, ccf:                     ${summary(cols.ccf)}   mean pull ${summary(cols.ccfPull, 2)}`);
console.log(`  noise projection δv:                ${summary(cols.noise)}   (photon-noise limit per night ${mean(cols.limit).toFixed(2)}; mean δv/limit ${summary(cols.noise.map((x, i) => x / cols.limit[i]), 2)})`);
console.log(`  true grid, lines − δv:              ${summary(cols.linesMinusNoise)}   (rms ${Math.sqrt(mean(cols.linesMinusNoise.map((x) => x * x))).toFixed(3)})`);
console.log(`  true grid, ccf − δv:                ${summary(cols.ccfMinusNoise)}   (rms ${Math.sqrt(mean(cols.ccfMinusNoise.map((x) => x * x))).toFixed(3)})`);
console.log(`  noise-free model, lines:            ${mean(cols.freeLines).toFixed(4)} (range ${Math.min(...cols.freeLines).toFixed(4)} … ${Math.max(...cols.freeLines).toFixed(4)})`);
console.log(`  noise-free model, ccf:              ${mean(cols.freeCcf).toFixed(4)} (range ${Math.min(...cols.freeCcf).toFixed(4)} … ${Math.max(...cols.freeCcf).toFixed(4)})`);
console.log('\nPer line on the true grid (nights where it was used): mean error (km/s), mean pull, noise-free error (km/s)');
for (const [key, p] of perLine) {
  console.log(`  ${key.padEnd(16)} n ${String(p.err.length).padStart(2)}  error ${summary(p.err, 2)}  pull ${summary(p.pull, 2)}  noise-free ${p.free.length ? mean(p.free).toFixed(4) : '—'}`);
}

// ---------------------------------------------------------------------------------------------
// Other seasons: the same scenario with other seeds.

if (seeds.length) {
  const work = mkdtempSync(join(tmpdir(), 'lineshift-bench-budget-'));
  const all = { lines: [] as number[], linesPull: [] as number[], ccf: [] as number[], ccfPull: [] as number[], calib: [] as number[] };
  try {
    for (const seed of seeds) {
      const dir = join(work, String(seed));
      generateDemo(dir, { ...sc, seed });
      const t = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as DemoTruth;
      const season = { lines: [] as number[], linesPull: [] as number[], ccf: [] as number[], ccfPull: [] as number[], calib: [] as number[] };
      for (const method of ['lines', 'ccf'] as const) {
        const out = join(dir, `out-${method}`);
        const run = spawnSync(process.execPath, [CLI, 'batch', join(dir, 'lvac7'), '--out', out, '--lamp', sc.lamp.lamp, ...grating,
          '--species', 'H,Si II,Fe II', '--profile', 'voigt', '--method', method, '--workers', '1', '--json'], { cwd: REPO, encoding: 'utf8' });
        if (run.status !== 1) throw new Error(`batch (seed ${seed}) exited with ${run.status}: ${run.stderr}`);
        const report = JSON.parse(run.stdout) as BatchReport;
        for (const r of report.results) {
          const e = t.exposures.find((x: TrueExposure) => `${x.night}/star.fits` === r.label)!;
          const d = r.measuredVelocity.value - e.topocentricVelocityKmPerS;
          season[method].push(d);
          season[method === 'lines' ? 'linesPull' : 'ccfPull'].push(d / r.measuredVelocity.uncertainty);
          if (method === 'lines') season.calib.push(mean(calibrationOffsetsKmPerS(sc, e, readSpectrum(r.calibratedFile).wavelength).map((o) => o.offsetKmPerS)));
        }
      }
      for (const k of Object.keys(all) as (keyof typeof all)[]) all[k].push(...season[k]);
      console.log(`seed ${seed}: lines ${summary(season.lines)} (pull ${mean(season.linesPull).toFixed(2)}), ccf ${summary(season.ccf)} (pull ${mean(season.ccfPull).toFixed(2)}), calibration ${mean(season.calib).toFixed(4)}`);
      rmSync(dir, { recursive: true, force: true });
    }
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
  console.log(`\n${seeds.length} seasons, ${all.lines.length} nights, mean ± standard error (km/s):`);
  console.log(`  lines: ${summary(all.lines)}   mean pull ${summary(all.linesPull, 3)}   pull sd ${sd(all.linesPull).toFixed(3)}`);
  console.log(`  ccf:   ${summary(all.ccf)}   mean pull ${summary(all.ccfPull, 3)}   pull sd ${sd(all.ccfPull).toFixed(3)}`);
  console.log(`  calibration at the star's lines: ${summary(all.calib, 4)}`);
}
