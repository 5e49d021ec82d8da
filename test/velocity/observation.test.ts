import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { Header, type HeaderCard } from '../../src/spectrum/header.js';
import { barycentricCorrectionFromHeader, readObservation, type ObservationOverrides } from '../../src/velocity/observation.js';
import { addSeconds, formatUtcTime, parseUtcTime } from '../../src/velocity/time.js';
import { astropy } from './astropy-fixture.js';

const card = (keyword: string, value: HeaderCard['value'], comment?: string): HeaderCard => (comment === undefined ? { keyword, value } : { keyword, value, comment });

// An invented club header (Larkspur Valley Astronomy Club, invented star LVAC-7; site invented).
const clubCards: HeaderCard[] = [
  card('OBJECT', 'LVAC-7'),
  card('DATE-OBS', '2024-03-05T21:14:07.000'),
  card('EXPTIME', 600),
  card('OBJCTRA', '06 45 09.0'),
  card('OBJCTDEC', '-16 42 58'),
  card('SITELAT', '+38:52:10'),
  card('SITELONG', '-121:03:40'),
  card('SITEELEV', 312),
];

function inputError(call: () => unknown): InputError {
  try {
    call();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

describe('readObservation', () => {
  it('reads a typical header: start + EXPTIME/2, sexagesimal target and site, keys used in order', () => {
    const o = readObservation(Header.from(clubCards));
    expect(o.midpointIso).toBe('2024-03-05T21:19:07.000');
    expect(o.midpointMethod).toBe('start-exposure');
    expect(o.midpointGiven).toBe(false);
    expect(o.exposureS).toBe(600);
    expect(o.target.raDeg).toBeCloseTo((6 + 45 / 60 + 9 / 3600) * 15, 12);
    expect(o.target.decDeg).toBeCloseTo(-(16 + 42 / 60 + 58 / 3600), 12);
    expect(o.site.latitudeDeg).toBeCloseTo(38 + 52 / 60 + 10 / 3600, 12);
    expect(o.site.longitudeDeg).toBeCloseTo(-(121 + 3 / 60 + 40 / 3600), 12);
    expect(o.site.heightM).toBe(312);
    expect(o.keysUsed).toEqual(['DATE-OBS', 'EXPTIME', 'OBJCTRA', 'OBJCTDEC', 'SITELAT', 'SITELONG', 'SITEELEV']);
  });

  it('takes the time of day from TIME-OBS when DATE-OBS holds a date only', () => {
    const h = Header.from(clubCards).with('DATE-OBS', '2024-03-05').with('TIME-OBS', '21:14:07');
    const o = readObservation(h);
    expect(o.midpointIso).toBe('2024-03-05T21:19:07.000');
    expect(o.keysUsed.slice(0, 3)).toEqual(['DATE-OBS', 'TIME-OBS', 'EXPTIME']);
    const ut = Header.from(clubCards).with('DATE-OBS', '2024-03-05').with('UT', '21:14:07');
    expect(readObservation(ut).midpointIso).toBe('2024-03-05T21:19:07.000');
  });

  it('refuses a date-only DATE-OBS without a time of day, naming the card and the ways out', () => {
    const h = Header.from(clubCards).with('DATE-OBS', '2024-03-05');
    const e = inputError(() => readObservation(h, {}, { file: 'lvac7.fits', hdu: 0 }));
    expect(e.code).toBe('observation.date-only');
    expect(e.message).toBe("lvac7.fits: HDU 0: card 2 (DATE-OBS): DATE-OBS = '2024-03-05' has no time of day and no TIME-OBS/UT/UTSTART/UTC card gives it; give the start with --time (options.start) or the mid-point with --midpoint (options.midpoint)");
  });

  it('uses half-way between DATE-OBS and DATE-END when the end is given (leap second counted)', () => {
    const h = Header.from(clubCards).with('DATE-OBS', '2016-12-31T23:59:00').with('DATE-END', '2017-01-01T00:00:01');
    const o = readObservation(h);
    // 62 SI seconds elapse (one leap second): the mid-point is 31 s after the start.
    expect(o.midpointIso).toBe('2016-12-31T23:59:31.000');
    expect(o.midpointMethod).toBe('start-end');
    expect(o.keysUsed).toContain('DATE-END');
  });

  it('uses DATE-AVG / MJD-AVG as a given mid-point', () => {
    const o = readObservation(Header.from(clubCards).with('DATE-AVG', '2024-03-05T21:20:00'));
    expect(o.midpointIso).toBe('2024-03-05T21:20:00.000');
    expect(o.midpointGiven).toBe(true);
    const m = readObservation(Header.from(clubCards).without('DATE-OBS').with('MJD-AVG', 60374.5));
    expect(m.midpointIso).toBe('2024-03-05T12:00:00.000');
  });

  it('reads MJD-OBS with EXPOSURE', () => {
    const h = Header.from(clubCards).without('DATE-OBS', 'EXPTIME').with('MJD-OBS', 60374.25).with('EXPOSURE', 120);
    const o = readObservation(h);
    expect(o.midpointIso).toBe('2024-03-05T06:01:00.000');
    expect(o.keysUsed.slice(0, 2)).toEqual(['MJD-OBS', 'EXPOSURE']);
  });

  it('lets explicit values override the header, without mutating them', () => {
    const overrides: ObservationOverrides = Object.freeze({
      midpoint: '2024-03-06T01:00:00',
      target: Object.freeze({ raDeg: 10, decDeg: 20 }),
      latitudeDeg: -30, longitudeDeg: 150, heightM: 1000,
    });
    const before = JSON.stringify(overrides);
    const o = readObservation(Header.from(clubCards).with('EQUINOX', 1950), overrides);
    expect(JSON.stringify(overrides)).toBe(before);
    expect(o.midpointIso).toBe('2024-03-06T01:00:00.000');
    expect(o.midpointGiven).toBe(true);
    expect(o.target).toEqual({ raDeg: 10, decDeg: 20 });
    expect(o.site).toEqual({ latitudeDeg: -30, longitudeDeg: 150, heightM: 1000 });
    expect(o.keysUsed).toEqual([]); // EQUINOX not checked: the target came from the caller
  });

  it('refuses an override instant that is not one', () => {
    const e = inputError(() => readObservation(Header.from(clubCards), { midpoint: { mjdDay: 60000, secondsOfDay: 90000 } }));
    expect(e.message).toBe("keyword midpoint: midpoint: { mjdDay: 60000, secondsOfDay: 90000 } is not a UTC instant (mjdDay a whole number, 0 ≤ secondsOfDay < the day's length)");
  });

  it('uses a start override with the header exposure time', () => {
    const o = readObservation(Header.from(clubCards), { start: '2024-03-05T22:00:00' });
    expect(o.midpointIso).toBe('2024-03-05T22:05:00.000');
  });

  it('lists everything missing, the keywords it looked for and the options that supply each', () => {
    const e = inputError(() => readObservation(Header.from([card('OBJECT', 'LVAC-7')]), {}, { file: 'x.fits' }));
    expect(e.code).toBe('observation.missing');
    expect(e.message).toBe(
      'x.fits: cannot compute the correction; missing: '
      + 'the exposure time (looked for DATE-AVG, MJD-AVG, DATE-OBS, DATE-BEG, MJD-OBS, MJD-BEG; give --time ISO or --midpoint ISO, options.start or options.midpoint); '
      + "the target's RA/Dec (looked for RA_OBJ/DEC_OBJ, OBJCTRA/OBJCTDEC, OBJRA/OBJDEC, RA/DEC; give --ra and --dec, options.target); "
      + 'the site (looked for OBSGEO-X/OBSGEO-Y/OBSGEO-Z, OBSGEO-B/OBSGEO-L, SITELAT/SITELONG, OBS-LAT/OBS-LONG, LATITUDE/LONGITUD, LAT-OBS/LONG-OBS, OBSLAT/OBSLONG; give --lat, --lon and --height, options.latitudeDeg, options.longitudeDeg and options.heightM)',
    );
  });

  it('warns and uses the start when no exposure time or end is known', () => {
    const logger = collectingLogger();
    const o = readObservation(Header.from(clubCards).without('EXPTIME'), {}, { logger });
    expect(o.midpointMethod).toBe('start-only');
    expect(o.midpointIso).toBe('2024-03-05T21:14:07.000');
    expect(logger.warnings).toEqual([{ code: 'observation.no-exposure-time', message: 'no exposure time (EXPTIME, EXPOSURE) or end (DATE-END, MJD-END): the exposure start is used as the mid-point' }]);
  });

  it('warns and assumes 0 m when no height is known', () => {
    const logger = collectingLogger();
    const o = readObservation(Header.from(clubCards).without('SITEELEV'), {}, { logger });
    expect(o.site.heightM).toBe(0);
    expect(logger.warnings.map((w) => w.code)).toEqual(['observation.no-height']);
  });

  it('reads longitude conventions: east by default, west by comment, option or compass letter', () => {
    const logger = collectingLogger();
    const west = Header.from(clubCards).without('SITELONG').with('SITELONG', 121.06, 'longitude, degrees west');
    expect(readObservation(west, {}, { logger }).site.longitudeDeg).toBeCloseTo(-121.06, 12);
    expect(logger.warnings.map((w) => w.code)).toEqual(['observation.west-longitude']);
    const plain = Header.from(clubCards).with('SITELONG', 121.06);
    expect(readObservation(plain).site.longitudeDeg).toBeCloseTo(121.06, 12);
    expect(readObservation(plain, {}, { headerLongitude: 'west' }).site.longitudeDeg).toBeCloseTo(-121.06, 12);
    expect(readObservation(Header.from(clubCards).with('SITELONG', '121 03 40 W')).site.longitudeDeg).toBeCloseTo(-(121 + 3 / 60 + 40 / 3600), 12);
    expect(readObservation(Header.from(clubCards).with('SITELAT', 'S 33:52:00')).site.latitudeDeg).toBeCloseTo(-(33 + 52 / 60), 12);
  });

  it('reads other site and target keyword families', () => {
    const h = Header.from([
      card('DATE-OBS', '2024-03-05T21:14:07'), card('EXPTIME', 60),
      card('RA', 101.2875), card('DEC', -16.7161), card('EQUINOX', 2000.0), card('RADESYS', 'ICRS'),
      card('OBS-LAT', 38.87), card('OBS-LONG', -121.06), card('OBS-ELEV', 312),
    ]);
    const o = readObservation(h);
    expect(o.target).toEqual({ raDeg: 101.2875, decDeg: -16.7161 });
    expect(o.site).toEqual({ latitudeDeg: 38.87, longitudeDeg: -121.06, heightM: 312 });
    expect(o.keysUsed).toEqual(['DATE-OBS', 'EXPTIME', 'RA', 'DEC', 'EQUINOX', 'RADESYS', 'OBS-LAT', 'OBS-LONG', 'OBS-ELEV']);
    // RA_OBJ wins over RA; OBSGEO-X/Y/Z wins over the geodetic cards.
    const h2 = h.with('RA_OBJ', 50).with('DEC_OBJ', 10).with('OBSGEO-X', 6378137).with('OBSGEO-Y', 0).with('OBSGEO-Z', 0);
    const o2 = readObservation(h2);
    expect(o2.target).toEqual({ raDeg: 50, decDeg: 10 });
    expect(o2.site.latitudeDeg).toBeCloseTo(0, 12);
    expect(o2.site.heightM).toBeCloseTo(0, 6);
  });

  it.each([
    [card('EQUINOX', 1950.0), 'observation.equinox', 'card 9 (EQUINOX): EQUINOX = 1950: only J2000/ICRS coordinates are supported (no precession is applied); give J2000 coordinates with --ra/--dec (options.target)'],
    [card('RADESYS', 'FK4'), 'observation.frame', "card 9 (RADESYS): RADESYS = 'FK4': only ICRS or FK5 (J2000) coordinates are supported; give ICRS coordinates with --ra/--dec (options.target)"],
    [card('TIMESYS', 'TT'), 'observation.time-scale', "card 9 (TIMESYS): TIMESYS = 'TT': only UTC header times are supported; give the UTC start with --time (options.start)"],
  ])('refuses %j', (extra, code, message) => {
    const e = inputError(() => readObservation(Header.from([...clubCards, extra])));
    expect(e.code).toBe(code);
    expect(e.message).toBe(message);
  });

  it('accepts EQUINOX written as the string J2000', () => {
    expect(readObservation(Header.from([...clubCards, card('EQUINOX', 'J2000')])).keysUsed).toContain('EQUINOX');
  });

  it.each([
    ['DATE-OBS', '2024-03-05T25:00:00', 'card 2 (DATE-OBS): hour 25 is not in 0..23'],
    ['EXPTIME', 'long', 'card 3 (EXPTIME): EXPTIME = "long" is not a number'],
    ['EXPTIME', -5, 'card 3 (EXPTIME): EXPTIME = -5 is not an exposure time in seconds (0..1e7)'],
    ['OBJCTRA', '25 00 00', 'card 4 (OBJCTRA): "25 00 00": hours 25 must be below 24'],
    ['SITELAT', '+95:00:00', 'card 6 (SITELAT): latitude "+95:00:00" is outside -90..+90 degrees'],
  ])('names the card of a bad %s', (keyword, value, message) => {
    const e = inputError(() => readObservation(Header.from(clubCards).with(keyword, value)));
    expect(e.message).toBe(message);
  });

  it('warns when DATE-OBS and MJD-OBS disagree', () => {
    const logger = collectingLogger();
    readObservation(Header.from(clubCards).with('MJD-OBS', 60374.0), {}, { logger });
    expect(logger.warnings.map((w) => w.message)).toEqual(['DATE-OBS and MJD-OBS differ by -76447.0 s; DATE-OBS is used']);
  });
});

describe('barycentricCorrectionFromHeader against astropy 5.2.1', () => {
  it('reproduces the reference corrections from headers built from the reference cases', () => {
    // Reference: test/fixtures/barycentric-astropy.json (astropy 5.2.1 radial_velocity_correction,
    // light_travel_time). Each header holds DATE-OBS = reference time − EXPTIME/2 so that the
    // mid-point falls on the reference time, the site as OBSGEO-X/Y/Z and the target as RA/DEC.
    for (const c of astropy.cases.slice(0, 12)) {
      const start = addSeconds(parseUtcTime(c.time_utc), -150);
      const h = Header.from([
        card('DATE-OBS', formatUtcTime(start, 3)), card('EXPTIME', 300),
        card('RA', c.ra_deg), card('DEC', c.dec_deg),
        card('OBSGEO-X', c.itrs_xyz_m[0]), card('OBSGEO-Y', c.itrs_xyz_m[1]), card('OBSGEO-Z', c.itrs_xyz_m[2]),
      ]);
      const r = barycentricCorrectionFromHeader(h);
      expect(r.midpoint).toBe(formatUtcTime(parseUtcTime(c.time_utc), 3));
      // Same 3 m/s and 20 ms budget as test/velocity/barycentric.test.ts.
      expect(Math.abs(r.barycentricCorrectionKmPerS * 1000 - c.barycentric_correction_m_s)).toBeLessThan(3);
      expect(Math.abs(r.heliocentricCorrectionKmPerS * 1000 - c.heliocentric_correction_m_s)).toBeLessThan(3);
      expect(Math.abs(r.bjdTdb - 2400000 - c.bjd_tdb_minus_2400000) * 86400).toBeLessThan(0.02);
      expect(Math.abs(r.hjd - 2400000 - c.hjd_utc_minus_2400000) * 86400).toBeLessThan(0.02);
      expect(r.keysUsed).toEqual(['DATE-OBS', 'EXPTIME', 'RA', 'DEC', 'OBSGEO-X', 'OBSGEO-Y', 'OBSGEO-Z']);
    }
  });
});
