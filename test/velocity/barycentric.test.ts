import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { barycentricCorrection, unitVectorFromRaDec, type BarycentricInput } from '../../src/velocity/barycentric.js';
import { applyVelocityCorrection } from '../../src/velocity/doppler.js';
import { makeSite } from '../../src/velocity/site.js';
import { parseUtcTime } from '../../src/velocity/time.js';
import { astropy, worstAndRms, type AstropyCase } from './astropy-fixture.js';

function ours(c: AstropyCase) {
  return barycentricCorrection({
    time: parseUtcTime(c.time_utc),
    target: { raDeg: c.ra_deg, decDeg: c.dec_deg },
    site: makeSite(c.lat_deg, c.lon_deg, c.height_m),
  });
}

// Reference: astropy 5.2.1 (Debian python3-astropy, ERFA epv00 ephemeris), written by
// test/reference/make_barycentric_refs.py into test/fixtures/barycentric-astropy.json; the
// exact calls are recorded in the fixture. 69 cases: 60 seeded random times 1990–2035, sites
// and targets (incl. |lat| ≈ 78–90°, |Dec| ≈ 88–90°) and 9 hand-picked times around leap
// seconds (one inside 2016-12-31T23:59:60) and in the future.
describe('barycentric corrections against astropy 5.2.1', () => {
  const results = astropy.cases.map((c) => ({ c, r: ours(c) }));

  it('has enough cases of the right kinds', () => {
    expect(astropy.library).toMatch(/^astropy 5\.2\.1/);
    expect(astropy.cases.length).toBeGreaterThanOrEqual(60);
    expect(astropy.cases.some((c) => c.time_utc.includes('T23:59:60'))).toBe(true);
    expect(astropy.cases.some((c) => Math.abs(c.dec_deg) > 89)).toBe(true);
    expect(astropy.cases.some((c) => Math.abs(c.lat_deg) > 89)).toBe(true);
  });

  it('barycentric correction (radial_velocity_correction kind=barycentric) agrees within 3 m/s', () => {
    const d = results.map(({ c, r }) => r.barycentricCorrectionKmPerS * 1000 - c.barycentric_correction_m_s);
    const { worst, rms } = worstAndRms(d);
    console.log(`barycentric correction vs astropy: worst ${worst.toFixed(3)} m/s, RMS ${rms.toFixed(3)} m/s over ${d.length} cases`);
    // Budget: astronomy-engine's truncated VSOP87 Earth velocity (~1 m/s, measured worst 1.4 m/s
    // when written); the brief's limit is 10 m/s. 3 m/s leaves room without hiding a lost term
    // (the gravitational term alone is ~3 m/s, the transverse-Doppler term up to ~5 m/s).
    expect(worst).toBeLessThan(3);
    expect(rms).toBeLessThan(1.5);
  });

  it('heliocentric correction (kind=heliocentric) agrees within 3 m/s', () => {
    const d = results.map(({ c, r }) => r.heliocentricCorrectionKmPerS * 1000 - c.heliocentric_correction_m_s);
    const { worst, rms } = worstAndRms(d);
    console.log(`heliocentric correction vs astropy: worst ${worst.toFixed(3)} m/s, RMS ${rms.toFixed(3)} m/s`);
    expect(worst).toBeLessThan(3);
  });

  it('light-travel times (Time.light_travel_time) agree within 20 ms', () => {
    const db = results.map(({ c, r }) => r.lightTravelTimeBarycentricS - c.light_travel_time_barycentric_s);
    const dh = results.map(({ c, r }) => r.lightTravelTimeHeliocentricS - c.light_travel_time_heliocentric_s);
    const b = worstAndRms(db);
    const h = worstAndRms(dh);
    console.log(`light time vs astropy: barycentric worst ${(b.worst * 1e3).toFixed(2)} ms RMS ${(b.rms * 1e3).toFixed(2)} ms; heliocentric worst ${(h.worst * 1e3).toFixed(2)} ms RMS ${(h.rms * 1e3).toFixed(2)} ms`);
    // Budget: the Earth's barycentric position from astronomy-engine is good to a few thousand km
    // (~10 ms of light time; measured worst 8.7 ms); the brief's limit is 0.1 s.
    expect(b.worst).toBeLessThan(0.02);
    expect(h.worst).toBeLessThan(0.02);
  });

  it('BJD_TDB and HJD (UTC) agree within 20 ms', () => {
    const dbjd = results.map(({ c, r }) => (r.bjdTdb - 2400000 - c.bjd_tdb_minus_2400000) * 86400);
    const dhjd = results.map(({ c, r }) => (r.hjd - 2400000 - c.hjd_utc_minus_2400000) * 86400);
    const b = worstAndRms(dbjd);
    const h = worstAndRms(dhjd);
    console.log(`BJD_TDB vs astropy: worst ${(b.worst * 1e3).toFixed(2)} ms, RMS ${(b.rms * 1e3).toFixed(2)} ms; HJD: worst ${(h.worst * 1e3).toFixed(2)} ms, RMS ${(h.rms * 1e3).toFixed(2)} ms`);
    // Same budget as the light times, plus 40 µs of double-precision JD resolution.
    expect(b.worst).toBeLessThan(0.02);
    expect(h.worst).toBeLessThan(0.02);
  });

  it('the JD of TDB agrees within 20 µs', () => {
    const d = results.map(({ c, r }) => (r.time.mjdTdb - c.mjd_tdb) * 86400);
    const { worst } = worstAndRms(d);
    console.log(`MJD TDB vs astropy: worst ${(worst * 1e6).toFixed(2)} µs`);
    // TDB−TT series good to ~10 µs (Kaplan 2005) plus ~1 µs of MJD rounding.
    expect(worst).toBeLessThan(20e-6);
  });
});

describe('barycentricCorrection', () => {
  const input: BarycentricInput = {
    time: parseUtcTime('2024-03-05T21:19:07'),
    target: { raDeg: 101.2875, decDeg: -16.7161 },
    site: makeSite(40, -105, 1600),
  };

  it('does not mutate its input', () => {
    const frozen = Object.freeze({ ...input, time: Object.freeze({ ...input.time }), target: Object.freeze({ ...input.target }), site: Object.freeze({ ...input.site }) });
    const copy = JSON.stringify(frozen);
    barycentricCorrection(frozen);
    expect(JSON.stringify(frozen)).toBe(copy);
  });

  it('has the diurnal term: sites 90° apart on the equator span a circle of radius ω·a', () => {
    // Rotation speed at the equator ω·a = 7.292116e-5 rad/s × 6 378 137 m = 465.1 m/s (IAU ERA rate,
    // WGS 84 radius, from memory). Sites at longitudes 0/180 and 90/−90 see ±v·cos H and ±v·sin H
    // for an equatorial target, so hypot(a − b, c − d) = 2·ω·a whatever the hour angle H; the
    // orbital part is common to all four and cancels.
    const t = parseUtcTime('2024-03-05T00:00:00');
    const target = { raDeg: 0, decDeg: 0 };
    const at = (lon: number) => barycentricCorrection({ time: t, target, site: makeSite(0, lon, 0) }).barycentricCorrectionKmPerS;
    const diameter = Math.hypot(at(0) - at(180), at(90) - at(-90));
    // 2 m/s: the target's of-date declination (precession since J2000, ~0.1°) and relativistic cross terms.
    expect(Math.abs(diameter - 0.9302)).toBeLessThan(0.002);
  });

  it('warns past the end of the leap-second table', () => {
    const logger = collectingLogger();
    barycentricCorrection({ ...input, time: parseUtcTime('2030-01-01T00:00:00') }, { logger });
    expect(logger.warnings.map((w) => w.code)).toEqual(['time.leap-seconds-unknown']);
    expect(logger.warnings[0].message).toBe('2030-01-01T00:00:00.000 is after 2026-06-28, the end of the leap-second table; TAI − UTC = 37 s is assumed (no leap second since 2017)');
  });

  it.each([
    [{ raDeg: 361, decDeg: 0 }, 'right ascension 361 is outside 0..360 degrees'],
    [{ raDeg: 10, decDeg: -91 }, 'declination -91 is outside -90..+90 degrees'],
    [{ raDeg: Number.NaN, decDeg: 0 }, 'right ascension NaN is outside 0..360 degrees'],
  ])('refuses target %j', (target, message) => {
    expect(() => barycentricCorrection({ ...input, target })).toThrow(InputError);
    expect(() => barycentricCorrection({ ...input, target })).toThrow(message);
  });

  it('points the unit vector at RA/Dec', () => {
    const [x, y, z] = unitVectorFromRaDec(90, 30);
    expect(x).toBeCloseTo(0, 15);
    expect(y).toBeCloseTo(Math.sqrt(3) / 2, 15);
    expect(z).toBeCloseTo(0.5, 15);
  });

  it('a star at rest relative to the barycentre shows a measured velocity that the correction cancels', () => {
    // Identity: the observer's motion adds −v_bc (as a Doppler factor) to a star at rest; the
    // multiplicative application of the correction must return 0 exactly (to rounding).
    const r = barycentricCorrection(input);
    const zB = r.barycentricCorrectionKmPerS / 299792.458;
    const measuredZ = 1 / (1 + zB) - 1;
    const measured = 299792.458 * measuredZ;
    expect(Math.abs(applyVelocityCorrection(measured, r.barycentricCorrectionKmPerS, { formula: 'classical' }))).toBeLessThan(1e-9);
  });
});
