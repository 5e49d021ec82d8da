import { resolve } from 'node:path';
import { UsageError, InputError } from '../../errors.js';
import { readSpectrum } from '../../io/read.js';
import { calibrateLamp } from '../../calibrate/lamp.js';
import { calibrateOnStarLines } from '../../calibrate/star-lines.js';
import { gratingSolution } from '../../calibrate/grating-solution.js';
import type { GratingParameterName, GratingSetup } from '../../calibrate/grating.js';
import type { WavelengthHint } from '../../calibrate/identify.js';
import { writeSolution } from '../../calibrate/solution-json.js';
import { solutionWavelength, type DispersionSolution, type SolutionLine } from '../../calibrate/solution.js';
import type { Header } from '../../spectrum/header.js';
import { readObservation } from '../../velocity/observation.js';
import { mjdUtcOf } from '../../velocity/time.js';
import type { Logger } from '../../logger.js';
import { flagOption, listOption, numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';

/** What `lineshift calibrate --json` prints: the solution's summary (with `rms` in Å as a short name) and its line table. */
export interface CalibrateReport {
  file: string;
  ok: boolean;
  reason: string | null;
  message: string;
  method: string;
  calibratedByLamp: boolean;
  velocityZeroPointMeaningful: boolean;
  order: number;
  /** RMS of the residuals of the lines used, Å (the same as rmsAngstrom). */
  rms: number | null;
  rmsAngstrom: number | null;
  rmsPixels: number | null;
  rmsKmPerS: number | null;
  linesMeasured: number;
  linesIdentified: number;
  linesUsed: number;
  /** Identified lines not used in the solution (sigma-clipped, saturated, blended, fit failed). */
  linesRejected: number;
  /** Of the rejected lines, those removed by sigma clipping. */
  linesClipped: number;
  /** Resolving power λ/FWHM: the median over the lamp lines (null when no line could be measured). */
  resolvingPower: number | null;
  /** Spread (robust standard deviation) of λ/FWHM over the lines, and how many lines. */
  resolvingPowerSpread: number | null;
  resolvingPowerLines: number;
  wavelengthUncertaintyAngstrom: DispersionSolution['wavelengthUncertaintyAngstrom'];
  /** λ at the first and last pixel, Å (null when not ok). */
  wavelengthRangeAngstrom: [number, number] | null;
  warnings: readonly string[];
  out: string | null;
  lines: readonly SolutionLine[];
}

/** The lamp's (or star's) mid-exposure time from its header, or null when the header has none. */
export function headerMidpoint(header: Header, file: string, logger: Logger): { midpointUtc: string; mjdUtc: number } | null {
  try {
    // Only the time is wanted: target and site are given as dummies so that their absence is no error.
    const o = readObservation(header, { target: { raDeg: 0, decDeg: 0 }, latitudeDeg: 0, longitudeDeg: 0, heightM: 0 }, { file, logger });
    return { midpointUtc: o.midpointIso, mjdUtc: mjdUtcOf(o.midpoint) };
  } catch (e) {
    if (e instanceof InputError && e.code === 'observation.missing') return null;
    throw e;
  }
}

const UNCERTAINTY_NAMES: readonly GratingParameterName[] = ['linesPerMm', 'incidenceDeg', 'cameraAngleDeg', 'deviationDeg', 'centerWavelengthAngstrom', 'focalLengthMm', 'distanceMm', 'pixelSizeUm', 'axisPixel', 'zeroOrderPixel', 'tiltDeg'];

/** The grating set-up from the options, or null when none of its options is given. */
export function gratingFromArgs(args: ParsedArgs, pixels: number): GratingSetup | null {
  const lines = numberOption(args, 'lines-per-mm');
  const names = ['diffraction-order', 'incidence-deg', 'camera-angle-deg', 'deviation-deg', 'focal-length-mm', 'pixel-size-um', 'axis-pixel', 'distance-mm', 'zero-order-pixel', 'tilt-deg', 'grating-center'];
  const any = names.some((n) => args.options.has(n));
  if (lines === undefined) {
    if (any) throw new UsageError('cli.missing-option', 'a grating set-up needs --lines-per-mm');
    return null;
  }
  const pixel = numberOption(args, 'pixel-size-um');
  if (pixel === undefined) throw new UsageError('cli.missing-option', 'a grating set-up needs --pixel-size-um');
  const order = numberOption(args, 'diffraction-order') ?? 1;
  const tiltDeg = numberOption(args, 'tilt-deg');
  const pixelDirection = flagOption(args, 'reversed') ? 'decreasing' as const : 'increasing' as const;
  const distance = numberOption(args, 'distance-mm');
  if (distance !== undefined) {
    const zero = numberOption(args, 'zero-order-pixel');
    if (zero === undefined) throw new UsageError('cli.missing-option', 'a transmission grating (--distance-mm) needs --zero-order-pixel');
    return { kind: 'transmission', linesPerMm: lines, order, distanceMm: distance, pixelSizeUm: pixel, zeroOrderPixel: zero, incidenceDeg: numberOption(args, 'incidence-deg') ?? 0, tiltDeg, pixelDirection, pixels };
  }
  const focal = numberOption(args, 'focal-length-mm');
  const incidence = numberOption(args, 'incidence-deg');
  if (focal === undefined || incidence === undefined) throw new UsageError('cli.missing-option', 'a slit spectrograph needs --focal-length-mm and --incidence-deg (or give --distance-mm and --zero-order-pixel for a transmission grating)');
  return {
    kind: 'slit', linesPerMm: lines, order, incidenceDeg: incidence, focalLengthMm: focal, pixelSizeUm: pixel, pixels,
    cameraAngleDeg: numberOption(args, 'camera-angle-deg'), deviationDeg: numberOption(args, 'deviation-deg'), centerWavelengthAngstrom: numberOption(args, 'grating-center'),
    axisPixel: numberOption(args, 'axis-pixel'), tiltDeg, pixelDirection,
  };
}

/** The wavelength hint from the options (--range, --center with --dispersion, or the grating set-up), or undefined. */
export function hintFromArgs(args: ParsedArgs, grating: GratingSetup | null): WavelengthHint | undefined {
  const accuracyAngstrom = numberOption(args, 'hint-accuracy');
  const range = listOption(args, 'range');
  const center = numberOption(args, 'center');
  const dispersion = numberOption(args, 'dispersion');
  const given = [range !== undefined, center !== undefined || dispersion !== undefined, grating !== null].filter(Boolean).length;
  if (given > 1) throw new UsageError('cli.conflicting-options', 'give one hint: --range, or --center with --dispersion, or the grating set-up');
  if (range) {
    const v = range.map(Number);
    if (v.length !== 2 || !v.every(Number.isFinite)) throw new UsageError('cli.bad-range', `--range needs two wavelengths in Å, MIN,MAX, got "${range.join(',')}"`);
    return { kind: 'range', minWavelengthAngstrom: Math.min(v[0], v[1]), maxWavelengthAngstrom: Math.max(v[0], v[1]), reversed: v[0] > v[1], accuracyAngstrom };
  }
  if (center !== undefined || dispersion !== undefined) {
    if (center === undefined || dispersion === undefined) throw new UsageError('cli.missing-option', '--center and --dispersion go together');
    return { kind: 'linear', centerWavelengthAngstrom: center, dispersionAngstromPerPixel: dispersion, accuracyAngstrom };
  }
  if (grating) return { kind: 'grating', setup: grating, accuracyAngstrom };
  if (accuracyAngstrom !== undefined) throw new UsageError('cli.missing-option', '--hint-accuracy needs a hint (--range, --center with --dispersion, or the grating set-up)');
  return undefined;
}

function uncertaintiesFromArgs(args: ParsedArgs): Partial<Record<GratingParameterName, number>> {
  const out: Partial<Record<GratingParameterName, number>> = {};
  for (const item of listOption(args, 'geometry-uncertainty') ?? []) {
    const m = /^([A-Za-z]+)\s*=\s*(.+)$/.exec(item);
    const name = m?.[1] as GratingParameterName | undefined;
    const value = m ? Number(m[2]) : NaN;
    if (!name || !UNCERTAINTY_NAMES.includes(name) || !(value > 0)) {
      throw new UsageError('cli.bad-uncertainty', `--geometry-uncertainty takes NAME=SIGMA items with NAME one of ${UNCERTAINTY_NAMES.join(', ')} and SIGMA > 0, got "${item}"`);
    }
    out[name] = value;
  }
  return out;
}

/** Builds the JSON report of the command. */
export function calibrateReport(s: DispersionSolution, file: string, out: string | null): CalibrateReport {
  const ends = s.ok && s.coefficients.length ? ([s.domain.min, s.domain.max].map((p) => solutionWavelength(s, p)) as [number, number]) : null;
  return {
    file, ok: s.ok, reason: s.reason, message: s.message, method: s.method, calibratedByLamp: s.calibratedByLamp,
    velocityZeroPointMeaningful: s.velocityZeroPointMeaningful, order: s.order,
    rms: s.rmsAngstrom, rmsAngstrom: s.rmsAngstrom, rmsPixels: s.rmsPixels, rmsKmPerS: s.rmsKmPerS,
    linesMeasured: s.linesMeasured, linesIdentified: s.linesIdentified, linesUsed: s.linesUsed, linesRejected: s.linesIdentified - s.linesUsed, linesClipped: s.linesRejected,
    resolvingPower: s.resolvingPower?.median ?? null, resolvingPowerSpread: s.resolvingPower?.spread ?? null, resolvingPowerLines: s.resolvingPower?.lines ?? 0,
    wavelengthUncertaintyAngstrom: s.wavelengthUncertaintyAngstrom,
    wavelengthRangeAngstrom: ends, warnings: s.warnings, out, lines: s.lines,
  };
}

const f = (v: number | null, digits: number) => (v === null ? '—' : v.toFixed(digits));

function describe(r: CalibrateReport): string {
  const out: string[] = [r.file, `  ${r.ok ? 'accepted' : `NOT accepted (${r.reason})`}: ${r.message}`];
  if (r.wavelengthRangeAngstrom) out.push(`  range:            ${r.wavelengthRangeAngstrom[0].toFixed(2)} to ${r.wavelengthRangeAngstrom[1].toFixed(2)} Å (${r.method}${r.calibratedByLamp ? '' : ', not calibrated by a lamp'})`);
  if (r.method !== 'grating-equation') {
    out.push(`  order:            ${r.order}`);
    out.push(`  lines:            ${r.linesMeasured} measured, ${r.linesIdentified} identified, ${r.linesUsed} used, ${r.linesRejected} not used (${r.linesClipped} clipped)`);
    out.push(`  RMS:              ${f(r.rmsAngstrom, 4)} Å = ${f(r.rmsPixels, 4)} pixel = ${f(r.rmsKmPerS, 2)} km/s`);
    if (r.resolvingPower !== null) out.push(`  resolving power:  ${r.resolvingPower.toFixed(0)} ± ${(r.resolvingPowerSpread ?? NaN).toFixed(0)} (λ/FWHM, median and spread of ${r.resolvingPowerLines} lines)`);
  }
  if (r.wavelengthUncertaintyAngstrom) out.push(`  solution error:   ${r.wavelengthUncertaintyAngstrom.middle.toPrecision(2)} Å at the middle, up to ${r.wavelengthUncertaintyAngstrom.max.toPrecision(2)} Å`);
  for (const w of r.warnings) out.push(`  warning: ${w}`);
  if (r.lines.length) {
    out.push('  pixel        ±σ      FWHM    λ list (Å)    residual Å   pixel    km/s   used');
    for (const l of r.lines) {
      out.push(`  ${l.pixel.toFixed(3).padStart(9)} ${f(l.pixelUncertainty, 4).padStart(7)} ${f(l.fwhmPixels, 2).padStart(6)} ${f(l.wavelengthAngstrom, 3).padStart(12)} ${f(l.residualAngstrom, 4).padStart(10)} ${f(l.residualPixels, 3).padStart(7)} ${f(l.residualKmPerS, 2).padStart(7)}   ${l.used ? 'yes' : `no (${l.rejection})`}`);
    }
  }
  if (r.out) out.push(`  written: ${r.out}`);
  return out.join('\n') + '\n';
}

export const calibrateCommand: Command = {
  name: 'calibrate',
  summary: 'wavelength calibration: dispersion solution from a lamp spectrum, a star\'s Balmer lines, or the grating equation',
  usage: 'FILE --lamp NAME[,NAME] [--order N] [--range MIN,MAX | --center Å --dispersion Å_PER_PIXEL | grating options] [--out solution.json] [--json]',
  description: `Finds the lines of a lamp spectrum (FILE, on a pixel axis), identifies them against the
lamp's line list (air wavelengths, Å) with a rough hint or blind, and fits a Chebyshev
dispersion polynomial with sigma clipping. Prints the RMS in Å, pixels and km/s, the
lines used and rejected with their residuals, and the resolving power λ/FWHM. A solution
that fails the acceptance tests is reported as NOT accepted, with the reason, and the
exit code is 1. Hints: --range MIN,MAX (λ at the first and last pixel; MAX,MIN when λ
falls with the pixel), --center and --dispersion, or the grating set-up: --lines-per-mm,
--diffraction-order, --pixel-size-um and, for a slit spectrograph, --incidence-deg,
--focal-length-mm and one of --camera-angle-deg, --deviation-deg or --grating-center;
for a transmission grating in front of a camera, --distance-mm and --zero-order-pixel.
--star-lines calibrates FILE (a star) on its own Balmer lines instead (its radial
velocity then sits in the zero point). --grating-only writes the grating equation's
approximate solution for FILE's pixel count, without a lamp. Lamp times (DATE-OBS,
EXPTIME) are kept in the solution for "lineshift apply --after".`,
  options: [
    { name: 'lamp', type: 'string', valueName: 'NAME', description: 'lamp gases: neon, argon, mercury, helium, krypton, xenon, hydrogen, or a combination like neon,argon' },
    { name: 'order', type: 'number', valueName: 'N', description: 'polynomial order 1–5 (default 3; 2 with --star-lines)' },
    { name: 'range', type: 'list', valueName: 'MIN,MAX', description: 'hint: approximate wavelengths (Å) at the first and last pixel' },
    { name: 'center', type: 'number', valueName: 'Å', description: 'hint: approximate wavelength at the middle pixel (with --dispersion)' },
    { name: 'dispersion', type: 'number', valueName: 'Å_PER_PIXEL', description: 'hint: approximate dispersion (negative when λ falls with the pixel)' },
    { name: 'hint-accuracy', type: 'number', valueName: 'Å', description: 'how far the true scale may be from the hint (default 5 % of the hinted span)' },
    { name: 'lines-per-mm', type: 'number', valueName: 'N', description: 'grating groove density' },
    { name: 'diffraction-order', type: 'number', valueName: 'M', description: 'diffraction order (default 1)' },
    { name: 'incidence-deg', type: 'number', valueName: 'DEG', description: 'angle of incidence on the grating, degrees from its normal' },
    { name: 'camera-angle-deg', type: 'number', valueName: 'DEG', description: 'slit spectrograph: diffraction angle of the camera axis' },
    { name: 'deviation-deg', type: 'number', valueName: 'DEG', description: 'slit spectrograph: angle between collimator and camera axes (0 = Littrow)' },
    { name: 'grating-center', type: 'number', valueName: 'Å', description: 'slit spectrograph: wavelength on the camera axis (sets the camera angle)' },
    { name: 'focal-length-mm', type: 'number', valueName: 'MM', description: 'slit spectrograph: camera focal length' },
    { name: 'axis-pixel', type: 'number', valueName: 'PIXEL', description: 'slit spectrograph: pixel on the camera axis (default the middle)' },
    { name: 'distance-mm', type: 'number', valueName: 'MM', description: 'transmission grating: grating-to-sensor distance' },
    { name: 'zero-order-pixel', type: 'number', valueName: 'PIXEL', description: 'transmission grating: pixel of the zero-order image' },
    { name: 'pixel-size-um', type: 'number', valueName: 'UM', description: 'pixel size along the dispersion, micrometres' },
    { name: 'tilt-deg', type: 'number', valueName: 'DEG', description: 'sensor tilt (default 0)' },
    { name: 'reversed', type: 'boolean', description: 'the sensor is read against the direction of increasing diffraction angle' },
    { name: 'geometry-uncertainty', type: 'list', valueName: 'NAME=SIGMA,...', description: 'with --grating-only: 1-σ of set-up values, e.g. distanceMm=0.5,zeroOrderPixel=2' },
    { name: 'star-lines', type: 'boolean', description: "calibrate on the star's own Balmer lines (no lamp)" },
    { name: 'grating-only', type: 'boolean', description: 'approximate solution from the grating set-up alone (no lamp)' },
    { name: 'significance', type: 'number', valueName: 'SIGMA', description: 'line detection threshold in σ (default 8)' },
    { name: 'saturation', type: 'number', valueName: 'ADU', description: 'flux at which the camera saturates (flat-topped lines are flagged anyway)' },
    { name: 'out', type: 'string', valueName: 'FILE.json', description: 'write the solution (JSON) here' },
  ],
  positionals: { min: 1, max: 1, name: 'FILE' },
  async run(args, io) {
    const file = args.positionals[0];
    const spectrum = readSpectrum(resolve(io.cwd, file), { logger: io.logger });
    const pixels = spectrum.flux.length;
    const grating = gratingFromArgs(args, pixels);
    const starLines = flagOption(args, 'star-lines');
    const gratingOnly = flagOption(args, 'grating-only');
    const lamp = stringOption(args, 'lamp');
    if (starLines && gratingOnly) throw new UsageError('cli.conflicting-options', '--star-lines and --grating-only exclude each other');
    const order = numberOption(args, 'order');
    let solution: DispersionSolution;
    if (gratingOnly) {
      if (!grating) throw new UsageError('cli.missing-option', '--grating-only needs the grating set-up (--lines-per-mm, --pixel-size-um, ...)');
      solution = gratingSolution(grating, pixels, uncertaintiesFromArgs(args));
    } else {
      if (args.options.has('geometry-uncertainty')) throw new UsageError('cli.conflicting-options', '--geometry-uncertainty applies to --grating-only');
      const hint = hintFromArgs(args, grating);
      const significance = numberOption(args, 'significance');
      if (starLines) {
        solution = calibrateOnStarLines(spectrum, { hint, order, significance });
      } else {
        if (!lamp) throw new UsageError('cli.missing-option', '"lineshift calibrate" needs --lamp NAME (or --star-lines, or --grating-only)');
        solution = calibrateLamp(spectrum, {
          lamp, order, hint,
          lines: { significance, saturationLevel: numberOption(args, 'saturation') },
          observation: headerMidpoint(spectrum.header, file, io.logger),
        });
      }
    }
    const out = stringOption(args, 'out');
    if (out !== undefined) writeSolution(resolve(io.cwd, out), solution, [resolve(io.cwd, file)]);
    const report = calibrateReport(solution, file, out ?? null);
    io.stdout(args.json ? JSON.stringify(report) + '\n' : describe(report));
    if (!solution.ok) io.stderr(`lineshift: ${file}: ${solution.message}\n`);
    return solution.ok ? 0 : 1;
  },
};
