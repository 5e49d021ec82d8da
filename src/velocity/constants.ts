/**
 * Physical and astronomical constants used by the velocity area, with units in the names
 * and the source of each value beside it.
 */

/** Speed of light in vacuum, km/s (defined once, in the spectrum area, which the velocity area builds on). */
export { SPEED_OF_LIGHT_KM_PER_S } from '../spectrum/constants.js';

/** Speed of light in vacuum, m/s. Exact by the SI definition of the metre (1983). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/** The astronomical unit in metres. Exact by IAU 2012 Resolution B2. */
export const METERS_PER_AU = 149_597_870_700;

/** Seconds in a day (of 86 400 SI seconds, as in every Julian date scale except UTC on a leap-second day). */
export const SECONDS_PER_DAY = 86_400;

/** Julian date of the modified Julian date zero point: MJD = JD − 2 400 000.5 (IAU 1973 convention). */
export const MJD_ZERO_JD = 2_400_000.5;

/** Modified Julian date of the J2000.0 epoch, 2000-01-01T12:00:00 (JD 2 451 545.0) in TT. */
export const MJD_J2000 = 51_544.5;

/** Days in a Julian century (used for time arguments of series in T centuries from J2000.0). */
export const DAYS_PER_JULIAN_CENTURY = 36_525;

/** TT − TAI in seconds. Exact by definition (IAU 1991 Resolution A4). */
export const TT_MINUS_TAI_S = 32.184;

/** Heliocentric gravitational parameter GM☉, m³/s². Nominal value of IAU 2015 Resolution B3. */
export const GM_SUN_M3_PER_S2 = 1.3271244e20;

/** Jupiter's gravitational parameter, m³/s². Nominal value of IAU 2015 Resolution B3. */
export const GM_JUPITER_M3_PER_S2 = 1.2668653e17;

/** Earth's gravitational parameter, m³/s². Nominal value of IAU 2015 Resolution B3. */
export const GM_EARTH_M3_PER_S2 = 3.986004e14;

/**
 * The Moon's gravitational parameter, m³/s²: G (CODATA 2018, 6.674 30e−11 m³ kg⁻¹ s⁻²) times
 * a lunar mass of 7.347 673 09e22 kg; the same product astropy 5.2.1 uses in
 * `EarthLocation.gravitational_redshift`, so that the two agree term by term.
 */
export const GM_MOON_M3_PER_S2 = 6.6743e-11 * 7.34767309e22;

/** WGS 84 ellipsoid semi-major axis, m (NIMA TR8350.2). */
export const WGS84_SEMI_MAJOR_AXIS_M = 6_378_137;

/** WGS 84 ellipsoid flattening (NIMA TR8350.2). */
export const WGS84_FLATTENING = 1 / 298.257223563;

/**
 * Rate of the Earth rotation angle, rad/s: 2π × 1.002 737 811 911 354 48 per UT1 day of
 * 86 400 s (IAU 2000 definition of the Earth rotation angle, from memory; ≈ 7.292 115 855e−5).
 */
export const EARTH_ROTATION_RAD_PER_S = (2 * Math.PI * 1.00273781191135448) / 86_400;
