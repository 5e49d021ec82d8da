/**
 * Time scales: UTC (with leap seconds), TAI, TT and TDB, as Julian and modified Julian dates.
 *
 * A UTC instant is held as a calendar day (its MJD) plus seconds into that day, so that the
 * leap second 23:59:60 is representable. Julian dates of UTC follow the convention of the
 * IAU SOFA/ERFA libraries (and astropy): on a day that ends with a leap second the day has
 * 86 401 s and the fraction of the day is seconds/86 401. Every other scale has days of
 * exactly 86 400 SI seconds.
 */
import { InputError, type ErrorLocation } from '../errors.js';
import type { Logger } from '../logger.js';
import {
  DAYS_PER_JULIAN_CENTURY, MJD_J2000, MJD_ZERO_JD, SECONDS_PER_DAY, TT_MINUS_TAI_S,
} from './constants.js';

/** An instant of UTC: a calendar day and the seconds elapsed in it. */
export interface UtcTime {
  /** Modified Julian date of the UTC calendar day (an integer; 51 544 is 2000-01-01). */
  readonly mjdDay: number;
  /**
   * Seconds since 00:00:00 UTC of that day: 0 ≤ s < the day's length (86 400 s, or 86 401 s
   * on a day that ends with a leap second, whose last second is written 23:59:60).
   */
  readonly secondsOfDay: number;
}

/** A parsed date/time string: the instant, and whether the text held a date only. */
export interface ParsedUtcTime extends UtcTime {
  /** True when the text held a date and no time of day (the instant is then 00:00:00). */
  readonly dateOnly: boolean;
}

/**
 * TAI − UTC in seconds from 1972-01-01, as steps at the start of the given UTC day (MJD).
 * Source: IERS Bulletin C, as listed in the IERS/IETF `leap-seconds.list` that Debian's
 * tzdata 2025b ships (checked by test/velocity/time.test.ts against that list and against
 * ERFA's table through test/reference/make_barycentric_refs.py). That list says no further
 * leap second was announced before it expires on 2026-06-28 ({@link LEAP_SECONDS_KNOWN_UNTIL_MJD}).
 */
const LEAP_STEPS: ReadonlyArray<readonly [mjd: number, taiMinusUtcS: number]> = [
  [41317, 10], [41499, 11], [41683, 12], [42048, 13], [42413, 14], [42778, 15], [43144, 16],
  [43509, 17], [43874, 18], [44239, 19], [44786, 20], [45151, 21], [45516, 22], [46247, 23],
  [47161, 24], [47892, 25], [48257, 26], [48804, 27], [49169, 28], [49534, 29], [50083, 30],
  [50630, 31], [51179, 32], [53736, 33], [54832, 34], [56109, 35], [57204, 36], [57754, 37],
];

/**
 * 1960–1971, when UTC seconds were not SI seconds: TAI − UTC = base + (MJD − driftMjd) × rate,
 * in force from the start of the given day. Values of the ERFA `eraDat` table (from memory;
 * checked against `erfa.dat` at eight dates through the reference script).
 */
const DRIFT_STEPS: ReadonlyArray<readonly [mjd: number, baseS: number, driftMjd: number, rateSPerDay: number]> = [
  [36934, 1.417818, 37300, 0.001296], [37300, 1.422818, 37300, 0.001296],
  [37512, 1.372818, 37300, 0.001296], [37665, 1.845858, 37665, 0.0011232],
  [38334, 1.945858, 37665, 0.0011232], [38395, 3.24013, 38761, 0.001296],
  [38486, 3.34013, 38761, 0.001296], [38639, 3.44013, 38761, 0.001296],
  [38761, 3.54013, 38761, 0.001296], [38820, 3.64013, 38761, 0.001296],
  [38942, 3.74013, 38761, 0.001296], [39004, 3.84013, 38761, 0.001296],
  [39126, 4.31317, 39126, 0.002592], [39887, 4.21317, 39126, 0.002592],
];

/** First day (MJD 36 934 = 1960-01-01) for which UTC and TAI − UTC are defined. */
export const UTC_START_MJD = 36_934;

/**
 * Last day (MJD 61 219 = 2026-06-28) for which the leap-second table is known to hold: the
 * expiry date of the IERS/IETF `leap-seconds.list` in Debian's tzdata 2025b. Later times use
 * the last value (37 s) — no further leap second assumed — and {@link timeScales} warns.
 */
export const LEAP_SECONDS_KNOWN_UNTIL_MJD = 61_219;

/** Days from 1970-01-01 of a proleptic Gregorian date (H. Hinnant's days_from_civil algorithm). */
function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Proleptic Gregorian date of a day count from 1970-01-01 (inverse of daysFromCivil). */
function civilFromDays(days: number): [year: number, month: number, day: number] {
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp + (mp < 10 ? 3 : -9);
  return [yoe + era * 400 + (m <= 2 ? 1 : 0), m, d];
}

const MJD_OF_UNIX_EPOCH = 40_587;

/** MJD of a Gregorian calendar date (no range check). */
export function mjdFromCalendarDate(year: number, month: number, day: number): number {
  return daysFromCivil(year, month, day) + MJD_OF_UNIX_EPOCH;
}

/** Gregorian calendar date [year, month, day] of an integer MJD. */
export function calendarDateFromMjd(mjdDay: number): [year: number, month: number, day: number] {
  return civilFromDays(Math.floor(mjdDay) - MJD_OF_UNIX_EPOCH);
}

function checkUtcDay(mjdDay: number, where: ErrorLocation): void {
  if (mjdDay < UTC_START_MJD) {
    throw new InputError('time.before-utc', `UTC is not defined before 1960-01-01 (got ${formatDate(mjdDay)}); give a later time`, where);
  }
}

function formatDate(mjdDay: number): string {
  const [y, m, d] = calendarDateFromMjd(mjdDay);
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
}

/**
 * TAI − UTC in seconds at an instant of UTC.
 *
 * Method: the leap-second steps of IERS Bulletin C from 1972; the 1960–1971 drift formulas
 * (ERFA's table) before that. After {@link LEAP_SECONDS_KNOWN_UNTIL_MJD} the last value (37 s)
 * is kept.
 *
 * @param utc an instant of UTC from 1960-01-01 on.
 * @returns TAI − UTC, s (37 from 2017-01-01).
 * @throws {InputError} `time.before-utc` before 1960.
 * @example
 * taiMinusUtcSeconds({ mjdDay: 60000, secondsOfDay: 0 }); // 37
 */
export function taiMinusUtcSeconds(utc: UtcTime, where: ErrorLocation = {}): number {
  checkUtcDay(utc.mjdDay, where);
  return datAt(utc.mjdDay, utc.secondsOfDay / SECONDS_PER_DAY);
}

/** TAI − UTC at MJD day + fraction (fraction used only for the 1960–1971 drift). */
function datAt(mjdDay: number, dayFraction: number): number {
  if (mjdDay >= LEAP_STEPS[0][0]) {
    let lo = 0;
    let hi = LEAP_STEPS.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (LEAP_STEPS[mid][0] <= mjdDay) lo = mid; else hi = mid - 1;
    }
    return LEAP_STEPS[lo][1];
  }
  let k = 0;
  while (k + 1 < DRIFT_STEPS.length && DRIFT_STEPS[k + 1][0] <= mjdDay) k++;
  const [, base, drift, rate] = DRIFT_STEPS[k];
  return base + (mjdDay + dayFraction - drift) * rate;
}

/** Per-day facts of a UTC day: TAI−UTC at its start, its drift per day, its leap step and length. */
function dayFacts(mjdDay: number): { dat0: number; dlod: number; lengthS: number } {
  const dat0 = datAt(mjdDay, 0);
  const dlod = 2 * (datAt(mjdDay, 0.5) - dat0);
  const dleap = datAt(mjdDay + 1, 0) - (dat0 + dlod);
  return { dat0, dlod, lengthS: SECONDS_PER_DAY + dleap };
}

/** Length of a UTC day in UTC seconds: 86 400, or 86 401 on a day that ends with a leap second. */
export function utcDayLengthSeconds(mjdDay: number): number {
  return Math.round(dayFacts(mjdDay).lengthS * 1e7) / 1e7;
}

/**
 * Builds a UTC instant from calendar fields, checking every range (second 60 only on a day
 * that ends with a leap second).
 *
 * @throws {InputError} `time.bad-field` for a field out of range, `time.before-utc` before 1960.
 * @example
 * utcFromCalendar(2016, 12, 31, 23, 59, 60.5); // { mjdDay: 57753, secondsOfDay: 86400.5 }
 */
export function utcFromCalendar(year: number, month: number, day: number, hour = 0, minute = 0, second = 0, where: ErrorLocation = {}): UtcTime {
  const bad = (what: string) => new InputError('time.bad-field', what, where);
  if (!Number.isInteger(year) || !Number.isInteger(month) || !Number.isInteger(day)) throw bad('year, month and day must be whole numbers');
  if (month < 1 || month > 12) throw bad(`month ${month} is not in 1..12`);
  const mjdDay = mjdFromCalendarDate(year, month, day);
  const [, m2] = calendarDateFromMjd(mjdDay);
  if (day < 1 || m2 !== month) throw bad(`day ${day} does not exist in ${year}-${String(month).padStart(2, '0')}`);
  if (!Number.isInteger(hour) || hour < 0 || hour > 23) throw bad(`hour ${hour} is not in 0..23`);
  if (!Number.isInteger(minute) || minute < 0 || minute > 59) throw bad(`minute ${minute} is not in 0..59`);
  if (!Number.isFinite(second) || second < 0 || second >= 61) throw bad(`second ${second} is not in 0..60.999`);
  checkUtcDay(mjdDay, where);
  const secondsOfDay = hour * 3600 + minute * 60 + second;
  if (second >= 60 && secondsOfDay >= utcDayLengthSeconds(mjdDay)) {
    throw bad(`second ${second} exists only in a leap second, and ${formatDate(mjdDay)} does not end with one`);
  }
  return { mjdDay, secondsOfDay };
}

const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}(?:\.\d*)?))?)?\s*(Z|[+-]00(?::?00)?|UTC?)?$/i;
const OLD_FITS_DATE_RE = /^(\d{2})\/(\d{2})\/(\d{2})$/;

/**
 * Parses a UTC date or date-time string.
 *
 * Accepts ISO 8601 as FITS uses it (FITS Standard 4.0, §9.1.1): `YYYY-MM-DD`,
 * `YYYY-MM-DDThh:mm`, `YYYY-MM-DDThh:mm:ss[.s…]`, a space instead of `T`, and an optional
 * `Z`, `+00:00` or `UTC` suffix; also the old FITS form `DD/MM/YY` (meaning 19YY). A second
 * of 60 is accepted on a day that ends with a leap second. Other time zones are refused.
 *
 * @param text the string (surrounding spaces ignored).
 * @param where location for error messages (file, card, keyword, option).
 * @returns the instant and whether the text held a date only.
 * @throws {InputError} `time.bad-format` when the text is not such a string;
 *   `time.bad-field` for a field out of range; `time.before-utc` before 1960.
 * @example
 * parseUtcTime('2024-03-05T21:14:07.5'); // { mjdDay: 60374, secondsOfDay: 76447.5, dateOnly: false }
 */
export function parseUtcTime(text: string, where: ErrorLocation = {}): ParsedUtcTime {
  const s = text.trim();
  const old = OLD_FITS_DATE_RE.exec(s);
  if (old) {
    const u = utcFromCalendar(1900 + Number(old[3]), Number(old[2]), Number(old[1]), 0, 0, 0, where);
    return { ...u, dateOnly: true };
  }
  const m = ISO_RE.exec(s);
  if (!m) {
    throw new InputError('time.bad-format', `"${text}" is not a UTC date/time (expected ISO 8601 such as 2024-03-05T21:14:07.5 or 2024-03-05)`, where);
  }
  const dateOnly = m[4] === undefined;
  const u = utcFromCalendar(Number(m[1]), Number(m[2]), Number(m[3]), dateOnly ? 0 : Number(m[4]), dateOnly ? 0 : Number(m[5]), m[6] === undefined ? 0 : Number(m[6]), where);
  return { ...u, dateOnly };
}

/**
 * Parses a time of day `hh:mm:ss[.s…]` or `hh:mm` (as in TIME-OBS, UT, UTSTART cards) into
 * seconds after midnight (up to 60.999… in the seconds field, for a leap second).
 *
 * @throws {InputError} `time.bad-format` / `time.bad-field`.
 * @example
 * parseTimeOfDaySeconds('21:14:07.5'); // 76447.5
 */
export function parseTimeOfDaySeconds(text: string, where: ErrorLocation = {}): number {
  const m = /^(\d{1,2}):(\d{2})(?::(\d{2}(?:\.\d*)?))?$/.exec(text.trim());
  if (!m) throw new InputError('time.bad-format', `"${text}" is not a time of day (expected hh:mm:ss such as 21:14:07.5)`, where);
  const h = Number(m[1]);
  const min = Number(m[2]);
  const sec = m[3] === undefined ? 0 : Number(m[3]);
  if (h > 23 || min > 59 || sec >= 61) throw new InputError('time.bad-field', `"${text}" is not a valid time of day`, where);
  return h * 3600 + min * 60 + sec;
}

/**
 * The UTC instant of a modified Julian date of UTC (SOFA/ERFA convention on leap-second days:
 * the fraction of the day is seconds/86 401).
 *
 * @param mjdUtc MJD in UTC, from 36 934 (1960-01-01).
 * @throws {InputError} `time.bad-value` when not finite; `time.before-utc` before 1960.
 * @example
 * utcFromMjd(60000.25); // { mjdDay: 60000, secondsOfDay: 21600 }
 */
export function utcFromMjd(mjdUtc: number, where: ErrorLocation = {}): UtcTime {
  if (!Number.isFinite(mjdUtc)) throw new InputError('time.bad-value', `MJD ${mjdUtc} is not a finite number`, where);
  const mjdDay = Math.floor(mjdUtc);
  checkUtcDay(mjdDay, where);
  return { mjdDay, secondsOfDay: (mjdUtc - mjdDay) * utcDayLengthSeconds(mjdDay) };
}

/**
 * The UTC instant of a Julian date of UTC (see {@link utcFromMjd}).
 * @example
 * utcFromJd(2460000.75); // { mjdDay: 60000, secondsOfDay: 21600 }
 */
export function utcFromJd(jdUtc: number, where: ErrorLocation = {}): UtcTime {
  return utcFromMjd(jdUtc - MJD_ZERO_JD, where);
}

/**
 * MJD of UTC of an instant (SOFA/ERFA convention on leap-second days).
 * @example
 * mjdUtcOf({ mjdDay: 60000, secondsOfDay: 21600 }); // 60000.25
 */
export function mjdUtcOf(utc: UtcTime): number {
  return utc.mjdDay + utc.secondsOfDay / utcDayLengthSeconds(utc.mjdDay);
}

/**
 * MJD of TAI of a UTC instant.
 *
 * Method: TAI = UTC + (TAI − UTC), with the 1960–1971 rate of UTC seconds to SI seconds
 * applied within the day as ERFA's `eraUtctai` does.
 *
 * @throws {InputError} `time.before-utc` before 1960.
 * @example
 * mjdTaiOf({ mjdDay: 60000, secondsOfDay: 0 }); // 60000 + 37/86400
 */
export function mjdTaiOf(utc: UtcTime, where: ErrorLocation = {}): number {
  checkUtcDay(utc.mjdDay, where);
  const { dat0, dlod } = dayFacts(utc.mjdDay);
  return utc.mjdDay + (utc.secondsOfDay * (1 + dlod / SECONDS_PER_DAY) + dat0) / SECONDS_PER_DAY;
}

/**
 * The UTC instant of an MJD of TAI (inverse of {@link mjdTaiOf}; a TAI instant inside a
 * leap second maps to 23:59:60.x).
 *
 * @throws {InputError} `time.before-utc` before 1960.
 * @example
 * utcFromMjdTai(60000 + 37 / 86400); // { mjdDay: 60000, secondsOfDay: 0 }
 */
export function utcFromMjdTai(mjdTai: number, where: ErrorLocation = {}): UtcTime {
  if (!Number.isFinite(mjdTai)) throw new InputError('time.bad-value', `MJD ${mjdTai} is not a finite number`, where);
  const d0 = Math.floor(mjdTai);
  for (const mjdDay of [d0, d0 - 1]) {
    if (mjdDay < UTC_START_MJD) continue;
    const { dat0, dlod, lengthS } = dayFacts(mjdDay);
    const secondsOfDay = ((mjdTai - mjdDay) * SECONDS_PER_DAY - dat0) / (1 + dlod / SECONDS_PER_DAY);
    // Rounding can put an instant a few ns outside its day; clamp within 1 µs.
    if (secondsOfDay >= -1e-6 && secondsOfDay < lengthS - 1e-6) return { mjdDay, secondsOfDay: Math.max(0, secondsOfDay) };
    if (secondsOfDay >= lengthS - 1e-6 && secondsOfDay < lengthS) return { mjdDay: mjdDay + 1, secondsOfDay: 0 };
  }
  checkUtcDay(d0 - 1, where);
  throw new InputError('time.before-utc', `UTC is not defined before 1960-01-01`, where);
}

/**
 * The UTC instant `seconds` SI seconds after `utc` (negative for before), counting any leap
 * second in between.
 * @example
 * addSeconds({ mjdDay: 57753, secondsOfDay: 86399 }, 2); // { mjdDay: 57754, secondsOfDay: 0 } (across 23:59:60)
 */
export function addSeconds(utc: UtcTime, seconds: number, where: ErrorLocation = {}): UtcTime {
  return utcFromMjdTai(mjdTaiOf(utc, where) + seconds / SECONDS_PER_DAY, where);
}

/**
 * SI seconds from `a` to `b` (b − a), counting leap seconds.
 * @throws {InputError} `time.before-utc` before 1960.
 * @example
 * secondsBetween(parseUtcTime('2016-12-31T23:59:59'), parseUtcTime('2017-01-01T00:00:01')); // 3
 */
export function secondsBetween(a: UtcTime, b: UtcTime): number {
  return (mjdTaiOf(b) - mjdTaiOf(a)) * SECONDS_PER_DAY;
}

/**
 * ISO 8601 form of a UTC instant, e.g. `2016-12-31T23:59:60.500` (the seconds field shows 60
 * inside a leap second).
 *
 * @param decimals digits after the decimal point of the seconds, 0..9 (default 3).
 * @example
 * formatUtcTime({ mjdDay: 60000, secondsOfDay: 3725.25 }); // '2023-02-25T01:02:05.250'
 */
export function formatUtcTime(utc: UtcTime, decimals = 3): string {
  const scale = 10 ** decimals;
  let mjdDay = utc.mjdDay;
  let ticks = Math.round(utc.secondsOfDay * scale);
  if (ticks >= Math.round(utcDayLengthSeconds(mjdDay) * scale)) {
    mjdDay += 1;
    ticks = 0;
  }
  const whole = Math.floor(ticks / scale);
  const frac = ticks - whole * scale;
  const h = Math.min(23, Math.floor(whole / 3600));
  const m = Math.min(59, Math.floor((whole - h * 3600) / 60));
  const s = whole - h * 3600 - m * 60;
  const pad = (v: number, n = 2) => String(v).padStart(n, '0');
  return `${formatDate(mjdDay)}T${pad(h)}:${pad(m)}:${pad(s)}${decimals > 0 ? '.' + pad(frac, decimals) : ''}`;
}

/**
 * TDB − TT in seconds at a given TT.
 *
 * Method: the leading terms of the Fairhead & Bretagnon (1990) series as given by Kaplan
 * (2005, USNO Circular 179, eq. 2.6; coefficients from memory), stated there to be good to
 * about 10 µs from 1600 to 2200. Geocentric: the observer-dependent term (≤ 2 µs) is left out.
 * Measured against astropy 5.2.1 (ERFA `dtdb`, 787 terms) at 69 times 1990–2035: see
 * test/velocity/time.test.ts.
 *
 * @param mjdTt modified Julian date in TT.
 * @returns TDB − TT, s (periodic, amplitude about 1.66 ms).
 * @example
 * tdbMinusTtSeconds(51544.5); // -0.0000957... (J2000.0)
 */
export function tdbMinusTtSeconds(mjdTt: number): number {
  const t = (mjdTt - MJD_J2000) / DAYS_PER_JULIAN_CENTURY;
  return 0.001657 * Math.sin(628.3076 * t + 6.2401)
    + 0.000022 * Math.sin(575.3385 * t + 4.297)
    + 0.000014 * Math.sin(1256.6152 * t + 6.1969)
    + 0.000005 * Math.sin(606.9777 * t + 4.0212)
    + 0.000005 * Math.sin(52.9691 * t + 0.4444)
    + 0.000002 * Math.sin(21.3299 * t + 5.5431)
    + 0.00001 * t * Math.sin(628.3076 * t + 4.249);
}

/** One instant in each time scale. JDs are doubles (resolution about 40 µs); MJDs about 1 µs. */
export interface TimeScales {
  /** The instant as an ISO 8601 UTC string (ms). */
  readonly isoUtc: string;
  /** MJD of UTC (SOFA/ERFA convention on leap-second days). */
  readonly mjdUtc: number;
  /** JD of UTC. */
  readonly jdUtc: number;
  /** MJD of TAI. */
  readonly mjdTai: number;
  /** MJD of TT (TT = TAI + 32.184 s). */
  readonly mjdTt: number;
  /** JD of TT. */
  readonly jdTt: number;
  /** MJD of TDB (geocentric). */
  readonly mjdTdb: number;
  /** JD of TDB (geocentric). */
  readonly jdTdb: number;
  /** TAI − UTC, s. */
  readonly taiMinusUtcS: number;
  /** TT − UTC, s (TAI − UTC + 32.184). */
  readonly ttMinusUtcS: number;
  /** TDB − TT, s. */
  readonly tdbMinusTtS: number;
  /** True when the instant is past {@link LEAP_SECONDS_KNOWN_UNTIL_MJD}: a leap second unknown to the table may have occurred. */
  readonly beyondLeapSecondTable: boolean;
}

/**
 * Converts a UTC instant to TAI, TT and TDB.
 *
 * Method: UTC → TAI with {@link taiMinusUtcSeconds}; TT = TAI + 32.184 s (IAU 1991);
 * TDB = TT + {@link tdbMinusTtSeconds}.
 *
 * @param utc the instant (1960 on).
 * @param options.logger receives `time.leap-seconds-unknown` past the table's known range.
 * @throws {InputError} `time.before-utc` before 1960.
 * @example
 * timeScales({ mjdDay: 60000, secondsOfDay: 0 }).ttMinusUtcS; // 69.184
 */
export function timeScales(utc: UtcTime, options: { logger?: Logger; where?: ErrorLocation } = {}): TimeScales {
  const where = options.where ?? {};
  const mjdTai = mjdTaiOf(utc, where);
  const mjdTt = mjdTai + TT_MINUS_TAI_S / SECONDS_PER_DAY;
  const tdbMinusTtS = tdbMinusTtSeconds(mjdTt);
  const mjdTdb = mjdTt + tdbMinusTtS / SECONDS_PER_DAY;
  const mjdUtc = mjdUtcOf(utc);
  const taiMinusUtcS = taiMinusUtcSeconds(utc, where);
  const beyond = utc.mjdDay > LEAP_SECONDS_KNOWN_UNTIL_MJD;
  if (beyond) {
    options.logger?.warn({
      code: 'time.leap-seconds-unknown',
      message: `${formatUtcTime(utc)} is after 2026-06-28, the end of the leap-second table; TAI − UTC = 37 s is assumed (no leap second since 2017)`,
    });
  }
  return {
    isoUtc: formatUtcTime(utc),
    mjdUtc,
    jdUtc: mjdUtc + MJD_ZERO_JD,
    mjdTai,
    mjdTt,
    jdTt: mjdTt + MJD_ZERO_JD,
    mjdTdb,
    jdTdb: mjdTdb + MJD_ZERO_JD,
    taiMinusUtcS,
    ttMinusUtcS: taiMinusUtcS + TT_MINUS_TAI_S,
    tdbMinusTtS,
    beyondLeapSecondTable: beyond,
  };
}
