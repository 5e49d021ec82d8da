/**
 * ADAPTER (temporary): air-to-vacuum conversion for the identification, until the project's
 * own air/vacuum module (src/spectrum/air-vacuum.ts) is on this branch. Replace the body of
 * {@link listWavelengthInMedium} with a call to `airToVacuum` from that module then; the
 * behaviour must stay the same (Peck & Reeder 1972, the formula the line lists use).
 */

/**
 * Refractive index of standard air, Peck & Reeder (1972), J. Opt. Soc. Am. 62, 958:
 * n − 1 = 8.06051e-5 + 2.480990e-2/(132.274 − σ²) + 1.74557e-4/(39.32957 − σ²), σ = 1/λ_vac in µm⁻¹.
 */
function refractiveIndexPeckReeder(vacuumAngstrom: number): number {
  const s2 = (1e4 / vacuumAngstrom) ** 2;
  return 1 + 8.06051e-5 + 2.48099e-2 / (132.274 - s2) + 1.74557e-4 / (39.32957 - s2);
}

/**
 * A list wavelength expressed in the spectrum's medium: unchanged when the media agree,
 * air → vacuum by fixed-point iteration of λ_vac = λ_air · n(λ_vac) (converges to 1e-12 Å in a
 * few steps), vacuum → air by λ_air = λ_vac / n(λ_vac).
 *
 * @param wavelengthAngstrom list wavelength, Å.
 * @param from the list's medium.
 * @param to the spectrum's medium.
 * @returns the wavelength in `to`, Å.
 */
export function listWavelengthInMedium(wavelengthAngstrom: number, from: 'air' | 'vacuum', to: 'air' | 'vacuum'): number {
  if (from === to) return wavelengthAngstrom;
  if (from === 'vacuum') return wavelengthAngstrom / refractiveIndexPeckReeder(wavelengthAngstrom);
  let vac = wavelengthAngstrom;
  for (let i = 0; i < 8; i++) vac = wavelengthAngstrom * refractiveIndexPeckReeder(vac);
  return vac;
}
