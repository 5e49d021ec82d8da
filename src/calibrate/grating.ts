/**
 * The grating equation and the geometry of two common set-ups: a slit spectrograph
 * (collimator, reflection grating, camera lens onto a flat sensor) and a transmission
 * grating in front of a camera (slitless, the zero order on the sensor as the origin).
 *
 * Conventions (Palmer & Loewen, Diffraction Grating Handbook, 6th ed., ch. 2):
 * - the grating equation is m λ = d (sin α + sin β), d = 1/(lines per mm) the groove
 *   spacing, m the order (an integer, sign included), α the angle of incidence and β the
 *   angle of diffraction, both measured from the grating normal and of the same sign when
 *   on the same side of it (so Littrow is α = β);
 * - **slit spectrograph**: the camera axis leaves the grating at β_c, the sensor sits at the
 *   camera's focal length f, a pixel p lies at s = (p − p_c)·pixel size along the sensor
 *   (p_c the pixel on the camera axis), and its ray leaves the grating at
 *   β = β_c + atan2(s cos τ, f + s sin τ), τ the sensor's tilt (0 = square to the axis).
 *   Increasing pixels therefore see increasing β and, for m > 0, increasing λ; set
 *   `pixelDirection: 'decreasing'` when the sensor is read the other way;
 * - **transmission grating in front of a camera**: the grating is parallel to the sensor at
 *   a distance L; light meets the grating at θ_in to its normal (0 for a star on the axis),
 *   the undeviated zero order lands at x₀ = L tan θ_in from the foot of the normal, and a
 *   pixel p at s = (p − p₀)·pixel size from the zero-order pixel p₀ sees the diffraction
 *   angle β with tan β = (x₀ + s cos τ)/(L + s sin τ) — the exact projection onto a flat
 *   sensor, not the small-angle x/L. The grating equation is then m λ = d (sin β − sin θ_in)
 *   (the equation above with α = −θ_in: the zero order continues undeviated);
 * - wavelengths are those of the medium the set-up works in (air for a ground-based
 *   instrument; the shipped line lists are air).
 *
 * Everything here is plain geometry; it can stand alone where there is no lamp (an
 * approximate solution, flagged as not calibrated by a lamp) or seed the identification of
 * lamp lines.
 */
import { UsageError } from '../errors.js';

/** Å per mm. */
const ANGSTROM_PER_MM = 1e7;
const DEG = Math.PI / 180;

/** Geometry of a slit spectrograph with a reflection grating. Angles in degrees, lengths in the unit of the name. */
export interface SlitSpectrographSetup {
  readonly kind: 'slit';
  /** Groove density, lines per mm (> 0). */
  readonly linesPerMm: number;
  /** Diffraction order m (non-zero integer). Default 1. */
  readonly order?: number;
  /** Angle of incidence α, degrees from the grating normal (−90…90). */
  readonly incidenceDeg: number;
  /**
   * Where the camera axis points. Exactly one of: `cameraAngleDeg` (β_c, degrees from the
   * normal), `deviationDeg` (the angle between the collimator and camera axes, β_c = α − deviation,
   * so 0 is Littrow), or `centerWavelengthAngstrom` (β_c from the grating equation for that λ).
   */
  readonly cameraAngleDeg?: number;
  readonly deviationDeg?: number;
  readonly centerWavelengthAngstrom?: number;
  /** Camera focal length (lens to sensor), mm (> 0). */
  readonly focalLengthMm: number;
  /** Pixel size along the dispersion, µm (> 0). */
  readonly pixelSizeUm: number;
  /** Pixel on the camera axis (0-based index, fractional allowed). Default: the middle of `pixels`. */
  readonly axisPixel?: number;
  /** Number of pixels along the dispersion (for the default axis pixel and for solutions). */
  readonly pixels?: number;
  /** Sensor tilt τ, degrees (0 = square to the camera axis). Default 0. */
  readonly tiltDeg?: number;
  /** `increasing` (default): β grows with the pixel index; `decreasing`: the sensor is read the other way. */
  readonly pixelDirection?: 'increasing' | 'decreasing';
  /** Illuminated width of the grating, mm, for the theoretical resolving power. */
  readonly illuminatedWidthMm?: number;
}

/** Geometry of a transmission grating in front of a camera sensor (slitless). */
export interface TransmissionGratingSetup {
  readonly kind: 'transmission';
  /** Groove density, lines per mm (> 0). */
  readonly linesPerMm: number;
  /** Diffraction order m (non-zero integer). Default 1. */
  readonly order?: number;
  /** Grating-to-sensor distance L, mm (> 0). */
  readonly distanceMm: number;
  /** Pixel size along the dispersion, µm (> 0). */
  readonly pixelSizeUm: number;
  /** Pixel of the zero-order image (0-based index, fractional allowed); may lie off the spectrum's pixels. */
  readonly zeroOrderPixel: number;
  /** Angle of the incoming light to the grating normal, degrees, positive toward the dispersed side. Default 0. */
  readonly incidenceDeg?: number;
  /** Sensor tilt τ relative to the grating plane, degrees (about the zero-order point). Default 0. */
  readonly tiltDeg?: number;
  /** `increasing` (default): the spectrum runs toward higher pixels from the zero order; `decreasing`: toward lower. */
  readonly pixelDirection?: 'increasing' | 'decreasing';
  /** Illuminated width of the grating, mm, for the theoretical resolving power. */
  readonly illuminatedWidthMm?: number;
  /** Number of pixels along the dispersion (for solutions). */
  readonly pixels?: number;
}

/** Either set-up. */
export type GratingSetup = SlitSpectrographSetup | TransmissionGratingSetup;

/** Numeric parameters of a set-up whose 1-σ uncertainties {@link gratingWavelengthUncertainty} propagates. */
export type GratingParameterName =
  | 'linesPerMm' | 'incidenceDeg' | 'cameraAngleDeg' | 'deviationDeg' | 'centerWavelengthAngstrom'
  | 'focalLengthMm' | 'distanceMm' | 'pixelSizeUm' | 'axisPixel' | 'zeroOrderPixel' | 'tiltDeg';

/**
 * Groove spacing d in Å for a groove density: d = 10⁷ Å / (lines per mm).
 *
 * @param linesPerMm groove density (> 0).
 * @returns d in Å.
 * @throws {UsageError} for a non-positive or non-finite density.
 * @example grooveSpacingAngstrom(600); // 16 666.67
 */
export function grooveSpacingAngstrom(linesPerMm: number): number {
  if (!(linesPerMm > 0) || !Number.isFinite(linesPerMm)) throw new UsageError('grating.bad-lines', `lines per mm must be a positive number, got ${linesPerMm}`);
  return ANGSTROM_PER_MM / linesPerMm;
}

function checkOrder(m: number): number {
  if (!Number.isInteger(m) || m === 0) throw new UsageError('grating.bad-order', `the diffraction order must be a non-zero whole number, got ${m}`);
  return m;
}

/**
 * Diffraction angle β for a wavelength, from m λ = d (sin α + sin β).
 *
 * Method: the grating equation (Palmer & Loewen, Diffraction Grating Handbook, eq. 2-1),
 * solved for β.
 *
 * @param wavelengthAngstrom λ in Å (> 0), in the medium the grating works in.
 * @param linesPerMm groove density (> 0).
 * @param order m, a non-zero integer.
 * @param incidenceDeg α in degrees (same-side convention; 0 = normal incidence).
 * @returns β in degrees, or NaN when |sin β| would exceed 1 (the order does not exist).
 * @throws {UsageError} for a non-positive groove density or a zero/non-integer order.
 * @example diffractionAngleDeg(5000, 600, 1, 0); // 17.4576 (sin β = 0.3)
 */
export function diffractionAngleDeg(wavelengthAngstrom: number, linesPerMm: number, order: number, incidenceDeg: number): number {
  const d = grooveSpacingAngstrom(linesPerMm);
  const s = (checkOrder(order) * wavelengthAngstrom) / d - Math.sin(incidenceDeg * DEG);
  return Math.abs(s) <= 1 ? Math.asin(s) / DEG : NaN;
}

/**
 * Wavelength diffracted at β for incidence α: λ = d (sin α + sin β)/m.
 *
 * @param diffractionDeg β in degrees.
 * @param linesPerMm groove density (> 0).
 * @param order m, a non-zero integer.
 * @param incidenceDeg α in degrees.
 * @returns λ in Å (negative when the order and angles do not match).
 * @throws {UsageError} as {@link diffractionAngleDeg}.
 * @example gratingWavelengthAngstrom(17.4576, 600, 1, 0); // ≈ 5000
 */
export function gratingWavelengthAngstrom(diffractionDeg: number, linesPerMm: number, order: number, incidenceDeg: number): number {
  const d = grooveSpacingAngstrom(linesPerMm);
  return (d * (Math.sin(incidenceDeg * DEG) + Math.sin(diffractionDeg * DEG))) / checkOrder(order);
}

/**
 * Angular dispersion dβ/dλ = m/(d cos β), in radians per Å.
 *
 * @param diffractionDeg β in degrees.
 * @param linesPerMm groove density.
 * @param order m.
 * @returns dβ/dλ in rad/Å.
 * @example angularDispersionRadPerAngstrom(17.4576, 1200, 1); // 1.258e-4
 */
export function angularDispersionRadPerAngstrom(diffractionDeg: number, linesPerMm: number, order: number): number {
  return checkOrder(order) / (grooveSpacingAngstrom(linesPerMm) * Math.cos(diffractionDeg * DEG));
}

/**
 * Theoretical resolving power of a grating, R = m N with N = lines per mm × illuminated
 * width (Palmer & Loewen, eq. 2-16 in the form R = mN).
 *
 * @param linesPerMm groove density.
 * @param order m (its absolute value is used).
 * @param illuminatedWidthMm width of the grating the beam covers, mm.
 * @returns R (dimensionless).
 * @example gratingResolvingPower(600, 1, 25); // 15000
 */
export function gratingResolvingPower(linesPerMm: number, order: number, illuminatedWidthMm: number): number {
  if (!(illuminatedWidthMm > 0)) throw new UsageError('grating.bad-width', `the illuminated width must be > 0 mm, got ${illuminatedWidthMm}`);
  grooveSpacingAngstrom(linesPerMm);
  return Math.abs(checkOrder(order)) * linesPerMm * illuminatedWidthMm;
}

interface Resolved {
  kind: 'slit' | 'transmission';
  d: number;
  m: number;
  /** α in rad (for transmission: −θ_in). */
  alpha: number;
  /** Slit: β_c; transmission: unused. */
  betaC: number;
  /** Slit: f; transmission: L (mm). */
  length: number;
  /** Transmission: x₀ (mm). */
  x0: number;
  tau: number;
  pixelMm: number;
  refPixel: number;
  direction: 1 | -1;
}

function positive(v: number | undefined, name: string): number {
  if (v === undefined || !(v > 0) || !Number.isFinite(v)) throw new UsageError('grating.bad-setup', `${name} must be a positive number, got ${v}`);
  return v;
}

function finiteAngle(v: number, name: string): number {
  if (!Number.isFinite(v) || Math.abs(v) >= 90) throw new UsageError('grating.bad-setup', `${name} must be an angle between −90 and 90 degrees, got ${v}`);
  return v;
}

function resolve(setup: GratingSetup): Resolved {
  const d = grooveSpacingAngstrom(setup.linesPerMm);
  const m = checkOrder(setup.order ?? 1);
  const tau = finiteAngle(setup.tiltDeg ?? 0, 'tiltDeg') * DEG;
  const pixelMm = positive(setup.pixelSizeUm, 'pixelSizeUm') / 1000;
  const direction = setup.pixelDirection === 'decreasing' ? -1 : 1;
  if (setup.kind === 'slit') {
    const alphaDeg = finiteAngle(setup.incidenceDeg, 'incidenceDeg');
    const given = [setup.cameraAngleDeg, setup.deviationDeg, setup.centerWavelengthAngstrom].filter((v) => v !== undefined).length;
    if (given !== 1) {
      throw new UsageError('grating.bad-setup', 'give exactly one of cameraAngleDeg, deviationDeg or centerWavelengthAngstrom for a slit spectrograph');
    }
    let betaCDeg: number;
    if (setup.cameraAngleDeg !== undefined) betaCDeg = finiteAngle(setup.cameraAngleDeg, 'cameraAngleDeg');
    else if (setup.deviationDeg !== undefined) betaCDeg = finiteAngle(alphaDeg - setup.deviationDeg, 'incidenceDeg − deviationDeg');
    else {
      betaCDeg = diffractionAngleDeg(positive(setup.centerWavelengthAngstrom, 'centerWavelengthAngstrom'), setup.linesPerMm, m, alphaDeg);
      if (Number.isNaN(betaCDeg)) {
        throw new UsageError('grating.no-order', `order ${m} of ${setup.centerWavelengthAngstrom} Å does not exist for ${setup.linesPerMm} lines/mm at ${alphaDeg}° incidence (|sin β| > 1)`);
      }
    }
    const refPixel = setup.axisPixel ?? (setup.pixels !== undefined ? (setup.pixels - 1) / 2 : undefined);
    if (refPixel === undefined || !Number.isFinite(refPixel)) {
      throw new UsageError('grating.bad-setup', 'give axisPixel (the pixel on the camera axis) or pixels (the sensor length, whose middle is then taken)');
    }
    return { kind: 'slit', d, m, alpha: alphaDeg * DEG, betaC: betaCDeg * DEG, length: positive(setup.focalLengthMm, 'focalLengthMm'), x0: 0, tau, pixelMm, refPixel, direction };
  }
  const thetaIn = finiteAngle(setup.incidenceDeg ?? 0, 'incidenceDeg') * DEG;
  const L = positive(setup.distanceMm, 'distanceMm');
  if (!Number.isFinite(setup.zeroOrderPixel)) throw new UsageError('grating.bad-setup', `zeroOrderPixel must be a finite number, got ${setup.zeroOrderPixel}`);
  return { kind: 'transmission', d, m, alpha: -thetaIn, betaC: 0, length: L, x0: L * Math.tan(thetaIn), tau, pixelMm, refPixel: setup.zeroOrderPixel, direction };
}

/** β (rad) of the ray reaching sensor coordinate s (mm from the reference point), and dβ/ds. */
function betaOf(r: Resolved, s: number): { beta: number; dBetaDs: number } {
  const ct = Math.cos(r.tau), st = Math.sin(r.tau);
  if (r.kind === 'slit') {
    const u = s * ct, v = r.length + s * st;
    return { beta: r.betaC + Math.atan2(u, v), dBetaDs: (r.length * ct) / (u * u + v * v) };
  }
  const u = r.x0 + s * ct, v = r.length + s * st;
  return { beta: Math.atan2(u, v), dBetaDs: (r.length * ct - r.x0 * st) / (u * u + v * v) };
}

/** Sensor coordinate s (mm) where the ray at β lands (inverse of betaOf), or NaN. */
function sensorOf(r: Resolved, beta: number): number {
  const ct = Math.cos(r.tau), st = Math.sin(r.tau);
  if (r.kind === 'slit') {
    const theta = beta - r.betaC;
    if (Math.abs(theta) >= Math.PI / 2) return NaN;
    const t = Math.tan(theta);
    const den = ct - t * st;
    return den > 0 ? (r.length * t) / den : NaN;
  }
  if (Math.abs(beta) >= Math.PI / 2) return NaN;
  const t = Math.tan(beta);
  const den = ct - t * st;
  return den > 0 ? (r.length * t - r.x0) / den : NaN;
}

/** λ (Å) at a pixel and dλ/dpixel, for a set-up. */
function wavelengthAndDispersion(r: Resolved, pixel: number): { wavelength: number; dispersion: number; beta: number } {
  const s = r.direction * (pixel - r.refPixel) * r.pixelMm;
  const { beta, dBetaDs } = betaOf(r, s);
  const wavelength = (r.d * (Math.sin(r.alpha) + Math.sin(beta))) / r.m;
  const dispersion = ((r.d * Math.cos(beta)) / r.m) * dBetaDs * r.direction * r.pixelMm;
  return { wavelength, dispersion, beta };
}

/**
 * Wavelength at a pixel predicted by the grating equation and the set-up's geometry.
 *
 * Method: the pixel's position on the sensor gives its diffraction angle β exactly (see the
 * module's conventions: β = β_c + atan2(s cos τ, f + s sin τ) for a slit spectrograph,
 * tan β = (x₀ + s cos τ)/(L + s sin τ) for a transmission grating), then
 * λ = d (sin α + sin β)/m.
 *
 * @param setup the geometry (slit spectrograph or transmission grating).
 * @param pixel 0-based pixel index (fractional allowed).
 * @returns λ in Å (in the medium the grating works in: air for the shipped line lists).
 * @throws {UsageError} for an incomplete or impossible set-up.
 * @example
 * // 100 lines/mm grating 50 mm in front of a sensor of 5.4 µm pixels, zero order at pixel 200
 * gratingPixelToWavelength({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 }, 700); // ≈ 5392.1 Å
 */
export function gratingPixelToWavelength(setup: GratingSetup, pixel: number): number {
  return wavelengthAndDispersion(resolve(setup), pixel).wavelength;
}

/**
 * Dispersion dλ/dpixel predicted by the set-up at a pixel, Å per pixel.
 *
 * Method: dλ/dp = (d cos β / m) · dβ/ds · ds/dp, with dβ/ds from the exact sensor
 * geometry (for a transmission grating with τ = 0 and θ_in = 0: d cos³β/(m L) per mm).
 *
 * @param setup the geometry.
 * @param pixel 0-based pixel index.
 * @returns Å per pixel (negative when λ decreases with the pixel index).
 * @throws {UsageError} for an incomplete or impossible set-up.
 * @example gratingDispersion({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 }, 200); // 10.8 Å/pixel
 */
export function gratingDispersion(setup: GratingSetup, pixel: number): number {
  return wavelengthAndDispersion(resolve(setup), pixel).dispersion;
}

/**
 * Pixel at which a wavelength lands (the inverse of {@link gratingPixelToWavelength}).
 *
 * Method: β from the grating equation, then the sensor coordinate in closed form
 * (s = f tan θ/(cos τ − tan θ sin τ) with θ = β − β_c for a slit spectrograph;
 * s = (L tan β − x₀)/(cos τ − tan β sin τ) for a transmission grating).
 *
 * @param setup the geometry.
 * @param wavelengthAngstrom λ in Å (> 0).
 * @returns 0-based pixel index (fractional), or NaN when the order does not exist for λ or
 *   the ray misses the sensor plane.
 * @throws {UsageError} for an incomplete or impossible set-up.
 * @example gratingWavelengthToPixel({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 }, 5392.144); // ≈ 700
 */
export function gratingWavelengthToPixel(setup: GratingSetup, wavelengthAngstrom: number): number {
  const r = resolve(setup);
  const sb = (r.m * wavelengthAngstrom) / r.d - Math.sin(r.alpha);
  if (!(Math.abs(sb) <= 1)) return NaN;
  const s = sensorOf(r, Math.asin(sb));
  return r.refPixel + (r.direction * s) / r.pixelMm;
}

/** What {@link describeGrating} returns. */
export interface GratingDescription {
  /** λ at the first, middle and last pixel, Å. */
  readonly wavelengthAngstrom: { readonly first: number; readonly middle: number; readonly last: number };
  /** dλ/dpixel at the first, middle and last pixel, Å per pixel. */
  readonly dispersionAngstromPerPixel: { readonly first: number; readonly middle: number; readonly last: number };
  /** Diffraction angle at the middle pixel, degrees. */
  readonly diffractionAngleMiddleDeg: number;
  /** Angular dispersion at the middle pixel, rad per Å. */
  readonly angularDispersionRadPerAngstrom: number;
  /** R = m N when the illuminated width is given, else null. */
  readonly theoreticalResolvingPower: number | null;
}

/**
 * Summary of a set-up over a sensor of `pixels` pixels: wavelength range, dispersion,
 * diffraction angle, angular dispersion and theoretical resolving power.
 *
 * @param setup the geometry.
 * @param pixels number of pixels along the dispersion (≥ 2).
 * @returns the summary.
 * @throws {UsageError} for an incomplete or impossible set-up.
 * @example describeGrating({ kind: 'slit', linesPerMm: 1200, incidenceDeg: 25, deviationDeg: 10, focalLengthMm: 200, pixelSizeUm: 9, pixels: 2048 }, 2048).dispersionAngstromPerPixel.middle; // ≈ 0.362 (λ ≈ 5679 Å at β = 15°)
 */
export function describeGrating(setup: GratingSetup, pixels: number): GratingDescription {
  if (!Number.isInteger(pixels) || pixels < 2) throw new UsageError('grating.bad-pixels', `pixels must be a whole number ≥ 2, got ${pixels}`);
  const r = resolve(setup);
  const at = (p: number) => wavelengthAndDispersion(r, p);
  const a = at(0), b = at((pixels - 1) / 2), c = at(pixels - 1);
  return {
    wavelengthAngstrom: { first: a.wavelength, middle: b.wavelength, last: c.wavelength },
    dispersionAngstromPerPixel: { first: a.dispersion, middle: b.dispersion, last: c.dispersion },
    diffractionAngleMiddleDeg: b.beta / DEG,
    angularDispersionRadPerAngstrom: r.m / (r.d * Math.cos(b.beta)),
    theoreticalResolvingPower: setup.illuminatedWidthMm !== undefined ? gratingResolvingPower(setup.linesPerMm, r.m, setup.illuminatedWidthMm) : null,
  };
}

/**
 * Wavelengths of every pixel from the set-up, for pixels 0 … n−1.
 *
 * @param setup the geometry.
 * @param pixels n (≥ 2).
 * @returns Float64Array of λ in Å (NaN where the order does not reach).
 * @throws {UsageError} for an incomplete or impossible set-up.
 * @example gratingWavelengths({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 0 }, 3)[1]; // ≈ 10.8
 */
export function gratingWavelengths(setup: GratingSetup, pixels: number): Float64Array {
  if (!Number.isInteger(pixels) || pixels < 1) throw new UsageError('grating.bad-pixels', `pixels must be a whole number ≥ 1, got ${pixels}`);
  const r = resolve(setup);
  const out = new Float64Array(pixels);
  for (let p = 0; p < pixels; p++) out[p] = wavelengthAndDispersion(r, p).wavelength;
  return out;
}

/**
 * 1-σ wavelength error at a pixel from the stated 1-σ uncertainties of the set-up's
 * parameters, assumed independent.
 *
 * Method: first-order propagation, σ_λ² = Σ (∂λ/∂q_k · σ_k)², with the derivatives by
 * central differences of the exact model (steps of 10⁻³ σ_k).
 *
 * @param setup the geometry.
 * @param uncertainties 1-σ per parameter name, in the parameter's own unit (degrees, mm, µm, pixels, lines per mm, Å).
 * @param pixel 0-based pixel index.
 * @returns σ_λ in Å (0 when no uncertainties are given).
 * @throws {UsageError} for a negative uncertainty or a parameter the set-up does not use.
 * @example gratingWavelengthUncertainty({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 }, { distanceMm: 0.5, zeroOrderPixel: 1 }, 700); // ≈ 54.8 Å
 */
export function gratingWavelengthUncertainty(setup: GratingSetup, uncertainties: Readonly<Partial<Record<GratingParameterName, number>>>, pixel: number): number {
  let variance = 0;
  for (const [name, sigma] of Object.entries(uncertainties) as [GratingParameterName, number | undefined][]) {
    if (sigma === undefined || sigma === 0) continue;
    if (!(sigma > 0) || !Number.isFinite(sigma)) throw new UsageError('grating.bad-uncertainty', `the uncertainty of ${name} must be a positive number, got ${sigma}`);
    let base = (setup as unknown as Record<string, unknown>)[name];
    if (name === 'axisPixel' && base === undefined && setup.kind === 'slit' && setup.pixels !== undefined) base = (setup.pixels - 1) / 2;
    if (name === 'tiltDeg' && base === undefined) base = 0;
    if (typeof base !== 'number') throw new UsageError('grating.bad-uncertainty', `the set-up has no parameter ${name} to which an uncertainty can apply`);
    const h = sigma * 1e-3;
    const plus = gratingPixelToWavelength({ ...setup, [name]: base + h } as GratingSetup, pixel);
    const minus = gratingPixelToWavelength({ ...setup, [name]: base - h } as GratingSetup, pixel);
    variance += (((plus - minus) / (2 * h)) * sigma) ** 2;
  }
  return Math.sqrt(variance);
}
