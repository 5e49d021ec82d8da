import { UsageError } from '../errors.js';
import type { SpectralUnit } from './spectrum.js';

/** Length of one unit in ångström, for the wavelength units. */
const ANGSTROM_PER_UNIT: Readonly<Record<Exclude<SpectralUnit, 'pixel'>, number>> = Object.freeze({
  angstrom: 1,
  nm: 10,
  um: 1e4,
});

/**
 * How many ångström one `unit` is (1 for Å, 10 for nm, 10 000 for µm).
 * @throws {UsageError} for `pixel`, which has no length.
 * @example angstromPerUnit('nm'); // 10
 */
export function angstromPerUnit(unit: SpectralUnit): number {
  if (unit === 'pixel') throw new UsageError('units.pixel', 'a pixel axis has no wavelength unit; calibrate the spectrum first');
  return ANGSTROM_PER_UNIT[unit];
}

/** Converts a wavelength value from one unit to another (Å, nm, µm). */
export function convertWavelength(value: number, from: SpectralUnit, to: SpectralUnit): number {
  if (from === to) return value;
  return (value * angstromPerUnit(from)) / angstromPerUnit(to);
}

const UNIT_NAMES: ReadonlyMap<string, SpectralUnit> = new Map([
  ['angstrom', 'angstrom'], ['angstroms', 'angstrom'], ['a', 'angstrom'], ['aa', 'angstrom'], ['å', 'angstrom'], ['ang', 'angstrom'], ['0.1 nm', 'angstrom'],
  ['nm', 'nm'], ['nanometer', 'nm'], ['nanometers', 'nm'], ['nanometre', 'nm'], ['nanometres', 'nm'],
  ['um', 'um'], ['µm', 'um'], ['μm', 'um'], ['micron', 'um'], ['microns', 'um'], ['micrometer', 'um'], ['micrometre', 'um'], ['micrometers', 'um'], ['micrometres', 'um'],
  ['pixel', 'pixel'], ['pixels', 'pixel'], ['pix', 'pixel'], ['px', 'pixel'],
]);

/**
 * Reads a unit name as written in files and headers (`Angstrom`, `nm`, `um`, `micron`,
 * `pixel`, the FITS `CUNIT1` forms, case-insensitive), or undefined when unknown.
 * @example parseSpectralUnit('Angstrom'); // 'angstrom'
 */
export function parseSpectralUnit(text: string): SpectralUnit | undefined {
  return UNIT_NAMES.get(text.trim().toLowerCase());
}

/** The unit's symbol for labels and FITS CUNIT1: `Angstrom`, `nm`, `um`, `pixel`. */
export function unitSymbol(unit: SpectralUnit): string {
  return unit === 'angstrom' ? 'Angstrom' : unit;
}

/** The unit's label for plots and reports: Å, nm, µm, pixel. */
export function unitLabel(unit: SpectralUnit): string {
  return unit === 'angstrom' ? 'Å' : unit === 'um' ? 'µm' : unit;
}
