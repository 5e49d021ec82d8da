/**
 * One 80-character FITS header card: parsing (FITS Standard 4.0 §4.1–§4.2) and
 * formatting (the fixed format of §4.2, used by the writer).
 *
 * Internal module: the public API is in `spectrum.ts`, `write.ts`, `structure.ts` and
 * `checksum.ts`.
 */
import type { CardValue, HeaderCard } from '../../spectrum/header.js';

/** Length of a header card in characters (§4.1.1). */
export const CARD_LENGTH = 80;

/** Length of a FITS block in bytes (§3.1). */
export const BLOCK_LENGTH = 2880;

/** Cards per block. */
export const CARDS_PER_BLOCK = BLOCK_LENGTH / CARD_LENGTH;

/** A card as it comes out of {@link parseCard}, before CONTINUE cards are joined. */
export type RawCard =
  | {
      readonly kind: 'value';
      readonly card: HeaderCard;
      readonly hierarch: boolean;
      /** For string values: the text between the quotes with `''` undone, trailing blanks kept (for `&`). */
      readonly rawString?: string;
      /** Set when the value is of no FITS type and was kept as text. */
      readonly malformed?: string;
    }
  | { readonly kind: 'commentary'; readonly card: HeaderCard }
  | { readonly kind: 'continue'; readonly text: string | undefined; readonly comment: string | undefined; readonly rawField: string }
  | { readonly kind: 'end' };

/** Problem found in one card; the caller adds the file, HDU and card number. */
export class CardProblem extends Error {
  constructor(
    readonly code: string,
    readonly detail: string,
    readonly keyword: string | undefined,
  ) {
    super(detail);
  }
}

/** A keyword of the standard form: up to 8 of A–Z, 0–9, hyphen, underscore (§4.1.2.1). */
const STANDARD_KEYWORD = /^[A-Z0-9_-]{1,8}$/;

/** True when `keyword` can be written in bytes 1–8 of a card without the HIERARCH convention. */
export function isStandardKeyword(keyword: string): boolean {
  return STANDARD_KEYWORD.test(keyword);
}

const INTEGER = /^[+-]?\d+$/;
// §4.2.4: a real has a decimal point or an exponent; E or D marks the exponent. Lower-case
// exponent letters are tolerated on reading.
const REAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[EeDd][+-]?\d+)?$/;
const REAL_PART = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:[EeDd][+-]?\d+)?`;
const COMPLEX = new RegExp(String.raw`^\(\s*${REAL_PART}\s*,\s*${REAL_PART}\s*\)$`);

/** What {@link parseValueField} finds in a value field. */
export interface ValueFieldResult {
  value: CardValue;
  rawValue?: string;
  comment?: string;
  /** Set when the value is not of any FITS type and was kept as the text found. */
  malformed?: string;
}

/**
 * Parses the value field of a card (the text after `= `, or after `CONTINUE`), §4.2.
 * Strings: `'` delimited, `''` is a quote, trailing blanks are insignificant (§4.2.1.1);
 * logical T/F (§4.2.2); integers (§4.2.3, bigint beyond 2^53); reals with E or D
 * exponents (§4.2.4, raw text kept); complex as text (§4.2.5, raw text kept); an empty
 * field is the undefined value, null (§4.1.2.3).
 */
export function parseValueField(field: string): ValueFieldResult {
  let i = 0;
  while (i < field.length && field[i] === ' ') i++;
  if (i >= field.length) return { value: null };
  if (field[i] === '/') return { value: null, comment: commentText(field.slice(i + 1)) };
  if (field[i] === "'") {
    let text = '';
    let j = i + 1;
    for (;;) {
      const q = field.indexOf("'", j);
      if (q < 0) throw new CardProblem('fits.unterminated-string', 'the string value has no closing quote', undefined);
      text += field.slice(j, q);
      if (field[q + 1] === "'") {
        text += "'";
        j = q + 2;
        continue;
      }
      j = q + 1;
      break;
    }
    const rest = field.slice(j);
    const slash = rest.indexOf('/');
    const between = slash < 0 ? rest : rest.slice(0, slash);
    const result: ValueFieldResult = { value: normaliseString(text) };
    if (slash >= 0) result.comment = commentText(rest.slice(slash + 1));
    if (between.trim() !== '') result.malformed = field.trim();
    return result;
  }
  // Not a string: the value runs up to the first slash. A complex value has no slash either.
  const slash = field.indexOf('/', i);
  const token = (slash < 0 ? field.slice(i) : field.slice(i, slash)).trim();
  const result: ValueFieldResult = { value: null };
  if (slash >= 0) result.comment = commentText(field.slice(slash + 1));
  if (token === 'T' || token === 'F') {
    result.value = token === 'T';
  } else if (INTEGER.test(token)) {
    const digits = token.replace(/^[+-]/, '').replace(/^0+(?=\d)/, '');
    if (digits.length <= 15) result.value = Number(token);
    else {
      const big = BigInt(token);
      result.value = big >= BigInt(Number.MIN_SAFE_INTEGER) && big <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(big) : big;
    }
  } else if (REAL.test(token)) {
    result.value = Number(token.replace(/[Dd]/, 'E'));
    result.rawValue = token;
  } else if (COMPLEX.test(token)) {
    // Complex values are kept as their text (§4.2.5); rawValue lets the writer reproduce them.
    result.value = token;
    result.rawValue = token;
  } else {
    result.value = token;
    result.malformed = token;
  }
  return result;
}

/** Trailing blanks in a string value are insignificant; a value of only blanks is one blank (§4.2.1.1). */
function normaliseString(text: string): string {
  const trimmed = text.replace(/ +$/, '');
  return trimmed === '' && text.length > 0 ? ' ' : trimmed;
}

function commentText(text: string): string {
  return text.trim();
}

/**
 * Parses one 80-character card. `text` must already be checked to be printable ASCII.
 *
 * @throws {CardProblem} for an unterminated string.
 */
export function parseCard(text: string): RawCard {
  const name = text.slice(0, 8);
  // HIERARCH convention (a registered FITS convention, not part of the Standard):
  // `HIERARCH ESO DET CHIP = value / comment`. The keyword is the full name after HIERARCH.
  if (name === 'HIERARCH' && text.indexOf('=', 8) > 8) {
    const eq = text.indexOf('=', 8);
    const keyword = text.slice(8, eq).trim().replace(/\s+/g, ' ').toUpperCase();
    if (keyword !== '') {
      return valueRawCard(keyword, text.slice(eq + 1), true);
    }
  }
  const keyword = name.trim().toUpperCase();
  if (keyword === 'END' && name.trimEnd() === 'END') return { kind: 'end' };
  if (keyword === 'COMMENT' || keyword === 'HISTORY' || keyword === '') {
    // Commentary keywords (§4.4.2.4): bytes 9–80 are free text, even when they hold '= '.
    return { kind: 'commentary', card: { keyword, text: text.slice(8).trimEnd() } };
  }
  if (keyword === 'CONTINUE') {
    // Long-string convention (§4.2.1.2): bytes 9–10 blank, a string value from byte 11.
    const rawField = text.slice(8);
    if (rawField.trimStart().startsWith("'")) {
      try {
        const field = parseValueField(rawField);
        if (typeof field.value === 'string' && field.malformed === undefined) {
          return { kind: 'continue', text: rawStringContent(rawField), comment: field.comment, rawField };
        }
      } catch {
        // fall through: kept as a commentary-like card
      }
    }
    return { kind: 'continue', text: undefined, comment: undefined, rawField };
  }
  if (text.slice(8, 10) === '= ') {
    return valueRawCard(keyword, text.slice(10), false);
  }
  // A keyword without a value indicator: bytes 9–80 are commentary (§4.1.2.2).
  return { kind: 'commentary', card: { keyword, text: text.slice(8).trimEnd() } };
}

/** The string content of a CONTINUE field without trimming trailing blanks (they matter before `&`). */
function rawStringContent(field: string): string {
  const start = field.indexOf("'");
  let text = '';
  let j = start + 1;
  for (;;) {
    const q = field.indexOf("'", j);
    if (q < 0) return text;
    text += field.slice(j, q);
    if (field[q + 1] === "'") {
      text += "'";
      j = q + 2;
      continue;
    }
    return text;
  }
}

function valueRawCard(keyword: string, fieldText: string, hierarch: boolean): RawCard {
  const field = parseValueField(fieldText);
  const card: { keyword: string; value: CardValue; comment?: string; rawValue?: string } = { keyword, value: field.value };
  if (field.comment !== undefined && field.comment !== '') card.comment = field.comment;
  if (field.rawValue !== undefined) card.rawValue = field.rawValue;
  const isQuoted = fieldText.trimStart().startsWith("'");
  return {
    kind: 'value',
    card,
    hierarch,
    ...(isQuoted && field.malformed === undefined ? { rawString: rawStringContent(fieldText) } : {}),
    ...(field.malformed !== undefined ? { malformed: field.malformed } : {}),
  };
}

// ---------------------------------------------------------------------------------------
// Formatting (fixed format, §4.2): values right-justified to byte 30, strings from byte 11.

/** Formats a number as a FITS real: shortest text that reads back to the same double, with an `E` exponent. */
export function formatReal(x: number): string {
  let s = String(x);
  if (/e/.test(s)) {
    const [mantissa, exponent] = s.split('e');
    s = `${mantissa.includes('.') ? mantissa : mantissa + '.0'}E${exponent}`;
  } else if (!s.includes('.')) {
    s += '.0';
  }
  return s;
}

/** The text of a non-string value, or undefined for strings (which need quoting and may need CONTINUE). */
export function formatScalar(card: HeaderCard): string | undefined {
  const v = card.value;
  if (v === null || v === undefined) return '';
  if (typeof v === 'boolean') return v ? 'T' : 'F';
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'number') {
    // Keep the text as read (e.g. `1.5D3`) when it still says the same number.
    if (card.rawValue !== undefined && REAL.test(card.rawValue) && Object.is(Number(card.rawValue.replace(/[Dd]/, 'E')), v)) {
      return card.rawValue;
    }
    return Number.isInteger(v) && card.rawValue === undefined && Math.abs(v) < 1e21 ? v.toFixed(0) : formatReal(v);
  }
  // A complex value read from a file is kept as text with rawValue set: write it back unquoted.
  if (typeof v === 'string' && card.rawValue !== undefined && card.rawValue === v && COMPLEX.test(v)) return v;
  return undefined;
}

/** Quotes a string for a card: `'` doubled, padded to at least 8 characters inside the quotes (§4.2.1.1). */
export function quoteString(s: string): string {
  return `'${s.replace(/'/g, "''").padEnd(8, ' ')}'`;
}

/** Longest `KEYWORD = ` prefix that leaves room for a value (HIERARCH keywords can be long). */
const MAX_PREFIX = 60;

/** Longest keyword written with the HIERARCH convention (`HIERARCH ` + keyword + ` = ` ≤ {@link MAX_PREFIX}). */
export const MAX_HIERARCH_KEYWORD = MAX_PREFIX - 12;

function pad80(s: string): string {
  return s.length >= CARD_LENGTH ? s.slice(0, CARD_LENGTH) : s.padEnd(CARD_LENGTH, ' ');
}

function withComment(head: string, comment: string | undefined): string {
  if (comment === undefined || comment === '') return pad80(head);
  const room = CARD_LENGTH - head.length - 3;
  if (room <= 0) return pad80(head);
  return pad80(`${head} / ${comment.slice(0, room)}`);
}

/**
 * Formats a card as one or more 80-character card images (more than one for long strings,
 * which use CONTINUE cards, §4.2.1.2, and for commentary longer than 72 characters).
 * `keyword` must be upper case; keywords that are not of the standard form are written
 * with the HIERARCH convention. Text must be printable ASCII (the caller checks).
 */
export function formatCard(card: HeaderCard): string[] {
  const kw = card.keyword;
  if (card.value === undefined) {
    // Commentary: bytes 9–80 hold the text; longer text goes on further cards of the same keyword.
    const text = card.text ?? '';
    const out: string[] = [];
    for (let i = 0; i === 0 || i < text.length; i += 72) out.push(pad80(kw.padEnd(8, ' ') + text.slice(i, i + 72)));
    return out;
  }
  const standard = isStandardKeyword(kw);
  const prefix = standard ? `${kw.padEnd(8, ' ')}= ` : `HIERARCH ${kw} = `;
  if (prefix.length > MAX_PREFIX) {
    throw new CardProblem('fits.keyword-too-long', `the keyword is ${kw.length} characters long; at most ${MAX_PREFIX - 12} fit on a HIERARCH card`, kw);
  }
  const scalar = formatScalar(card);
  if (scalar !== undefined) {
    const head = standard ? prefix + scalar.padStart(20, ' ') : prefix + scalar;
    return [withComment(head, card.comment)];
  }
  const s = String(card.value);
  const quoted = quoteString(s);
  // A short string is padded to a 20-character value field (bytes 11–30), the layout most
  // writers use; checksum verifiers that re-format the CHECKSUM card expect it.
  if (prefix.length + quoted.length <= CARD_LENGTH) return [withComment(prefix + (standard ? quoted.padEnd(20, ' ') : quoted), card.comment)];
  return formatLongString(prefix, s, card.comment);
}

/**
 * Splits a long string over a first card and CONTINUE cards (§4.2.1.2): every chunk but
 * the last ends in `&`. A comment goes on the last card when it fits; otherwise it is
 * split at spaces over CONTINUE cards holding an empty string (`'&'`, then `''`), and the
 * reader joins the parts with one space.
 */
function formatLongString(prefix: string, s: string, comment: string | undefined): string[] {
  const out: string[] = [];
  let rest = s;
  let head = prefix;
  for (;;) {
    // Room inside the quotes, keeping one character for a possible '&'.
    const room = CARD_LENGTH - head.length - 3;
    let n = 0;
    let used = 0;
    while (n < rest.length && used + (rest[n] === "'" ? 2 : 1) <= room) {
      used += rest[n] === "'" ? 2 : 1;
      n++;
    }
    if (n >= rest.length) {
      out.push(head + `'${rest.replace(/'/g, "''")}'`);
      break;
    }
    out.push(pad80(head + `'${rest.slice(0, n).replace(/'/g, "''")}&'`));
    rest = rest.slice(n);
    head = 'CONTINUE  ';
  }
  const last = out.pop() as string;
  if (comment === undefined || comment === '' || last.length + 3 + comment.length <= CARD_LENGTH) {
    out.push(withComment(last, comment));
    return out;
  }
  out.push(pad80(last.replace(/'$/, "&'")));
  const pieces = splitWords(comment, CARD_LENGTH - "CONTINUE  '&' / ".length);
  pieces.forEach((piece, i) => out.push(pad80(`CONTINUE  '${i === pieces.length - 1 ? '' : '&'}' / ${piece}`)));
  return out;
}

/** Splits text at spaces into pieces of at most `width` characters (words longer than that are cut). */
function splitWords(text: string, width: number): string[] {
  const pieces: string[] = [];
  let piece = '';
  for (let word of text.split(' ')) {
    while (word.length > width) {
      if (piece !== '') { pieces.push(piece); piece = ''; }
      pieces.push(word.slice(0, width));
      word = word.slice(width);
    }
    const candidate = piece === '' ? word : `${piece} ${word}`;
    if (candidate.length <= width) piece = candidate;
    else { pieces.push(piece); piece = word; }
  }
  if (piece !== '' || pieces.length === 0) pieces.push(piece);
  return pieces;
}
