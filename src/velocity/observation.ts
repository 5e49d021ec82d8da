/**
 * What a barycentric correction needs, read from a FITS header: the exposure mid-point, the
 * target's RA/Dec and the observing site, each of which the caller may also give explicitly
 * (an explicit value overrides the header). The result lists the header keywords it used.
 */
import { InputError, type ErrorLocation } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import type { CardValue, Header } from '../spectrum/header.js';
import { barycentricCorrection, type BarycentricResult, type TargetDirection } from './barycentric.js';
import { parseDeclination, parseLatitude, parseLongitude, parseRightAscension } from './coordinates.js';
import { makeSite, siteFromGeocentric, type ObservingSite } from './site.js';
import {
  addSeconds, formatUtcTime, parseTimeOfDaySeconds, parseUtcTime, secondsBetween, utcDayLengthSeconds, utcFromMjd, type UtcTime,
} from './time.js';

/** Header keywords searched, in order of preference (exported so that messages and docs agree). */
export const OBSERVATION_KEYWORDS = {
  /** Mid-exposure time given in the header (FITS Standard 4.0 time keywords). */
  midpoint: ['DATE-AVG', 'MJD-AVG'],
  /** Exposure start: ISO date(-time) or MJD. */
  start: ['DATE-OBS', 'DATE-BEG', 'MJD-OBS', 'MJD-BEG'],
  /** Time of day when DATE-OBS holds a date only. */
  timeOfDay: ['TIME-OBS', 'UT', 'UTSTART', 'UTC'],
  /** Exposure end. */
  end: ['DATE-END', 'MJD-END'],
  /** Exposure length in seconds. */
  exposure: ['EXPTIME', 'EXPOSURE'],
  /** Target right ascension / declination pairs. */
  target: [['RA_OBJ', 'DEC_OBJ'], ['OBJCTRA', 'OBJCTDEC'], ['OBJRA', 'OBJDEC'], ['RA', 'DEC']],
  /** Geocentric site position in metres (ITRS). */
  siteGeocentric: ['OBSGEO-X', 'OBSGEO-Y', 'OBSGEO-Z'],
  /** Geodetic site latitude / longitude pairs (OBSGEO-B/L: FITS time keywords, east positive). */
  siteGeodetic: [['OBSGEO-B', 'OBSGEO-L'], ['SITELAT', 'SITELONG'], ['OBS-LAT', 'OBS-LONG'], ['LATITUDE', 'LONGITUD'], ['LAT-OBS', 'LONG-OBS'], ['OBSLAT', 'OBSLONG']],
  /** Site height above the ellipsoid (or sea level), metres. */
  siteHeight: ['OBSGEO-H', 'SITEELEV', 'OBS-ELEV', 'ALT-OBS', 'OBSELEV'],
  /** Coordinate system checks. */
  frame: ['EQUINOX', 'EPOCH', 'RADESYS', 'RADECSYS'],
  /** Time scale of the header's dates. */
  timeScale: ['TIMESYS'],
} as const;

/** How the exposure mid-point was found. */
export type MidpointMethod =
  /** Given explicitly (the `midpoint` override, or DATE-AVG/MJD-AVG in the header). */
  | 'given'
  /** Half-way between the start and the end (DATE-END/MJD-END or the `end` override). */
  | 'start-end'
  /** Start + exposure time / 2. */
  | 'start-exposure'
  /** Start only: no exposure time or end was found (the mid-point is uncertain by half the exposure). */
  | 'start-only';

/** Values that override (or stand in for) the header's. */
export interface ObservationOverrides {
  /** Mid-exposure instant (UTC): wins over every other time input. */
  midpoint?: UtcTime | string;
  /** Exposure start (UTC); replaces the header's start, and then the header's end is not used. */
  start?: UtcTime | string;
  /** Exposure end (UTC). */
  end?: UtcTime | string;
  /** Exposure length, seconds, ≥ 0. */
  exposureS?: number;
  /** Target direction (ICRS/J2000 degrees). */
  target?: TargetDirection;
  /** Site latitude, degrees north (with `longitudeDeg`). */
  latitudeDeg?: number;
  /** Site longitude, degrees EAST positive (with `latitudeDeg`). */
  longitudeDeg?: number;
  /** Site height, metres. */
  heightM?: number;
}

/** Options of {@link readObservation}. */
export interface ObservationOptions {
  /** File name for messages. */
  file?: string;
  /** HDU index for messages. */
  hdu?: number;
  /**
   * Sign convention of longitude cards other than OBSGEO-L (which is east positive by
   * definition): `'east'` (default) or `'west'` (as some observatories write it). A card whose
   * comment says "west" is read as west-positive either way, with a warning.
   */
  headerLongitude?: 'east' | 'west';
  /** Receives warnings (no exposure time, no height, times that disagree). */
  logger?: Logger;
}

/** An observation's mid-point, target and site, with the header keywords used. */
export interface Observation {
  /** Mid-exposure instant, UTC. */
  readonly midpoint: UtcTime;
  /** Mid-exposure instant as ISO 8601 UTC (ms). */
  readonly midpointIso: string;
  /** How the mid-point was found. */
  readonly midpointMethod: MidpointMethod;
  /** True when the mid-point was given explicitly rather than computed. */
  readonly midpointGiven: boolean;
  /** Exposure length, s, when known. */
  readonly exposureS: number | null;
  /** Target direction, ICRS/J2000 degrees. */
  readonly target: TargetDirection;
  /** Observing site (longitude east positive). */
  readonly site: ObservingSite;
  /** Header keywords whose values were used, in the order used. */
  readonly keysUsed: readonly string[];
}

const DEFAULT_HEIGHT_M = 0;

class HeaderReader {
  readonly used: string[] = [];
  constructor(readonly header: Header, readonly options: ObservationOptions) {}

  where(keyword: string): ErrorLocation {
    const loc: ErrorLocation = { keyword };
    if (this.options.file !== undefined) loc.file = this.options.file;
    if (this.options.hdu !== undefined) loc.hdu = this.options.hdu;
    const card = this.header.position(keyword);
    if (card !== undefined) loc.card = card;
    return loc;
  }

  /** The value of a card that is present with a defined, non-blank value. */
  value(keyword: string): CardValue | undefined {
    const v = this.header.get(keyword);
    if (v === undefined || v === null) return undefined;
    if (typeof v === 'string' && v.trim() === '') return undefined;
    return v;
  }

  first(keywords: readonly string[]): string | undefined {
    return keywords.find((k) => this.value(k) !== undefined);
  }

  use(keyword: string): void {
    if (!this.used.includes(keyword)) this.used.push(keyword);
  }

  number(keyword: string): number {
    const v = this.value(keyword);
    const n = typeof v === 'number' ? v : typeof v === 'bigint' ? Number(v) : typeof v === 'string' && /^\s*[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?\s*$/.test(v) ? Number(v.replace(/[dD]/, 'e')) : NaN;
    if (!Number.isFinite(n)) throw new InputError('observation.not-a-number', `${keyword} = ${JSON.stringify(v)} is not a number`, this.where(keyword));
    this.use(keyword);
    return n;
  }

  text(keyword: string): string {
    const v = this.value(keyword);
    if (typeof v !== 'string') throw new InputError('observation.not-a-string', `${keyword} = ${String(v)} should be a string`, this.where(keyword));
    this.use(keyword);
    return v.trim();
  }

  /** A time card: ISO string (DATE-*) or MJD number (MJD-*). Returns the instant and whether it was date-only. */
  instant(keyword: string): { utc: UtcTime; dateOnly: boolean } {
    if (keyword.startsWith('MJD')) return { utc: utcFromMjd(this.number(keyword), this.where(keyword)), dateOnly: false };
    const p = parseUtcTime(this.text(keyword), this.where(keyword));
    return { utc: { mjdDay: p.mjdDay, secondsOfDay: p.secondsOfDay }, dateOnly: p.dateOnly };
  }

  angle(keyword: string, parse: (v: number | string, where: ErrorLocation) => number): number {
    const v = this.value(keyword);
    if (typeof v !== 'number' && typeof v !== 'string') throw new InputError('observation.bad-angle', `${keyword} = ${String(v)} is not an angle`, this.where(keyword));
    const r = parse(typeof v === 'string' ? v.trim() : v, this.where(keyword));
    this.use(keyword);
    return r;
  }
}

function toUtc(value: UtcTime | string, name: string): UtcTime {
  const p = typeof value === 'string' ? parseUtcTime(value, { keyword: name }) : value;
  if (!Number.isInteger(p.mjdDay) || !(p.secondsOfDay >= 0 && p.secondsOfDay < utcDayLengthSeconds(p.mjdDay))) {
    throw new InputError('time.bad-value', `${name}: { mjdDay: ${p.mjdDay}, secondsOfDay: ${p.secondsOfDay} } is not a UTC instant (mjdDay a whole number, 0 ≤ secondsOfDay < the day's length)`, { keyword: name });
  }
  return { mjdDay: p.mjdDay, secondsOfDay: p.secondsOfDay };
}

/** Strips a compass letter (N/S/E/W) before or after a sexagesimal string; returns the sign it implies. */
function compassSign(v: number | string, positive: string, negative: string): { value: number | string; sign: 1 | -1 | 0 } {
  if (typeof v !== 'string') return { value: v, sign: 0 };
  const m = new RegExp(`^\\s*([${positive}${negative}])?\\s*(.*?)\\s*([${positive}${negative}])?\\s*$`, 'i').exec(v);
  const letter = (m?.[1] ?? m?.[3])?.toUpperCase();
  if (!m || !letter) return { value: v, sign: 0 };
  return { value: m[2], sign: letter === positive ? 1 : -1 };
}

interface TimeResult { midpoint: UtcTime; method: MidpointMethod; exposureS: number | null }

function readTime(r: HeaderReader, o: ObservationOverrides, logger: Logger): TimeResult | null {
  const exposure = (): number | null => {
    if (o.exposureS !== undefined) {
      if (!Number.isFinite(o.exposureS) || o.exposureS < 0) throw new InputError('observation.bad-exposure', `exposure time ${o.exposureS} s must be a finite number ≥ 0`, { keyword: 'exposureS' });
      return o.exposureS;
    }
    const k = r.first(OBSERVATION_KEYWORDS.exposure);
    if (k === undefined) return null;
    const e = r.number(k);
    if (e < 0 || e > 1e7) throw new InputError('observation.bad-exposure', `${k} = ${e} is not an exposure time in seconds (0..1e7)`, r.where(k));
    return e;
  };
  if (o.midpoint !== undefined) return { midpoint: toUtc(o.midpoint, 'midpoint'), method: 'given', exposureS: o.exposureS ?? null };

  const timesys = r.value('TIMESYS');
  let start: UtcTime | undefined;
  let end: UtcTime | undefined;
  if (o.start !== undefined) {
    start = toUtc(o.start, 'start');
    if (o.end !== undefined) end = toUtc(o.end, 'end');
  } else {
    if (timesys !== undefined) {
      const ts = String(timesys).trim().toUpperCase();
      r.use('TIMESYS');
      if (ts !== 'UTC' && ts !== 'UT') {
        throw new InputError('observation.time-scale', `TIMESYS = '${String(timesys).trim()}': only UTC header times are supported; give the UTC start with --time (options.start)`, r.where('TIMESYS'));
      }
    }
    const mid = r.first(OBSERVATION_KEYWORDS.midpoint);
    if (mid !== undefined) return { midpoint: r.instant(mid).utc, method: 'given', exposureS: exposure() };
    const k = r.first(OBSERVATION_KEYWORDS.start);
    if (k === undefined) return null;
    const s = r.instant(k);
    start = s.utc;
    if (s.dateOnly) {
      const tk = r.first(OBSERVATION_KEYWORDS.timeOfDay);
      if (tk === undefined) {
        throw new InputError('observation.date-only', `${k} = '${r.text(k)}' has no time of day and no ${OBSERVATION_KEYWORDS.timeOfDay.join('/')} card gives it; give the start with --time (options.start) or the mid-point with --midpoint (options.midpoint)`, r.where(k));
      }
      const sod = parseTimeOfDaySeconds(r.text(tk), r.where(tk));
      start = { mjdDay: start.mjdDay, secondsOfDay: sod };
    }
    // DATE-OBS and MJD-OBS that disagree by more than a second are worth a warning.
    if (k === 'DATE-OBS' && r.value('MJD-OBS') !== undefined) {
      const other = utcFromMjd(r.number('MJD-OBS'), r.where('MJD-OBS'));
      const diff = secondsBetween(start, other);
      if (Math.abs(diff) > 1) logger.warn({ code: 'observation.time-mismatch', message: `DATE-OBS and MJD-OBS differ by ${diff.toFixed(1)} s; DATE-OBS is used` });
    }
    const ek = r.first(OBSERVATION_KEYWORDS.end);
    if (ek !== undefined) end = r.instant(ek).utc;
  }
  const exp = exposure();
  if (end !== undefined) {
    const span = secondsBetween(start, end);
    if (span < 0) throw new InputError('observation.end-before-start', `the exposure ends ${(-span).toFixed(3)} s before it starts`, {});
    return { midpoint: addSeconds(start, span / 2), method: 'start-end', exposureS: exp ?? span };
  }
  if (exp !== null) return { midpoint: addSeconds(start, exp / 2), method: 'start-exposure', exposureS: exp };
  logger.warn({ code: 'observation.no-exposure-time', message: `no exposure time (${OBSERVATION_KEYWORDS.exposure.join(', ')}) or end (${OBSERVATION_KEYWORDS.end.join(', ')}): the exposure start is used as the mid-point` });
  return { midpoint: start, method: 'start-only', exposureS: null };
}

function readTarget(r: HeaderReader, o: ObservationOverrides): TargetDirection | null {
  if (o.target !== undefined) {
    return { raDeg: parseRightAscension(o.target.raDeg, { keyword: 'raDeg' }), decDeg: parseDeclination(o.target.decDeg, { keyword: 'decDeg' }) };
  }
  const pair = OBSERVATION_KEYWORDS.target.find(([a, d]) => r.value(a) !== undefined && r.value(d) !== undefined);
  if (pair === undefined) return null;
  const raDeg = r.angle(pair[0], parseRightAscension);
  const decDeg = r.angle(pair[1], parseDeclination);
  checkFrame(r);
  return { raDeg, decDeg };
}

function checkFrame(r: HeaderReader): void {
  const eqKey = r.first(['EQUINOX', 'EPOCH']);
  if (eqKey !== undefined) {
    const v = r.value(eqKey);
    const n = typeof v === 'number' ? v : typeof v === 'string' ? Number(v.trim().replace(/^J/i, '')) : NaN;
    r.use(eqKey);
    if (!(Math.abs(n - 2000) < 0.01)) {
      throw new InputError('observation.equinox', `${eqKey} = ${JSON.stringify(v)}: only J2000/ICRS coordinates are supported (no precession is applied); give J2000 coordinates with --ra/--dec (options.target)`, r.where(eqKey));
    }
  }
  const sysKey = r.first(['RADESYS', 'RADECSYS']);
  if (sysKey !== undefined) {
    const s = String(r.value(sysKey)).trim().toUpperCase();
    r.use(sysKey);
    if (s !== 'ICRS' && s !== 'FK5') {
      throw new InputError('observation.frame', `${sysKey} = '${s}': only ICRS or FK5 (J2000) coordinates are supported; give ICRS coordinates with --ra/--dec (options.target)`, r.where(sysKey));
    }
  }
}

function readSite(r: HeaderReader, o: ObservationOverrides, options: ObservationOptions, logger: Logger): ObservingSite | null {
  const height = (): number => {
    if (o.heightM !== undefined) return o.heightM;
    const hk = r.first(OBSERVATION_KEYWORDS.siteHeight);
    if (hk !== undefined) return r.number(hk);
    logger.warn({ code: 'observation.no-height', message: `no site height (${OBSERVATION_KEYWORDS.siteHeight.join(', ')}): ${DEFAULT_HEIGHT_M} m is assumed (each km of height changes the correction by less than 0.1 m/s)` });
    return DEFAULT_HEIGHT_M;
  };
  if (o.latitudeDeg !== undefined || o.longitudeDeg !== undefined) {
    if (o.latitudeDeg === undefined || o.longitudeDeg === undefined) {
      throw new InputError('observation.partial-site', 'a site needs both a latitude and a longitude (--lat and --lon; options.latitudeDeg and options.longitudeDeg)', {});
    }
    return makeSite(o.latitudeDeg, o.longitudeDeg, height(), { keyword: 'site' });
  }
  const [gx, gy, gz] = OBSERVATION_KEYWORDS.siteGeocentric;
  if (r.value(gx) !== undefined && r.value(gy) !== undefined && r.value(gz) !== undefined) {
    const site = siteFromGeocentric([r.number(gx), r.number(gy), r.number(gz)], r.where(gx));
    return o.heightM !== undefined ? makeSite(site.latitudeDeg, site.longitudeDeg, o.heightM) : site;
  }
  const pair = OBSERVATION_KEYWORDS.siteGeodetic.find(([a, b]) => r.value(a) !== undefined && r.value(b) !== undefined);
  if (pair === undefined) return null;
  const [latKey, lonKey] = pair;
  const lat = r.angle(latKey, (v, where) => {
    const c = compassSign(v, 'N', 'S');
    const x = parseLatitude(c.value, where);
    return c.sign === 0 ? x : c.sign * Math.abs(x);
  });
  let lon = r.angle(lonKey, (v, where) => {
    const c = compassSign(v, 'E', 'W');
    const x = parseLongitude(c.value, where);
    return c.sign === 0 ? x : c.sign * Math.abs(x);
  });
  const rawLon = r.value(lonKey);
  const lettered = typeof rawLon === 'string' && /[EW]/i.test(rawLon);
  if (lonKey !== 'OBSGEO-L' && !lettered) {
    const comment = r.header.card(lonKey)?.comment ?? '';
    if (/\bwest\b/i.test(comment) && !/\beast\b/i.test(comment)) {
      lon = -lon;
      logger.warn({ code: 'observation.west-longitude', message: `${lonKey} is read as west-positive because its comment says so ("${comment}")` });
    } else if (options.headerLongitude === 'west') {
      lon = -lon;
    }
  }
  return makeSite(lat, lon, height(), r.where(latKey));
}

function missingMessage(missing: string[]): string {
  return `cannot compute the correction; missing: ${missing.join('; ')}`;
}

/**
 * Reads an observation's mid-exposure time, target direction and site from a FITS header,
 * with explicit values overriding the header.
 *
 * Conventions:
 * - Time: DATE-OBS (or DATE-BEG, MJD-OBS, MJD-BEG) is the exposure START, in UTC (TIMESYS
 *   must be absent, UTC or UT). When DATE-OBS holds a date only, TIME-OBS/UT/UTSTART/UTC give
 *   the time of day. The mid-point is, in order: an explicit `midpoint`; DATE-AVG/MJD-AVG;
 *   half-way between start and DATE-END/MJD-END (the whole elapsed interval, even if EXPTIME
 *   is shorter); start + EXPTIME/2 (or EXPOSURE); else the start, with a warning.
 * - Target: RA_OBJ/DEC_OBJ, OBJCTRA/OBJCTDEC, OBJRA/OBJDEC, RA/DEC (first pair present).
 *   A number is degrees; a string is sexagesimal hours for RA (`hh:mm:ss.s`) or degrees.
 *   EQUINOX/EPOCH must be 2000 and RADESYS ICRS or FK5 when present (no precession is done).
 * - Site: OBSGEO-X/Y/Z (m, ITRS), else OBSGEO-B/L/H, SITELAT/SITELONG, OBS-LAT/OBS-LONG,
 *   LATITUDE/LONGITUD, LAT-OBS/LONG-OBS, OBSLAT/OBSLONG with a height from OBSGEO-H, SITEELEV,
 *   OBS-ELEV, ALT-OBS or OBSELEV (0 m with a warning if none). Longitudes are east-positive
 *   unless `options.headerLongitude` is `'west'`, the card's comment says west, or the value
 *   carries an E/W letter.
 *
 * @param header the spectrum's header.
 * @param overrides explicit values (each replaces the corresponding header values).
 * @param options file/HDU for messages, longitude convention, logger.
 * @returns the mid-point, target, site and the keywords used.
 * @throws {InputError} `observation.missing` listing every missing input, the keywords looked
 *   for and the options that supply it; other `observation.*`, `time.*`, `coord.*`, `site.*`
 *   codes for values that cannot be used, with the card named.
 * @example
 * const h = Header.from([
 *   { keyword: 'DATE-OBS', value: '2024-03-05T21:14:07' }, { keyword: 'EXPTIME', value: 600 },
 *   { keyword: 'OBJCTRA', value: '06 45 09' }, { keyword: 'OBJCTDEC', value: '-16 42 58' },
 *   { keyword: 'SITELAT', value: 40 }, { keyword: 'SITELONG', value: -105 }, { keyword: 'SITEELEV', value: 1600 },
 * ]);
 * readObservation(h).midpointIso; // '2024-03-05T21:19:07.000'
 */
export function readObservation(header: Header, overrides: ObservationOverrides = {}, options: ObservationOptions = {}): Observation {
  const r = new HeaderReader(header, options);
  const logger = options.logger ?? silentLogger;
  const time = readTime(r, overrides, logger);
  const target = readTarget(r, overrides);
  const site = readSite(r, overrides, options, logger);
  const missing: string[] = [];
  if (time === null) {
    missing.push(`the exposure time (looked for ${[...OBSERVATION_KEYWORDS.midpoint, ...OBSERVATION_KEYWORDS.start].join(', ')}; give --time ISO or --midpoint ISO, options.start or options.midpoint)`);
  }
  if (target === null) {
    missing.push(`the target's RA/Dec (looked for ${OBSERVATION_KEYWORDS.target.map((p) => p.join('/')).join(', ')}; give --ra and --dec, options.target)`);
  }
  if (site === null) {
    missing.push(`the site (looked for ${OBSERVATION_KEYWORDS.siteGeocentric.join('/')}, ${OBSERVATION_KEYWORDS.siteGeodetic.map((p) => p.join('/')).join(', ')}; give --lat, --lon and --height, options.latitudeDeg, options.longitudeDeg and options.heightM)`);
  }
  if (time === null || target === null || site === null) {
    const where: ErrorLocation = {};
    if (options.file !== undefined) where.file = options.file;
    if (options.hdu !== undefined) where.hdu = options.hdu;
    throw new InputError('observation.missing', missingMessage(missing), where);
  }
  return {
    midpoint: time.midpoint,
    midpointIso: formatUtcTime(time.midpoint),
    midpointMethod: time.method,
    midpointGiven: time.method === 'given',
    exposureS: time.exposureS,
    target,
    site,
    keysUsed: r.used.slice(),
  };
}

/** The corrections of {@link barycentricCorrectionFromHeader}: the result plus what it was computed from. */
export interface HeaderCorrection extends BarycentricResult {
  /** Mid-exposure instant as ISO 8601 UTC. */
  readonly midpoint: string;
  /** How the mid-point was found; `observation.midpointGiven` says whether it was explicit. */
  readonly observation: Observation;
  /** Header keywords used. */
  readonly keysUsed: readonly string[];
}

/**
 * Barycentric and heliocentric corrections, BJD_TDB and HJD at the exposure mid-point of a
 * spectrum, from its header plus explicit overrides: {@link readObservation} then
 * {@link barycentricCorrection}.
 *
 * @param header the spectrum's header.
 * @param overrides explicit values that replace the header's.
 * @param options file/HDU for messages, longitude convention, logger.
 * @returns `barycentricCorrectionKmPerS`, `heliocentricCorrectionKmPerS`, `bjdTdb`, `hjd`
 *   (UTC-based), `midpoint`, `keysUsed`, the light times and time scales.
 * @throws {InputError} as {@link readObservation} and {@link barycentricCorrection}.
 * @example
 * const c = barycentricCorrectionFromHeader(spectrum.header, { exposureS: 600 });
 * applyVelocityCorrection(measuredKmPerS, c.barycentricCorrectionKmPerS);
 */
export function barycentricCorrectionFromHeader(header: Header, overrides: ObservationOverrides = {}, options: ObservationOptions = {}): HeaderCorrection {
  const observation = readObservation(header, overrides, options);
  const where: ErrorLocation = {};
  if (options.file !== undefined) where.file = options.file;
  const result = barycentricCorrection({ time: observation.midpoint, target: observation.target, site: observation.site }, { logger: options.logger, where });
  return { ...result, midpoint: observation.midpointIso, observation, keysUsed: observation.keysUsed };
}
