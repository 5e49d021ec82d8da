/**
 * What every part of the FITS reader needs to report a problem: the file name and a
 * logger. Messages follow the library's one format: `file: HDU n: card k (KEYWORD): what`.
 */
import { InputError, formatLocation, type ErrorLocation } from '../../errors.js';
import { silentLogger, type Logger } from '../../logger.js';

/** Reader context: file name for messages, and where warnings go. */
export interface FitsContext {
  readonly file: string;
  readonly logger: Logger;
}

/** Builds a reader context. */
export function fitsContext(file: string, logger: Logger = silentLogger): FitsContext {
  return { file, logger };
}

/** An InputError located in `ctx.file`. */
export function fitsError(ctx: FitsContext, code: string, detail: string, where: Omit<ErrorLocation, 'file'> = {}): InputError {
  return new InputError(code, detail, { file: ctx.file, ...where });
}

/** Sends a located warning to the context's logger. */
export function fitsWarn(ctx: FitsContext, code: string, detail: string, where: Omit<ErrorLocation, 'file'> = {}): void {
  ctx.logger.warn({ code, message: `${formatLocation({ file: ctx.file, ...where })}: ${detail}` });
}
