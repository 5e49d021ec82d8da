/**
 * The reduction of one star exposure, as a batch worker runs it: calibrate the lamps
 * before and after the star, interpolate their dispersion solutions to the star's
 * mid-exposure, apply the result, measure the velocity (lines or cross-correlation, with
 * the calibration's error), and correct it to the solar-system barycentre. Every output is
 * written through a temporary file and a rename.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { applySolution, interpolateSolutions } from '../../calibrate/apply.js';
import type { WavelengthHint } from '../../calibrate/identify.js';
import { calibrateLamp } from '../../calibrate/lamp.js';
import { writeSolution } from '../../calibrate/solution-json.js';
import { solutionWavelength, type DispersionSolution } from '../../calibrate/solution.js';
import { InputError } from '../../errors.js';
import { writeFitsSpectrum } from '../../io/fits/write.js';
import { parseSpectrum } from '../../io/read.js';
import { lineListTemplate } from '../../lines/synthetic.js';
import { collectingLogger } from '../../logger.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../velocity/constants.js';
import { crossCorrelationVelocity } from '../../velocity/ccf.js';
import type { WavelengthCalibrationError } from '../../velocity/calibration-error.js';
import { applyVelocityCorrection } from '../../velocity/doppler.js';
import { velocityFromLines } from '../../velocity/lines.js';
import { barycentricCorrectionFromHeader } from '../../velocity/observation.js';
import { headerMidpoint } from '../commands/calibrate.js';
import { batchMessages } from './messages.js';
import { asFailure } from './plan.js';
import type { BatchSettings, JobOutcome, LampOutcome, Measured, StarJob } from './types.js';

/** Output file names of a star exposure and its lamps, below the output folder. */
export function outputPaths(settings: BatchSettings, input: string): { spectrum: string; solution: string } {
  const rel = relative(settings.root, input).replace(/\.(fits|fit|fts)$/i, '');
  return {
    spectrum: join(settings.outDir, 'spectra', `${rel}.fits`),
    solution: join(settings.outDir, 'solutions', `${rel}.solution.json`),
  };
}

function read(path: string, shown: string, logger: ReturnType<typeof collectingLogger>): Spectrum {
  return parseSpectrum(new Uint8Array(readFileSync(path)), shown, { logger });
}

function hintFor(hint: WavelengthHint | undefined, pixels: number): WavelengthHint | undefined {
  if (!hint || hint.kind !== 'grating') return hint;
  return { ...hint, setup: { ...hint.setup, pixels } };
}

/**
 * The calibration error of the solution applied, as the velocity functions take it:
 * c·σ/λ with σ² = Σ wᵢ² rmsᵢ² p/Nᵢ over the lamps (weights 1 − w and w of an interpolation,
 * 1 for a single lamp; the zero-point error of a least-squares solution, see
 * DEVELOPERS.md "Velocities"), expressed as an equivalent { rms, lines, coefficients }.
 */
function calibrationError(parts: readonly { solution: DispersionSolution; weight: number }[]): { error: WavelengthCalibrationError; sigmaAngstrom: number } | undefined {
  let variance = 0;
  let lines = 0;
  let coefficients = 1;
  for (const { solution, weight } of parts) {
    if (solution.rmsAngstrom === null || solution.linesUsed < 1) return undefined;
    const p = solution.order + 1;
    variance += weight * weight * solution.rmsAngstrom ** 2 * (p / solution.linesUsed);
    lines = Math.max(lines, solution.linesUsed);
    coefficients = Math.max(coefficients, p);
  }
  const sigma = Math.sqrt(variance);
  if (!(lines >= coefficients)) return undefined;
  return { error: { rmsAngstrom: sigma * Math.sqrt(lines / coefficients), lineCount: lines, coefficients }, sigmaAngstrom: sigma };
}

/**
 * Reduces one star exposure (see the module notes). Never throws: a problem becomes a
 * failure record; outputs made before the problem stay written.
 *
 * @param job the star and its lamps (absolute paths).
 * @param settings the batch settings.
 * @returns the result, or the failure.
 */
export function processStar(job: StarJob, settings: BatchSettings): JobOutcome {
  const t0 = performance.now();
  const shown = (p: string) => relative(settings.cwd, p) || p;
  const file = shown(job.star);
  const logger = collectingLogger();
  let stage: 'read' | 'calibrate' | 'velocity' | 'write' = 'read';
  try {
    const star = read(job.star, file, logger);
    const starTime = headerMidpoint(star.header, file, logger);
    if (!starTime) throw new InputError('batch.no-time', batchMessages.noTime(file, 'star'));

    // Lamps: calibrate each; keep the accepted ones.
    stage = 'calibrate';
    const lamps: LampOutcome[] = [];
    const accepted: { role: 'before' | 'after'; solution: DispersionSolution }[] = [];
    for (const [role, path] of [['before', job.lampBefore], ['after', job.lampAfter]] as const) {
      if (!path) continue;
      const lampFile = shown(path);
      const lamp = read(path, lampFile, logger);
      const saturationLevel = settings.saturationAdu ?? lamp.header.number('SATURATE');
      const solution = calibrateLamp(lamp, {
        lamp: settings.lamp,
        order: settings.order,
        hint: hintFor(settings.hint, lamp.flux.length),
        lines: { significance: settings.significance, saturationLevel },
        observation: headerMidpoint(lamp.header, lampFile, logger),
      });
      let solutionFile: string | null = null;
      const out = outputPaths(settings, path).solution;
      mkdirSync(dirname(out), { recursive: true });
      writeSolution(out, solution, [path, job.star]);
      solutionFile = shown(out);
      lamps.push({
        file: lampFile, role, ok: solution.ok, reason: solution.reason, message: solution.message, order: solution.order,
        rmsAngstrom: solution.rmsAngstrom, rmsKmPerS: solution.rmsKmPerS, linesMeasured: solution.linesMeasured, linesUsed: solution.linesUsed,
        midpointUtc: solution.observation?.midpointUtc ?? null, solutionFile,
      });
      if (solution.ok) accepted.push({ role, solution });
    }
    if (accepted.length === 0) {
      throw new InputError('batch.no-accepted-lamp', batchMessages.noAcceptedLamp(file, lamps.map((l) => batchMessages.lampNotAccepted(l.file, l.reason, l.message))));
    }
    let solution: DispersionSolution;
    let weightAfter: number | null = null;
    let parts: { solution: DispersionSolution; weight: number }[];
    if (accepted.length === 2) {
      const [before, after] = [accepted[0].solution, accepted[1].solution];
      solution = interpolateSolutions(before, after, starTime.mjdUtc, logger);
      const w = (starTime.mjdUtc - before.observation!.mjdUtc) / (after.observation!.mjdUtc - before.observation!.mjdUtc);
      weightAfter = w;
      parts = [{ solution: before, weight: 1 - w }, { solution: after, weight: w }];
    } else {
      solution = accepted[0].solution;
      parts = [{ solution, weight: 1 }];
      logger.warn({ code: 'batch.one-lamp', message: batchMessages.oneLampOnly(accepted[0].role) });
    }
    const calibrated = applySolution(star, solution, { logger });
    stage = 'write';
    const spectrumOut = outputPaths(settings, job.star).spectrum;
    mkdirSync(dirname(spectrumOut), { recursive: true });
    writeFitsSpectrum(spectrumOut, calibrated, { logger });

    // Velocity in the observer's frame, then barycentric.
    stage = 'velocity';
    const correction = barycentricCorrectionFromHeader(star.header, {}, { file, logger });
    const calib = calibrationError(parts);
    const middle = solutionWavelength(solution, (solution.domain.min + solution.domain.max) / 2);
    const v = settings.velocity;
    let measured: Measured;
    let converged: boolean;
    let why: string;
    let detail: Record<string, number | string | null>;
    const formula = v.formula ?? 'relativistic';
    if (v.method === 'lines') {
      const r = velocityFromLines(calibrated, {
        species: v.species, maxLinesPerSpecies: v.maxLinesPerSpecies, resolvingPower: v.resolvingPower, profile: v.profile,
        velocityRangeKmPerS: v.velocityRangeKmPerS, formula, calibration: calib?.error, logger,
      });
      measured = r.velocity;
      converged = r.converged;
      why = r.message;
      detail = { linesUsed: r.linesUsed, linesRejected: r.linesRejected, reducedChiSquare: Number.isFinite(r.reducedChiSquare) ? r.reducedChiSquare : null, statisticalUncertaintyKmPerS: r.statisticalUncertaintyKmPerS };
    } else {
      const w = calibrated.wavelength;
      const lo = Math.min(w[0], w[w.length - 1]);
      const hi = Math.max(w[0], w[w.length - 1]);
      const R = v.resolvingPower ?? (0.5 * (lo + hi)) / (2.5 * ((hi - lo) / (w.length - 1)));
      const template = lineListTemplate({ species: v.species, maxLinesPerSpecies: v.maxLinesPerSpecies, startAngstrom: lo, endAngstrom: hi, medium: calibrated.medium ?? 'air', resolvingPower: R });
      const r = crossCorrelationVelocity(calibrated, template, { velocityRangeKmPerS: v.velocityRangeKmPerS, formula, uncertaintyMethod: v.uncertaintyMethod, calibration: calib?.error });
      measured = r.velocity;
      converged = r.converged;
      why = r.message;
      detail = { peakHeight: r.peak.height, peakFwhmKmPerS: r.peak.fwhmKmPerS, templateResolvingPower: R };
    }
    if (!converged) throw new InputError('batch.no-velocity', batchMessages.noVelocity(file, why));
    const bc = correction.barycentricCorrectionKmPerS;
    const h = Math.max(1e-6, measured.uncertainty);
    const slope = (applyVelocityCorrection(measured.value + h, bc, { formula }) - applyVelocityCorrection(measured.value - h, bc, { formula })) / (2 * h);
    const radial: Measured = { value: applyVelocityCorrection(measured.value, bc, { formula }), uncertainty: Math.abs(slope) * measured.uncertainty };
    return {
      kind: 'result',
      result: {
        index: job.index, file, label: job.label, object: star.header.string('OBJECT') ?? null, lamps,
        calibration: accepted.length === 2 ? 'interpolated' : accepted[0].role, weightAfter,
        calibrationUncertaintyKmPerS: calib ? (SPEED_OF_LIGHT_KM_PER_S * calib.sigmaAngstrom) / middle : 0,
        calibratedFile: shown(spectrumOut),
        midpointUtc: correction.midpoint, bjdTdb: correction.bjdTdb, barycentricCorrectionKmPerS: bc,
        method: v.method, measuredVelocity: { value: measured.value, uncertainty: measured.uncertainty }, radialVelocity: radial,
        detail, warnings: logger.warnings.map((w) => w.message), milliseconds: performance.now() - t0,
      },
    };
  } catch (e) {
    return { kind: 'failure', failure: asFailure(e, file, stage), milliseconds: performance.now() - t0 };
  }
}
