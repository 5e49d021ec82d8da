/**
 * Number and label formatting for everything people read: table cells, result summaries
 * (notebook, report, command line) and plot titles. One place, one style: the minus sign
 * `−` (U+2212), `value ± uncertainty` rounded on the uncertainty, powers of ten as `× 10ⁿ`.
 */
import type { Spectrum } from '../spectrum/spectrum.js';

/** A measured value with its 1-σ uncertainty; shown as `value ± uncertainty`. */
export interface ValueWithUncertainty {
  readonly value: number;
  readonly uncertainty: number;
}

/** A table column as far as formatting needs it (a `TableColumn` fits). */
export interface CellFormat {
  readonly key?: string;
  readonly label?: string;
  readonly unit?: string;
  /** Decimals for numbers (and value ± uncertainty); default: numbers as JavaScript prints them, value ± uncertainty by {@link formatMeasured}. */
  readonly digits?: number;
}

/** Significant digits kept on an uncertainty (common practice: two, so that the rounding changes it by at most 5 %). */
export const UNCERTAINTY_SIGNIFICANT_DIGITS = 2;
/** Numbers of this magnitude or more are written with a power of ten. */
const LARGE = 1e6;
/** Non-zero numbers below this magnitude are written with a power of ten. */
const SMALL = 1e-3;

const SUPERSCRIPT: Readonly<Record<string, string>> = Object.freeze({
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻',
});

/** Replaces a leading ASCII minus with the typographic minus sign. */
function minus(text: string): string {
  return text.replace(/^-/, '−');
}

/** `× 10ⁿ` for an exponent n. */
function powerOfTen(exponent: number): string {
  return `× 10${String(exponent).replace(/[-0-9]/g, (c) => SUPERSCRIPT[c])}`;
}

/** The text of a non-finite number: `NaN`, `∞`, `−∞`. */
function nonFinite(v: number): string {
  return Number.isNaN(v) ? 'NaN' : v > 0 ? '∞' : '−∞';
}

/**
 * A number with a fixed count of decimals (or as JavaScript prints it when `digits` is
 * undefined), with the minus sign `−`; NaN, ∞ and −∞ as such.
 *
 * @param v the number.
 * @param digits decimals, 0–20; undefined for JavaScript's shortest form.
 * @returns plain text.
 * @example formatNumber(-12.345, 2); // '−12.35'
 */
export function formatNumber(v: number, digits?: number): string {
  if (!Number.isFinite(v)) return nonFinite(v);
  return minus(digits === undefined ? String(v) : v.toFixed(digits));
}

/**
 * A number to `digits` significant digits: fixed-point between 10⁻³ and 10⁶, otherwise
 * `a × 10ⁿ`; trailing zeros kept (they are significant); the minus sign `−`.
 *
 * @param v the number.
 * @param digits significant digits, 1–15.
 * @returns plain text.
 * @example formatSignificant(0.000123456, 3); // '1.23 × 10⁻⁴'
 * @example formatSignificant(6562.7951, 5); // '6562.8'
 */
export function formatSignificant(v: number, digits: number): string {
  if (!Number.isFinite(v)) return nonFinite(v);
  if (v === 0) return '0';
  const n = Math.min(15, Math.max(1, Math.round(digits)));
  const exponent = Number(v.toExponential(n - 1).split('e')[1]);
  const magnitude = Math.abs(v);
  if (magnitude >= LARGE || magnitude < SMALL) {
    const mantissa = v.toExponential(n - 1).split('e')[0];
    return `${minus(mantissa)} ${powerOfTen(exponent)}`;
  }
  return minus(v.toFixed(Math.max(0, n - 1 - exponent)));
}

/**
 * `value ± uncertainty`, with the uncertainty rounded to two significant digits and the
 * value to the same decimal place (common practice, e.g. the Particle Data Group's
 * rounding of errors to one or two digits; two are kept here so that rounding never
 * changes the uncertainty by more than 5 %). Very large or small numbers share a power of
 * ten when fixed-point would need made-up zeros or many leading zeros: `(7.03 ± 0.12) × 10⁶`.
 *
 * Missing values: a non-finite or negative uncertainty prints as `± n/a` after the value
 * to 6 significant digits; an uncertainty of exactly 0 (a fixed parameter) as `± 0`; a
 * non-finite value as `NaN`, `∞` or `−∞`.
 *
 * @param value the measured value.
 * @param uncertainty its 1-σ uncertainty, same unit, ≥ 0.
 * @param unit optional unit appended after a space (`Å`, `km/s`).
 * @returns plain text.
 * @example formatMeasured(6562.23924, 0.0561299, 'Å'); // '6562.239 ± 0.056 Å'
 * @example formatMeasured(12345, 1234); // '12300 ± 1200'
 * @example formatMeasured(0.0996, 0.0996); // '0.10 ± 0.10' (the rounding carries into a new digit)
 */
export function formatMeasured(value: number, uncertainty: number, unit?: string): string {
  const suffix = unit ? ` ${unit}` : '';
  if (!Number.isFinite(value)) return `${nonFinite(value)}${Number.isFinite(uncertainty) ? ` ± ${formatSignificant(uncertainty, UNCERTAINTY_SIGNIFICANT_DIGITS)}` : ''}${suffix}`;
  if (!Number.isFinite(uncertainty) || uncertainty < 0) return `${formatSignificant(value, 6)} ± n/a${suffix}`;
  if (uncertainty === 0) return `${formatSignificant(value, 6)} ± 0${suffix}`;
  const digits = UNCERTAINTY_SIGNIFICANT_DIGITS;
  // Decimal place of the last kept digit of the uncertainty; rounding may carry into a new digit (0.0996 → 0.10).
  let exponent = Math.floor(Math.log10(uncertainty));
  let place = digits - 1 - exponent;
  if (Math.abs(roundTo(uncertainty, place)) >= 10 ** (exponent + 1)) {
    exponent += 1;
    place -= 1;
  }
  const magnitude = Math.max(Math.abs(value), uncertainty);
  // A power of ten where fixed-point would show made-up zeros (rounding to tens or coarser
  // on a large number) or many leading zeros; a BJD (2460801.8 ± 2.6) stays fixed-point.
  if ((magnitude >= LARGE && place < 0) || magnitude < SMALL) {
    const shared = Math.floor(Math.log10(magnitude));
    const scale = 10 ** shared;
    const decimals = Math.max(0, place + shared);
    return `(${minus((value / scale).toFixed(decimals))} ± ${(uncertainty / scale).toFixed(decimals)}) ${powerOfTen(shared)}${suffix}`;
  }
  if (place >= 0) return `${minus(value.toFixed(place))} ± ${uncertainty.toFixed(place)}${suffix}`;
  return `${minus(String(roundTo(value, place)))} ± ${String(roundTo(uncertainty, place))}${suffix}`;
}

/** `v` rounded to `place` decimals (negative: to tens, hundreds …). */
function roundTo(v: number, place: number): number {
  if (place >= 0) return Number(v.toFixed(place));
  const step = 10 ** -place;
  return Math.round(v / step) * step;
}

/**
 * A probability for people: `50%`, `1%`, `0.1%` down to 0.01 %, then `3.2 × 10⁻⁷`; `< 10⁻³⁰⁰`
 * for 0 (a tail beyond double precision).
 *
 * @param p a probability, 0–1.
 * @returns plain text.
 * @example formatProbability(0.001); // '0.1%'
 * @example formatProbability(3.2e-7); // '3.2 × 10⁻⁷'
 */
export function formatProbability(p: number): string {
  if (!Number.isFinite(p)) return nonFinite(p);
  if (p <= 0) return '< 10⁻³⁰⁰';
  if (p >= 1e-4) return `${Number((p * 100).toPrecision(2))}%`;
  return formatSignificant(p, 2);
}

function isValueWithUncertainty(v: unknown): v is ValueWithUncertainty {
  return v !== null && typeof v === 'object' && typeof (v as ValueWithUncertainty).value === 'number' && typeof (v as ValueWithUncertainty).uncertainty === 'number';
}

/**
 * True for a `{ value, uncertainty }` cell.
 * @example isMeasuredCell({ value: 1, uncertainty: 0.1 }); // true
 */
export function isMeasuredCell(v: unknown): v is ValueWithUncertainty {
  return isValueWithUncertainty(v);
}

/**
 * The text of one table cell: numbers with the column's decimals (minus sign `−`), a value
 * with uncertainty as `12.30 ± 0.45` (the column's decimals, or {@link formatMeasured}
 * without them), booleans as `yes`/`no`, null and undefined as an empty cell, anything
 * else with `String`.
 *
 * @param value the cell value.
 * @param column its column (for the decimals).
 * @returns plain text, not escaped.
 * @example formatCell({ value: 12.3, uncertainty: 0.45 }, { key: 'v', label: 'v', digits: 2 }); // '12.30 ± 0.45'
 * @example formatCell({ value: 12.3456, uncertainty: 0.0123 }, {}); // '12.346 ± 0.012'
 */
export function formatCell(value: unknown, column: CellFormat): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return formatNumber(value, column.digits);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (isValueWithUncertainty(value)) {
    if (column.digits === undefined) return formatMeasured(value.value, value.uncertainty);
    return `${formatNumber(value.value, column.digits)} ± ${formatNumber(value.uncertainty, column.digits)}`;
  }
  return String(value);
}

/**
 * Who and when, from a spectrum's header: the OBJECT card and the observation start
 * (DATE-OBS, else DATE-BEG) as `2026-05-14 03:12:45 UTC` (header times are UTC, see
 * DEVELOPERS.md "Time and velocity conventions"). Either part may be missing.
 *
 * @param spectrum any spectrum.
 * @returns `{ object, date }`, each a string or undefined; texts are trimmed, not escaped.
 * @example observationOf(readSpectrum('lvac7-star.fits')); // { object: 'LVAC-7', date: '2026-05-14 03:12:45 UTC' }
 */
export function observationOf(spectrum: Pick<Spectrum, 'header'>): { object?: string; date?: string } {
  const text = (key: string) => {
    const v = spectrum.header.get(key);
    return typeof v === 'string' && v.trim() ? v.trim() : undefined;
  };
  const object = text('OBJECT');
  const raw = text('DATE-OBS') ?? text('DATE-BEG');
  let date: string | undefined;
  if (raw) {
    const m = /^(\d{4}-\d{2}-\d{2})(?:T(\d{2}:\d{2}(?::\d{2})?))?/.exec(raw);
    const timesys = text('TIMESYS')?.toUpperCase();
    const utc = timesys === undefined || timesys === 'UTC' || timesys === 'UT';
    date = m ? `${m[1]}${m[2] ? ` ${m[2]}${utc ? ' UTC' : ` ${timesys}`}` : ''}` : raw;
  }
  return { ...(object ? { object } : {}), ...(date ? { date } : {}) };
}

/**
 * One line naming an observation: `LVAC-7, 2026-05-14 03:12:45 UTC`, or the part that is
 * known, or undefined.
 *
 * @param spectrum any spectrum.
 * @returns the label, or undefined when the header names neither object nor date.
 * @example observationLabel(readSpectrum('lvac7-star.fits')); // 'LVAC-7, 2026-05-14 03:12:45 UTC'
 */
export function observationLabel(spectrum: Pick<Spectrum, 'header'>): string | undefined {
  const { object, date } = observationOf(spectrum);
  const parts = [object, date].filter((p): p is string => p !== undefined);
  return parts.length ? parts.join(', ') : undefined;
}
