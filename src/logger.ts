/**
 * Warnings for recoverable oddities (a unit guessed from the values, a line flagged
 * as saturated). Functions that can warn take an optional `logger`; the default
 * writes nothing, so a library call never prints. The CLI passes a logger that
 * writes `lineshift: warning: ...` to stderr.
 */

/** One warning: a stable code and a readable message. */
export interface Warning {
  code: string;
  message: string;
}

/** Receives warnings. */
export interface Logger {
  warn(warning: Warning): void;
}

/** A logger that drops everything (the default). */
export const silentLogger: Logger = { warn() {} };

/** A logger that keeps every warning in `warnings`, for tests and for results that carry their warnings. */
export function collectingLogger(): Logger & { readonly warnings: Warning[] } {
  const warnings: Warning[] = [];
  return { warnings, warn: (w) => void warnings.push(w) };
}

/** A logger that writes each warning as one line through `write`. */
export function lineLogger(write: (line: string) => void): Logger {
  return { warn: (w) => write(`lineshift: warning: ${w.message}`) };
}
