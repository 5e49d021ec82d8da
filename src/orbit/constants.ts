/**
 * Physical constants of the orbit area, each with its source. Masses are computed as
 * GM / (GM)☉ with the IAU nominal solar mass parameter, so the uncertainty of G itself
 * never enters a mass in solar units.
 */

/** Newtonian constant of gravitation, m³ kg⁻¹ s⁻² (CODATA 2018 recommended value, from memory). */
export const GRAVITATIONAL_CONSTANT_SI = 6.6743e-11;

/** Nominal solar mass parameter (GM)☉ᴺ, m³ s⁻² (IAU 2015 Resolution B3, exact by definition, from memory). */
export const GM_SUN_NOMINAL_M3_PER_S2 = 1.3271244e20;

/** Nominal solar radius R☉ᴺ, m (IAU 2015 Resolution B3, exact by definition, from memory). */
export const SOLAR_RADIUS_NOMINAL_M = 6.957e8;

/** Astronomical unit, m (IAU 2012 Resolution B2, exact by definition). */
export const ASTRONOMICAL_UNIT_M = 149_597_870_700;

/** Seconds in one day of BJD_TDB (the Julian day of 86 400 SI seconds, exact). */
export const SECONDS_PER_DAY = 86_400;
