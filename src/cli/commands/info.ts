import { resolve } from 'node:path';
import { readSpectrum } from '../../io/read.js';
import { isLineshiftError } from '../../errors.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { angstromPerUnit } from '../../spectrum/units.js';
import type { Command } from '../command.js';
import { reportError } from '../run.js';

/** What `lineshift info --json` prints for one file. */
export interface SpectrumInfo {
  file: string;
  /** 0-based HDU used (0 for text files). */
  hdu: number;
  format: 'fits' | 'text';
  pixels: number;
  unit: string;
  medium: 'air' | 'vacuum' | null;
  /** First and last value of the spectral axis: in Å when calibrated, in pixels otherwise. */
  wavelengthFirst: number;
  wavelengthLast: number;
  /** Pixels whose flux is NaN. */
  nanCount: number;
  /** Sum of the finite flux values. */
  fluxSum: number;
  /** The OBJECT card, or null. */
  object: string | null;
  /** DATE-OBS card, or null. */
  dateObs: string | null;
  hasUncertainty: boolean;
  /** Flux unit (BUNIT or the flux column's unit), or null. */
  fluxUnit: string | null;
  /**
   * For an uncalibrated axis: `0-based index` when the axis is the pixel index 0…N−1 (what
   * the readers give a file without a wavelength scale), `from file` otherwise; null when
   * calibrated.
   */
  pixelConvention: '0-based index' | 'from file' | null;
}

/** Summarises a spectrum for `lineshift info`. */
export function spectrumInfo(s: Spectrum, file: string): SpectrumInfo {
  const scale = s.unit === 'pixel' ? 1 : angstromPerUnit(s.unit);
  let nanCount = 0;
  let fluxSum = 0;
  for (const f of s.flux) {
    if (Number.isNaN(f)) nanCount++;
    else if (Number.isFinite(f)) fluxSum += f;
  }
  return {
    file,
    hdu: s.source?.hdu ?? 0,
    format: s.source?.format ?? 'text',
    pixels: s.flux.length,
    unit: s.unit === 'pixel' ? 'pixel' : 'angstrom',
    medium: s.medium,
    wavelengthFirst: s.wavelength[0] * scale,
    wavelengthLast: s.wavelength[s.wavelength.length - 1] * scale,
    nanCount,
    fluxSum,
    object: s.header.string('OBJECT') ?? null,
    dateObs: s.header.string('DATE-OBS') ?? null,
    hasUncertainty: s.uncertainty !== undefined,
    fluxUnit: s.fluxUnit,
    pixelConvention: s.unit !== 'pixel' ? null : s.wavelength[0] === 0 && s.wavelength[s.wavelength.length - 1] === s.wavelength.length - 1 ? '0-based index' : 'from file',
  };
}

function describe(i: SpectrumInfo): string {
  const axis = i.unit === 'pixel'
    ? `pixels ${i.wavelengthFirst} to ${i.wavelengthLast} (${i.pixelConvention === '0-based index' ? '0-based pixel index' : 'pixel coordinates from the file'}; not wavelength-calibrated)`
    : `${i.wavelengthFirst.toFixed(3)} to ${i.wavelengthLast.toFixed(3)} Å${i.medium ? ` (${i.medium})` : ' (medium not stated)'}`;
  return [
    `${i.file}${i.format === 'fits' ? ` [HDU ${i.hdu}]` : ''}`,
    `  object:      ${i.object ?? '(none)'}`,
    `  date-obs:    ${i.dateObs ?? '(none)'}`,
    `  pixels:      ${i.pixels}${i.nanCount ? ` (${i.nanCount} NaN)` : ''}`,
    `  axis:        ${axis}`,
    `  flux sum:    ${i.fluxSum.toPrecision(8)}${i.fluxUnit ? ` ${i.fluxUnit}` : ''}`,
    `  uncertainty: ${i.hasUncertainty ? 'yes' : 'no'}`,
  ].join('\n') + '\n';
}

export const infoCommand: Command = {
  name: 'info',
  summary: 'describe spectrum files: size, spectral axis, object, NaN count',
  usage: 'FILE... [--json]',
  description: `Reads each FITS or text spectrum and prints what it holds. With --json, one JSON
object per file, one per line. A file that cannot be read is reported on stderr and
the others are still described; the exit code is then 1.`,
  options: [],
  positionals: { min: 1, max: Infinity, name: 'FILE' },
  async run(args, io) {
    let failed = 0;
    for (const file of args.positionals) {
      try {
        const info = spectrumInfo(readSpectrum(resolve(io.cwd, file), { logger: io.logger }), file);
        io.stdout(args.json ? JSON.stringify(info) + '\n' : describe(info));
      } catch (e) {
        if (!isLineshiftError(e)) throw e;
        reportError(e, io);
        failed++;
      }
    }
    return failed ? 1 : 0;
  },
};
