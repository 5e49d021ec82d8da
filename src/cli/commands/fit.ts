import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { fitLine, fitLineArrays, type LineComponentResult, type LineFitResult, type LineFitSettings, type MeasuredValue } from '../../fit/line-fit.js';
import type { ContinuumOrder } from '../../fit/line-model.js';
import { LINE_PROFILES, type LineProfile } from '../../fit/profiles.js';
import { readSpectrum } from '../../io/read.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { listOption, numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';

/** What `lineshift fit --json` prints: the library's {@link LineFitResult} without the plotted curve, plus the file. */
export type FitReport = { file: string } & Omit<LineFitResult, 'curve'>;

/** Options of the fit command as read from the command line. */
export interface FitCommandOptions extends LineFitSettings {
  /** Centre(s) in Å (pixels for an uncalibrated spectrum). */
  center: number[];
  /** Full window width, same unit. */
  window?: number;
}

/** Reads the command's options. @throws {UsageError} for malformed values. */
export function fitCommandOptions(args: ParsedArgs): FitCommandOptions {
  const centers = (listOption(args, 'center') ?? []).map((t) => {
    const v = Number(t);
    if (t.trim() === '' || !Number.isFinite(v)) throw new UsageError('cli.not-a-number', `option --center needs numbers, got "${t}"`);
    return v;
  });
  const profile = (stringOption(args, 'profile') ?? 'gaussian') as LineProfile;
  if (!LINE_PROFILES.includes(profile)) throw new UsageError('cli.bad-profile', `option --profile must be one of ${LINE_PROFILES.join(', ')}, got "${profile}"`);
  const components = numberOption(args, 'components');
  if (components !== undefined && (!Number.isInteger(components) || components < 1 || components > 20)) {
    throw new UsageError('cli.bad-components', `option --components must be a whole number from 1 to 20, got ${components}`);
  }
  const order = numberOption(args, 'continuum-order');
  if (order !== undefined && ![0, 1, 2].includes(order)) throw new UsageError('cli.bad-continuum-order', `option --continuum-order must be 0, 1 or 2, got ${order}`);
  const window = numberOption(args, 'window');
  if (window !== undefined && !(window > 0)) throw new UsageError('cli.bad-window', `option --window must be > 0, got ${window}`);
  return {
    center: centers,
    ...(window !== undefined ? { window } : {}),
    profile,
    ...(components !== undefined ? { components } : {}),
    ...(order !== undefined ? { continuumOrder: order as ContinuumOrder } : {}),
  };
}

/** Fits a spectrum as the command does: calibrated spectra through fitLine (Å), pixel-axis spectra through fitLineArrays (pixels). */
export function runFit(spectrum: Spectrum, o: FitCommandOptions): LineFitResult {
  const { center, window, ...settings } = o;
  if (spectrum.unit === 'pixel') {
    return fitLineArrays({ x: spectrum.wavelength, unit: 'pixel', flux: spectrum.flux, uncertainty: spectrum.uncertainty, mask: spectrum.mask }, { ...settings, center, window });
  }
  return fitLine(spectrum, { ...settings, centerAngstrom: center, windowAngstrom: window });
}

/** The JSON report of a fit. */
export function fitReport(result: LineFitResult, file: string): FitReport {
  const { curve, ...rest } = result;
  void curve;
  return { file, ...rest };
}

/** A value with its uncertainty, rounded to two significant digits of the uncertainty. */
export function formatMeasured(m: MeasuredValue): string {
  const { value, uncertainty } = m;
  if (!Number.isFinite(value)) return '—';
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty)) return `${value.toPrecision(6)} ± ?`;
  const decimals = Math.max(0, Math.min(10, 1 - Math.floor(Math.log10(uncertainty))));
  return `${value.toFixed(decimals)} ± ${uncertainty.toFixed(decimals)}`;
}

const PROFILE_NAMES: Record<LineProfile, string> = { gaussian: 'Gaussian', lorentzian: 'Lorentzian', voigt: 'Voigt' };

/** The human-readable report: a heading, the fit quality, and one table row per component. */
export function formatFitReport(r: LineFitResult, file: string): string {
  const u = r.unit === 'angstrom' ? 'Å' : 'px';
  const n = r.components.length;
  const lines = [
    `${file}: ${PROFILE_NAMES[r.profile]} fit of ${n} ${r.sign} line${n === 1 ? '' : 's'} over ${r.window.start.toFixed(2)}–${r.window.end.toFixed(2)} ${u} (${r.window.pixelsUsed} pixels)`,
    `  ${r.message}; ${r.iterations} steps`,
    `  χ² ${r.chiSquare.toPrecision(5)} for ${r.degreesOfFreedom} degrees of freedom (reduced ${r.reducedChiSquare.toPrecision(4)}); uncertainties ${r.uncertaintySource === 'data' ? 'from the data' : 'scaled by the reduced χ²'}; S/N (DER_SNR) ${Number.isFinite(r.signalToNoise) ? r.signalToNoise.toFixed(0) : '—'}`,
    '',
  ];
  const head = ['line', `centre (${u})`, `FWHM (${u})`, 'amplitude', 'depth', `equiv. width (${u})`, `flux × ${u}`];
  const rows = r.components.map((c: LineComponentResult, k) => [
    String(k + 1), formatMeasured(c.center), formatMeasured(c.fwhm), formatMeasured(c.amplitude),
    formatMeasured(c.depth), formatMeasured(c.equivalentWidth), formatMeasured(c.integratedFlux),
  ]);
  const table = [head, ...rows];
  const widths = head.map((_, j) => Math.max(...table.map((row) => row[j].length)));
  for (const row of table) lines.push('  ' + row.map((cell, j) => cell.padEnd(widths[j])).join('  ').trimEnd());
  if (r.profile === 'voigt') {
    r.components.forEach((c, k) => lines.push(`  line ${k + 1}: Gaussian FWHM ${formatMeasured(c.fwhmGaussian!)} ${u}, Lorentzian FWHM ${formatMeasured(c.fwhmLorentzian!)} ${u}`));
  }
  return lines.join('\n') + '\n';
}

export const fitCommand: Command = {
  name: 'fit',
  summary: 'fit a line profile (or a blend) on a local continuum: centre, FWHM, depth, equivalent width',
  usage: 'FILE --center Å [--window Å] [--profile gaussian|lorentzian|voigt] [--components N] [--continuum-order 0|1|2] [--json]',
  description: `Fits one line, or several blended lines, in a FITS or text spectrum by weighted least
squares: a polynomial continuum (order 0–2) plus Gaussian, Lorentzian or Voigt profiles,
started from the data near the given centre. Widths are FWHM; amplitudes are in flux
units, negative for absorption; the equivalent width is positive for absorption and
refers to the fitted continuum at the line centre. Every number comes with its 1-σ
uncertainty, from the spectrum's uncertainties when it has them, otherwise scaled by
the reduced χ². Lengths are in Å (nm and µm spectra are converted), or in pixels for a
spectrum without a wavelength scale. Unusable pixels (NaN, masked) are skipped.
Exit code 0 when the fit converged, 1 when it did not (the reason is printed) or the
file cannot be read.`,
  options: [
    { name: 'center', type: 'list', valueName: 'Å', description: 'approximate line centre; several comma-separated for one per component', required: true },
    { name: 'window', type: 'number', valueName: 'Å', description: 'full width of the fitting window (default: ±3 estimated FWHM around the line)' },
    { name: 'profile', type: 'string', valueName: 'NAME', description: 'line shape: gaussian (default), lorentzian or voigt' },
    { name: 'components', type: 'number', valueName: 'N', description: 'number of blended lines (default: one per centre)' },
    { name: 'continuum-order', type: 'number', valueName: 'N', description: 'polynomial order of the continuum: 0, 1 (default) or 2' },
  ],
  positionals: { min: 1, max: 1, name: 'FILE' },
  async run(args, io) {
    const file = args.positionals[0];
    const options = fitCommandOptions(args);
    const spectrum = readSpectrum(resolve(io.cwd, file), { logger: io.logger });
    const result = runFit(spectrum, options);
    io.stdout(args.json ? JSON.stringify(fitReport(result, file)) + '\n' : formatFitReport(result, file));
    if (!result.converged) {
      io.stderr(`lineshift: ${file}: the fit did not converge: ${result.message}\n`);
      return 1;
    }
    return 0;
  },
};
