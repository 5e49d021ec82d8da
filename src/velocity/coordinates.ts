/**
 * Sky and site coordinates as people write them: decimal degrees or sexagesimal strings
 * (right ascension in hours `hh:mm:ss.s`, declination and latitude `±dd:mm:ss`).
 */
import { InputError, type ErrorLocation } from '../errors.js';

/** A number or a string that may be decimal or sexagesimal. */
export type AngleInput = number | string;

interface Sexagesimal {
  negative: boolean;
  fields: number[];
  /** True when the text had more than one field (`12:30`, `12 30 00`, `12h30m`). */
  sexagesimal: boolean;
}

const NUMBER_RE = /^(\d+(\.\d*)?|\.\d+)$/;

function splitSexagesimal(text: string, what: string, where: ErrorLocation): Sexagesimal {
  let s = text.trim();
  let negative = false;
  if (s.startsWith('-') || s.startsWith('+')) {
    negative = s[0] === '-';
    s = s.slice(1).trim();
  }
  const marked = /[hHdD\u00b0]/.test(s);
  const tokens = s.replace(/[:hHdD\u00b0mM'\u2032sS"\u2033]/g, ' ').trim().split(/\s+/);
  if (s === '' || tokens.length > 3 || !tokens.every((t) => NUMBER_RE.test(t))) {
    throw new InputError('coord.bad-format', `"${text}" is not ${what}`, where);
  }
  for (let i = 0; i < tokens.length - 1; i++) {
    if (tokens[i].includes('.')) throw new InputError('coord.bad-format', `"${text}" is not ${what} (only the last field may have a decimal point)`, where);
  }
  return { negative, fields: tokens.map(Number), sexagesimal: tokens.length > 1 || marked };
}

function checkMinutesSeconds(sx: Sexagesimal, text: string, where: ErrorLocation): void {
  if (sx.fields.length > 1 && sx.fields[1] >= 60) throw new InputError('coord.out-of-range', `"${text}": minutes ${sx.fields[1]} must be below 60`, where);
  if (sx.fields.length > 2 && sx.fields[2] >= 60) throw new InputError('coord.out-of-range', `"${text}": seconds ${sx.fields[2]} must be below 60`, where);
}

function combine(fields: number[]): number {
  return fields[0] + (fields[1] ?? 0) / 60 + (fields[2] ?? 0) / 3600;
}

/**
 * Right ascension in degrees from a number of degrees or a string.
 *
 * A number is degrees. A string with two or three fields (`hh:mm:ss.s`, `hh mm ss`,
 * `12h34m56.7s`) is hours, minutes, seconds; a single decimal field (`187.25`) is degrees, and
 * `12.5h` is hours. Range: 0 ≤ RA < 360° (24 h); 360 itself is taken as 0.
 *
 * @param value degrees, or the string.
 * @param where location for messages (keyword, option).
 * @returns RA in degrees, 0 ≤ RA < 360.
 * @throws {InputError} `coord.bad-format`, `coord.out-of-range`.
 * @example
 * parseRightAscension('12:30:00'); // 187.5
 * parseRightAscension(187.5);      // 187.5
 */
export function parseRightAscension(value: AngleInput, where: ErrorLocation = {}): number {
  const expect = 'a right ascension (degrees, or hours as hh:mm:ss.s)';
  let deg: number;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InputError('coord.bad-format', `${value} is not ${expect}`, where);
    deg = value;
  } else {
    const sx = splitSexagesimal(value, expect, where);
    if (sx.negative) throw new InputError('coord.out-of-range', `"${value}": a right ascension cannot be negative`, where);
    checkMinutesSeconds(sx, value, where);
    if (sx.sexagesimal) {
      if (sx.fields[0] >= 24 && !(sx.fields.length === 1 && sx.fields[0] === 24)) {
        throw new InputError('coord.out-of-range', `"${value}": hours ${sx.fields[0]} must be below 24`, where);
      }
      deg = combine(sx.fields) * 15;
    } else {
      deg = sx.fields[0];
    }
  }
  if (deg < 0 || deg > 360) throw new InputError('coord.out-of-range', `right ascension ${typeof value === 'number' ? value : `"${value}"`} is outside 0..360 degrees`, where);
  return deg === 360 ? 0 : deg;
}

function parseSignedAngle(value: AngleInput, limitDeg: number, name: string, where: ErrorLocation): number {
  const expect = `a ${name} (degrees, or ±dd:mm:ss.s)`;
  let deg: number;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InputError('coord.bad-format', `${value} is not ${expect}`, where);
    deg = value;
  } else {
    const sx = splitSexagesimal(value, expect, where);
    checkMinutesSeconds(sx, value, where);
    const magnitude = combine(sx.fields);
    deg = sx.negative ? -magnitude : magnitude;
  }
  if (!(Math.abs(deg) <= limitDeg)) {
    throw new InputError('coord.out-of-range', `${name} ${typeof value === 'number' ? value : `"${value}"`} is outside -${limitDeg}..+${limitDeg} degrees`, where);
  }
  return deg;
}

/**
 * Declination in degrees from a number of degrees or a string `±dd:mm:ss.s`, `±dd mm ss`,
 * `-00:30:00` (the sign applies to the whole angle, also when the degrees are zero) or
 * decimal degrees.
 *
 * @returns Dec in degrees, −90 ≤ Dec ≤ +90.
 * @throws {InputError} `coord.bad-format`, `coord.out-of-range`.
 * @example
 * parseDeclination('-00:30:00'); // -0.5
 */
export function parseDeclination(value: AngleInput, where: ErrorLocation = {}): number {
  return parseSignedAngle(value, 90, 'declination', where);
}

/**
 * Geodetic latitude in degrees (north positive) from degrees or `±dd:mm:ss`.
 * @returns latitude, −90..+90.
 * @throws {InputError} `coord.bad-format`, `coord.out-of-range`.
 * @example
 * parseLatitude('+45:30:00'); // 45.5
 */
export function parseLatitude(value: AngleInput, where: ErrorLocation = {}): number {
  return parseSignedAngle(value, 90, 'latitude', where);
}

/**
 * Longitude in degrees from degrees or `±ddd:mm:ss`, as written (the caller decides whether
 * east or west is positive). Accepts −360..+360 and returns the value as given.
 * @throws {InputError} `coord.bad-format`, `coord.out-of-range`.
 * @example
 * parseLongitude('-71:05:00'); // -71.0833...
 */
export function parseLongitude(value: AngleInput, where: ErrorLocation = {}): number {
  return parseSignedAngle(value, 360, 'longitude', where);
}

/**
 * Longitude folded into −180 < λ ≤ 180 degrees.
 * @param longitudeDeg any finite longitude, degrees.
 * @example
 * normalizeLongitudeDeg(359); // -1
 */
export function normalizeLongitudeDeg(longitudeDeg: number): number {
  let l = longitudeDeg % 360;
  if (l > 180) l -= 360;
  if (l <= -180) l += 360;
  return l;
}

/**
 * Formats a right ascension in degrees as `hh:mm:ss.sss`.
 *
 * @param raDeg 0 ≤ RA < 360.
 * @param decimals digits of the seconds (default 3; 0.001 s of time = 0.015″).
 * @example
 * formatRightAscension(187.5); // '12:30:00.000'
 */
export function formatRightAscension(raDeg: number, decimals = 3): string {
  return formatSexagesimal(raDeg / 15, decimals, false, 24);
}

/**
 * Formats a declination in degrees as `±dd:mm:ss.ss`.
 * @param decimals digits of the seconds (default 2).
 * @example
 * formatDeclination(-0.5); // '-00:30:00.00'
 */
export function formatDeclination(decDeg: number, decimals = 2): string {
  return formatSexagesimal(decDeg, decimals, true, Infinity);
}

function formatSexagesimal(value: number, decimals: number, signed: boolean, wrap: number): string {
  const negative = value < 0;
  const scale = 10 ** decimals;
  let ticks = Math.round(Math.abs(value) * 3600 * scale);
  if (Number.isFinite(wrap)) ticks %= wrap * 3600 * scale;
  const secTicks = ticks % (60 * scale);
  const totalMin = (ticks - secTicks) / (60 * scale);
  const mm = totalMin % 60;
  const hh = (totalMin - mm) / 60;
  const secWhole = Math.floor(secTicks / scale);
  const secFrac = secTicks - secWhole * scale;
  const pad = (v: number, n = 2) => String(v).padStart(n, '0');
  const sign = signed ? (negative && ticks > 0 ? '-' : '+') : '';
  return `${sign}${pad(hh)}:${pad(mm)}:${pad(secWhole)}${decimals > 0 ? '.' + pad(secFrac, decimals) : ''}`;
}
