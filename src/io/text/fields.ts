/**
 * Low-level pieces shared by the delimited-text readers (spectra and line lists):
 * decoding bytes to text, walking lines, splitting a line into fields, and reading a
 * numeric cell. Every failure is an {@link InputError} that names the file, the line
 * and, where it helps, the column.
 */
import { InputError, type ErrorLocation } from '../../errors.js';
import type { Logger } from '../../logger.js';

/** Field separator of a delimited text file. `whitespace` means runs of spaces and tabs. */
export type Delimiter = ',' | '\t' | ';' | 'whitespace';

/** Longest line, in characters, that a text reader accepts. A longer line is not a table row. */
export const MAX_LINE_LENGTH = 65_536;

/** The delimiter's name as written in messages and provenance. */
export function delimiterName(d: Delimiter): 'comma' | 'tab' | 'semicolon' | 'whitespace' {
  return d === ',' ? 'comma' : d === '\t' ? 'tab' : d === ';' ? 'semicolon' : 'whitespace';
}

/**
 * Decodes the bytes of a text file: UTF-8 (a byte-order mark is dropped), or Latin-1 with a
 * warning when the bytes are not valid UTF-8.
 *
 * @throws {InputError} `text.binary` when the bytes hold control characters other than
 *   tab, line feed, form feed and carriage return (a binary file, not text), naming the line
 *   and column of the first one; `text.utf16` for UTF-16 text.
 */
export function decodeText(bytes: Uint8Array, file: string, logger?: Logger): string {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) {
    throw new InputError('text.utf16', 'the file is UTF-16 text; save it as UTF-8 (or plain ASCII)', { file });
  }
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b === 0x0a) {
      line++;
      lineStart = i + 1;
    } else if ((b < 0x20 && b !== 0x09 && b !== 0x0c && b !== 0x0d) || b === 0x7f) {
      throw new InputError(
        'text.binary',
        `the file is not text: it holds the control byte 0x${b.toString(16).padStart(2, '0')} (a binary file?)`,
        { file, line, column: String(i - lineStart + 1) },
      );
    }
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    logger?.warn({ code: 'text.not-utf8', message: `${file}: the file is not valid UTF-8; read it as Latin-1` });
    return new TextDecoder('latin1').decode(bytes);
  }
}

/** One line of a text file: its 1-based number and its text without the line ending. */
export interface TextLine {
  readonly number: number;
  readonly text: string;
}

/**
 * The lines of a text, one at a time (LF, CRLF and lone CR endings all end a line; a
 * final line ending does not make an extra empty line).
 *
 * @throws {InputError} `text.line-too-long` for a line longer than {@link MAX_LINE_LENGTH}.
 */
export function* textLines(text: string, file: string): Generator<TextLine> {
  let start = 0;
  let number = 1;
  const n = text.length;
  if (text.indexOf('\r') < 0) {
    // Fast path: LF line ends only.
    while (start < n) {
      let end = text.indexOf('\n', start);
      if (end < 0) end = n;
      if (end - start > MAX_LINE_LENGTH) {
        throw new InputError('text.line-too-long', `the line is longer than ${MAX_LINE_LENGTH} characters; this is not a table of numbers`, { file, line: number });
      }
      yield { number, text: text.slice(start, end) };
      start = end + 1;
      number++;
    }
    return;
  }
  while (start < n) {
    let end = start;
    while (end < n) {
      const c = text.charCodeAt(end);
      if (c === 10 || c === 13) break;
      end++;
      if (end - start > MAX_LINE_LENGTH) {
        throw new InputError('text.line-too-long', `the line is longer than ${MAX_LINE_LENGTH} characters; this is not a table of numbers`, { file, line: number });
      }
    }
    yield { number, text: text.slice(start, end) };
    if (end < n && text.charCodeAt(end) === 13 && end + 1 < n && text.charCodeAt(end + 1) === 10) end++;
    start = end + 1;
    number++;
  }
}

function isBlank(c: string): boolean {
  return c === ' ' || c === '\t' || c === '\f';
}

/**
 * Splits one line into fields. Fields are trimmed; a field may be quoted with double
 * quotes (a doubled quote inside stands for one quote), and may then hold the delimiter
 * or `#`. An unquoted `#` starts a trailing comment, which is dropped. In `whitespace`
 * mode, runs of blanks separate fields and leading/trailing blanks make no empty field.
 *
 * @throws {InputError} `text.bad-quote` for an unterminated quote or text after a closing quote.
 */
export function splitFields(line: string, delimiter: Delimiter, where: ErrorLocation): string[] {
  const ws = delimiter === 'whitespace';
  if (line.indexOf('"') < 0) {
    const hash = line.indexOf('#');
    const body = hash < 0 ? line : line.slice(0, hash);
    if (ws) {
      const t = body.trim();
      return t === '' ? [] : t.split(/[ \t\f]+/);
    }
    const parts = body.split(delimiter);
    for (let i = 0; i < parts.length; i++) {
      const f = parts[i];
      const a = f.charCodeAt(0);
      const b = f.charCodeAt(f.length - 1);
      if (a <= 32 || b <= 32) parts[i] = f.trim();
    }
    return parts;
  }
  const fields: string[] = [];
  let cur = '';
  let quoted = false;
  let inQuotes = false;
  let afterQuote = false;
  let any = false;
  const push = () => {
    fields.push(quoted ? cur : cur.trim());
    cur = '';
    quoted = false;
    afterQuote = false;
  };
  let i = 0;
  if (ws) while (i < line.length && isBlank(line[i])) i++;
  for (; i < line.length; i++) {
    const ch = line[i];
    if (inQuotes) {
      if (ch === '"') {
        if (line[i + 1] === '"') {
          cur += '"';
          i++;
        } else {
          inQuotes = false;
          afterQuote = true;
        }
      } else {
        cur += ch;
      }
      continue;
    }
    if (ch === '#') break;
    const isDelim = ws ? isBlank(ch) : ch === delimiter;
    if (isDelim) {
      push();
      any = false;
      if (ws) {
        while (i + 1 < line.length && isBlank(line[i + 1])) i++;
        // Blanks before a trailing comment or the line end make no extra field.
        if (i + 1 >= line.length || line[i + 1] === '#') return fields;
      }
      continue;
    }
    if (ch === '"' && !quoted && cur.trim() === '') {
      inQuotes = true;
      quoted = true;
      any = true;
      cur = '';
      continue;
    }
    if (afterQuote) {
      if (isBlank(ch)) continue;
      throw new InputError('text.bad-quote', `unexpected text after a closing quote in field ${fields.length + 1}`, where);
    }
    cur += ch;
    any = true;
  }
  if (inQuotes) throw new InputError('text.bad-quote', `a quote opened in field ${fields.length + 1} is not closed on this line`, where);
  if (!ws || any || quoted) push();
  return fields;
}

const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?$/;
const NAN_RE = /^[+-]?nan$/i;
const INF_RE = /^([+-]?)inf(?:inity)?$/i;

/**
 * Reads a numeric cell: decimal numbers with an optional exponent (`e`, or the Fortran `d`),
 * `NaN`/`nan` (any case, optional sign), `inf`/`Infinity` (any case, optional sign). An empty
 * cell gives NaN. Anything else (including `0x10`, `1,5` and `1 000`) gives undefined.
 *
 * @example parseNumberCell('6562.8'); // 6562.8
 * @example parseNumberCell('-inf'); // -Infinity
 * @example parseNumberCell('abc'); // undefined
 */
export function parseNumberCell(cell: string): number | undefined {
  if (cell === '') return NaN;
  // Fast path: only digits, sign, point and e/E. For such text, Number() accepts exactly what
  // NUMBER_RE accepts (a decimal literal) and gives NaN for anything else ('-', '1e', '1.2.3').
  let plain = true;
  for (let i = 0; i < cell.length && plain; i++) {
    const c = cell.charCodeAt(i);
    plain = (c >= 48 && c <= 57) || c === 46 || c === 43 || c === 45 || c === 101 || c === 69;
  }
  if (plain) {
    const v = Number(cell);
    return Number.isNaN(v) ? undefined : v;
  }
  if (NUMBER_RE.test(cell)) return Number(cell.replace(/[dD]/, 'e'));
  if (NAN_RE.test(cell)) return NaN;
  const m = INF_RE.exec(cell);
  if (m) return m[1] === '-' ? -Infinity : Infinity;
  return undefined;
}

/** True when a cell reads as a number (including NaN and infinity words, excluding the empty cell). */
export function isNumberCell(cell: string): boolean {
  return cell !== '' && parseNumberCell(cell) !== undefined;
}

/** Hint added to a non-numeric-cell message when the cell looks like a number with a decimal comma. */
export function decimalCommaHint(cell: string): string {
  return /^[+-]?\d+,\d+(?:[eE][+-]?\d+)?$/.test(cell) ? ' (decimal commas are not supported; use a point)' : '';
}

/**
 * Chooses the delimiter of a table from some of its content lines: the first of comma, tab
 * and semicolon that appears (outside quotes and comments) in the first line and in at least
 * half of the lines; otherwise whitespace. A tab is not taken when the cells it separates
 * hold blanks in the middle (a whitespace-aligned table that happens to use tabs).
 */
export function detectDelimiter(lines: readonly string[]): Delimiter {
  if (lines.length === 0) return 'whitespace';
  const unquoted = lines.map((l) => stripQuotedAndComment(l));
  for (const d of [',', '\t', ';'] as const) {
    if (!unquoted[0].includes(d)) continue;
    const count = unquoted.filter((l) => l.includes(d)).length;
    if (count * 2 < unquoted.length) continue;
    if (d === '\t') {
      const inner = unquoted.slice(1).some((l) => l.split('\t').some((f) => /\S[ \f]+\S/.test(f) && f.trim().split(/[ \f]+/).every(isNumberCell)));
      if (inner) continue;
    }
    return d;
  }
  return 'whitespace';
}

/** The line without quoted text, bracketed units (`[nm, air]`, `(Å)`) and a trailing comment. */
function stripQuotedAndComment(line: string): string {
  let out = '';
  let inQuotes = false;
  let depth = 0;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (ch === '"') inQuotes = !inQuotes;
    else if (inQuotes) continue;
    else if (ch === '#') break;
    else if (ch === '[' || ch === '(') depth++;
    else if ((ch === ']' || ch === ')') && depth > 0) depth--;
    else if (depth === 0) out += ch;
  }
  return out;
}

/**
 * In a whitespace-separated header row, `wavelength [nm, air]` splits into several fields:
 * join each bracketed part to the name before it.
 *
 * @example joinBracketedUnits(['wavelength', '[nm,', 'air]', 'flux']); // ['wavelength [nm, air]', 'flux']
 */
export function joinBracketedUnits(fields: readonly string[]): string[] {
  const out: string[] = [];
  for (const f of fields) {
    const last = out[out.length - 1];
    const open = last === undefined ? 0 : (last.match(/[[(]/g)?.length ?? 0) - (last.match(/[\])]/g)?.length ?? 0);
    if (last !== undefined && (open > 0 || /^[[(]/.test(f))) out[out.length - 1] += ` ${f}`;
    else out.push(f);
  }
  return out;
}
