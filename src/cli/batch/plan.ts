/**
 * Finding the frames of a batch and pairing each star exposure with its lamps: every FITS
 * file under the given folders is read, told apart as a lamp or a star by its frame-type
 * card (or, without one, by its name), placed in time by its header (DATE-OBS and EXPTIME,
 * as the velocity command reads them), and each star gets the latest lamp before it and
 * the earliest lamp after it in the same folder.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, dirname, extname, join, relative, resolve, sep } from 'node:path';
import { InputError, isLineshiftError } from '../../errors.js';
import { silentLogger, type Logger } from '../../logger.js';
import { parseSpectrum } from '../../io/read.js';
import type { Header } from '../../spectrum/header.js';
import { headerMidpoint } from '../commands/calibrate.js';
import { batchMessages } from './messages.js';
import type { BatchFailure, StarJob } from './types.js';

/** File name endings taken as FITS when a folder is searched. */
export const FITS_EXTENSIONS: readonly string[] = Object.freeze(['.fits', '.fit', '.fts']);

/** IMAGETYP (or FRAMETYP, OBSTYPE) values of lamp frames, lower case. */
export const LAMP_FRAME_TYPES: readonly string[] = Object.freeze(['lamp', 'arc', 'comp', 'comparison', 'wavecal', 'calibration lamp']);
/** IMAGETYP (or FRAMETYP, OBSTYPE) values of star frames, lower case. */
export const STAR_FRAME_TYPES: readonly string[] = Object.freeze(['object', 'light', 'light frame', 'science', 'star', 'target']);
/** Header keywords that may hold the frame type, first present wins. */
export const FRAME_TYPE_KEYWORDS: readonly string[] = Object.freeze(['IMAGETYP', 'FRAMETYP', 'OBSTYPE']);

/** A frame that could be read and placed. */
export interface PlannedFrame {
  readonly path: string;
  readonly kind: 'lamp' | 'star';
  readonly mjdUtc: number;
}

/** The plan of a batch. */
export interface BatchPlan {
  /** One job per star exposure that has at least one lamp, in folder and time order. */
  readonly jobs: readonly StarJob[];
  /** Files that could not be read, classified, timed or paired. */
  readonly failures: readonly BatchFailure[];
  /** Lamp frames no star uses (shown, not an error). */
  readonly unusedLamps: readonly string[];
  /** Number of FITS files found. */
  readonly files: number;
  /** The folder outputs are laid out from (the deepest folder holding every input). */
  readonly root: string;
}

/**
 * Every FITS file under the inputs (files as given, folders searched recursively), absolute,
 * sorted, without repeats, leaving out the folder `exclude` (the batch's own output).
 * @throws {InputError} `batch.no-such-input` for an input that does not exist.
 */
export function findFrames(inputs: readonly string[], cwd: string, exclude?: string): string[] {
  const out = new Set<string>();
  const walk = (dir: string) => {
    if (exclude !== undefined && resolve(dir) === resolve(exclude)) return;
    const entries = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const e of entries) {
      if (e.name.startsWith('.')) continue;
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.isFile() && FITS_EXTENSIONS.includes(extname(e.name).toLowerCase())) out.add(p);
    }
  };
  for (const input of inputs) {
    const p = resolve(cwd, input);
    let st;
    try {
      st = statSync(p);
    } catch {
      throw new InputError('batch.no-such-input', batchMessages.noSuchInput(input));
    }
    if (st.isDirectory()) walk(p);
    else out.add(p);
  }
  return [...out].sort();
}

/** The deepest folder that holds all the paths. */
export function commonFolder(paths: readonly string[]): string {
  if (paths.length === 0) return sep;
  let parts = dirname(paths[0]).split(sep);
  for (const p of paths.slice(1)) {
    const q = dirname(p).split(sep);
    let k = 0;
    while (k < parts.length && k < q.length && parts[k] === q[k]) k++;
    parts = parts.slice(0, k);
  }
  return parts.join(sep) || sep;
}

/** Lamp or star, from the frame-type card or else the file name; null when neither says. */
export function frameKind(header: Header, path: string): 'lamp' | 'star' | null {
  for (const keyword of FRAME_TYPE_KEYWORDS) {
    const value = header.string(keyword);
    if (value === undefined) continue;
    const v = value.trim().toLowerCase();
    if (LAMP_FRAME_TYPES.includes(v)) return 'lamp';
    if (STAR_FRAME_TYPES.includes(v)) return 'star';
  }
  const name = basename(path).toLowerCase();
  if (/lamp|arc|comp/.test(name)) return 'lamp';
  if (/star|object|target/.test(name)) return 'star';
  return null;
}

function failureOf(e: unknown, file: string, stage: BatchFailure['stage']): BatchFailure {
  if (isLineshiftError(e)) return { file, stage, code: e.code, message: e.message };
  const err = e as NodeJS.ErrnoException;
  if (err && typeof err.code === 'string') return { file, stage, code: `fs.${err.code.toLowerCase()}`, message: `${file}: ${err.code === 'ENOENT' ? 'no such file' : err.message}` };
  return { file, stage: 'internal', code: 'batch.internal', message: batchMessages.internal(file, String((e as Error)?.message ?? e)) };
}

/** Turns anything thrown while handling `file` into a failure record. */
export function asFailure(e: unknown, file: string, stage: BatchFailure['stage']): BatchFailure {
  return failureOf(e, file, stage);
}

/**
 * Reads every frame, classifies and times it, and pairs stars with lamps.
 *
 * @param inputs files and folders, as given on the command line.
 * @param cwd working directory (absolute).
 * @param logger receives the readers' warnings.
 * @param exclude a folder not to search (the output folder, so that a second run does not take its own outputs for inputs).
 * @returns the jobs, the failures, the unused lamps and the root folder.
 * @throws {InputError} `batch.no-frames` when no FITS file is found, `batch.no-such-input` for a missing input.
 */
export function planBatch(inputs: readonly string[], cwd: string, logger: Logger = silentLogger, exclude?: string): BatchPlan {
  const paths = findFrames(inputs, cwd, exclude);
  if (paths.length === 0) throw new InputError('batch.no-frames', batchMessages.noFrames(inputs));
  const shown = (p: string) => relative(cwd, p) || p;
  const failures: BatchFailure[] = [];
  const frames: PlannedFrame[] = [];
  for (const path of paths) {
    const file = shown(path);
    let header: Header;
    try {
      header = parseSpectrum(new Uint8Array(readFileSync(path)), file, { logger }).header;
    } catch (e) {
      failures.push(failureOf(e, file, 'read'));
      continue;
    }
    const kind = frameKind(header, path);
    if (!kind) {
      failures.push({ file, stage: 'classify', code: 'batch.unknown-frame-type', message: batchMessages.unknownFrameType(file) });
      continue;
    }
    let time: { mjdUtc: number } | null;
    try {
      time = headerMidpoint(header, file, logger);
    } catch (e) {
      failures.push(failureOf(e, file, 'read'));
      continue;
    }
    if (!time) {
      failures.push({ file, stage: 'pair', code: 'batch.no-time', message: batchMessages.noTime(file, kind) });
      continue;
    }
    frames.push({ path, kind, mjdUtc: time.mjdUtc });
  }

  const root = commonFolder(paths);
  const byFolder = new Map<string, PlannedFrame[]>();
  for (const f of frames) {
    const d = dirname(f.path);
    const list = byFolder.get(d) ?? [];
    list.push(f);
    byFolder.set(d, list);
  }
  const jobs: StarJob[] = [];
  const used = new Set<string>();
  for (const folder of [...byFolder.keys()].sort()) {
    const list = byFolder.get(folder)!;
    const lamps = list.filter((f) => f.kind === 'lamp').sort((a, b) => a.mjdUtc - b.mjdUtc);
    const stars = list.filter((f) => f.kind === 'star').sort((a, b) => a.mjdUtc - b.mjdUtc);
    for (const s of stars) {
      const before = [...lamps].reverse().find((l) => l.mjdUtc < s.mjdUtc) ?? null;
      const after = lamps.find((l) => l.mjdUtc > s.mjdUtc) ?? null;
      if (!before && !after) {
        failures.push({ file: shown(s.path), stage: 'pair', code: 'batch.no-lamp', message: batchMessages.noLamp(shown(s.path)) });
        continue;
      }
      if (before) used.add(before.path);
      if (after) used.add(after.path);
      jobs.push({ index: jobs.length, star: s.path, lampBefore: before?.path ?? null, lampAfter: after?.path ?? null, label: relative(root, s.path).split(sep).join('/') });
    }
  }
  const unusedLamps = frames.filter((f) => f.kind === 'lamp' && !used.has(f.path)).map((f) => shown(f.path));
  return { jobs, failures, unusedLamps, files: paths.length, root };
}
