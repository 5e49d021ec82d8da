/**
 * Barycentric and heliocentric velocity corrections, light-travel times, BJD_TDB and HJD for
 * an observer on the Earth looking at a star.
 *
 * Ephemerides and the Earth's orientation come from astronomy-engine 2.1.19: `BaryState`
 * (VSOP87-based Earth and Sun, barycentre from the four giant planets), `GeoMoon`,
 * `SiderealTime` (apparent sidereal time) and `Rotation_EQD_EQJ` (precession and nutation
 * back to the J2000 mean equator, which we take as the ICRS axes; the frame bias of 23 mas is
 * neglected). The observer's Earth-fixed position is rotated by the sidereal angle; polar
 * motion (< 0.5″, a position error < 15 m) is neglected and UT1 is taken as UTC (|UT1 − UTC|
 * < 0.9 s: < 0.5 km of rotation, < 0.05 m/s of velocity direction).
 */
import {
  AstroTime, BaryState, Body, GeoMoon, Rotation_EQD_EQJ, SiderealTime,
} from 'astronomy-engine';
import { InputError, type ErrorLocation } from '../errors.js';
import type { Logger } from '../logger.js';
import {
  EARTH_ROTATION_RAD_PER_S, GM_EARTH_M3_PER_S2, GM_JUPITER_M3_PER_S2, GM_MOON_M3_PER_S2,
  GM_SUN_M3_PER_S2, METERS_PER_AU, MJD_J2000, MJD_ZERO_JD, SECONDS_PER_DAY, SPEED_OF_LIGHT_M_PER_S,
} from './constants.js';
import { geocentricFromSite, type ObservingSite } from './site.js';
import { mjdTaiOf, mjdUtcOf, timeScales, utcFromMjdTai, type TimeScales, type UtcTime } from './time.js';

/** A target direction: ICRS (or FK5 J2000) right ascension and declination in degrees. */
export interface TargetDirection {
  /** Right ascension, degrees, 0..360. */
  readonly raDeg: number;
  /** Declination, degrees, −90..+90. */
  readonly decDeg: number;
}

/** What a barycentric correction needs: when, where from, and in which direction. */
export interface BarycentricInput {
  /** The instant the correction is for (normally the exposure mid-point), UTC. */
  readonly time: UtcTime;
  /** The target's ICRS/J2000 direction. */
  readonly target: TargetDirection;
  /** The observing site. */
  readonly site: ObservingSite;
}

/** Corrections and time stamps at one instant. */
export interface BarycentricResult {
  /**
   * Barycentric correction, km/s: c·z_B, to be ADDED to a measured velocity (positive when the
   * observer moves away from the target); apply it with `applyVelocityCorrection`.
   */
  readonly barycentricCorrectionKmPerS: number;
  /** Heliocentric correction, km/s, classical projection only (same sign convention). */
  readonly heliocentricCorrectionKmPerS: number;
  /** Barycentric Julian date in TDB: JD_TDB + Rømer delay. */
  readonly bjdTdb: number;
  /** Heliocentric Julian date on the UTC scale (the traditional HJD): JD_UTC + heliocentric light time. */
  readonly hjd: number;
  /** Rømer delay to the solar-system barycentre, s: (r_obs · n̂)/c. */
  readonly lightTravelTimeBarycentricS: number;
  /** Light time to the Sun's centre, s: ((r_obs − r_sun) · n̂)/c. */
  readonly lightTravelTimeHeliocentricS: number;
  /** The instant in UTC, TT and TDB. */
  readonly time: TimeScales;
}

/** Options of {@link barycentricCorrection}. */
export interface BarycentricOptions {
  /** Receives a warning when the time is past the leap-second table. */
  logger?: Logger;
  /** Location for error messages. */
  where?: ErrorLocation;
}

type Vec3 = [number, number, number];

const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const norm = (a: Vec3) => Math.hypot(a[0], a[1], a[2]);
const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const add = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const AU_PER_DAY_TO_M_PER_S = METERS_PER_AU / SECONDS_PER_DAY;

/**
 * Unit vector towards a right ascension and declination, in the ICRS/J2000 equatorial frame.
 * @param raDeg right ascension, degrees; @param decDeg declination, degrees.
 * @returns [x, y, z], x towards RA 0 Dec 0, z towards the north pole.
 * @example
 * unitVectorFromRaDec(90, 0); // [6e-17, 1, 0]
 */
export function unitVectorFromRaDec(raDeg: number, decDeg: number): [number, number, number] {
  const a = (raDeg * Math.PI) / 180;
  const d = (decDeg * Math.PI) / 180;
  return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
}

/** An astronomy-engine time with our UT (UTC as UT1) and our TDB as its dynamical time. */
function engineTime(mjdUtc: number, mjdTdb: number): AstroTime {
  const t = new AstroTime(mjdUtc - MJD_J2000);
  t.tt = mjdTdb - MJD_J2000;
  return t;
}

/** Observer's geocentric position (m) and velocity (m/s) in J2000 equatorial axes. */
function observerGeocentricState(site: ObservingSite, time: AstroTime): { pos: Vec3; vel: Vec3 } {
  const [x, y, z] = geocentricFromSite(site);
  const theta = (SiderealTime(time) * 15 * Math.PI) / 180;
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  const pos: Vec3 = [x * c - y * s, x * s + y * c, z];
  const vel: Vec3 = [-EARTH_ROTATION_RAD_PER_S * pos[1], EARTH_ROTATION_RAD_PER_S * pos[0], 0];
  const r = Rotation_EQD_EQJ(time).rot; // r[i][j]: column-major as astronomy-engine applies it
  const rotate = (v: Vec3): Vec3 => [
    r[0][0] * v[0] + r[1][0] * v[1] + r[2][0] * v[2],
    r[0][1] * v[0] + r[1][1] * v[1] + r[2][1] * v[2],
    r[0][2] * v[0] + r[1][2] * v[1] + r[2][2] * v[2],
  ];
  return { pos: rotate(pos), vel: rotate(vel) };
}

function checkTarget(target: TargetDirection, where: ErrorLocation): void {
  if (!Number.isFinite(target.raDeg) || target.raDeg < 0 || target.raDeg > 360) {
    throw new InputError('coord.out-of-range', `right ascension ${target.raDeg} is outside 0..360 degrees`, where);
  }
  if (!Number.isFinite(target.decDeg) || Math.abs(target.decDeg) > 90) {
    throw new InputError('coord.out-of-range', `declination ${target.decDeg} is outside -90..+90 degrees`, where);
  }
}

/**
 * Barycentric and heliocentric corrections, BJD_TDB and HJD for one observation.
 *
 * Method:
 * - Time: UTC → TAI → TT → TDB ({@link timeScales}).
 * - Observer: Earth's barycentric position and velocity (astronomy-engine `BaryState`) plus
 *   the site's geocentric position and rotation velocity ω × r.
 * - Barycentric correction: z_B = γ (1 + β·n̂) / (1 + Φ/c²) − 1 with β = v_obs/c,
 *   γ = (1 − β²)^−½, Φ/c² = −Σ GM_i/(c² r_i) over the Sun, Jupiter, the Moon and the Earth
 *   (r_i from the Earth's centre; for the Earth, the site's distance from it). This is
 *   Wright & Eastman (2014, PASP 126, 838) eq. 28 without the Shapiro and stellar-motion
 *   terms, as astropy 5.2.1's `SkyCoord.radial_velocity_correction` implements it (read in
 *   its source); returned as c·z_B (the add-to-measured, "optical" convention).
 * - Heliocentric correction: n̂·(v_obs − v_sun), classical (as astropy's `kind='heliocentric'`).
 * - Light-travel times: (r_obs · n̂)/c to the barycentre, ((r_obs − r_sun) · n̂)/c to the Sun,
 *   as astropy's `Time.light_travel_time`; BJD_TDB = JD_TDB + barycentric light time (the
 *   Shapiro delay, ≤ ~20 µs, and the Einstein delay, already in TDB, are not added);
 *   HJD = JD_UTC + heliocentric light time (the traditional UTC-based HJD).
 *
 * Accuracy against astropy 5.2.1 (ERFA `epv00` ephemeris) over 69 cases 1990–2035: see
 * test/velocity/barycentric.test.ts for the measured worst differences (a few m/s; ms).
 *
 * @param input the instant (normally the exposure mid-point, UTC), target and site.
 * @param options.logger warned when the time is past the leap-second table.
 * @returns the corrections (km/s), BJD_TDB, HJD, light times (s) and the time scales.
 * @throws {InputError} `coord.out-of-range` for a target outside its ranges;
 *   `time.before-utc` before 1960.
 * @example
 * const r = barycentricCorrection({
 *   time: parseUtcTime('2024-03-05T21:14:07'),
 *   target: { raDeg: 101.2875, decDeg: -16.7161 },
 *   site: makeSite(40.0, -105.0, 1600),
 * });
 * r.barycentricCorrectionKmPerS; // ≈ -20 km/s (March, target in the west)
 */
export function barycentricCorrection(input: BarycentricInput, options: BarycentricOptions = {}): BarycentricResult {
  const where = options.where ?? {};
  checkTarget(input.target, where);
  const scales = timeScales(input.time, { logger: options.logger, where });
  const time = engineTime(scales.mjdUtc, scales.mjdTdb);

  const earth = BaryState(Body.Earth, time);
  const sun = BaryState(Body.Sun, time);
  const jupiter = BaryState(Body.Jupiter, time);
  const moon = GeoMoon(time);
  const au = METERS_PER_AU;
  const earthPos: Vec3 = [earth.x * au, earth.y * au, earth.z * au];
  const earthVel: Vec3 = [earth.vx * AU_PER_DAY_TO_M_PER_S, earth.vy * AU_PER_DAY_TO_M_PER_S, earth.vz * AU_PER_DAY_TO_M_PER_S];
  const sunPos: Vec3 = [sun.x * au, sun.y * au, sun.z * au];
  const sunVel: Vec3 = [sun.vx * AU_PER_DAY_TO_M_PER_S, sun.vy * AU_PER_DAY_TO_M_PER_S, sun.vz * AU_PER_DAY_TO_M_PER_S];
  const jupiterPos: Vec3 = [jupiter.x * au, jupiter.y * au, jupiter.z * au];
  const moonGeo: Vec3 = [moon.x * au, moon.y * au, moon.z * au];

  const obs = observerGeocentricState(input.site, time);
  const n = unitVectorFromRaDec(input.target.raDeg, input.target.decDeg);
  const c = SPEED_OF_LIGHT_M_PER_S;

  // Barycentric: special-relativistic Doppler factor of the observer, gravitational redshift at the site.
  const vObs = add(earthVel, obs.vel);
  const beta: Vec3 = [vObs[0] / c, vObs[1] / c, vObs[2] / c];
  const beta2 = dot(beta, beta);
  const gamma = 1 / Math.sqrt(1 - beta2);
  const potentialOverC2 = -(
    GM_SUN_M3_PER_S2 / norm(sub(sunPos, earthPos))
    + GM_JUPITER_M3_PER_S2 / norm(sub(jupiterPos, earthPos))
    + GM_MOON_M3_PER_S2 / norm(moonGeo)
    + GM_EARTH_M3_PER_S2 / norm(obs.pos)
  ) / (c * c);
  const zB = (gamma * (1 + dot(beta, n))) / (1 + potentialOverC2) - 1;

  // Heliocentric: classical projection of the observer's velocity relative to the Sun.
  const helio = dot(n, sub(vObs, sunVel));

  const rObs = add(earthPos, obs.pos);
  const lttBary = dot(rObs, n) / c;
  const lttHelio = dot(sub(rObs, sunPos), n) / c;
  const hjdUtc = utcFromMjdTai(mjdTaiOf(input.time) + lttHelio / SECONDS_PER_DAY);

  return {
    barycentricCorrectionKmPerS: (zB * c) / 1000,
    heliocentricCorrectionKmPerS: helio / 1000,
    bjdTdb: scales.jdTdb + lttBary / SECONDS_PER_DAY,
    hjd: mjdUtcOf(hjdUtc) + MJD_ZERO_JD,
    lightTravelTimeBarycentricS: lttBary,
    lightTravelTimeHeliocentricS: lttHelio,
    time: scales,
  };
}
