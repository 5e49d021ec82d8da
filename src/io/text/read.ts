/**
 * Reader for spectra stored as delimited text (CSV, TSV, semicolon- or whitespace-separated
 * columns). See DEVELOPERS.md, "Text spectra", for the format.
 */
import { InputError, type ErrorLocation } from '../../errors.js';
import type { Logger } from '../../logger.js';
import { Header, type CardValue, type HeaderCard } from '../../spectrum/header.js';
import { provenanceEntry, type ProvenanceEntry } from '../../spectrum/provenance.js';
import { createSpectrum, type Medium, type SpectralUnit, type Spectrum } from '../../spectrum/spectrum.js';
import { parseSpectralUnit, unitSymbol } from '../../spectrum/units.js';
import type { ReadSpectrumOptions } from '../read.js';
import { readColumnHeading, type ColumnHeading, type ColumnRole } from './columns.js';
import {
  decimalCommaHint,
  decodeText,
  delimiterName,
  detectDelimiter,
  isNumberCell,
  joinBracketedUnits,
  parseNumberCell,
  splitFields,
  textLines,
  type Delimiter,
  type TextLine,
} from './fields.js';

/** How many content lines the reader looks at to choose the delimiter. */
const DELIMITER_SAMPLE_LINES = 20;

/** Where the wavelength unit of a text spectrum came from. */
export type UnitSource = 'header' | 'comment' | 'option' | 'guessed';

/** Metadata read from `# key: value` comment lines. */
interface CommentMetadata {
  medium?: { value: Medium; line: number };
  unit?: { value: SpectralUnit; line: number };
  fluxUnit?: string;
  cards: HeaderCard[];
  provenance: ProvenanceEntry[];
}

/**
 * Parses a spectrum from the bytes of a delimited text file.
 *
 * Format (see DEVELOPERS.md, "Text spectra"): comma-, tab-, semicolon- or
 * whitespace-separated columns, told apart from the content. Lines starting with `#` are
 * comments, and `#` outside quotes starts a trailing comment. An optional header row names
 * the columns in any case: `wavelength`/`wave`/`lambda`/`wl` (or `pixel`), `flux`/`intensity`/
 * `counts`, `error`/`sigma`/`uncertainty`/`err`, and `mask`/`flag`; a wavelength column may
 * state its unit and medium in brackets or parentheses (`wavelength [nm]`, `lambda(Å)`,
 * `wavelength (Angstrom, air)`) or as words of its name (`wavelength_air_angstrom`), and a
 * flux column its unit (`flux [adu]`). Without a header row, two columns are wavelength and
 * flux, three add the 1-σ uncertainty. Comment lines `# medium: air`, `# wavelength unit: nm`
 * and `# flux unit: ...` state metadata; `# header: {...}` and `# provenance: {...}` lines
 * (JSON, as written by {@link formatTextSpectrum}) restore header cards and provenance.
 *
 * The wavelength unit comes from the header row or a comment, else from `options.unit`;
 * only when neither says is it guessed from the values (consecutive integers from 0 or 1:
 * pixel; 0.1–30: µm; 100–2500: nm; 1000–30 000: Å) and a `text.unit-guessed` warning is
 * sent to `options.logger`. The medium comes from the file, else `options.medium`, else
 * it is null (unknown).
 *
 * Missing data: an empty or `NaN` flux or uncertainty cell gives NaN (an unusable pixel);
 * `inf` is read as infinity. Wavelengths must be finite and strictly monotonic.
 *
 * @param bytes the whole file.
 * @param name file name, used in messages and in `source.file`.
 * @param options unit and medium to assume when the file does not say; a logger for warnings.
 * @returns a new Spectrum with `source.format` `text` and a `read-text` provenance entry.
 * @throws {InputError} with the file, 1-based line number and column for: binary or UTF-16
 *   data, a line over 65 536 characters, ragged rows, a non-numeric cell, fewer than two
 *   columns, no data rows, an empty, NaN or infinite wavelength, a wavelength that repeats
 *   or breaks monotonic order, an unknown unit, an unterminated quote.
 * @example
 * const bytes = new TextEncoder().encode('wavelength [nm],flux\n656.0,1.0\n656.1,0.8\n');
 * const s = parseTextSpectrum(bytes, 'halpha.csv');
 * s.unit; // 'nm'
 * s.flux[1]; // 0.8
 */
export function parseTextSpectrum(bytes: Uint8Array, name: string, options: ReadSpectrumOptions = {}): Spectrum {
  const file = name;
  const logger = options.logger;
  const text = decodeText(bytes, file, logger);
  const meta: CommentMetadata = { cards: [], provenance: [] };
  const lines = textLines(text, file);

  // 1. Collect the first content lines to choose the delimiter.
  const sample: TextLine[] = [];
  let next = lines.next();
  while (!next.done && sample.length < DELIMITER_SAMPLE_LINES) {
    const line = next.value;
    if (!handleNonContent(line, meta, file, logger)) sample.push(line);
    next = lines.next();
  }
  if (sample.length === 0) throw new InputError('text.no-data', 'no data rows (only comments or blank lines)', { file });
  const delimiter = detectDelimiter(sample.map((l) => l.text));

  // 2. Header row or not.
  let firstFields = splitRow(sample[0], delimiter, file);
  const hasHeader = firstFields.some((f) => f !== '') && firstFields.every((f) => f === '' || !isNumberCell(f));
  if (hasHeader && delimiter === 'whitespace') firstFields = joinBracketedUnits(firstFields);
  let headings: ColumnHeading[] | undefined;
  let roles: (ColumnRole | null)[];
  let ncol: number;
  if (hasHeader) {
    ncol = firstFields.length;
    headings = firstFields.map((f, i) => readColumnHeading(f, { file, line: sample[0].number, column: String(i + 1) }));
    roles = headingRoles(headings, file, sample[0].number, logger);
  } else {
    ncol = firstFields.length;
    roles = positionalRoles(ncol, file, sample[0].number);
  }
  const col = (role: ColumnRole) => roles.indexOf(role);
  const wCol = col('wavelength');
  const fCol = col('flux');
  const uCol = col('uncertainty');
  const mCol = col('mask');

  // 3. Data rows.
  const wavelength: number[] = [];
  const flux: number[] = [];
  const uncertainty: number[] = [];
  const mask: number[] = [];
  const rowLine: number[] = [];
  let uncertaintyAllEmpty = true;
  const readRow = (line: TextLine) => {
    const fields = splitRow(line, delimiter, file);
    const at = line.number;
    if (fields.length !== ncol) {
      const ref = hasHeader ? `the header row (line ${sample[0].number})` : `the first row (line ${sample[0].number})`;
      throw new InputError('text.ragged-row', `the row has ${fields.length} column${fields.length === 1 ? '' : 's'}, but ${ref} has ${ncol}`, { file, line: at });
    }
    const w = numberAt(fields, wCol, 'wavelength', file, at);
    if (!Number.isFinite(w)) {
      const what = fields[wCol] === '' ? 'is empty' : `is ${w}`;
      throw new InputError('text.bad-wavelength', `the wavelength cell ${what}; every row needs a finite wavelength`, { file, line: at, column: String(wCol + 1) });
    }
    if (wavelength.length >= 1) checkOrder(w, wavelength, rowLine, file, at, wCol);
    wavelength.push(w);
    rowLine.push(at);
    flux.push(numberAt(fields, fCol, 'flux', file, at));
    if (uCol >= 0) {
      if (fields[uCol] !== '') uncertaintyAllEmpty = false;
      uncertainty.push(numberAt(fields, uCol, 'uncertainty', file, at));
    }
    if (mCol >= 0) {
      const m = numberAt(fields, mCol, 'mask', file, at);
      if (!Number.isFinite(m)) throw new InputError('text.bad-mask', `the mask cell "${fields[mCol]}" must be a finite number (0 = good, non-zero = bad)`, { file, line: at, column: String(mCol + 1) });
      mask.push(m !== 0 ? 1 : 0);
    }
  };
  for (let i = hasHeader ? 1 : 0; i < sample.length; i++) readRow(sample[i]);
  for (; !next.done; next = lines.next()) {
    if (!handleNonContent(next.value, meta, file, logger)) readRow(next.value);
  }
  if (wavelength.length === 0) throw new InputError('text.no-data', 'no data rows after the header row', { file, line: sample[0].number });

  // 4. Unit and medium.
  const headerUnit = wCol >= 0 ? headings?.[wCol].unit : undefined;
  let unit: SpectralUnit;
  let unitFrom: UnitSource;
  if (headerUnit && meta.unit && headerUnit !== meta.unit.value) {
    throw new InputError('text.conflicting-unit', `the header row says the wavelength unit is ${unitSymbol(headerUnit)} but this comment says ${unitSymbol(meta.unit.value)}`, { file, line: meta.unit.line });
  }
  if (headerUnit || meta.unit) {
    unit = headerUnit ?? meta.unit!.value;
    unitFrom = headerUnit ? 'header' : 'comment';
    if (options.unit && options.unit !== unit) {
      logger?.warn({ code: 'text.option-ignored', message: `${file}: the file states the wavelength unit ${unitSymbol(unit)}; the unit option (${unitSymbol(options.unit)}) is ignored` });
    }
  } else if (options.unit) {
    unit = options.unit;
    unitFrom = 'option';
  } else {
    unit = guessUnit(wavelength, file);
    unitFrom = 'guessed';
    const lo = Math.min(wavelength[0], wavelength[wavelength.length - 1]);
    const hi = Math.max(wavelength[0], wavelength[wavelength.length - 1]);
    logger?.warn({
      code: 'text.unit-guessed',
      message: `${file}: the wavelength unit is not stated; guessed ${unitSymbol(unit)} from the values (${lo} to ${hi}); state it in the header row (e.g. "wavelength [nm]") or with the unit option`,
    });
  }
  const headerMedium = wCol >= 0 ? headings?.[wCol].medium : undefined;
  if (headerMedium && meta.medium && meta.medium.value !== headerMedium) {
    throw new InputError('text.conflicting-medium', `the header row says the wavelengths are in ${headerMedium} but this comment says ${meta.medium.value ?? 'unknown'}`, { file, line: meta.medium.line });
  }
  let medium: Medium = null;
  if (headerMedium) medium = headerMedium;
  else if (meta.medium) medium = meta.medium.value;
  else if (options.medium !== undefined) medium = options.medium;
  if ((headerMedium || meta.medium) && options.medium && options.medium !== medium) {
    logger?.warn({ code: 'text.option-ignored', message: `${file}: the file states the medium (${medium ?? 'unknown'}); the medium option (${options.medium}) is ignored` });
  }
  if (unit === 'pixel') medium = null;

  let useUncertainty = uCol >= 0;
  if (useUncertainty && uncertaintyAllEmpty) {
    logger?.warn({ code: 'text.empty-column', message: `${file}: the uncertainty column is empty in every row; it is ignored` });
    useUncertainty = false;
  }
  const fluxUnit = (fCol >= 0 ? headings?.[fCol].fluxUnit : undefined) ?? meta.fluxUnit ?? null;

  const entry = provenanceEntry('read-text', {
    file,
    delimiter: delimiterName(delimiter),
    rows: wavelength.length,
    unit,
    unitFrom,
    medium,
  });
  try {
    return createSpectrum(
      {
        wavelength,
        flux,
        uncertainty: useUncertainty ? uncertainty : undefined,
        mask: mCol >= 0 ? mask : undefined,
        unit,
        medium,
        fluxUnit,
        header: Header.from(meta.cards),
        provenance: [...meta.provenance, entry],
        source: { file, format: 'text' },
      },
      { file },
    );
  } catch (e) {
    // Every axis check was done above with line numbers; map any remaining one to its line.
    if (e instanceof InputError && e.location.index !== undefined) {
      throw new InputError(e.code, e.detail, { file, line: rowLine[e.location.index] }, { cause: e });
    }
    throw e;
  }
}

/** Handles blank and comment lines; returns false for a content line. */
function handleNonContent(line: TextLine, meta: CommentMetadata, file: string, logger: Logger | undefined): boolean {
  const s = line.text;
  let i = 0;
  while (i < s.length && (s.charCodeAt(i) === 32 || s.charCodeAt(i) === 9 || s.charCodeAt(i) === 12)) i++;
  if (i === s.length) return true;
  if (s.charCodeAt(i) === 35) {
    readCommentMetadata(s.trim(), line.number, meta, file, logger);
    return true;
  }
  return false;
}

function splitRow(line: TextLine, delimiter: Delimiter, file: string): string[] {
  return splitFields(line.text, delimiter, { file, line: line.number });
}

function headingRoles(headings: ColumnHeading[], file: string, line: number, logger: Logger | undefined): (ColumnRole | null)[] {
  const roles = headings.map((h) => h.role);
  if (roles.every((r) => r === null)) {
    if (headings.length === 2 || headings.length === 3) {
      logger?.warn({
        code: 'text.header-unrecognised',
        message: `${file}: line ${line}: no column name is recognised (${headings.map((h) => `"${h.text}"`).join(', ')}); reading the columns as wavelength, flux${headings.length === 3 ? ', uncertainty' : ''}`,
      });
      return positionalRoles(headings.length, file, line);
    }
  }
  for (const role of ['wavelength', 'flux', 'uncertainty', 'mask'] as const) {
    const first = roles.indexOf(role);
    const second = roles.indexOf(role, first + 1);
    if (first >= 0 && second >= 0) {
      throw new InputError('text.duplicate-column', `columns ${first + 1} ("${headings[first].text}") and ${second + 1} ("${headings[second].text}") both name the ${role}`, { file, line });
    }
  }
  for (const role of ['wavelength', 'flux'] as const) {
    if (!roles.includes(role)) {
      throw new InputError('text.missing-column', `the header row names no ${role} column (columns: ${headings.map((h) => `"${h.text}"`).join(', ')})`, { file, line });
    }
  }
  const unused = headings.filter((h) => h.role === null);
  if (unused.length > 0) {
    logger?.warn({ code: 'text.unused-column', message: `${file}: line ${line}: column${unused.length > 1 ? 's' : ''} ${unused.map((h) => `"${h.text}"`).join(', ')} not recognised; ignored` });
  }
  return roles;
}

function positionalRoles(ncol: number, file: string, line: number): ColumnRole[] {
  if (ncol < 2) {
    throw new InputError('text.too-few-columns', `the row has ${ncol} column${ncol === 1 ? '' : 's'}; a spectrum needs at least two (wavelength, flux)`, { file, line });
  }
  if (ncol > 3) {
    throw new InputError('text.too-many-columns', `the row has ${ncol} columns and there is no header row; name the columns in a header row (e.g. "wavelength,flux,uncertainty")`, { file, line });
  }
  return ncol === 2 ? ['wavelength', 'flux'] : ['wavelength', 'flux', 'uncertainty'];
}

function numberAt(fields: string[], index: number, what: string, file: string, line: number): number {
  const cell = fields[index];
  const v = parseNumberCell(cell);
  if (v === undefined) {
    throw new InputError('text.not-a-number', `the ${what} cell "${cell}" is not a number${decimalCommaHint(cell)}`, { file, line, column: String(index + 1) });
  }
  return v;
}

function checkOrder(w: number, axis: number[], rowLine: number[], file: string, line: number, wCol: number): void {
  const k = axis.length;
  const prev = axis[k - 1];
  if (w !== prev && (k < 2 || w > prev === axis[1] > axis[0])) return;
  const where: ErrorLocation = { file, line, column: String(wCol + 1) };
  if (w === prev) {
    throw new InputError('spectrum.duplicate-wavelength', `wavelength ${w} repeats the value on line ${rowLine[k - 1]}; the axis must be strictly monotonic`, where);
  }
  if (k >= 2) {
    const increasing = axis[1] > axis[0];
    if (w > prev !== increasing) {
      throw new InputError(
        'spectrum.not-monotonic',
        `wavelength ${w} after ${prev} (line ${rowLine[k - 1]}) breaks the ${increasing ? 'increasing' : 'decreasing'} order; the axis must be strictly monotonic`,
        where,
      );
    }
  }
}

/**
 * Guesses the wavelength unit from the values: consecutive integers starting at 0 or 1 are
 * pixels; otherwise the range decides (0.1–30 µm, 100–2500 nm, 1000–30 000 Å).
 */
function guessUnit(axis: number[], file: string): SpectralUnit {
  const n = axis.length;
  const first = axis[0];
  const lo = Math.min(first, axis[n - 1]);
  const hi = Math.max(first, axis[n - 1]);
  if ((first === 0 || first === 1) && n >= 2) {
    let step = true;
    for (let i = 1; i < n && step; i++) step = axis[i] - axis[i - 1] === 1;
    if (step) return 'pixel';
  }
  if (lo >= 0.1 && hi <= 30) return 'um';
  if (lo >= 100 && hi <= 2500) return 'nm';
  if (lo >= 1000 && hi <= 30_000) return 'angstrom';
  throw new InputError(
    'text.unknown-unit',
    `the wavelength unit is not stated and cannot be guessed from the values (${lo} to ${hi}); state it in the header row (e.g. "wavelength [nm]") or with the unit option`,
    { file },
  );
}

const META_RE = /^#\s*([A-Za-z][A-Za-z _-]*?)\s*[:=]\s*(.*?)\s*$/;

function readCommentMetadata(t: string, line: number, meta: CommentMetadata, file: string, logger: Logger | undefined): void {
  const m = META_RE.exec(t);
  if (!m) return;
  const key = m[1].toLowerCase().replace(/[\s_-]+/g, ' ');
  const value = m[2];
  const where = { file, line };
  switch (key) {
    case 'medium': {
      const v = value.toLowerCase();
      let medium: Medium | undefined;
      if (v === 'air') medium = 'air';
      else if (v === 'vacuum' || v === 'vac') medium = 'vacuum';
      else if (v === 'unknown' || v === 'not stated' || v === 'none' || v === '') medium = null;
      if (medium === undefined) {
        logger?.warn({ code: 'text.unknown-medium', message: `${file}: line ${line}: unknown medium "${value}" (expected air or vacuum); ignored` });
        return;
      }
      if (meta.medium && meta.medium.value !== medium) {
        throw new InputError('text.conflicting-medium', `this comment says the medium is ${medium ?? 'unknown'} but line ${meta.medium.line} says ${meta.medium.value ?? 'unknown'}`, where);
      }
      meta.medium = { value: medium, line };
      return;
    }
    case 'unit':
    case 'wavelength unit':
    case 'spectral unit': {
      const u = parseSpectralUnit(value);
      if (u === undefined && key === 'unit') {
        // A bare "unit:" may well be the flux unit: not an error.
        logger?.warn({ code: 'text.unknown-unit', message: `${file}: line ${line}: "${value}" is not a wavelength unit; this comment is ignored` });
        return;
      }
      if (u === undefined) throw new InputError('text.unknown-unit', `unknown wavelength unit "${value}" (known: Angstrom, nm, um, pixel)`, where);
      if (meta.unit && meta.unit.value !== u) {
        throw new InputError('text.conflicting-unit', `this comment says the wavelength unit is ${unitSymbol(u)} but line ${meta.unit.line} says ${unitSymbol(meta.unit.value)}`, where);
      }
      meta.unit = { value: u, line };
      return;
    }
    case 'flux unit':
      if (value !== '') meta.fluxUnit = value;
      return;
    case 'header': {
      const card = parseJsonCard(value);
      if (card) meta.cards.push(card);
      else logger?.warn({ code: 'text.bad-metadata', message: `${file}: line ${line}: a "# header:" comment that is not a header card in JSON; ignored` });
      return;
    }
    case 'provenance': {
      const entry = parseJsonProvenance(value);
      if (entry) meta.provenance.push(entry);
      else logger?.warn({ code: 'text.bad-metadata', message: `${file}: line ${line}: a "# provenance:" comment that is not a provenance entry in JSON; ignored` });
      return;
    }
    default:
      return;
  }
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** Reads a header card written by the text writer: `{"keyword": ..., "value"|"bigint"|"text": ..., "comment"?, "rawValue"?}`. */
function parseJsonCard(text: string): HeaderCard | undefined {
  const o = parseJson(text);
  if (typeof o !== 'object' || o === null || Array.isArray(o)) return undefined;
  const r = o as Record<string, unknown>;
  if (typeof r.keyword !== 'string') return undefined;
  const card: { keyword: string; value?: CardValue; comment?: string; text?: string; rawValue?: string } = { keyword: r.keyword };
  if (typeof r.bigint === 'string' && /^-?\d+$/.test(r.bigint)) card.value = BigInt(r.bigint);
  else if ('value' in r) {
    const v = r.value;
    if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') card.value = v;
    else return undefined;
  }
  if (typeof r.text === 'string') card.text = r.text;
  if (typeof r.comment === 'string') card.comment = r.comment;
  if (typeof r.rawValue === 'string') card.rawValue = r.rawValue;
  return card;
}

function parseJsonProvenance(text: string): ProvenanceEntry | undefined {
  const o = parseJson(text);
  if (typeof o !== 'object' || o === null || Array.isArray(o)) return undefined;
  const r = o as Record<string, unknown>;
  if (typeof r.step !== 'string' || typeof r.version !== 'string') return undefined;
  const p = r.parameters;
  if (typeof p !== 'object' || p === null || Array.isArray(p)) return undefined;
  return Object.freeze({ step: r.step, parameters: Object.freeze({ ...(p as Record<string, unknown>) }), version: r.version });
}
