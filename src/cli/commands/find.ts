import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { findLines, type FindLinesOptions, type FindLinesResult } from '../../lines/find.js';
import { readSpectrum } from '../../io/read.js';
import { numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';

/** What `lineshift find --json` prints: the library's {@link FindLinesResult} plus the file. */
export type FindReport = { file: string } & FindLinesResult;

/** Reads the command's options. @throws {UsageError} for malformed values. */
export function findCommandOptions(args: ParsedArgs): FindLinesOptions {
  const significance = numberOption(args, 'significance');
  const kind = stringOption(args, 'kind');
  if (kind !== undefined && !['absorption', 'emission', 'both'].includes(kind)) {
    throw new UsageError('cli.bad-kind', `option --kind must be absorption, emission or both, got "${kind}"`);
  }
  const cw = numberOption(args, 'continuum-window');
  return {
    ...(significance !== undefined ? { significance } : {}),
    ...(kind !== undefined ? { kind: kind as FindLinesOptions['kind'] } : {}),
    ...(cw !== undefined ? { continuumWindowPixels: cw } : {}),
  };
}

/** The human-readable report: a heading and one table row per window. */
export function formatFindReport(r: FindLinesResult, file: string): string {
  const u = r.unit === 'angstrom' ? 'Å' : 'px';
  const noise = r.noiseSource === 'uncertainty' ? 'noise from the uncertainties' : `noise from DER_SNR: ${r.noisePerPixel!.toPrecision(3)} per pixel`;
  const out = [`${file}: ${r.lines.length} line${r.lines.length === 1 ? '' : 's'} in ${r.windows.length} window${r.windows.length === 1 ? '' : 's'} at ≥ ${r.significance} σ (${noise})`];
  if (r.windows.length) {
    out.push('');
    const head = [`window (${u})`, 'lines', 'sign', `centres (${u})`, 'σ'];
    const decimals = r.unit === 'angstrom' ? 2 : 1;
    const rows = r.windows.map((w) => [
      `${w.start.toFixed(decimals)}–${w.end.toFixed(decimals)}`, String(w.components), w.sign,
      w.centers.map((c) => c.toFixed(decimals)).join(', '), w.significance.toFixed(1),
    ]);
    const table = [head, ...rows];
    const widths = head.map((_, j) => Math.max(...table.map((row) => row[j].length)));
    for (const row of table) out.push('  ' + row.map((cell, j) => cell.padEnd(widths[j])).join('  ').trimEnd());
  }
  return out.join('\n') + '\n';
}

export const findCommand: Command = {
  name: 'find',
  summary: 'find absorption and emission lines and group blends into windows ready to fit',
  usage: 'FILE [--significance σ] [--kind absorption|emission|both] [--continuum-window PIXELS] [--json]',
  description: `Finds lines in a FITS or text spectrum: a running-median continuum, a matched filter
of Gaussian shapes from 1.5 pixels FWHM upwards, and lines taken one by one from the most
significant down to the threshold (default 5 σ, with the noise from the spectrum's
uncertainties or, without them, from DER_SNR). Blended lines are kept together in one
window. Positions are in Å (nm and µm spectra are converted), or in pixels for a
spectrum without a wavelength scale. Fit a window with "lineshift fit FILE --center
C1,C2 --window W".`,
  options: [
    { name: 'significance', type: 'number', valueName: 'σ', description: 'detection threshold on the matched-filter significance (default 5)' },
    { name: 'kind', type: 'string', valueName: 'KIND', description: 'absorption, emission or both (default)' },
    { name: 'continuum-window', type: 'number', valueName: 'PIXELS', description: 'running-median width for the continuum (default max(101, pixels/8))' },
  ],
  positionals: { min: 1, max: 1, name: 'FILE' },
  async run(args, io) {
    const file = args.positionals[0];
    const options = findCommandOptions(args);
    const spectrum = readSpectrum(resolve(io.cwd, file), { logger: io.logger });
    const result = findLines(spectrum, options);
    io.stdout(args.json ? JSON.stringify({ file, ...result } satisfies FindReport) + '\n' : formatFindReport(result, file));
    return 0;
  },
};
