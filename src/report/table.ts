/**
 * Tables of results for reports and notebooks: one plain description, shown as HTML or
 * as aligned plain text.
 */
import { UsageError } from '../errors.js';
import { formatCell, isMeasuredCell, type ValueWithUncertainty } from './format.js';
import { escapeHtml } from './html.js';

export { formatCell, type ValueWithUncertainty } from './format.js';

/** What a table cell may hold. */
export type TableCell = string | number | boolean | null | undefined | ValueWithUncertainty;

/** One column of a {@link Table}. */
export interface TableColumn {
  /** Key of the value in each row. */
  readonly key: string;
  /** Heading text. */
  readonly label: string;
  /** Unit shown after the heading in parentheses, e.g. `Å` or `km/s`. */
  readonly unit?: string;
  /** Decimals for numbers (and value ± uncertainty); default: numbers as JavaScript prints them, value ± uncertainty rounded on two significant digits of the uncertainty (`formatMeasured`). */
  readonly digits?: number;
}

/** A table of results. Nothing in it is modified when it is shown. */
export interface Table {
  /** Caption above the table. */
  readonly caption?: string;
  /** Columns in order. */
  readonly columns: readonly TableColumn[];
  /** Rows: values by column key. */
  readonly rows: readonly Readonly<Record<string, TableCell>>[];
}

/**
 * True when `value` has the shape of a {@link Table} (columns and rows arrays).
 * @example isTable({ columns: [], rows: [] }); // true
 */
export function isTable(value: unknown): value is Table {
  if (value === null || typeof value !== 'object') return false;
  const t = value as { columns?: unknown; rows?: unknown };
  return Array.isArray(t.columns) && Array.isArray(t.rows);
}

function heading(c: TableColumn): string {
  return c.unit ? `${c.label} (${c.unit})` : c.label;
}

function isNumericColumn(table: Table, c: TableColumn): boolean {
  return table.rows.some((r) => typeof r[c.key] === 'number' || isMeasuredCell(r[c.key]));
}

function checkTable(table: Table): void {
  if (!isTable(table)) throw new UsageError('report.bad-table', 'a table needs a columns array and a rows array');
  const keys = new Set<string>();
  for (const c of table.columns) {
    if (keys.has(c.key)) throw new UsageError('report.bad-table', `the table has two columns with key "${c.key}"`, { column: c.key });
    keys.add(c.key);
  }
}

/**
 * The table as an HTML `<table>` element. Every text (caption, headings, cells) is
 * escaped; numeric columns are right-aligned (class `num`).
 *
 * @param table columns, rows and caption.
 * @returns HTML text.
 * @throws {UsageError} `report.bad-table` for a table without columns/rows arrays or with a repeated column key.
 * @example
 * tableHtml({ columns: [{ key: 'v', label: 'Velocity', unit: 'km/s', digits: 1 }], rows: [{ v: -12.34 }] });
 * // '<table><thead><tr><th class="num">Velocity (km/s)</th></tr></thead><tbody><tr><td class="num">−12.3</td></tr></tbody></table>'
 */
export function tableHtml(table: Table): string {
  checkTable(table);
  const numeric = table.columns.map((c) => isNumericColumn(table, c));
  const cls = (i: number) => (numeric[i] ? ' class="num"' : '');
  const caption = table.caption ? `<caption>${escapeHtml(table.caption)}</caption>` : '';
  const head = `<thead><tr>${table.columns.map((c, i) => `<th${cls(i)}>${escapeHtml(heading(c))}</th>`).join('')}</tr></thead>`;
  const body = table.rows
    .map((r) => `<tr>${table.columns.map((c, i) => `<td${cls(i)}>${escapeHtml(formatCell(r[c.key], c))}</td>`).join('')}</tr>`)
    .join('');
  return `<table>${caption}${head}<tbody>${body}</tbody></table>`;
}

/**
 * The table as aligned plain text (for `text/plain` in notebooks and for terminals):
 * caption line, heading line, a rule, one line per row; numbers right-aligned.
 *
 * @param table columns, rows and caption.
 * @returns lines joined with `\n`.
 * @throws {UsageError} `report.bad-table` as {@link tableHtml}.
 * @example tableText({ columns: [{ key: 'a', label: 'A' }], rows: [{ a: 1 }, { a: 22 }] }); // ' A\n--\n 1\n22'
 */
export function tableText(table: Table): string {
  checkTable(table);
  const numeric = table.columns.map((c) => isNumericColumn(table, c));
  const cells = table.rows.map((r) => table.columns.map((c) => formatCell(r[c.key], c).replace(/\s*\n\s*/g, ' ')));
  const heads = table.columns.map(heading);
  const widths = heads.map((h, i) => Math.max([...h].length, ...cells.map((row) => [...row[i]].length)));
  const pad = (text: string, i: number) => {
    const fill = ' '.repeat(widths[i] - [...text].length);
    return numeric[i] ? fill + text : text + fill;
  };
  const lines = [
    heads.map(pad).join('  '),
    widths.map((w) => '-'.repeat(w)).join('  '),
    ...cells.map((row) => row.map(pad).join('  ')),
  ].map((l) => l.trimEnd());
  return [...(table.caption ? [table.caption] : []), ...lines].join('\n');
}
