/**
 * Physical constants used by the spectrum area.
 */

/**
 * Speed of light in vacuum, km/s. Exact: the SI defines the metre by fixing
 * c = 299 792 458 m/s (17th CGPM, 1983).
 */
export const SPEED_OF_LIGHT_KM_PER_S = 299_792.458;
