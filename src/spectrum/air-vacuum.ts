/**
 * Conversion between vacuum and air wavelengths (standard air: dry, 15 °C, 101 325 Pa).
 *
 * Every formula here gives the refractive index of standard air as
 *   n − 1 = c₀ + Σₖ aₖ / (bₖ − σ²),   σ = 1/λ_vac in µm⁻¹,
 * and λ_air = λ_vac / n(λ_vac). The inverse (air → vacuum) solves that equation by Newton
 * iteration. Laboratory line lists above 2000 Å give air wavelengths by convention; the
 * line lists shipped in data/linelists/ were converted from vacuum with Peck & Reeder 1972.
 */
import { UsageError } from '../errors.js';
import { provenanceEntry } from './provenance.js';
import { deriveSpectrum, type Spectrum } from './spectrum.js';
import { angstromPerUnit } from './units.js';

/**
 * A dispersion formula for standard air:
 * - `peck-reeder-1972`: E. R. Peck and K. Reeder, "Dispersion of air", J. Opt. Soc. Am. 62,
 *   958 (1972). The default: the reference line lists use it (and NIST's ASD uses it for
 *   air wavelengths from 200 to 2000 nm).
 * - `morton-2000`: D. C. Morton, ApJS 130, 403 (2000), the IAU-adopted conversion, based on
 *   Edlén (1966) as revised by Birch & Downs (1994).
 * - `ciddor-1996`: P. E. Ciddor, Appl. Opt. 35, 1566 (1996), for standard dry air with
 *   450 ppm CO₂ (his eq. 1; humidity, pressure and temperature terms not included).
 */
export type AirVacuumFormula = 'peck-reeder-1972' | 'morton-2000' | 'ciddor-1996';

/** Options of the air/vacuum conversions. */
export interface AirVacuumOptions {
  /** Dispersion formula; default `peck-reeder-1972`. */
  formula?: AirVacuumFormula;
}

/** The default formula, written once. */
export const DEFAULT_AIR_VACUUM_FORMULA: AirVacuumFormula = 'peck-reeder-1972';

/** Shortest and longest wavelength (Å) the conversions accept: the formulas are fits to measurements from about 0.23 to 1.7 µm, and air wavelengths are used above 2000 Å by convention. */
export const AIR_VACUUM_RANGE_ANGSTROM = Object.freeze({ min: 2000, max: 25_000 });

interface Dispersion {
  readonly c0: number;
  readonly terms: readonly (readonly [a: number, b: number])[];
}

const FORMULAS: Readonly<Record<AirVacuumFormula, Dispersion>> = Object.freeze({
  // Peck & Reeder 1972, their formula for standard air: (n−1)·10⁸ = 8060.51 + 2480990/(132.274 − σ²) + 17455.7/(39.32957 − σ²).
  // Coefficients as given in ../shared/reference/linelists/SOURCES.md (source PR1972, from the
  // refractiveindex.info database) and copied into data/linelists/SOURCES.md.
  'peck-reeder-1972': { c0: 8.06051e-5, terms: [[2.48099e-2, 132.274], [1.74557e-4, 39.32957]] },
  // Morton 2000, ApJS 130, 403 (Edlén 1966 form with the Birch & Downs 1994 coefficients):
  // n − 1 = 8.34254e-5 + 2.406147e-2/(130 − σ²) + 1.5998e-4/(38.9 − σ²). Coefficients from memory;
  // the tests check that this formula agrees with the other two to 2·10⁻⁴ Å in the visible.
  'morton-2000': { c0: 8.34254e-5, terms: [[2.406147e-2, 130], [1.5998e-4, 38.9]] },
  // Ciddor 1996, Appl. Opt. 35, 1566, eq. (1), standard air (15 °C, 101 325 Pa, dry, 450 ppm CO₂):
  // (n − 1)·10⁸ = 5792105/(238.0185 − σ²) + 167917/(57.362 − σ²). Coefficients from memory; checked as above.
  'ciddor-1996': { c0: 0, terms: [[5.792105e-2, 238.0185], [1.67917e-3, 57.362]] },
});

function formulaOf(options: AirVacuumOptions | undefined): Dispersion {
  const name = options?.formula ?? DEFAULT_AIR_VACUUM_FORMULA;
  const f = FORMULAS[name];
  if (!f || !Object.prototype.hasOwnProperty.call(FORMULAS, name)) {
    throw new UsageError('airvac.unknown-formula', `unknown air/vacuum formula "${String(name)}" (known: ${Object.keys(FORMULAS).join(', ')})`);
  }
  return f;
}

function checkWavelength(w: number, index?: number): void {
  if (!(w >= AIR_VACUUM_RANGE_ANGSTROM.min && w <= AIR_VACUUM_RANGE_ANGSTROM.max)) {
    const at = index === undefined ? '' : ` at index ${index}`;
    throw new UsageError(
      'airvac.out-of-range',
      `wavelength ${w} Å${at} is outside the range of the air/vacuum formulas (${AIR_VACUUM_RANGE_ANGSTROM.min}–${AIR_VACUUM_RANGE_ANGSTROM.max} Å)`,
      index === undefined ? {} : { index },
    );
  }
}

/** n − 1 and d(n)/d(λ_vac) for a vacuum wavelength in Å. */
function indexAndSlope(d: Dispersion, vacuumAngstrom: number): [nMinus1: number, dnDlambda: number] {
  const s2 = 1e8 / (vacuumAngstrom * vacuumAngstrom);
  let nm1 = d.c0;
  let dnds2 = 0;
  for (const [a, b] of d.terms) {
    const q = 1 / (b - s2);
    nm1 += a * q;
    dnds2 += a * q * q;
  }
  // dσ²/dλ = −2·10⁸/λ³
  return [nm1, (dnds2 * -2e8) / (vacuumAngstrom * vacuumAngstrom * vacuumAngstrom)];
}

/**
 * The refractive index of standard air at a vacuum wavelength.
 *
 * @param vacuumWavelengthAngstrom vacuum wavelength in Å, 2000–25 000.
 * @param options `formula` (default Peck & Reeder 1972).
 * @returns n (about 1.000277 at 6000 Å).
 * @throws {UsageError} for a wavelength outside 2000–25 000 Å or an unknown formula.
 * @example refractiveIndexOfAir(6000); // 1.000277…
 */
export function refractiveIndexOfAir(vacuumWavelengthAngstrom: number, options?: AirVacuumOptions): number {
  const d = formulaOf(options);
  checkWavelength(vacuumWavelengthAngstrom);
  return 1 + indexAndSlope(d, vacuumWavelengthAngstrom)[0];
}

function toAir(d: Dispersion, vac: number): number {
  return vac / (1 + indexAndSlope(d, vac)[0]);
}

/**
 * Solves λ_vac / n(λ_vac) = λ_air for λ_vac by Newton iteration, starting from λ_air·n(λ_air).
 * The map is nearly the identity (its slope differs from 1 by < 10⁻⁵), so two or three steps
 * reach full double precision; iteration stops when a step is below 10⁻¹³ λ, or after 20 steps.
 */
function toVacuum(d: Dispersion, air: number): number {
  let x = air * (1 + indexAndSlope(d, air)[0]);
  for (let k = 0; k < 20; k++) {
    const [nm1, dn] = indexAndSlope(d, x);
    const n = 1 + nm1;
    const g = x / n - air;
    const gp = 1 / n - (x * dn) / (n * n);
    const dx = g / gp;
    x -= dx;
    if (Math.abs(dx) <= 1e-13 * x) break;
  }
  return x;
}

/**
 * Converts a vacuum wavelength to the wavelength in standard air: λ_air = λ_vac / n(λ_vac).
 *
 * @param vacuumWavelengthAngstrom vacuum wavelength in Å, 2000–25 000.
 * @param options `formula`: `peck-reeder-1972` (default), `morton-2000` or `ciddor-1996`.
 * @returns the air wavelength in Å.
 * @throws {UsageError} for a wavelength outside 2000–25 000 Å (NaN included) or an unknown formula.
 * @example vacuumToAir(8769.9438); // 8767.5360 (Ne I; Sansonetti et al. 2004 give 8767.536 in air)
 */
export function vacuumToAir(vacuumWavelengthAngstrom: number, options?: AirVacuumOptions): number {
  const d = formulaOf(options);
  checkWavelength(vacuumWavelengthAngstrom);
  return toAir(d, vacuumWavelengthAngstrom);
}

/**
 * Converts a wavelength in standard air to the vacuum wavelength, inverting
 * {@link vacuumToAir} by Newton iteration (round trip exact to about 10⁻¹¹ Å).
 *
 * @param airWavelengthAngstrom air wavelength in Å, 2000–25 000.
 * @param options `formula`: `peck-reeder-1972` (default), `morton-2000` or `ciddor-1996`.
 * @returns the vacuum wavelength in Å.
 * @throws {UsageError} for a wavelength outside 2000–25 000 Å (NaN included) or an unknown formula.
 * @example airToVacuum(6562.795); // 6564.6079 (Hα blend; data/linelists/H_I.csv notes vac 6564.608)
 */
export function airToVacuum(airWavelengthAngstrom: number, options?: AirVacuumOptions): number {
  const d = formulaOf(options);
  checkWavelength(airWavelengthAngstrom);
  return toVacuum(d, airWavelengthAngstrom);
}

function convertArray(values: ArrayLike<number>, options: AirVacuumOptions | undefined, f: (d: Dispersion, x: number) => number): Float64Array {
  const d = formulaOf(options);
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (Number.isNaN(x)) {
      out[i] = NaN;
      continue;
    }
    checkWavelength(x, i);
    out[i] = f(d, x);
  }
  return out;
}

/**
 * {@link vacuumToAir} for many wavelengths. NaN values stay NaN (missing data).
 *
 * @param vacuumWavelengthAngstrom vacuum wavelengths in Å, each 2000–25 000 or NaN.
 * @param options `formula` (default Peck & Reeder 1972).
 * @returns a new array of air wavelengths in Å.
 * @throws {UsageError} naming the index of the first value out of range.
 * @example Array.from(vacuumToAirArray([6564.608, 4862.683])); // [6562.7951…, 4861.3250…]
 */
export function vacuumToAirArray(vacuumWavelengthAngstrom: ArrayLike<number>, options?: AirVacuumOptions): Float64Array {
  return convertArray(vacuumWavelengthAngstrom, options, toAir);
}

/**
 * {@link airToVacuum} for many wavelengths. NaN values stay NaN (missing data).
 *
 * @param airWavelengthAngstrom air wavelengths in Å, each 2000–25 000 or NaN.
 * @param options `formula` (default Peck & Reeder 1972).
 * @returns a new array of vacuum wavelengths in Å.
 * @throws {UsageError} naming the index of the first value out of range.
 * @example Array.from(airToVacuumArray([6562.795, 4861.325])); // [6564.6079…, 4862.6830…]
 */
export function airToVacuumArray(airWavelengthAngstrom: ArrayLike<number>, options?: AirVacuumOptions): Float64Array {
  return convertArray(airWavelengthAngstrom, options, toVacuum);
}

/** Options of {@link convertSpectrumMedium}. */
export interface ConvertMediumOptions extends AirVacuumOptions {
  /**
   * The medium of the spectrum's wavelengths, when `spectrum.medium` is null (unknown).
   * When the spectrum states its medium, this must agree with it.
   */
  from?: 'air' | 'vacuum';
}

/**
 * The same spectrum with its wavelengths converted to air or to vacuum, and `medium` set.
 * Any wavelength unit (Å, nm, µm) is kept. Flux values are not rescaled: the change of a
 * flux density per unit wavelength (a factor n ≈ 1.0003) is below the flux calibration of
 * any club spectrum.
 *
 * @param s the spectrum (not modified).
 * @param to `air` or `vacuum`.
 * @param options `from` when the spectrum's medium is unknown; `formula` (default Peck & Reeder 1972).
 * @returns a new Spectrum with an `air-vacuum` provenance entry, or `s` itself when it is already in `to`.
 * @throws {UsageError} `airvac.medium-unknown` when the spectrum's medium is null and
 *   `from` is not given; `airvac.medium-conflict` when `from` contradicts the spectrum;
 *   `units.pixel` for a pixel axis; `airvac.out-of-range` for wavelengths outside 2000–25 000 Å.
 * @example
 * const s = createSpectrum({ wavelength: [6564.0, 6565.0], flux: [1, 1], medium: 'vacuum' });
 * convertSpectrumMedium(s, 'air').wavelength[0]; // 6562.187…
 */
export function convertSpectrumMedium(s: Spectrum, to: 'air' | 'vacuum', options: ConvertMediumOptions = {}): Spectrum {
  if (to !== 'air' && to !== 'vacuum') throw new UsageError('airvac.bad-medium', `the target medium must be air or vacuum (got ${String(to)})`);
  const scale = angstromPerUnit(s.unit);
  if (s.medium !== null && options.from !== undefined && options.from !== s.medium) {
    throw new UsageError('airvac.medium-conflict', `the spectrum states its wavelengths are in ${s.medium}, but the call says they are in ${options.from}`);
  }
  const from = s.medium ?? options.from;
  if (from === undefined) {
    throw new UsageError('airvac.medium-unknown', `the spectrum does not say whether its wavelengths are in air or vacuum; state it with { from: 'air' } or { from: 'vacuum' }`);
  }
  const formula = options.formula ?? DEFAULT_AIR_VACUUM_FORMULA;
  if (from === to) return s.medium === to ? s : deriveSpectrum(s, { medium: to }, provenanceEntry('air-vacuum', { from, to, formula, stated: true }));
  const d = formulaOf(options);
  const f = to === 'air' ? toAir : toVacuum;
  const w = s.wavelength;
  const out = new Float64Array(w.length);
  for (let i = 0; i < w.length; i++) {
    const a = w[i] * scale;
    checkWavelength(a, i);
    out[i] = f(d, a) / scale;
  }
  return deriveSpectrum(s, { wavelength: out, medium: to }, provenanceEntry('air-vacuum', { from, to, formula }));
}
