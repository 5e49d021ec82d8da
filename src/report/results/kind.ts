/**
 * Telling the library's result values apart by their shape, so that one `display(x)` or
 * `summarizeResult(x)` can take any of them. The checks look at the fields each result
 * type alone has; they do not validate the whole value.
 */
import type { DispersionSolution } from '../../calibrate/solution.js';
import type { IdentificationResult } from '../../elements/identify.js';
import type { LineFitResult } from '../../fit/line-fit.js';
import type { ContinuumResult } from '../../lines/continuum.js';
import type { FindLinesResult } from '../../lines/find.js';
import type { OrbitFit } from '../../orbit/orbit-fit.js';
import type { Periodogram } from '../../orbit/periodogram.js';
import type { VelocityTable } from '../../orbit/table.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { CrossCorrelationResult } from '../../velocity/ccf.js';
import type { LineVelocityResult } from '../../velocity/lines.js';

/** Every result value the summaries, plots and notebook display understand. */
export type LibraryResult =
  | Spectrum
  | LineFitResult
  | FindLinesResult
  | ContinuumResult
  | IdentificationResult
  | DispersionSolution
  | VelocityTable
  | Periodogram
  | OrbitFit
  | CrossCorrelationResult
  | LineVelocityResult;

/** The name of each kind of {@link LibraryResult}. */
export type ResultKind =
  | 'spectrum'
  | 'line-fit'
  | 'found-lines'
  | 'continuum'
  | 'identification'
  | 'dispersion-solution'
  | 'velocity-table'
  | 'periodogram'
  | 'orbit-fit'
  | 'cross-correlation'
  | 'line-velocities';

type Fields = Record<string, unknown>;

const isObject = (v: unknown): v is Fields => v !== null && typeof v === 'object' && !Array.isArray(v);
const isNumbers = (v: unknown): boolean => v instanceof Float64Array;

/**
 * Which kind of library result `value` is, by the fields that kind alone has; undefined
 * for anything else (a plot spec, a table, a string, a plain object).
 *
 * @param value any value.
 * @returns the kind, or undefined.
 * @example resultKind(fitLine(spectrum, { centerAngstrom: 6563 })); // 'line-fit'
 */
export function resultKind(value: unknown): ResultKind | undefined {
  if (!isObject(value)) return undefined;
  const v = value;
  if (v.method === 'cross-correlation' && isObject(v.ccf) && isObject(v.velocity)) return 'cross-correlation';
  if (v.method === 'lines' && isObject(v.velocity) && Array.isArray(v.lines) && typeof v.linesUsed === 'number') return 'line-velocities';
  if (isNumbers(v.wavelength) && isNumbers(v.flux) && isObject(v.header) && typeof v.unit === 'string') return 'spectrum';
  if (Array.isArray(v.components) && Array.isArray(v.parameters) && isObject(v.curve) && typeof v.profile === 'string') return 'line-fit';
  if (Array.isArray(v.windows) && Array.isArray(v.lines) && typeof v.noiseSource === 'string') return 'found-lines';
  if (isNumbers(v.continuum) && v.used instanceof Uint8Array && typeof v.scatter === 'number') return 'continuum';
  if (Array.isArray(v.elements) && Array.isArray(v.lines) && typeof v.speciesTested === 'number') return 'identification';
  if (Array.isArray(v.coefficients) && isObject(v.domain) && Array.isArray(v.lines) && typeof v.calibratedByLamp === 'boolean') return 'dispersion-solution';
  if (isObject(v.orbit) && isObject(v.circularTest) && isObject(v.periodDays)) return 'orbit-fit';
  if (isNumbers(v.frequencyPerDay) && isNumbers(v.power) && isNumbers(v.windowPower) && isObject(v.best)) return 'periodogram';
  if (isNumbers(v.bjdTdb) && isNumbers(v.velocityKmPerS) && isNumbers(v.uncertaintyKmPerS)) return 'velocity-table';
  return undefined;
}

/**
 * True for any {@link LibraryResult}.
 * @example isLibraryResult('text'); // false
 */
export function isLibraryResult(value: unknown): value is LibraryResult {
  return resultKind(value) !== undefined;
}
