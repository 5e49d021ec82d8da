/**
 * Error types. Three outcomes, three mechanisms:
 * - bad input (a file, a value the caller passed) throws an {@link InputError};
 * - a wrong call or command line throws a {@link UsageError};
 * - a legitimate "no answer" (a fit that did not converge, no lines found) is a typed
 *   result that says so, never an exception;
 * - recoverable oddities go to a {@link Logger} (see `logger.ts`).
 *
 * Every message says what is wrong and where: file, HDU, header card, line number,
 * column or keyword, as far as they are known.
 */

/** Where in an input something went wrong. Every field is optional. */
export interface ErrorLocation {
  /** File name or path as the caller gave it. */
  file?: string;
  /** 0-based HDU index in a FITS file. */
  hdu?: number;
  /** 1-based card number within the HDU's header. */
  card?: number;
  /** Header keyword or option name concerned. */
  keyword?: string;
  /** 1-based line number in a text file. */
  line?: number;
  /** Column name or number in a text or table file. */
  column?: string;
  /** 0-based byte offset in a binary file. */
  byteOffset?: number;
  /** 0-based element index in an array (pixel, row). */
  index?: number;
}

/** Formats a location as a prefix such as `spec.fits: HDU 1: card 7 (NAXIS1)`. */
export function formatLocation(loc: ErrorLocation): string {
  const parts: string[] = [];
  if (loc.file !== undefined) parts.push(loc.file);
  if (loc.hdu !== undefined) parts.push(`HDU ${loc.hdu}`);
  if (loc.card !== undefined) {
    parts.push(loc.keyword !== undefined ? `card ${loc.card} (${loc.keyword})` : `card ${loc.card}`);
  } else if (loc.keyword !== undefined) {
    parts.push(`keyword ${loc.keyword}`);
  }
  if (loc.line !== undefined) parts.push(`line ${loc.line}`);
  if (loc.column !== undefined) parts.push(`column ${loc.column}`);
  if (loc.byteOffset !== undefined) parts.push(`byte ${loc.byteOffset}`);
  if (loc.index !== undefined) parts.push(`index ${loc.index}`);
  return parts.join(': ');
}

/** Base class of every error this library throws on purpose. */
export class LineshiftError extends Error {
  /** A stable machine-readable code, e.g. `fits.missing-end`. */
  readonly code: string;
  /** Where the problem is. */
  readonly location: ErrorLocation;
  /** The message without the location prefix. */
  readonly detail: string;

  constructor(code: string, detail: string, location: ErrorLocation = {}, options?: { cause?: unknown }) {
    const where = formatLocation(location);
    super(where ? `${where}: ${detail}` : detail, options);
    this.name = 'LineshiftError';
    this.code = code;
    this.location = { ...location };
    this.detail = detail;
  }
}

/** Bad input data: a malformed file, an impossible value, a missing header keyword. */
export class InputError extends LineshiftError {
  constructor(code: string, detail: string, location: ErrorLocation = {}, options?: { cause?: unknown }) {
    super(code, detail, location, options);
    this.name = 'InputError';
  }
}

/** A wrong call: an unknown option, a value out of its allowed range, a missing argument. */
export class UsageError extends LineshiftError {
  constructor(code: string, detail: string, location: ErrorLocation = {}, options?: { cause?: unknown }) {
    super(code, detail, location, options);
    this.name = 'UsageError';
  }
}

/** True when `e` is one of this library's errors. */
export function isLineshiftError(e: unknown): e is LineshiftError {
  return e instanceof LineshiftError;
}
