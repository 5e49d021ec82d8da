/**
 * Velocity tables: radial velocities of one star over time, with their uncertainties,
 * read from and written to CSV or JSON.
 *
 * CSV layout (comma-separated, one header row naming the columns, any column order,
 * names case-insensitive; lines starting with `#` are comments; blank lines are skipped;
 * cells may be double-quoted, `""` inside quotes is a quote):
 *
 * ```text
 * bjd_tdb,velocity_km_s,uncertainty_km_s,label
 * 2460412.41873,-12.31,0.84,night 1
 * ```
 *
 * Optional columns `velocity2_km_s` and `uncertainty2_km_s` hold the second star of a
 * double-lined binary; either both cells of that pair are given in a row or both are
 * empty (the second star not measured that night, e.g. blended).
 *
 * JSON layout: `{"rows": [{"bjdTdb": …, "velocityKmPerS": …, "uncertaintyKmPerS": …,
 * "label": …, "velocity2KmPerS": …, "uncertainty2KmPerS": …}], "provenance": [...]}`,
 * or a bare array of such rows.
 */
import { readFileSync } from 'node:fs';
import { writeFileAtomic } from '../io/atomic-write.js';
import { extname, resolve } from 'node:path';
import { formatLocation, InputError, UsageError, type ErrorLocation } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { messages, TABLE_COLUMNS } from './messages.js';

/** File formats of a velocity table. */
export type VelocityTableFormat = 'csv' | 'json';

/**
 * Radial velocities of a star (and optionally its companion) over time. Treat it as
 * immutable; rows are kept in the order of the file (not sorted).
 */
export interface VelocityTable {
  /** Time of each measurement, BJD_TDB in days (any zero point the caller chose, e.g. full JD). */
  readonly bjdTdb: Float64Array;
  /** Radial velocity of the (primary) star, km/s. */
  readonly velocityKmPerS: Float64Array;
  /** 1-σ uncertainty of `velocityKmPerS`, km/s, positive and finite. */
  readonly uncertaintyKmPerS: Float64Array;
  /** Free-text label per row ('' when none). */
  readonly label: readonly string[];
  /** Radial velocity of the second star of a double-lined binary, km/s; NaN where not measured. */
  readonly velocity2KmPerS?: Float64Array;
  /** 1-σ uncertainty of `velocity2KmPerS`, km/s; NaN exactly where the velocity is NaN. */
  readonly uncertainty2KmPerS?: Float64Array;
  /** How the table was made, oldest step first. */
  readonly provenance: readonly ProvenanceEntry[];
  /** Where it was read from. */
  readonly source?: { readonly file: string; readonly format: VelocityTableFormat };
}

/** What {@link createVelocityTable} takes; arrays are copied. */
export interface VelocityTableInit {
  bjdTdb: ArrayLike<number>;
  velocityKmPerS: ArrayLike<number>;
  uncertaintyKmPerS: ArrayLike<number>;
  label?: readonly string[];
  velocity2KmPerS?: ArrayLike<number>;
  uncertainty2KmPerS?: ArrayLike<number>;
  provenance?: readonly ProvenanceEntry[];
  source?: { file: string; format: VelocityTableFormat };
}

/** Options of the table readers. */
export interface ReadVelocityTableOptions {
  /** Receives warnings (repeated times, unknown columns). Default: silent. */
  logger?: Logger;
}

/**
 * Builds a validated velocity table, copying the arrays.
 *
 * Repeated times are allowed (two spectra at once, or two lines measured separately) and
 * reported through the logger.
 *
 * @param init columns; `label` defaults to empty strings.
 * @param where location for messages (file name); `index` is filled per row.
 * @param logger receives `orbit.duplicate-time` warnings. Default: silent.
 * @returns a frozen table.
 * @throws {InputError} when the table is empty, lengths differ, a time or velocity is not
 *   finite, an uncertainty is not positive and finite, or only one of a second-star
 *   velocity/uncertainty pair is given.
 * @example
 * const t = createVelocityTable({ bjdTdb: [2460000.5, 2460001.5], velocityKmPerS: [3.1, -2.4], uncertaintyKmPerS: [0.5, 0.5] });
 * t.label; // ['', '']
 */
export function createVelocityTable(init: VelocityTableInit, where: ErrorLocation = {}, logger: Logger = silentLogger): VelocityTable {
  const n = init.bjdTdb.length;
  if (n === 0) throw new InputError('orbit.table-empty', messages.tableEmpty(), where);
  const check = (name: string, a: ArrayLike<number> | undefined) => {
    if (a !== undefined && a.length !== n) throw new InputError('orbit.table-lengths', messages.tableLengths(name, a.length, n), where);
  };
  check('velocityKmPerS', init.velocityKmPerS);
  check('uncertaintyKmPerS', init.uncertaintyKmPerS);
  check('velocity2KmPerS', init.velocity2KmPerS);
  check('uncertainty2KmPerS', init.uncertainty2KmPerS);
  if (init.label !== undefined && init.label.length !== n) throw new InputError('orbit.table-lengths', messages.tableLengths('label', init.label.length, n), where);
  if ((init.velocity2KmPerS === undefined) !== (init.uncertainty2KmPerS === undefined)) {
    const [present, missing] = init.velocity2KmPerS ? ['velocity2KmPerS', 'uncertainty2KmPerS'] : ['uncertainty2KmPerS', 'velocity2KmPerS'];
    throw new InputError('orbit.table-missing-column', messages.tablePairIncomplete(present, missing), where);
  }
  const t = Float64Array.from(init.bjdTdb);
  const v = Float64Array.from(init.velocityKmPerS);
  const s = Float64Array.from(init.uncertaintyKmPerS);
  const v2 = init.velocity2KmPerS ? Float64Array.from(init.velocity2KmPerS) : undefined;
  const s2 = init.uncertainty2KmPerS ? Float64Array.from(init.uncertainty2KmPerS) : undefined;
  const at = (i: number, column: string): ErrorLocation => ({ ...where, index: i, column });
  const seen = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(t[i])) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(t[i]), at(i, 'bjdTdb'));
    if (!Number.isFinite(v[i])) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(v[i]), at(i, 'velocityKmPerS'));
    if (!(s[i] > 0 && Number.isFinite(s[i]))) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s[i]), at(i, 'uncertaintyKmPerS'));
    if (v2 && s2) {
      const has2 = !Number.isNaN(v2[i]);
      const hasS2 = !Number.isNaN(s2[i]);
      if (has2 !== hasS2) {
        const [p, m] = has2 ? ['velocity2KmPerS', 'uncertainty2KmPerS'] : ['uncertainty2KmPerS', 'velocity2KmPerS'];
        throw new InputError('orbit.table-half-pair', messages.tableHalfPair(p, m), at(i, p));
      }
      if (has2) {
        if (!Number.isFinite(v2[i])) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(v2[i]), at(i, 'velocity2KmPerS'));
        if (!(s2[i] > 0 && Number.isFinite(s2[i]))) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s2[i]), at(i, 'uncertainty2KmPerS'));
      }
    }
    const first = seen.get(t[i]);
    if (first !== undefined) {
      logger.warn({ code: 'orbit.duplicate-time', message: `${prefix({ ...where, index: i })}${messages.tableDuplicateTime(t[i], `index ${first}`)}` });
    } else {
      seen.set(t[i], i);
    }
  }
  const table: VelocityTable = {
    bjdTdb: t,
    velocityKmPerS: v,
    uncertaintyKmPerS: s,
    label: Object.freeze(init.label ? [...init.label] : new Array<string>(n).fill('')),
    ...(v2 && s2 ? { velocity2KmPerS: v2, uncertainty2KmPerS: s2 } : {}),
    provenance: Object.freeze([...(init.provenance ?? [])]),
    ...(init.source ? { source: Object.freeze({ ...init.source }) } : {}),
  };
  return Object.freeze(table);
}

/**
 * Whether a table holds velocities of a second star (a double-lined binary).
 *
 * @param table the table.
 * @returns true when `velocity2KmPerS` exists and at least one row has a value (not NaN).
 * @example
 * isDoubleLined(parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,1\n', 'x.csv')); // false
 */
export function isDoubleLined(table: VelocityTable): boolean {
  const v2 = table.velocity2KmPerS;
  if (!v2) return false;
  for (let i = 0; i < v2.length; i++) if (!Number.isNaN(v2[i])) return true;
  return false;
}

function prefix(where: ErrorLocation): string {
  const w = formatLocation(where);
  return w ? `${w}: ` : '';
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Splits one CSV line into cells (double quotes, `""` escapes); throws on an unclosed quote. */
function splitCsvLine(line: string, where: ErrorLocation): string[] {
  const cells: string[] = [];
  let cell = '';
  let i = 0;
  let quoted = false;
  let wasQuoted = false;
  while (i < line.length) {
    const c = line[i];
    if (quoted) {
      if (c === '"') {
        if (line[i + 1] === '"') { cell += '"'; i += 2; continue; }
        quoted = false; i++; continue;
      }
      cell += c; i++; continue;
    }
    if (c === '"' && cell.trim() === '') { quoted = true; wasQuoted = true; cell = ''; i++; continue; }
    if (c === ',') { cells.push(wasQuoted ? cell : cell.trim()); cell = ''; wasQuoted = false; i++; continue; }
    cell += c; i++;
  }
  if (quoted) throw new InputError('orbit.table-unclosed-quote', messages.tableUnclosedQuote(), where);
  cells.push(wasQuoted ? cell : cell.trim());
  return cells;
}

/**
 * Parses a velocity table from text, choosing CSV or JSON by content (JSON when the first
 * non-blank character is `{` or `[`).
 *
 * @param text the file's content.
 * @param name file name for messages and `source`.
 * @param options logger for warnings (repeated times, unknown columns).
 * @returns a validated table whose provenance ends with a `read-velocity-table` entry.
 * @throws {InputError} with the file and line (CSV) or row line (JSON) for: a missing
 *   header row or column, a ragged row, a cell that is not a number, a non-finite value, a
 *   non-positive uncertainty, half a second-star pair, malformed JSON, an empty table.
 * @example
 * const t = parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s\n2460000.5,3.1,0.5\n', 'lvac7.csv');
 * t.velocityKmPerS[0]; // 3.1
 */
export function parseVelocityTable(text: string, name: string, options: ReadVelocityTableOptions = {}): VelocityTable {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const first = body.trimStart()[0];
  return first === '{' || first === '['
    ? parseJsonTable(body, name, options.logger ?? silentLogger)
    : parseCsvTable(body, name, options.logger ?? silentLogger);
}

/**
 * Reads a velocity table file (CSV or JSON, chosen by content).
 *
 * @param path file path.
 * @param options logger for warnings.
 * @returns the table, with `source` set.
 * @throws {InputError} as {@link parseVelocityTable}; Node's file errors (ENOENT …) pass through.
 * @example
 * const t = readVelocityTable('lvac7-velocities.csv'); // invented demo data
 */
export function readVelocityTable(path: string, options: ReadVelocityTableOptions = {}): VelocityTable {
  return parseVelocityTable(readFileSync(path, 'utf8'), path, options);
}

type ColumnKey = keyof typeof TABLE_COLUMNS;

function parseCsvTable(text: string, file: string, logger: Logger): VelocityTable {
  const lines = text.split(/\r\n|\n|\r/);
  const provenance: ProvenanceEntry[] = [];
  let header: string[] | undefined;
  let headerLine = 0;
  const index: Partial<Record<ColumnKey, number>> = {};
  const rows: { cells: string[]; line: number }[] = [];
  for (let k = 0; k < lines.length; k++) {
    const line = lines[k];
    const lineNo = k + 1;
    const trimmed = line.trim();
    if (trimmed === '') continue;
    if (trimmed.startsWith('#')) {
      const m = /^#\s*provenance:\s*(.*)$/.exec(trimmed);
      if (m) {
        try {
          const p = JSON.parse(m[1]) as ProvenanceEntry;
          if (typeof p.step === 'string' && typeof p.version === 'string') provenance.push(Object.freeze({ step: p.step, parameters: Object.freeze({ ...(p.parameters ?? {}) }), version: p.version }));
        } catch {
          logger.warn({ code: 'orbit.bad-provenance', message: `${prefix({ file, line: lineNo })}${messages.tableBadProvenance()}` });
        }
      }
      continue;
    }
    const cells = splitCsvLine(line, { file, line: lineNo });
    if (!header) {
      header = cells.map((c) => c.toLowerCase());
      headerLine = lineNo;
      if (NUMBER.test(header[0])) throw new InputError('orbit.table-missing-header', messages.tableMissingHeader(cells[0]), { file, line: lineNo });
      const known = new Map<string, ColumnKey>(Object.entries(TABLE_COLUMNS).map(([k, v]) => [v, k as ColumnKey]));
      header.forEach((h, j) => {
        const key = known.get(h);
        if (key === undefined) {
          logger.warn({ code: 'orbit.unknown-column', message: `${prefix({ file, line: lineNo })}${messages.tableUnknownColumn(cells[j])}` });
          return;
        }
        if (index[key] !== undefined) throw new InputError('orbit.table-duplicate-column', messages.tableDuplicateColumn(h), { file, line: lineNo });
        index[key] = j;
      });
      for (const key of ['time', 'velocity', 'uncertainty'] as const) {
        if (index[key] === undefined) throw new InputError('orbit.table-missing-column', messages.tableMissingColumn(TABLE_COLUMNS[key]), { file, line: lineNo });
      }
      if ((index.velocity2 === undefined) !== (index.uncertainty2 === undefined)) {
        const [p, m] = index.velocity2 !== undefined ? [TABLE_COLUMNS.velocity2, TABLE_COLUMNS.uncertainty2] : [TABLE_COLUMNS.uncertainty2, TABLE_COLUMNS.velocity2];
        throw new InputError('orbit.table-missing-column', messages.tablePairIncomplete(p, m), { file, line: lineNo });
      }
      continue;
    }
    if (cells.length !== header.length) throw new InputError('orbit.table-ragged', messages.tableRagged(cells.length, header.length), { file, line: lineNo });
    rows.push({ cells, line: lineNo });
  }
  if (!header) throw new InputError('orbit.table-empty', messages.tableEmpty(), { file });
  if (rows.length === 0) throw new InputError('orbit.table-empty', messages.tableEmpty(), { file, line: headerLine });

  const n = rows.length;
  const t = new Float64Array(n);
  const v = new Float64Array(n);
  const s = new Float64Array(n);
  const double = index.velocity2 !== undefined;
  const v2 = double ? new Float64Array(n) : undefined;
  const s2 = double ? new Float64Array(n) : undefined;
  const label: string[] = [];
  const num = (row: { cells: string[]; line: number }, key: ColumnKey, allowEmpty: boolean): number => {
    const text = row.cells[index[key]!];
    if (allowEmpty && text === '') return NaN;
    if (!NUMBER.test(text)) throw new InputError('orbit.table-not-number', messages.tableNotNumber(text), { file, line: row.line, column: TABLE_COLUMNS[key] });
    const x = Number(text);
    if (!Number.isFinite(x)) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(x), { file, line: row.line, column: TABLE_COLUMNS[key] });
    return x;
  };
  const seen = new Map<number, number>();
  rows.forEach((row, i) => {
    t[i] = num(row, 'time', false);
    v[i] = num(row, 'velocity', false);
    s[i] = num(row, 'uncertainty', false);
    if (!(s[i] > 0)) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s[i]), { file, line: row.line, column: TABLE_COLUMNS.uncertainty });
    if (v2 && s2) {
      v2[i] = num(row, 'velocity2', true);
      s2[i] = num(row, 'uncertainty2', true);
      if (Number.isNaN(v2[i]) !== Number.isNaN(s2[i])) {
        const [p, m] = Number.isNaN(s2[i]) ? [TABLE_COLUMNS.velocity2, TABLE_COLUMNS.uncertainty2] : [TABLE_COLUMNS.uncertainty2, TABLE_COLUMNS.velocity2];
        throw new InputError('orbit.table-half-pair', messages.tableHalfPair(p, m), { file, line: row.line, column: m });
      }
      if (!Number.isNaN(s2[i]) && !(s2[i] > 0)) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s2[i]), { file, line: row.line, column: TABLE_COLUMNS.uncertainty2 });
    }
    label.push(index.label !== undefined ? row.cells[index.label] : '');
    const firstLine = seen.get(t[i]);
    if (firstLine !== undefined) {
      logger.warn({ code: 'orbit.duplicate-time', message: `${prefix({ file, line: row.line })}${messages.tableDuplicateTime(t[i], `line ${firstLine}`)}` });
    } else {
      seen.set(t[i], row.line);
    }
  });
  provenance.push(provenanceEntry('read-velocity-table', { file, format: 'csv', rows: n }));
  // Values are already checked row by row with line numbers; createVelocityTable re-checks
  // cheaply and must not warn twice about repeated times.
  return createVelocityTable(
    { bjdTdb: t, velocityKmPerS: v, uncertaintyKmPerS: s, label, ...(v2 && s2 ? { velocity2KmPerS: v2, uncertainty2KmPerS: s2 } : {}), provenance, source: { file, format: 'csv' } },
    { file },
  );
}

/** 1-based line number of each element of the array at `path` (top-level array, or the "rows" member). */
function rowLines(text: string, bareArray: boolean): number[] {
  const lines: number[] = [];
  let line = 1;
  let depth = 0;
  let inString = false;
  let lastKey = '';
  let stringStart = 0;
  let rowsDepth = bareArray ? 1 : -1;
  let expectValue = false;
  let pendingKey = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '\n') { line++; continue; }
    if (inString) {
      if (c === '\\') { i++; continue; }
      if (c === '"') {
        inString = false;
        if (pendingKey && depth === 1) lastKey = text.slice(stringStart + 1, i);
      }
      continue;
    }
    if (c === '"') {
      inString = true; stringStart = i;
      pendingKey = !expectValue;
      if (depth === rowsDepth) lines.push(line);
      continue;
    }
    if (c === ':') { expectValue = true; continue; }
    if (c === ',') { expectValue = false; continue; }
    if (c === '{' || c === '[') {
      if (depth === rowsDepth) lines.push(line);
      depth++;
      if (!bareArray && depth === 2 && c === '[' && lastKey === 'rows') rowsDepth = 2;
      expectValue = false;
      continue;
    }
    if (c === '}' || c === ']') {
      depth--;
      if (!bareArray && depth === 1 && rowsDepth === 2) rowsDepth = -1;
      continue;
    }
    if (depth === rowsDepth && /[-\dtfn]/.test(c)) {
      lines.push(line);
      while (i + 1 < text.length && !/[,\]\s]/.test(text[i + 1])) i++;
    }
  }
  return lines;
}

function parseJsonTable(text: string, file: string, logger: Logger): VelocityTable {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const detail = e instanceof Error ? e.message : String(e);
    const pos = /position (\d+)/.exec(detail);
    const where: ErrorLocation = { file };
    if (pos) where.line = text.slice(0, Number(pos[1])).split('\n').length;
    throw new InputError('orbit.table-bad-json', messages.tableBadJson(detail.replace(/\s*in JSON at position \d+.*$/, '')), where);
  }
  const bare = Array.isArray(doc);
  const rowsValue = bare ? doc : doc !== null && typeof doc === 'object' ? (doc as Record<string, unknown>).rows : undefined;
  if (!Array.isArray(rowsValue)) throw new InputError('orbit.table-json-shape', messages.tableJsonShape(), { file });
  const rows = rowsValue as unknown[];
  const lineOf = rowLines(text, bare);
  const where = (i: number, column?: string): ErrorLocation => {
    const w: ErrorLocation = { file };
    if (lineOf.length === rows.length) w.line = lineOf[i]; else w.index = i;
    if (column !== undefined) w.column = column;
    return w;
  };
  if (rows.length === 0) throw new InputError('orbit.table-empty', messages.tableEmpty(), { file });
  const n = rows.length;
  const t = new Float64Array(n);
  const v = new Float64Array(n);
  const s = new Float64Array(n);
  const label: string[] = [];
  const anyDouble = rows.some((r) => r !== null && typeof r === 'object' && ('velocity2KmPerS' in r || 'uncertainty2KmPerS' in r));
  const v2 = anyDouble ? new Float64Array(n) : undefined;
  const s2 = anyDouble ? new Float64Array(n) : undefined;
  const seen = new Map<number, number>();
  rows.forEach((r, i) => {
    if (r === null || typeof r !== 'object' || Array.isArray(r)) throw new InputError('orbit.table-json-row', messages.tableJsonRow(), where(i));
    const row = r as Record<string, unknown>;
    const num = (field: string, optional: boolean): number => {
      const x = row[field];
      if (x === undefined || x === null) {
        if (optional) return NaN;
        throw new InputError('orbit.table-missing-column', messages.tableJsonMissing(field), where(i, field));
      }
      if (typeof x !== 'number') throw new InputError('orbit.table-not-number', messages.tableJsonNotNumber(field, x), where(i, field));
      return x;
    };
    t[i] = num('bjdTdb', false);
    v[i] = num('velocityKmPerS', false);
    s[i] = num('uncertaintyKmPerS', false);
    if (!(s[i] > 0 && Number.isFinite(s[i]))) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s[i]), where(i, 'uncertaintyKmPerS'));
    if (v2 && s2) {
      v2[i] = num('velocity2KmPerS', true);
      s2[i] = num('uncertainty2KmPerS', true);
      if (Number.isNaN(v2[i]) !== Number.isNaN(s2[i])) {
        const [p, m] = Number.isNaN(s2[i]) ? ['velocity2KmPerS', 'uncertainty2KmPerS'] : ['uncertainty2KmPerS', 'velocity2KmPerS'];
        throw new InputError('orbit.table-half-pair', messages.tableHalfPair(p, m), where(i, m));
      }
      if (!Number.isNaN(s2[i]) && !(s2[i] > 0 && Number.isFinite(s2[i]))) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(s2[i]), where(i, 'uncertainty2KmPerS'));
    }
    const lab = row.label;
    if (lab !== undefined && lab !== null && typeof lab !== 'string') throw new InputError('orbit.table-json-label', messages.tableJsonLabel(lab), where(i, 'label'));
    label.push(typeof lab === 'string' ? lab : '');
    const firstRow = seen.get(t[i]);
    if (firstRow !== undefined) {
      const w = where(i);
      const other = lineOf.length === rows.length ? `line ${lineOf[firstRow]}` : `index ${firstRow}`;
      logger.warn({ code: 'orbit.duplicate-time', message: `${prefix(w)}${messages.tableDuplicateTime(t[i], other)}` });
    } else {
      seen.set(t[i], i);
    }
  });
  const provenance: ProvenanceEntry[] = [];
  const prov = bare ? undefined : (doc as Record<string, unknown>).provenance;
  if (Array.isArray(prov)) {
    for (const p of prov as Partial<ProvenanceEntry>[]) {
      if (p && typeof p.step === 'string' && typeof p.version === 'string') {
        provenance.push(Object.freeze({ step: p.step, parameters: Object.freeze({ ...(p.parameters ?? {}) }), version: p.version }));
      }
    }
  }
  provenance.push(provenanceEntry('read-velocity-table', { file, format: 'json', rows: n }));
  return createVelocityTable(
    { bjdTdb: t, velocityKmPerS: v, uncertaintyKmPerS: s, label, ...(v2 && s2 ? { velocity2KmPerS: v2, uncertainty2KmPerS: s2 } : {}), provenance, source: { file, format: 'json' } },
    { file },
  );
}

function csvCell(text: string): string {
  return /[",\r\n]/.test(text) || text !== text.trim() || text.startsWith('#') ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Formats a table as CSV text (the layout {@link parseVelocityTable} reads), with the
 * provenance as `# provenance: {...}` comment lines. Numbers are written with the
 * shortest text that reads back to the same double.
 *
 * @param table the table.
 * @returns CSV text ending with a newline.
 * @example
 * formatVelocityTableCsv(createVelocityTable({ bjdTdb: [2460000.5], velocityKmPerS: [3.1], uncertaintyKmPerS: [0.5] }));
 * // 'bjd_tdb,velocity_km_s,uncertainty_km_s,label\n2460000.5,3.1,0.5,\n'
 */
export function formatVelocityTableCsv(table: VelocityTable): string {
  const out: string[] = [];
  for (const p of table.provenance) out.push(`# provenance: ${JSON.stringify(p)}`);
  const double = table.velocity2KmPerS !== undefined;
  const cols: string[] = [TABLE_COLUMNS.time, TABLE_COLUMNS.velocity, TABLE_COLUMNS.uncertainty];
  if (double) cols.push(TABLE_COLUMNS.velocity2, TABLE_COLUMNS.uncertainty2);
  cols.push(TABLE_COLUMNS.label);
  out.push(cols.join(','));
  const num = (x: number) => (Number.isNaN(x) ? '' : String(x));
  for (let i = 0; i < table.bjdTdb.length; i++) {
    const cells = [String(table.bjdTdb[i]), String(table.velocityKmPerS[i]), String(table.uncertaintyKmPerS[i])];
    if (double) cells.push(num(table.velocity2KmPerS![i]), num(table.uncertainty2KmPerS![i]));
    cells.push(csvCell(table.label[i]));
    out.push(cells.join(','));
  }
  return out.join('\n') + '\n';
}

/**
 * Formats a table as JSON text (the layout {@link parseVelocityTable} reads): one row per
 * line, provenance included; second-star cells that were not measured are left out.
 *
 * @param table the table.
 * @returns JSON text ending with a newline.
 * @example
 * JSON.parse(formatVelocityTableJson(table)).rows[0].bjdTdb; // the first time
 */
export function formatVelocityTableJson(table: VelocityTable): string {
  const rows: string[] = [];
  for (let i = 0; i < table.bjdTdb.length; i++) {
    const row: Record<string, number | string> = {
      bjdTdb: table.bjdTdb[i],
      velocityKmPerS: table.velocityKmPerS[i],
      uncertaintyKmPerS: table.uncertaintyKmPerS[i],
    };
    if (table.velocity2KmPerS && !Number.isNaN(table.velocity2KmPerS[i])) {
      row.velocity2KmPerS = table.velocity2KmPerS[i];
      row.uncertainty2KmPerS = table.uncertainty2KmPerS![i];
    }
    if (table.label[i] !== '') row.label = table.label[i];
    rows.push('    ' + JSON.stringify(row));
  }
  const prov = table.provenance.map((p) => '    ' + JSON.stringify(p));
  return `{\n  "rows": [\n${rows.join(',\n')}\n  ],\n  "provenance": [\n${prov.join(',\n')}\n  ]\n}\n`;
}

/** Options of {@link writeVelocityTable}. */
export interface WriteVelocityTableOptions {
  /** File format. Default: `json` when the path ends in `.json`, otherwise `csv`. */
  format?: VelocityTableFormat;
}

/**
 * Writes a table to a file: first to a temporary name beside it, then renamed into place,
 * so a reader never sees half a file. Appends a `write-velocity-table` provenance entry to
 * what is written (the table itself is not changed).
 *
 * @param path output path.
 * @param table the table.
 * @param options format.
 * @throws {UsageError} when the path is the table's own input file or the format is unknown.
 * @example
 * writeVelocityTable('lvac7-velocities.json', table);
 */
export function writeVelocityTable(path: string, table: VelocityTable, options: WriteVelocityTableOptions = {}): void {
  const format = options.format ?? (extname(path).toLowerCase() === '.json' ? 'json' : 'csv');
  if (format !== 'csv' && format !== 'json') throw new UsageError('orbit.write-format', messages.writeFormat(String(format)));
  if (table.source && resolve(table.source.file) === resolve(path)) throw new UsageError('orbit.write-over-input', messages.writeOverInput(path));
  const out: VelocityTable = { ...table, provenance: [...table.provenance, provenanceEntry('write-velocity-table', { file: path, format })] };
  const text = format === 'json' ? formatVelocityTableJson(out) : formatVelocityTableCsv(out);
  writeFileAtomic(path, text);
}
