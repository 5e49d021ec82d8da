/**
 * The shape every result summary takes: a title, a few sentences, and tables of the
 * numbers. Notebook display, reports and the command line show the same summary.
 */
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { VelocityTable } from '../../orbit/table.js';
import { tableText, type Table } from '../table.js';

/** A result described for people. Texts are plain (not escaped). */
export interface ResultSummary {
  /** One line naming the result, e.g. `Line fit: LVAC-7, 2026-05-14 03:12:45 UTC`. */
  readonly title: string;
  /** Sentences, one per line: outcome, main numbers with uncertainties, warnings. */
  readonly lines: readonly string[];
  /** The numbers in tables (may be empty). */
  readonly tables: readonly Table[];
}

/**
 * What a summary or plot may use besides the result itself: the spectrum it came from
 * (object name, date, medium, flux unit, uncertainties) and the velocity table an orbit
 * or periodogram was computed from.
 */
export interface ResultContext {
  /** The spectrum the result was measured in. */
  readonly spectrum?: Spectrum;
  /** The velocity table an orbit fit or periodogram was computed from. */
  readonly table?: VelocityTable;
}

/** Most table rows shown in a summary; the rest are counted in a last line. */
export const SUMMARY_MAX_ROWS = 60;

/**
 * A summary as plain text: the title, its sentences, then each table as aligned text,
 * separated by blank lines.
 *
 * @param summary from one of the `summarize…` functions.
 * @returns text lines joined with `\n`.
 * @example summaryText({ title: 'Spectrum', lines: ['2048 pixels'], tables: [] }); // 'Spectrum\n2048 pixels'
 */
export function summaryText(summary: ResultSummary): string {
  const head = [summary.title, ...summary.lines].join('\n');
  return [head, ...summary.tables.map(tableText)].join('\n\n');
}

/** The first {@link SUMMARY_MAX_ROWS} rows and a note on how many were left out. */
export function capRows<T>(rows: readonly T[], what: string): { rows: T[]; note?: string } {
  if (rows.length <= SUMMARY_MAX_ROWS) return { rows: [...rows] };
  return { rows: rows.slice(0, SUMMARY_MAX_ROWS), note: `first ${SUMMARY_MAX_ROWS} of ${rows.length} ${what} shown` };
}

/** `1 line`, `2 lines`. */
export function plural(n: number, word: string, pluralWord = `${word}s`): string {
  return `${n} ${n === 1 ? word : pluralWord}`;
}
