/**
 * The demo pipeline: every step through the command-line tool, on the invented demo data.
 *
 *  1. calibrate one night's lamp (its residual plot goes into the report);
 *  2. batch: every night of LVAC-7 — lamps before and after each star, interpolation,
 *     velocities, barycentric correction, the season's table (the damaged file is reported);
 *  3. fit one line and cross-correlate one night (plots);
 *  4. periodogram and orbit of the season's table;
 *  5. LVAC-12: calibrate its lamp, apply, measure its velocity, identify its elements;
 *  6. compare everything with the truth it was generated from.
 */
import { existsSync, mkdirSync, readdirSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { DemoTruth, Scenario } from '../../data/demo/generate.js';
import { readSolution } from '../../src/calibrate/solution-json.js';
import { solutionWavelengths } from '../../src/calibrate/solution.js';
import type { ApplyReport } from '../../src/cli/commands/apply.js';
import type { BatchReport } from '../../src/cli/commands/batch.js';
import type { CalibrateReport } from '../../src/cli/commands/calibrate.js';
import type { ElementsReport } from '../../src/cli/commands/elements.js';
import type { FitReport } from '../../src/cli/commands/fit.js';
import type { VelocityReport } from '../../src/cli/commands/velocity.js';
import { readSpectrum } from '../../src/io/read.js';
import { loadLineList } from '../../src/lines/linelist.js';
import { shiftWavelength } from '../../src/velocity/doppler.js';
import { DemoStepError, runStep, type StepRecord } from './cli.js';
import { compareWithTruth, type DemoComparison, type OrbitJson, type PeriodogramJson } from './compare.js';
import { DATA, REPO, scenario as readScenario, truth as readTruth } from './paths.js';

/** Options of {@link runDemo}. */
export interface DemoOptions {
  /** Output folder relative to the repository (default `out/demo`). */
  readonly outDir?: string;
  /** Worker threads for the batch (default: the tool's default, the number of cores). */
  readonly workers?: number;
  /** Receives one line per step for the terminal (default: none). */
  readonly log?: (line: string) => void;
  /** Let the batch's own messages (progress bar, failures) through to this terminal (default true); tests turn it off. */
  readonly showToolMessages?: boolean;
}

/** Everything the demo made, for the report and the checks. */
export interface DemoRun {
  readonly outDir: string;
  readonly scenario: Scenario;
  readonly truth: DemoTruth;
  readonly steps: readonly StepRecord[];
  /** The night shown in detail (calibration, line fit, CCF). */
  readonly night: string;
  readonly calibration: CalibrateReport;
  readonly calibrationSolutionFile: string;
  readonly batch: BatchReport;
  readonly lineFit: FitReport;
  /** The line fitted: species and rest wavelength (Å, air). */
  readonly lineFitLine: { readonly species: string; readonly restAngstrom: number };
  readonly ccf: VelocityReport;
  readonly periodogram: PeriodogramJson;
  readonly orbit: OrbitJson;
  readonly lvac12: {
    readonly calibration: CalibrateReport;
    readonly solutionFile: string;
    readonly apply: ApplyReport;
    readonly velocity: VelocityReport;
    readonly elements: ElementsReport;
  };
  readonly comparison: DemoComparison;
  /** The files the batch could not use, and whether they are exactly the deliberately damaged one. */
  readonly expectedFailureOnly: boolean;
  readonly wallSeconds: number;
}

/** The grating options of a set-up, as `lineshift calibrate` and `lineshift batch` take them. */
function gratingArgs(s: { linesPerMm: number; order: number; incidenceDeg: number; centralWavelengthAngstrom: number; focalLengthMm: number; pixelSizeUm: number }): string[] {
  return [
    '--lines-per-mm', String(s.linesPerMm), '--diffraction-order', String(s.order), '--incidence-deg', String(s.incidenceDeg),
    '--grating-center', String(s.centralWavelengthAngstrom), '--focal-length-mm', String(s.focalLengthMm), '--pixel-size-um', String(s.pixelSizeUm),
  ];
}

/** Removes a previous demo output (only a folder that looks like one: empty, or holding results.json or steps/). */
function clearOutput(dir: string): void {
  const abs = join(REPO, dir);
  if (!existsSync(abs)) return;
  const entries = readdirSync(abs);
  if (entries.length && !entries.includes('results.json') && !entries.includes('steps')) {
    throw new DemoStepError(`${dir} exists and does not look like a demo output (no results.json or steps/); give another --out or remove it`);
  }
  rmSync(abs, { recursive: true, force: true });
}

/** The velocity species of LVAC-7 (an A-type star): Balmer, Si II and Fe II lines. */
export const LVAC7_SPECIES = 'H,Si II,Fe II';

/**
 * Runs the demo (see the module notes) and compares the results with the truth.
 *
 * @throws {DemoStepError} when a step fails unexpectedly (a failure other than the damaged file).
 */
export async function runDemo(options: DemoOptions = {}): Promise<DemoRun> {
  const t0 = performance.now();
  const out = options.outDir ?? 'out/demo';
  const log = options.log ?? (() => {});
  const sc = readScenario();
  const truth = readTruth();
  clearOutput(out);
  mkdirSync(join(REPO, out, 'steps'), { recursive: true });
  const stepsDir = join(out, 'steps');
  const steps: StepRecord[] = [];
  let n = 0;
  const step = async <T>(name: string, purpose: string, args: string[], opts: Parameters<typeof runStep>[4] = {}) => {
    n++;
    const label = `${String(n).padStart(2, '0')}-${name}`;
    log(`▸ [${n}] ${purpose}\n    lineshift ${args.join(' ')} --json`);
    const r = await runStep<T>(name, purpose, args, stepsDir, { saveAs: `${label}.json`, ...opts });
    steps.push(r.record);
    log(`    done in ${r.record.seconds.toFixed(1)} s`);
    return r.json;
  };

  const ins = sc.instrument;
  const grating7 = gratingArgs(ins);
  const good = truth.exposures.filter((e) => !e.damaged);
  const night = good[0].night;
  const nightDir = `${DATA}/lvac7/${night}`;

  // 1. One night's lamp, calibrated on its own, for the residual plot.
  const calibrationSolutionFile = `${out}/lvac7-${night}/lamp-before.solution.json`;
  mkdirSync(join(REPO, out, `lvac7-${night}`), { recursive: true });
  const calibration = await step<CalibrateReport>('calibrate-lamp', `Wavelength calibration of the neon-argon lamp taken before LVAC-7 on ${night}`, [
    'calibrate', `${nightDir}/lamp-before.fits`, '--lamp', sc.lamp.lamp, ...grating7, '--saturation', String(ins.saturationAdu), '--out', calibrationSolutionFile,
  ]);

  // 2. The whole season in one batch; the deliberately damaged file makes the exit code 1.
  const batch = await step<BatchReport>('batch', 'Every night of LVAC-7: lamps before and after each star, interpolated solutions, velocities, barycentric correction, the season\'s table', [
    'batch', `${DATA}/lvac7`, '--out', `${out}/lvac7`, '--lamp', sc.lamp.lamp, ...grating7, '--species', LVAC7_SPECIES, '--profile', 'voigt',
    ...(options.workers ? ['--workers', String(options.workers)] : []),
  ], { okExitCodes: [0, 1], showStderr: options.showToolMessages ?? true });
  const damaged = `${DATA}/${truth.damagedFile.file}`;
  const expectedFailureOnly = batch.failures.length === 1 && batch.failures[0].file === damaged;
  if (!expectedFailureOnly) {
    throw new DemoStepError(`the batch reported unexpected failures: ${batch.failures.map((f) => f.message).join('; ') || 'none (the damaged file should have failed)'}`);
  }
  log(`    (expected: ${damaged} is deliberately truncated, see ${DATA}/README.md; every other night was reduced)`);

  // 3. A line fit and a cross-correlation on the night shown in detail.
  const result = batch.results.find((r) => r.label === `${night}/star.fits`)!;
  const starFile = result.calibratedFile;
  const siII = loadLineList('Si II').entries.find((e) => Math.abs(e.wavelengthAngstrom - 6347.1) < 0.1)!;
  const centre = shiftWavelength(siII.wavelengthAngstrom, result.measuredVelocity.value);
  const lineFit = await step<FitReport>('fit-line', `Profile fit of the Si II ${siII.wavelengthAngstrom.toFixed(2)} Å line of LVAC-7 on ${night}`, [
    'fit', starFile, '--center', centre.toFixed(2),
  ]);
  const ccf = await step<VelocityReport>('cross-correlate', `Velocity of LVAC-7 on ${night} by cross-correlation (for comparison with the line method of the batch)`, [
    'velocity', starFile, '--method', 'ccf', '--species', LVAC7_SPECIES,
  ]);

  // 4. Period and orbit from the season's table.
  const table = `${out}/lvac7/velocities.csv`;
  const periodogram = await step<PeriodogramJson>('periodogram', 'Period search in the season\'s velocities (generalised Lomb-Scargle, Baluev false-alarm probability)', ['periodogram', table]);
  const orbit = await step<OrbitJson>('orbit', 'Keplerian orbit fitted to the season\'s velocities', ['orbit', table]);

  // 5. LVAC-12: calibrate, apply, velocity, elements.
  const id = sc.identificationStar;
  const l12 = truth.lvac12.files;
  const l12Solution = `${out}/lvac12/lamp.solution.json`;
  mkdirSync(join(REPO, out, 'lvac12'), { recursive: true });
  const l12cal = await step<CalibrateReport>('calibrate-lvac12-lamp', 'Wavelength calibration of the mercury-neon-argon lamp taken with LVAC-12 (low-resolution set-up)', [
    'calibrate', `${DATA}/${l12.lamp}`, '--lamp', id.lamp.lamp, ...gratingArgs(id.instrument), '--saturation', String(ins.saturationAdu), '--out', l12Solution,
  ]);
  const l12Spectrum = `${out}/lvac12/star-calibrated.fits`;
  const l12apply = await step<ApplyReport>('apply-lvac12', 'The lamp\'s dispersion solution applied to LVAC-12', ['apply', `${DATA}/${l12.star}`, '--solution', l12Solution, '--out', l12Spectrum]);
  const calibArgs = ['--calibration-rms', l12cal.rmsAngstrom!.toPrecision(4), '--calibration-lines', String(l12cal.linesUsed), '--calibration-terms', String(l12cal.order + 1)];
  const l12velocity = await step<VelocityReport>('velocity-lvac12', 'Velocity of LVAC-12 from its Balmer lines (to place the line lists for identification)', [
    'velocity', l12Spectrum, '--species', 'H', '--profile', 'voigt', ...calibArgs,
  ]);
  const elements = await step<ElementsReport>('elements-lvac12', 'Which elements LVAC-12 shows: its lines against every shipped line list', [
    'elements', l12Spectrum, '--velocity', l12velocity.measuredVelocity.value.toFixed(2), '--calibration-rms', l12cal.rmsAngstrom!.toPrecision(4),
  ]);

  // 6. The truth.
  const solution = readSolution(join(REPO, calibrationSolutionFile));
  const pixels = Float64Array.from({ length: solution.pixels ?? 0 }, (_, i) => i);
  const comparison = compareWithTruth({
    scenario: sc, truth, batch, orbit, lvac12Velocity: l12velocity, elements,
    lvac12Wavelengths: readSpectrum(resolve(REPO, l12Spectrum)).wavelength,
    calibration: { night, file: `${nightDir}/lamp-before.fits`, wavelengthAngstrom: solutionWavelengths(solution, pixels), statedMaxAngstrom: solution.wavelengthUncertaintyAngstrom?.max ?? NaN },
  });
  return {
    outDir: out, scenario: sc, truth, steps, night, calibration, calibrationSolutionFile, batch, lineFit,
    lineFitLine: { species: 'Si II', restAngstrom: siII.wavelengthAngstrom }, ccf, periodogram, orbit,
    lvac12: { calibration: l12cal, solutionFile: l12Solution, apply: l12apply, velocity: l12velocity, elements },
    comparison, expectedFailureOnly, wallSeconds: (performance.now() - t0) / 1000,
  };
}
