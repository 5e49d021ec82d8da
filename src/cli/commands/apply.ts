import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { writeFitsSpectrum } from '../../io/fits/write.js';
import { readSpectrum } from '../../io/read.js';
import { writeTextSpectrum } from '../../io/text/write.js';
import { applySolution, interpolateSolutions } from '../../calibrate/apply.js';
import { readSolution } from '../../calibrate/solution-json.js';
import { mjdUtcOf, parseUtcTime } from '../../velocity/time.js';
import { stringOption, type Command } from '../command.js';
import { headerMidpoint } from './calibrate.js';

/** What `lineshift apply --json` prints. */
export interface ApplyReport {
  file: string;
  out: string;
  solution: string;
  after: string | null;
  method: string;
  calibratedByLamp: boolean;
  velocityZeroPointMeaningful: boolean;
  /** Weight of the second solution when interpolating (0 = the first only), else null. */
  weightAfter: number | null;
  /** Star mid-exposure time used for interpolation (UTC), else null. */
  midpointUtc: string | null;
  wavelengthFirstAngstrom: number;
  wavelengthLastAngstrom: number;
  medium: 'air' | 'vacuum';
}

export const applyCommand: Command = {
  name: 'apply',
  summary: 'put a wavelength scale on a spectrum from a dispersion solution (or two, interpolated in time)',
  usage: 'SPECTRUM --solution solution.json [--after solution2.json] [--time ISO] --out calibrated.fits [--json]',
  description: `Applies a dispersion solution (written by "lineshift calibrate --out") to SPECTRUM, which
must be on the same pixel grid as the lamp frame. With --after, the two solutions (lamp
exposures before and after the star) are interpolated linearly in time to the star's
mid-exposure (from its DATE-OBS and EXPTIME, or --time ISO given as the mid-point, UTC).
Wavelengths are in Å, in air (the line lists' medium). The output is FITS (a linear or
log-linear WCS when the axis is one within 10⁻⁶ pixel, else a wavelength column) unless
its name ends in .csv, .txt, .tsv or .dat (text). The input is never overwritten; the
output is written to a temporary name and renamed.`,
  options: [
    { name: 'solution', type: 'string', valueName: 'FILE.json', description: 'the dispersion solution (of the lamp before the star when --after is given)', required: true },
    { name: 'after', type: 'string', valueName: 'FILE.json', description: 'solution of a lamp exposure after the star: interpolate in time' },
    { name: 'time', type: 'string', valueName: 'ISO', description: "the star's mid-exposure, UTC (default from its header)" },
    { name: 'out', type: 'string', valueName: 'FILE', description: 'output spectrum (.fits, or .csv/.txt for text)', required: true },
  ],
  positionals: { min: 1, max: 1, name: 'SPECTRUM' },
  async run(args, io) {
    const file = args.positionals[0];
    const solutionFile = stringOption(args, 'solution')!;
    const afterFile = stringOption(args, 'after');
    const out = stringOption(args, 'out')!;
    const abs = (p: string) => resolve(io.cwd, p);
    const inputs = [file, solutionFile, ...(afterFile ? [afterFile] : [])].map(abs);
    if (inputs.includes(abs(out))) throw new UsageError('apply.overwrite-input', `--out ${out} is one of the inputs; lineshift never overwrites its input, so write to another file`);
    const spectrum = readSpectrum(abs(file), { logger: io.logger });
    let solution = readSolution(abs(solutionFile));
    let weightAfter: number | null = null;
    let midpointUtc: string | null = null;
    const time = stringOption(args, 'time');
    if (time !== undefined && !afterFile) throw new UsageError('cli.conflicting-options', '--time is used only with --after (to interpolate between two solutions)');
    if (afterFile) {
      const after = readSolution(abs(afterFile));
      let mjd: number;
      if (time !== undefined) {
        const t = parseUtcTime(time, { keyword: '--time' });
        mjd = mjdUtcOf(t);
        midpointUtc = time;
      } else {
        const m = headerMidpoint(spectrum.header, file, io.logger);
        if (!m) throw new UsageError('apply.no-time', `${file} has no DATE-OBS (or DATE-AVG, MJD-OBS ...) to place it between the two lamp exposures; give its mid-exposure with --time ISO`);
        mjd = m.mjdUtc;
        midpointUtc = m.midpointUtc;
      }
      solution = interpolateSolutions(solution, after, mjd, io.logger);
      const t1 = solution.provenance.at(-1)?.parameters.weight;
      weightAfter = typeof t1 === 'number' ? t1 : null;
    }
    const calibrated = applySolution(spectrum, solution, { solutionFile, logger: io.logger });
    if (/\.(csv|txt|tsv|dat)$/i.test(out)) writeTextSpectrum(abs(out), calibrated);
    else writeFitsSpectrum(abs(out), calibrated, { logger: io.logger });
    const n = calibrated.wavelength.length;
    const report: ApplyReport = {
      file, out, solution: solutionFile, after: afterFile ?? null, method: solution.method,
      calibratedByLamp: solution.calibratedByLamp, velocityZeroPointMeaningful: solution.velocityZeroPointMeaningful,
      weightAfter, midpointUtc,
      wavelengthFirstAngstrom: calibrated.wavelength[0], wavelengthLastAngstrom: calibrated.wavelength[n - 1], medium: solution.medium,
    };
    io.stdout(args.json ? JSON.stringify(report) + '\n' : [
      `${file} → ${out}`,
      `  wavelengths: ${report.wavelengthFirstAngstrom.toFixed(3)} to ${report.wavelengthLastAngstrom.toFixed(3)} Å (${report.medium})`,
      `  solution:    ${solutionFile}${afterFile ? ` and ${afterFile}, interpolated to ${midpointUtc} (weight ${weightAfter?.toFixed(3)} on the second)` : ''} (${solution.method}${solution.calibratedByLamp ? '' : ', not calibrated by a lamp'})`,
      ...solution.warnings.map((w) => `  warning: ${w}`),
    ].join('\n') + '\n');
    return 0;
  },
};
