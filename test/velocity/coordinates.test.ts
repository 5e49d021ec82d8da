import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  formatDeclination, formatRightAscension, normalizeLongitudeDeg, parseDeclination, parseLatitude, parseLongitude, parseRightAscension,
} from '../../src/velocity/coordinates.js';
import { geocentricFromSite, makeSite, siteFromGeocentric } from '../../src/velocity/site.js';
import { astropy } from './astropy-fixture.js';

describe('sexagesimal angles', () => {
  it.each([
    ['12:30:00', 187.5],
    ['12 30 00', 187.5],
    ['12h30m00s', 187.5],
    ['06:45:08.917', (6 + 45 / 60 + 8.917 / 3600) * 15], // Sirius, J2000 (from memory)
    ['12:30', 187.5],
    ['12.5h', 187.5],
    ['187.5', 187.5],
    [187.5, 187.5],
    ['00:00:00', 0],
    [360, 0],
  ])('reads RA %j', (value, deg) => {
    expect(parseRightAscension(value)).toBeCloseTo(deg, 12);
  });

  it.each([
    ['-16:42:58.02', -(16 + 42 / 60 + 58.02 / 3600)],
    ['+89 15 51', 89 + 15 / 60 + 51 / 3600],
    ['-00:30:00', -0.5], // negative zero degrees: the sign applies to the whole angle
    ['-0 30 0', -0.5],
    ['45', 45],
    [-90, -90],
    ["-16d42'58\"", -(16 + 42 / 60 + 58 / 3600)],
  ])('reads Dec %j', (value, deg) => {
    expect(parseDeclination(value)).toBeCloseTo(deg, 12);
  });

  it.each([
    [() => parseRightAscension('24:00:01'), 'coord.out-of-range', '"24:00:01": hours 24 must be below 24'],
    [() => parseRightAscension('12:61:00'), 'coord.out-of-range', '"12:61:00": minutes 61 must be below 60'],
    [() => parseRightAscension('12:30:60'), 'coord.out-of-range', '"12:30:60": seconds 60 must be below 60'],
    [() => parseRightAscension('-01:00:00'), 'coord.out-of-range', '"-01:00:00": a right ascension cannot be negative'],
    [() => parseRightAscension(400), 'coord.out-of-range', 'right ascension 400 is outside 0..360 degrees'],
    [() => parseRightAscension('twelve'), 'coord.bad-format', '"twelve" is not a right ascension (degrees, or hours as hh:mm:ss.s)'],
    [() => parseRightAscension('12.5:30:00'), 'coord.bad-format', '"12.5:30:00" is not a right ascension (degrees, or hours as hh:mm:ss.s) (only the last field may have a decimal point)'],
    [() => parseDeclination('+91:00:00'), 'coord.out-of-range', 'declination "+91:00:00" is outside -90..+90 degrees'],
    [() => parseDeclination('12:30:00:00'), 'coord.bad-format', '"12:30:00:00" is not a declination (degrees, or ±dd:mm:ss.s)'],
    [() => parseDeclination(''), 'coord.bad-format', '"" is not a declination (degrees, or ±dd:mm:ss.s)'],
    [() => parseLatitude(95), 'coord.out-of-range', 'latitude 95 is outside -90..+90 degrees'],
  ])('refuses bad input (%#) with a clear message', (call, code, message) => {
    try {
      call();
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe(code);
      expect((e as InputError).message).toBe(message);
    }
  });

  it('names the keyword in messages', () => {
    expect(() => parseDeclination('x', { file: 'a.fits', card: 12, keyword: 'OBJCTDEC' })).toThrow('a.fits: card 12 (OBJCTDEC): "x" is not a declination');
  });

  it('round-trips RA and Dec through the sexagesimal form (property)', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 359.99999, noNaN: true }), fc.double({ min: -90, max: 90, noNaN: true }), (ra, dec) => {
      const raBack = parseRightAscension(formatRightAscension(ra, 4));
      const decBack = parseDeclination(formatDeclination(dec, 3));
      // Half a unit of the last digit: 0.00005 s of time = 2.1e-7°, 0.0005″ = 1.4e-7°.
      const dRa = Math.min(Math.abs(raBack - ra), 360 - Math.abs(raBack - ra));
      return dRa <= 2.2e-7 && Math.abs(decBack - dec) <= 1.5e-7;
    }), { numRuns: 2000 });
  });

  it('formats', () => {
    expect(formatRightAscension(187.5)).toBe('12:30:00.000');
    expect(formatRightAscension(359.9999999999)).toBe('00:00:00.000');
    expect(formatDeclination(-0.5)).toBe('-00:30:00.00');
    expect(formatDeclination(0)).toBe('+00:00:00.00');
  });

  it('reads and folds longitudes', () => {
    expect(parseLongitude('-71:05:00')).toBeCloseTo(-71.083333333, 8);
    expect(normalizeLongitudeDeg(359)).toBe(-1);
    expect(normalizeLongitudeDeg(-180)).toBe(180);
  });
});

describe('sites', () => {
  it('converts geodetic → geocentric as astropy 5.2.1 EarthLocation.from_geodetic (WGS84) does', () => {
    // Reference: itrs_xyz_m in test/fixtures/barycentric-astropy.json.
    let worst = 0;
    for (const c of astropy.cases) {
      const xyz = geocentricFromSite(makeSite(c.lat_deg, c.lon_deg, c.height_m));
      worst = Math.max(worst, Math.hypot(xyz[0] - c.itrs_xyz_m[0], xyz[1] - c.itrs_xyz_m[1], xyz[2] - c.itrs_xyz_m[2]));
      const back = siteFromGeocentric(c.itrs_xyz_m);
      expect(back.latitudeDeg).toBeCloseTo(c.lat_deg, 9);
      expect(back.heightM).toBeCloseTo(c.height_m, 4);
      if (Math.abs(c.lat_deg) < 89.99) expect(normalizeLongitudeDeg(back.longitudeDeg - c.lon_deg)).toBeCloseTo(0, 9);
    }
    console.log(`geocentric site position vs astropy: worst ${(worst * 1000).toFixed(4)} mm`);
    expect(worst).toBeLessThan(1e-3); // 1 mm: both evaluate the same closed-form expression
  });

  it('refuses positions far from the surface and bad geodetic values', () => {
    expect(() => siteFromGeocentric([6378.137, 0, 0], { keyword: 'OBSGEO-X' })).toThrow("keyword OBSGEO-X: geocentric position (6378.137, 0, 0) m is not near the Earth's surface (distance from the centre 6.4 km; expected metres)");
    expect(() => makeSite(91, 0, 0)).toThrow('latitude 91 is outside -90..+90 degrees');
    expect(() => makeSite(0, 0, 2e5)).toThrow('height 200000 m is outside -1000..100000 m');
  });
});
