import { availableParallelism } from 'node:os';
import { mkdirSync, readdirSync, rmSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { LINE_PROFILES, type LineProfile } from '../../fit/profiles.js';
import { writeFileAtomic } from '../../io/atomic-write.js';
import { createVelocityTable, writeVelocityTable } from '../../orbit/table.js';
import { provenanceEntry, type ProvenanceEntry } from '../../spectrum/provenance.js';
import { VERSION } from '../../version.js';
import { batchMessages } from '../batch/messages.js';
import { planBatch } from '../batch/plan.js';
import { runJobs } from '../batch/pool.js';
import { ProgressBar } from '../batch/progress.js';
import type { BatchFailure, BatchSettings, JobOutcome, StarResult } from '../batch/types.js';
import { listOption, numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';
import { calibrateCommand, gratingFromArgs, hintFromArgs } from './calibrate.js';
import { expandSpecies } from './velocity.js';

/** The calibration options `batch` shares with `calibrate`. */
const CALIBRATION_OPTION_NAMES = [
  'lamp', 'order', 'range', 'center', 'dispersion', 'hint-accuracy', 'lines-per-mm', 'diffraction-order', 'incidence-deg', 'camera-angle-deg',
  'deviation-deg', 'grating-center', 'focal-length-mm', 'axis-pixel', 'distance-mm', 'zero-order-pixel', 'pixel-size-um', 'tilt-deg', 'reversed',
  'significance', 'saturation',
];

/** The format name of batch.json. */
export const BATCH_FORMAT = 'lineshift-batch';
/** Its version; readers refuse later versions. */
export const BATCH_FORMAT_VERSION = 1;

/** What `lineshift batch` writes to batch.json (and prints with --json). */
export interface BatchReport {
  readonly format: typeof BATCH_FORMAT;
  readonly formatVersion: typeof BATCH_FORMAT_VERSION;
  readonly version: string;
  readonly inputs: readonly string[];
  readonly outDir: string;
  readonly workers: number;
  readonly filesFound: number;
  readonly starsPlanned: number;
  /** One per star exposure that gave a velocity, in time order. */
  readonly results: readonly StarResult[];
  /** Every file that failed, at any stage. */
  readonly failures: readonly BatchFailure[];
  readonly unusedLamps: readonly string[];
  /** Files written besides the per-star ones (relative to the working directory). */
  readonly tables: { readonly csv: string | null; readonly json: string | null };
  readonly wallSeconds: number;
  readonly settings: Omit<BatchSettings, 'outDir' | 'root' | 'cwd'>;
  readonly provenance: readonly ProvenanceEntry[];
}

function workersFrom(args: ParsedArgs): number {
  const n = numberOption(args, 'workers');
  if (n === undefined) return availableParallelism();
  if (!Number.isInteger(n) || n < 1 || n > 256) throw new UsageError('batch.bad-workers', batchMessages.badWorkers(n));
  return n;
}

function settingsFrom(args: ParsedArgs, cwd: string, outDir: string, root: string): BatchSettings {
  const lamp = stringOption(args, 'lamp')!;
  const grating = gratingFromArgs(args, 0);
  const hint = hintFromArgs(args, grating);
  const method = stringOption(args, 'method') ?? 'lines';
  if (method !== 'lines' && method !== 'ccf') throw new UsageError('cli.bad-choice', `--method must be lines or ccf; got "${method}"`);
  const profile = stringOption(args, 'profile');
  if (profile !== undefined && !LINE_PROFILES.includes(profile as LineProfile)) throw new UsageError('cli.bad-choice', `--profile must be ${LINE_PROFILES.join(', ')}; got "${profile}"`);
  const formula = stringOption(args, 'formula');
  if (formula !== undefined && formula !== 'relativistic' && formula !== 'classical') throw new UsageError('cli.bad-choice', `--formula must be relativistic or classical; got "${formula}"`);
  const uncertainty = stringOption(args, 'uncertainty');
  if (uncertainty !== undefined && !['propagated', 'zucker-2003', 'tonry-davis-1979'].includes(uncertainty)) {
    throw new UsageError('cli.bad-choice', `--uncertainty must be propagated, zucker-2003 or tonry-davis-1979; got "${uncertainty}"`);
  }
  const range = listOption(args, 'velocity-range');
  let velocityRangeKmPerS: { min: number; max: number } | undefined;
  if (range) {
    const [min, max] = range.map(Number);
    if (range.length !== 2 || !Number.isFinite(min) || !Number.isFinite(max) || !(max > min)) {
      throw new UsageError('cli.bad-range', `--velocity-range needs MIN,MAX in km/s with MIN < MAX, got "${range.join(',')}"`);
    }
    velocityRangeKmPerS = { min, max };
  }
  const prune = <T extends object>(o: T): T => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
  return prune({
    lamp, order: numberOption(args, 'order'), hint, significance: numberOption(args, 'significance'), saturationAdu: numberOption(args, 'saturation'),
    velocity: prune({
      method, species: expandSpecies(listOption(args, 'species') ?? ['H']), maxLinesPerSpecies: numberOption(args, 'max-lines'),
      profile: profile as LineProfile | undefined, resolvingPower: numberOption(args, 'resolving-power'), velocityRangeKmPerS,
      formula: formula as 'relativistic' | 'classical' | undefined, uncertaintyMethod: uncertainty as BatchSettings['velocity']['uncertaintyMethod'],
    }),
    outDir, root, cwd,
  });
}

/** Removes the temporary files this process left in `dir` (after an interruption). */
export function removeTemporaryFiles(dir: string, pid: number = process.pid): number {
  let removed = 0;
  const mark = `.${pid}.`;
  const walk = (d: string) => {
    let entries;
    try { entries = readdirSync(d, { withFileTypes: true }); } catch { return; }
    for (const e of entries) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name.endsWith('.tmp') && e.name.includes(mark)) {
        rmSync(p, { force: true });
        removed++;
      }
    }
  };
  walk(dir);
  return removed;
}

const fixed = (x: number, d: number) => (Number.isFinite(x) ? x.toFixed(d) : '—');

function describe(report: BatchReport): string {
  const lines = [`batch: ${report.starsPlanned} star exposure${report.starsPlanned === 1 ? '' : 's'} among ${report.filesFound} files, ${report.workers} worker${report.workers === 1 ? '' : 's'}, ${report.wallSeconds.toFixed(1)} s`];
  if (report.results.length) {
    const rows = [['star', 'lamps', 'lamp RMS km/s', 'velocity km/s (barycentric)', 'correction km/s', 'BJD_TDB']];
    for (const r of report.results) {
      const rms = r.lamps.filter((l) => l.ok).map((l) => fixed(l.rmsKmPerS ?? NaN, 2)).join('/');
      rows.push([r.label, r.calibration === 'interpolated' ? `before+after (w ${fixed(r.weightAfter ?? NaN, 2)})` : `${r.calibration} only`, rms,
        `${fixed(r.radialVelocity.value, 3)} ± ${fixed(r.radialVelocity.uncertainty, 3)}`, fixed(r.barycentricCorrectionKmPerS, 3), fixed(r.bjdTdb, 6)]);
    }
    const widths = rows[0].map((_, j) => Math.max(...rows.map((row) => row[j].length)));
    for (const row of rows) lines.push('  ' + row.map((c, j) => c.padEnd(widths[j])).join('  ').trimEnd());
  }
  // The same warning on many stars (e.g. saturated lamp lines every night) is shown once, with the stars it concerns.
  const warned = new Map<string, string[]>();
  for (const r of report.results) for (const w of new Set(r.warnings)) warned.set(w, [...(warned.get(w) ?? []), r.label]);
  for (const [w, labels] of warned) {
    lines.push(`warning: ${w} (${labels.length === report.results.length && labels.length > 1 ? `every star, ${labels.length}` : labels.join(', ')})`);
  }
  if (report.unusedLamps.length) lines.push(`lamp frames not used by any star: ${report.unusedLamps.join(', ')}`);
  if (report.failures.length) {
    lines.push(`failures (${report.failures.length}):`);
    for (const f of report.failures) lines.push(`  ${f.message} [${f.stage}]`);
  }
  if (report.tables.csv) lines.push(`written: ${report.tables.csv}, ${report.tables.json}, ${join(report.outDir, 'batch.json')}; calibrated spectra under ${join(report.outDir, 'spectra')}, solutions under ${join(report.outDir, 'solutions')}`);
  return lines.join('\n') + '\n';
}

export const batchCommand: Command = {
  name: 'batch',
  summary: 'many star exposures at once: calibrate the lamps around each, interpolate, measure and correct the velocities, write the table',
  usage: 'FOLDER_OR_FILE... --lamp NAME --out DIR [hint options as for calibrate] [--method lines|ccf] [--species H,...] [--workers N] [--json]',
  description: `Finds every FITS file under the folders given (or the files given), tells lamps from stars
by IMAGETYP (lamp/arc/comp or object/light; else by "lamp" in the file name), and pairs each
star with the latest lamp before it and the earliest lamp after it in the same folder (by
DATE-OBS and EXPTIME). For each star: calibrates both lamps (as "lineshift calibrate", with
the same hint options), interpolates the two dispersion solutions linearly in time to the
star's mid-exposure (one lamp alone is used with a warning), applies the result, measures
the radial velocity (as "lineshift velocity": --method lines or ccf, --species, with the
calibration's error included) and corrects it to the barycentre (time, target and site from
the header). Writes, under --out: velocities.csv and velocities.json (bjd_tdb,
velocity_km_s, uncertainty_km_s, label; for "lineshift periodogram" and "lineshift orbit"),
batch.json (every result and failure), spectra/.../NAME.fits (calibrated) and
solutions/.../NAME.solution.json, mirroring the input folders. The work is spread over
--workers threads (default: the number of CPU cores); a progress bar is drawn on standard
error when it is a terminal. A file that cannot be read or reduced does not stop the others:
every failure is listed at the end and the exit code is then 1 (all good outputs are still
written). Every output goes through a temporary file and a rename; on Ctrl-C the workers are
stopped, temporary files removed, no table is written, and the exit code is 130.`,
  options: [
    { name: 'out', type: 'string', valueName: 'DIR', description: 'output folder (created if needed)', required: true },
    ...calibrateCommand.options.filter((o) => CALIBRATION_OPTION_NAMES.includes(o.name)).map((o) => (o.name === 'lamp' ? { ...o, required: true } : o.name === 'saturation' ? { ...o, description: `${o.description} (default: each lamp's SATURATE card)` } : o)),
    { name: 'method', type: 'string', valueName: 'lines|ccf', description: 'velocity from individual lines (default) or by cross-correlation with a line-list template' },
    { name: 'species', type: 'list', valueName: 'H,Si II,...', description: 'shipped line lists: elements or spectra (default H)' },
    { name: 'max-lines', type: 'number', valueName: 'N', description: 'strongest lines used per species (default 30)' },
    { name: 'profile', type: 'string', valueName: 'gaussian|lorentzian|voigt', description: 'lines: profile fitted to each line (default gaussian)' },
    { name: 'resolving-power', type: 'number', valueName: 'R', description: 'λ/FWHM of the spectrograph (default: from the lines, or 2.5 pixels per resolution element)' },
    { name: 'velocity-range', type: 'list', valueName: 'MIN,MAX', description: 'velocities searched, km/s (default -500,500)' },
    { name: 'formula', type: 'string', valueName: 'relativistic|classical', description: 'Doppler formula (default relativistic)' },
    { name: 'uncertainty', type: 'string', valueName: 'propagated|zucker-2003|tonry-davis-1979', description: 'ccf: which uncertainty estimate to use (default propagated)' },
    { name: 'workers', type: 'number', valueName: 'N', description: 'worker threads (default: the number of CPU cores; 1 = no threads)' },
  ],
  positionals: { min: 1, max: 100_000, name: 'FOLDER_OR_FILE' },
  async run(args, io) {
    const t0 = performance.now();
    const workers = workersFrom(args);
    const outDir = resolve(io.cwd, stringOption(args, 'out')!);
    const shown = (p: string) => relative(io.cwd, p) || '.';
    // Options are checked before any file is read.
    settingsFrom(args, io.cwd, outDir, io.cwd);
    const plan = planBatch(args.positionals, io.cwd, io.logger, outDir);
    const settings = settingsFrom(args, io.cwd, outDir, plan.root);
    mkdirSync(outDir, { recursive: true });

    const failures: BatchFailure[] = [...plan.failures];
    const results: StarResult[] = [];
    const progress = new ProgressBar(io.stderr, io.isTTY);
    let done = 0;
    progress.update(0, plan.jobs.length, failures.length);
    const run = runJobs(plan.jobs, settings, workers, (o: JobOutcome) => {
      done++;
      if (o.kind === 'result') results.push(o.result);
      else failures.push(o.failure);
      progress.update(done, plan.jobs.length, failures.length);
    });
    const interrupt = () => void run.stop();
    process.once('SIGINT', interrupt);
    process.once('SIGTERM', interrupt);
    let outcome;
    try {
      outcome = await run.done;
    } finally {
      process.removeListener('SIGINT', interrupt);
      process.removeListener('SIGTERM', interrupt);
      progress.clear();
    }
    if (outcome.interrupted) {
      removeTemporaryFiles(outDir);
      io.stderr(`lineshift: ${batchMessages.interrupted(done, plan.jobs.length)}\n`);
      return 130;
    }

    results.sort((a, b) => a.bjdTdb - b.bjdTdb);
    const { outDir: _o, root: _r, cwd: _c, ...settingsShown } = settings;
    void _o, void _r, void _c;
    const provenance = [provenanceEntry('batch', { inputs: args.positionals, stars: results.length, failed: failures.length, workers, ...settingsShown })];
    let tables: BatchReport['tables'] = { csv: null, json: null };
    if (results.length) {
      const table = createVelocityTable({
        bjdTdb: results.map((r) => r.bjdTdb),
        velocityKmPerS: results.map((r) => r.radialVelocity.value),
        uncertaintyKmPerS: results.map((r) => r.radialVelocity.uncertainty),
        label: results.map((r) => r.label),
        provenance,
      });
      const csv = join(outDir, 'velocities.csv');
      const json = join(outDir, 'velocities.json');
      writeVelocityTable(csv, table);
      writeVelocityTable(json, table);
      tables = { csv: shown(csv), json: shown(json) };
    }
    const report: BatchReport = {
      format: BATCH_FORMAT, formatVersion: BATCH_FORMAT_VERSION, version: VERSION, inputs: args.positionals, outDir: shown(outDir), workers,
      filesFound: plan.files, starsPlanned: plan.jobs.length, results, failures, unusedLamps: plan.unusedLamps, tables,
      wallSeconds: (performance.now() - t0) / 1000, settings: settingsShown, provenance,
    };
    writeFileAtomic(join(outDir, 'batch.json'), JSON.stringify(report, null, 1) + '\n');
    io.stdout(args.json ? JSON.stringify(report) + '\n' : describe(report));
    for (const f of failures) io.stderr(`lineshift: ${f.message}\n`);
    if (!results.length) io.stderr(`lineshift: ${batchMessages.noResults()}\n`);
    if (failures.length) io.stderr(`lineshift: ${batchMessages.summaryFailures(failures.length, plan.files)}\n`);
    return failures.length || !results.length ? 1 : 0;
  },
};
