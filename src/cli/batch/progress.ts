/**
 * A one-line progress bar for a terminal: redrawn in place with a carriage return, on
 * standard error, and only when standard error is a terminal (never in a log or a pipe).
 */

/** Width of the bar in characters. */
export const PROGRESS_BAR_WIDTH = 28;

/**
 * The progress line: `batch [#####.......]  12/24 stars  1 failed  0:14`.
 *
 * @param done jobs finished (≥ 0). @param total jobs in all (≥ 1). @param failed of which failed.
 * @param elapsedMs time since the start, ms.
 * @returns the line, without a line end.
 * @example progressLine(6, 24, 1, 14_000); // 'batch [#######.....................]   6/24 stars, 1 failed, 0:14'
 */
export function progressLine(done: number, total: number, failed: number, elapsedMs: number): string {
  const filled = total > 0 ? Math.round((PROGRESS_BAR_WIDTH * done) / total) : PROGRESS_BAR_WIDTH;
  const bar = '#'.repeat(filled) + '.'.repeat(PROGRESS_BAR_WIDTH - filled);
  const s = Math.floor(elapsedMs / 1000);
  const clock = `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
  const width = String(total).length;
  return `batch [${bar}] ${String(done).padStart(width)}/${total} stars${failed ? `, ${failed} failed` : ''}, ${clock}`;
}

/** Draws and clears the progress line through `write` when `enabled`; otherwise does nothing. */
export class ProgressBar {
  readonly #write: (text: string) => void;
  readonly #enabled: boolean;
  readonly #start = Date.now();
  #shown = 0;

  constructor(write: (text: string) => void, enabled: boolean) {
    this.#write = write;
    this.#enabled = enabled;
  }

  /** Redraws the line. */
  update(done: number, total: number, failed: number): void {
    if (!this.#enabled) return;
    const line = progressLine(done, total, failed, Date.now() - this.#start);
    this.#write(`\r${line}${' '.repeat(Math.max(0, this.#shown - line.length))}`);
    this.#shown = line.length;
  }

  /** Removes the line so that what follows starts on a clean line. */
  clear(): void {
    if (!this.#enabled || this.#shown === 0) return;
    this.#write(`\r${' '.repeat(this.#shown)}\r`);
    this.#shown = 0;
  }
}
