/**
 * Constants of the orbit area. The day (86 400 s), the astronomical unit and the nominal
 * (GM)☉ are defined once, in the velocity area (`src/velocity/constants.ts`), and used from
 * there. Masses are computed as GM / (GM)☉ᴺ with the IAU 2015 nominal solar mass parameter
 * `GM_SUN_M3_PER_S2`, so the uncertainty of G itself never enters a mass in solar units.
 */

/**
 * Newtonian constant of gravitation, m³ kg⁻¹ s⁻² (CODATA 2018 recommended value, from
 * memory). Not needed for masses in solar units; given for converting them to kilograms
 * (M = (GM)☉ᴺ/G · m).
 */
export const GRAVITATIONAL_CONSTANT_SI = 6.6743e-11;
