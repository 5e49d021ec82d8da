import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import {
  addSeconds, calendarDateFromMjd, formatUtcTime, LEAP_SECONDS_KNOWN_UNTIL_MJD, mjdFromCalendarDate, mjdTaiOf, mjdUtcOf,
  parseTimeOfDaySeconds, parseUtcTime, secondsBetween, taiMinusUtcSeconds, tdbMinusTtSeconds, timeScales,
  utcDayLengthSeconds, utcFromCalendar, utcFromJd, utcFromMjd, utcFromMjdTai,
} from '../../src/velocity/time.js';
import { astropy, worstAndRms } from './astropy-fixture.js';

describe('calendar and MJD', () => {
  it('matches the MJD definition and J2000.0', () => {
    // MJD 0 = 1858-11-17 (definition of MJD, IAU 1973); J2000.0 = 2000-01-01T12:00 = JD 2451545.0
    // = MJD 51544.5 (IAU 1976); the Unix epoch 1970-01-01 = MJD 40587 (from memory).
    expect(mjdFromCalendarDate(1858, 11, 17)).toBe(0);
    expect(mjdFromCalendarDate(2000, 1, 1)).toBe(51544);
    expect(mjdFromCalendarDate(1970, 1, 1)).toBe(40587);
    expect(utcFromJd(2451545.0)).toEqual({ mjdDay: 51544, secondsOfDay: 43200 });
  });

  it('round-trips calendar dates for every day from 1960 to 2100', () => {
    for (let mjd = 36934; mjd < 88069; mjd += 1) {
      const [y, m, d] = calendarDateFromMjd(mjd);
      if (mjdFromCalendarDate(y, m, d) !== mjd) throw new Error(`round trip failed at MJD ${mjd}`);
    }
    expect(calendarDateFromMjd(51603)).toEqual([2000, 2, 29]); // 2000 is a leap year (Gregorian rule)
    expect(calendarDateFromMjd(mjdFromCalendarDate(2100, 3, 1) - 1)).toEqual([2100, 2, 28]); // 2100 is not
  });
});

describe('parsing UTC times', () => {
  it.each([
    ['2024-03-05T21:14:07.5', { mjdDay: 60374, secondsOfDay: 76447.5, dateOnly: false }],
    ['2024-03-05 21:14:07Z', { mjdDay: 60374, secondsOfDay: 76447, dateOnly: false }],
    ['2024-03-05T21:14', { mjdDay: 60374, secondsOfDay: 76440, dateOnly: false }],
    ['  2024-03-05T21:14:07+00:00 ', { mjdDay: 60374, secondsOfDay: 76447, dateOnly: false }],
    ['2024-03-05', { mjdDay: 60374, secondsOfDay: 0, dateOnly: true }],
    ['05/03/94', { mjdDay: 49416, secondsOfDay: 0, dateOnly: true }], // old FITS DD/MM/YY form (FITS Standard 4.0 §9.1.1)
    ['2016-12-31T23:59:60.5', { mjdDay: 57753, secondsOfDay: 86400.5, dateOnly: false }],
  ])('parses %s', (text, expected) => {
    const p = parseUtcTime(text);
    expect(p.mjdDay).toBe(expected.mjdDay);
    expect(p.secondsOfDay).toBeCloseTo(expected.secondsOfDay, 9);
    expect(p.dateOnly).toBe(expected.dateOnly);
  });

  it.each([
    ['2024-13-01', 'time.bad-field', 'month 13 is not in 1..12'],
    ['2023-02-29T00:00:00', 'time.bad-field', 'day 29 does not exist in 2023-02'],
    ['2024-03-05T24:00:00', 'time.bad-field', 'hour 24 is not in 0..23'],
    ['2017-06-30T23:59:60.5', 'time.bad-field', 'second 60.5 exists only in a leap second, and 2017-06-30 does not end with one'],
    ['2024-03-05T21:14:07+02:00', 'time.bad-format', '"2024-03-05T21:14:07+02:00" is not a UTC date/time (expected ISO 8601 such as 2024-03-05T21:14:07.5 or 2024-03-05)'],
    ['yesterday', 'time.bad-format', '"yesterday" is not a UTC date/time (expected ISO 8601 such as 2024-03-05T21:14:07.5 or 2024-03-05)'],
    ['1959-12-31T00:00:00', 'time.before-utc', 'UTC is not defined before 1960-01-01 (got 1959-12-31); give a later time'],
  ])('refuses %s', (text, code, message) => {
    try {
      parseUtcTime(text, { keyword: 'DATE-OBS', card: 7 });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe(code);
      expect((e as InputError).message).toBe(`card 7 (DATE-OBS): ${message}`);
    }
  });

  it('parses times of day', () => {
    expect(parseTimeOfDaySeconds('21:14:07.5')).toBe(76447.5);
    expect(parseTimeOfDaySeconds('3:05')).toBe(11100);
    expect(() => parseTimeOfDaySeconds('25:00:00')).toThrow('"25:00:00" is not a valid time of day');
    expect(() => parseTimeOfDaySeconds('21h14m')).toThrow('"21h14m" is not a time of day (expected hh:mm:ss such as 21:14:07.5)');
  });

  it('formats and re-parses any instant 1972–2035 to the millisecond (property)', () => {
    fc.assert(fc.property(fc.integer({ min: 41317, max: 64693 }), fc.integer({ min: 0, max: 86_400_999 }), (day, ms) => {
      const length = utcDayLengthSeconds(day);
      const seconds = Math.min(ms / 1000, length - 0.001);
      const text = formatUtcTime({ mjdDay: day, secondsOfDay: seconds });
      const back = parseUtcTime(text);
      return back.mjdDay === day && Math.abs(back.secondsOfDay - seconds) < 5e-7;
    }), { numRuns: 2000 });
  });

  it('formats a leap second as 23:59:60', () => {
    expect(formatUtcTime({ mjdDay: 57753, secondsOfDay: 86400.5 })).toBe('2016-12-31T23:59:60.500');
    expect(formatUtcTime({ mjdDay: 60000, secondsOfDay: 86399.9996 })).toBe('2023-02-26T00:00:00.000');
  });
});

describe('leap seconds', () => {
  it('agrees with ERFA\'s table (through astropy 5.2.1) at every step from 1972', () => {
    // Source: erfa.leap_seconds.get() (pyerfa 2.0.0.1), recorded by the reference script.
    for (const e of astropy.leap_seconds_erfa.filter((x) => x.year >= 1972)) {
      const day = mjdFromCalendarDate(e.year, e.month, 1);
      expect(taiMinusUtcSeconds({ mjdDay: day, secondsOfDay: 0 })).toBe(e.tai_utc_s);
      // The second before each step (1972-01-01 follows the 1960–1971 drift era, ending at 9.89 s).
      if (e.tai_utc_s > 10) expect(taiMinusUtcSeconds({ mjdDay: day - 1, secondsOfDay: 86399 })).toBe(e.tai_utc_s - 1);
    }
    expect(astropy.leap_seconds_erfa.at(-1)).toEqual({ year: 2017, month: 1, tai_utc_s: 37 });
  });

  it('agrees with the IERS/IETF leap-seconds.list of Debian tzdata, and ends where that list expires', () => {
    const list = astropy.leap_seconds_tzdata;
    if (list === null) throw new Error('fixture lacks the tzdata leap-seconds.list (regenerate on a machine with tzdata)');
    // Source: leap-seconds.list in Debian's tzdata 2025b ("File expires on 28 June 2026").
    expect(list.entries).toHaveLength(28);
    for (const e of list.entries) {
      expect(taiMinusUtcSeconds({ mjdDay: e.mjd, secondsOfDay: 0 })).toBe(e.tai_utc_s);
    }
    expect(list.expires_mjd).toBe(LEAP_SECONDS_KNOWN_UNTIL_MJD);
    expect(formatUtcTime({ mjdDay: LEAP_SECONDS_KNOWN_UNTIL_MJD, secondsOfDay: 0 })).toBe('2026-06-28T00:00:00.000');
  });

  it('reproduces ERFA\'s 1960–1971 drift formulas', () => {
    // Source: erfa.dat(year, month, day, fraction) through the reference script.
    for (const e of astropy.leap_seconds_pre1972) {
      const [y, m, d] = e.date.split('-').map(Number);
      const got = taiMinusUtcSeconds({ mjdDay: mjdFromCalendarDate(y, m, d), secondsOfDay: e.day_fraction * 86400 });
      expect(Math.abs(got - e.tai_utc_s)).toBeLessThan(1e-9);
    }
  });

  it('has a day of 86 401 s before each leap second and keeps 37 s after the table', () => {
    expect(utcDayLengthSeconds(57753)).toBe(86401); // 2016-12-31
    expect(utcDayLengthSeconds(57754)).toBe(86400);
    expect(taiMinusUtcSeconds(parseUtcTime('2035-12-31T00:00:00'))).toBe(37);
  });

  it('counts the leap second in elapsed time', () => {
    const before = parseUtcTime('2016-12-31T23:59:59');
    const after = parseUtcTime('2017-01-01T00:00:01');
    expect(secondsBetween(before, after)).toBeCloseTo(3, 6);
    expect(formatUtcTime(addSeconds(before, 1.5))).toBe('2016-12-31T23:59:60.500');
    expect(formatUtcTime(addSeconds(before, 2))).toBe('2017-01-01T00:00:00.000');
  });

  it('converts UTC → TAI → UTC both ways (property)', () => {
    fc.assert(fc.property(fc.integer({ min: 37000, max: 64693 }), fc.double({ min: 0, max: 86399.999, noNaN: true }), (day, s) => {
      const back = utcFromMjdTai(mjdTaiOf({ mjdDay: day, secondsOfDay: s }));
      const err = (back.mjdDay - day) * 86400 + back.secondsOfDay - s;
      return Math.abs(err) < 2e-6;
    }), { numRuns: 2000 });
  });
});

describe('time scales against astropy 5.2.1', () => {
  it('TT − UTC (from JDs, ERFA convention on leap-second days) within 2 µs', () => {
    const d = astropy.cases.map((c) => {
      const s = timeScales(parseUtcTime(c.time_utc));
      return (s.mjdTt - s.mjdUtc) * 86400 - c.tt_minus_utc_s;
    });
    const { worst } = worstAndRms(d);
    console.log(`TT−UTC vs astropy: worst ${(worst * 1e6).toFixed(3)} µs`);
    // 2 µs: the resolution of an MJD held in a double (~1 µs) twice.
    expect(worst).toBeLessThan(2e-6);
  });

  it('JD of UTC in ERFA\'s convention inside the leap second', () => {
    const c = astropy.cases.find((x) => x.time_utc === '2016-12-31T23:59:60.500');
    expect(c).toBeDefined();
    const s = timeScales(parseUtcTime(c!.time_utc));
    expect(Math.abs(s.jdUtc - c!.jd_utc) * 86400).toBeLessThan(5e-5);
  });

  it('TDB − TT within 10 µs (the stated accuracy of the series)', () => {
    const d = astropy.cases.map((c) => tdbMinusTtSeconds(timeScales(parseUtcTime(c.time_utc)).mjdTt) - c.tdb_minus_tt_s);
    const { worst, rms } = worstAndRms(d);
    console.log(`TDB−TT vs astropy (ERFA dtdb): worst ${(worst * 1e6).toFixed(2)} µs, RMS ${(rms * 1e6).toFixed(2)} µs`);
    // Kaplan (2005, USNO Circular 179) states ~10 µs for this truncated series (from memory).
    expect(worst).toBeLessThan(10e-6);
  });

  it('reports the standard offsets', () => {
    const s = timeScales(parseUtcTime('2024-03-05T00:00:00'));
    expect(s.taiMinusUtcS).toBe(37);
    expect(s.ttMinusUtcS).toBeCloseTo(69.184, 12); // 37 + 32.184 s (IAU 1991 TT − TAI)
    expect(Math.abs(s.tdbMinusTtS)).toBeLessThan(0.0017); // amplitude 1.657 ms (Fairhead & Bretagnon 1990)
    expect(s.isoUtc).toBe('2024-03-05T00:00:00.000');
    expect(s.beyondLeapSecondTable).toBe(false);
  });

  it('warns only after the table', () => {
    const logger = collectingLogger();
    timeScales(parseUtcTime('2026-06-28T12:00:00'), { logger });
    expect(logger.warnings).toEqual([]);
    timeScales(parseUtcTime('2026-06-29T00:00:00'), { logger });
    expect(logger.warnings.map((w) => w.code)).toEqual(['time.leap-seconds-unknown']);
  });
});

describe('MJD/JD of UTC', () => {
  it('round-trips and refuses bad values', () => {
    expect(utcFromMjd(60000.25)).toEqual({ mjdDay: 60000, secondsOfDay: 21600 });
    expect(mjdUtcOf(utcFromMjd(60123.456789))).toBeCloseTo(60123.456789, 10);
    expect(() => utcFromMjd(Number.NaN)).toThrow('MJD NaN is not a finite number');
    expect(() => utcFromMjd(30000)).toThrow('UTC is not defined before 1960-01-01 (got 1941-01-06); give a later time');
    expect(() => utcFromCalendar(2024, 2, 30)).toThrow('day 30 does not exist in 2024-02');
  });
});
