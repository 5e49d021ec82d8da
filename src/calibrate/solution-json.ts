/**
 * Dispersion solutions as JSON files: `{ "format": "lineshift-dispersion-solution",
 * "formatVersion": 1, …the DispersionSolution fields… }` (see DEVELOPERS.md, "Wavelength
 * calibration"). Reading checks every field and names the JSON path of the first bad one.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { writeFileAtomic } from '../io/atomic-write.js';
import { resolve } from 'node:path';
import { InputError, UsageError } from '../errors.js';
import type { ProvenanceEntry } from '../spectrum/provenance.js';
import type { GratingSetup } from './grating.js';
import type { CalibrationFailure } from './messages.js';
import type { DispersionSolution, CalibrationLineRejection, SolutionLine, SolutionMethod } from './solution.js';

/** The `format` value of a solution file. */
export const SOLUTION_FORMAT = 'lineshift-dispersion-solution';
/** The current `formatVersion`; files of a later version are refused. */
export const SOLUTION_FORMAT_VERSION = 1;

/**
 * A solution as JSON text (2-space indentation), with the format name and version first.
 * Non-finite numbers are written as null.
 *
 * @param solution the solution.
 * @returns JSON text ending with a newline.
 * @example JSON.parse(solutionToJson(solution)).formatVersion; // 1
 */
export function solutionToJson(solution: DispersionSolution): string {
  const body = { format: SOLUTION_FORMAT, formatVersion: SOLUTION_FORMAT_VERSION, ...solution };
  return JSON.stringify(body, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n';
}

class Reader {
  constructor(readonly file: string) {}
  fail(path: string, what: string): never {
    throw new InputError('calibrate.bad-solution-file', `${path} ${what}`, { file: this.file });
  }
  object(v: unknown, path: string): Record<string, unknown> {
    if (typeof v !== 'object' || v === null || Array.isArray(v)) this.fail(path, `should be an object, got ${describe(v)}`);
    return v as Record<string, unknown>;
  }
  number(v: unknown, path: string): number {
    if (typeof v !== 'number' || !Number.isFinite(v)) this.fail(path, `should be a finite number, got ${describe(v)}`);
    return v as number;
  }
  numberOrNull(v: unknown, path: string): number | null {
    return v === null ? null : this.number(v, path);
  }
  integer(v: unknown, path: string, min: number, max: number): number {
    const n = this.number(v, path);
    if (!Number.isInteger(n) || n < min || n > max) this.fail(path, `should be a whole number from ${min} to ${max}, got ${n}`);
    return n;
  }
  string(v: unknown, path: string): string {
    if (typeof v !== 'string') this.fail(path, `should be a string, got ${describe(v)}`);
    return v as string;
  }
  stringOrNull(v: unknown, path: string): string | null {
    return v === null ? null : this.string(v, path);
  }
  boolean(v: unknown, path: string): boolean {
    if (typeof v !== 'boolean') this.fail(path, `should be true or false, got ${describe(v)}`);
    return v as boolean;
  }
  array(v: unknown, path: string): unknown[] {
    if (!Array.isArray(v)) this.fail(path, `should be an array, got ${describe(v)}`);
    return v as unknown[];
  }
  oneOf<T extends string>(v: unknown, path: string, values: readonly T[]): T {
    if (typeof v !== 'string' || !values.includes(v as T)) this.fail(path, `should be one of ${values.map((x) => `"${x}"`).join(', ')}, got ${describe(v)}`);
    return v as T;
  }
}

function describe(v: unknown): string {
  if (v === undefined) return 'nothing (the field is missing)';
  const s = JSON.stringify(v);
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}

const METHODS: readonly SolutionMethod[] = ['lamp', 'grating-equation', 'star-lines', 'interpolated'];
const REASONS: readonly CalibrationFailure[] = ['no-lines-found', 'too-few-lines', 'no-pattern', 'few-identified', 'large-residuals'];
const REJECTIONS: readonly CalibrationLineRejection[] = ['sigma-clipped', 'saturated', 'blend', 'fit-failed', 'unidentified'];

/**
 * Parses and checks a solution file's text.
 *
 * @param text the JSON text.
 * @param file file name for messages.
 * @returns the solution (without the format fields).
 * @throws {InputError} `calibrate.bad-solution-file` naming the file and the JSON path of
 *   the first bad field (e.g. `$.coefficients[2] should be a finite number, got "x"`), for
 *   text that is not JSON, another format, a later version, or a coefficient count or
 *   covariance shape that does not match the order.
 * @example parseSolutionJson(solutionToJson(solution), 'solution.json').order;
 */
export function parseSolutionJson(text: string, file: string): DispersionSolution {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new InputError('calibrate.bad-solution-file', `is not valid JSON (${(e as Error).message})`, { file });
  }
  const r = new Reader(file);
  const o = r.object(raw, '$');
  if (o.format !== SOLUTION_FORMAT) r.fail('$.format', `should be "${SOLUTION_FORMAT}", got ${describe(o.format)}; this is not a lineshift dispersion solution`);
  const version = r.integer(o.formatVersion, '$.formatVersion', 1, Number.MAX_SAFE_INTEGER);
  if (version > SOLUTION_FORMAT_VERSION) r.fail('$.formatVersion', `is ${version}, newer than this version of lineshift reads (${SOLUTION_FORMAT_VERSION}); update lineshift`);
  const order = r.integer(o.order, '$.order', 1, 5);
  const d = r.object(o.domain, '$.domain');
  const domain = { min: r.number(d.min, '$.domain.min'), max: r.number(d.max, '$.domain.max') };
  if (!(domain.max > domain.min)) r.fail('$.domain', `should have max > min, got ${domain.min} to ${domain.max}`);
  const ok = r.boolean(o.ok, '$.ok');
  const coefficientsRaw = r.array(o.coefficients, '$.coefficients');
  const coefficients = coefficientsRaw.map((v, i) => r.number(v, `$.coefficients[${i}]`));
  const covRaw = r.array(o.covariance, '$.covariance');
  const covariance = covRaw.map((row, i) => r.array(row, `$.covariance[${i}]`).map((v, j) => r.number(v, `$.covariance[${i}][${j}]`)));
  if (ok || coefficients.length > 0) {
    if (coefficients.length !== order + 1) r.fail('$.coefficients', `should hold order + 1 = ${order + 1} numbers, got ${coefficients.length}`);
    if (covariance.length !== order + 1 || covariance.some((row) => row.length !== order + 1)) r.fail('$.covariance', `should be a ${order + 1}×${order + 1} matrix`);
  }
  const lines: SolutionLine[] = r.array(o.lines, '$.lines').map((v, i) => {
    const p = `$.lines[${i}]`;
    const l = r.object(v, p);
    return {
      pixel: r.number(l.pixel, `${p}.pixel`),
      pixelUncertainty: r.numberOrNull(l.pixelUncertainty, `${p}.pixelUncertainty`),
      fwhmPixels: r.numberOrNull(l.fwhmPixels, `${p}.fwhmPixels`),
      strength: r.numberOrNull(l.strength, `${p}.strength`),
      wavelengthAngstrom: r.numberOrNull(l.wavelengthAngstrom, `${p}.wavelengthAngstrom`),
      species: r.stringOrNull(l.species, `${p}.species`),
      relativeIntensity: r.numberOrNull(l.relativeIntensity, `${p}.relativeIntensity`),
      fittedWavelengthAngstrom: r.number(l.fittedWavelengthAngstrom, `${p}.fittedWavelengthAngstrom`),
      residualAngstrom: r.numberOrNull(l.residualAngstrom, `${p}.residualAngstrom`),
      residualPixels: r.numberOrNull(l.residualPixels, `${p}.residualPixels`),
      residualKmPerS: r.numberOrNull(l.residualKmPerS, `${p}.residualKmPerS`),
      resolvingPower: r.numberOrNull(l.resolvingPower, `${p}.resolvingPower`),
      used: r.boolean(l.used, `${p}.used`),
      rejection: l.rejection === null ? null : r.oneOf(l.rejection, `${p}.rejection`, REJECTIONS),
    };
  });
  const rp = o.resolvingPower === null ? null : r.object(o.resolvingPower, '$.resolvingPower');
  const wu = o.wavelengthUncertaintyAngstrom === null ? null : r.object(o.wavelengthUncertaintyAngstrom, '$.wavelengthUncertaintyAngstrom');
  const lamp = o.lamp === null ? null : r.object(o.lamp, '$.lamp');
  const obs = o.observation === null ? null : r.object(o.observation, '$.observation');
  const grating = o.grating === null ? null : (r.object(o.grating, '$.grating') as unknown as GratingSetup);
  if (grating && grating.kind !== 'slit' && grating.kind !== 'transmission') r.fail('$.grating.kind', `should be "slit" or "transmission", got ${describe((grating as { kind: unknown }).kind)}`);
  const provenance = r.array(o.provenance, '$.provenance').map((v, i) => {
    const e = r.object(v, `$.provenance[${i}]`);
    return { step: r.string(e.step, `$.provenance[${i}].step`), parameters: r.object(e.parameters, `$.provenance[${i}].parameters`), version: r.string(e.version, `$.provenance[${i}].version`) } as ProvenanceEntry;
  });
  return {
    ok,
    reason: o.reason === null ? null : r.oneOf(o.reason, '$.reason', REASONS),
    message: r.string(o.message, '$.message'),
    method: r.oneOf(o.method, '$.method', METHODS),
    calibratedByLamp: r.boolean(o.calibratedByLamp, '$.calibratedByLamp'),
    velocityZeroPointMeaningful: r.boolean(o.velocityZeroPointMeaningful, '$.velocityZeroPointMeaningful'),
    medium: r.oneOf(o.medium, '$.medium', ['air', 'vacuum'] as const),
    order,
    domain,
    coefficients,
    covariance,
    pixels: o.pixels === null ? null : r.integer(o.pixels, '$.pixels', 1, Number.MAX_SAFE_INTEGER),
    rmsAngstrom: r.numberOrNull(o.rmsAngstrom, '$.rmsAngstrom'),
    rmsPixels: r.numberOrNull(o.rmsPixels, '$.rmsPixels'),
    rmsKmPerS: r.numberOrNull(o.rmsKmPerS, '$.rmsKmPerS'),
    linesMeasured: r.integer(o.linesMeasured, '$.linesMeasured', 0, Number.MAX_SAFE_INTEGER),
    linesIdentified: r.integer(o.linesIdentified, '$.linesIdentified', 0, Number.MAX_SAFE_INTEGER),
    linesUsed: r.integer(o.linesUsed, '$.linesUsed', 0, Number.MAX_SAFE_INTEGER),
    linesRejected: r.integer(o.linesRejected, '$.linesRejected', 0, Number.MAX_SAFE_INTEGER),
    resolvingPower: rp ? { median: r.number(rp.median, '$.resolvingPower.median'), spread: r.number(rp.spread, '$.resolvingPower.spread'), lines: r.integer(rp.lines, '$.resolvingPower.lines', 0, Number.MAX_SAFE_INTEGER) } : null,
    wavelengthUncertaintyAngstrom: wu ? { middle: r.number(wu.middle, '$.wavelengthUncertaintyAngstrom.middle'), max: r.number(wu.max, '$.wavelengthUncertaintyAngstrom.max') } : null,
    lines,
    lamp: lamp ? { name: r.string(lamp.name, '$.lamp.name'), species: r.array(lamp.species, '$.lamp.species').map((s, i) => r.string(s, `$.lamp.species[${i}]`)) } : null,
    grating,
    observation: obs ? { midpointUtc: r.string(obs.midpointUtc, '$.observation.midpointUtc'), mjdUtc: r.number(obs.mjdUtc, '$.observation.mjdUtc') } : null,
    warnings: r.array(o.warnings, '$.warnings').map((s, i) => r.string(s, `$.warnings[${i}]`)),
    provenance,
  };
}

/**
 * Reads a solution file (see {@link parseSolutionJson}).
 *
 * @param path file path.
 * @returns the solution.
 * @throws {InputError} for a missing file, a folder, or a malformed file (with the JSON path).
 * @example readSolution('night1-lamp.json').rmsAngstrom;
 */
export function readSolution(path: string): DispersionSolution {
  let text: string;
  try {
    if (statSync(path).isDirectory()) throw new InputError('io.is-directory', 'is a directory, not a file', { file: path });
    const bytes = readFileSync(path);
    if (bytes.length > 64 * 1024 * 1024) throw new InputError('calibrate.bad-solution-file', 'is larger than 64 MiB; not a dispersion solution', { file: path });
    text = bytes.toString('utf8');
  } catch (e) {
    if (e instanceof InputError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('io.cannot-open', code === 'ENOENT' ? 'no such file' : `cannot open (${code ?? String(e)})`, { file: path });
  }
  return parseSolutionJson(text, path);
}

/**
 * Writes a solution file: to a temporary name in the same folder, then renamed over the
 * target, so that a failure never leaves a partial file.
 *
 * @param path output path.
 * @param solution the solution.
 * @param protect paths that must not be overwritten (the inputs).
 * @throws {UsageError} when `path` is a folder or one of `protect`.
 * @example writeSolution('lamp-solution.json', solution);
 */
export function writeSolution(path: string, solution: DispersionSolution, protect: readonly string[] = []): void {
  const target = resolve(path);
  if (existsSync(target) && statSync(target).isDirectory()) throw new UsageError('calibrate.output-is-folder', 'is a folder; give a file name for the solution', { file: path });
  if (protect.some((p) => resolve(p) === target)) throw new UsageError('calibrate.overwrite-input', 'is an input file; lineshift never overwrites its input, so write to another file', { file: path });
  const bytes = Buffer.from(solutionToJson(solution), 'utf8');
  writeFileAtomic(target, bytes);
}
