/**
 * An approximate dispersion solution from the grating equation alone, for a set-up without
 * a lamp: flagged as not calibrated by a lamp, with an error estimate from the stated
 * uncertainties of the geometry.
 */
import { UsageError } from '../errors.js';
import { provenanceEntry } from '../spectrum/provenance.js';
import { gratingPixelToWavelength, gratingWavelengthUncertainty, type GratingParameterName, type GratingSetup } from './grating.js';
import { calibrationMessages } from './messages.js';
import { evaluatePolynomial, quickFit } from './polynomial.js';
import type { DispersionSolution } from './solution.js';

/** Order of the Chebyshev series that stands for the grating equation (its largest departure is recorded in the provenance; below 10⁻³ pixel for the set-ups tested). */
const GRATING_SERIES_ORDER = 5;

/**
 * A dispersion solution predicted by the grating equation for a sensor of `pixels` pixels
 * (0-based index), in the medium the set-up works in (air for a ground-based instrument).
 *
 * Method: λ(p) from {@link gratingPixelToWavelength} sampled at 401 pixels and represented
 * by a Chebyshev series of order 5 (so that it saves, loads and applies like any solution;
 * the largest departure from the exact model is checked and stated). The error estimate at
 * each pixel is {@link gratingWavelengthUncertainty} with the given 1-σ uncertainties; the
 * solution's `wavelengthUncertaintyAngstrom` holds its value at the middle and its largest.
 *
 * @param setup the geometry.
 * @param pixels sensor length along the dispersion (≥ 8).
 * @param uncertainties 1-σ of the set-up's parameters (optional).
 * @returns a solution with `method: 'grating-equation'`, `calibratedByLamp: false` and a warning.
 * @throws {UsageError} for an impossible set-up (the order does not reach every pixel).
 * @example gratingSolution({ kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 }, 1600, { distanceMm: 1 }).calibratedByLamp; // false
 */
export function gratingSolution(setup: GratingSetup, pixels: number, uncertainties: Readonly<Partial<Record<GratingParameterName, number>>> = {}): DispersionSolution {
  if (!Number.isInteger(pixels) || pixels < 8) throw new UsageError('grating.bad-pixels', `pixels must be a whole number ≥ 8, got ${pixels}`);
  const domain = { min: 0, max: pixels - 1 };
  const xs: number[] = [], ys: number[] = [];
  for (let k = 0; k <= 400; k++) {
    const p = (k / 400) * (pixels - 1);
    const w = gratingPixelToWavelength(setup, p);
    if (!Number.isFinite(w) || w <= 0) throw new UsageError('grating.no-order', `the set-up gives no positive wavelength at pixel ${p.toFixed(1)}; check the order, angles and zero-order pixel`);
    xs.push(p);
    ys.push(w);
  }
  const coefficients = quickFit(xs, ys, GRATING_SERIES_ORDER, domain);
  let worst = 0;
  for (let k = 0; k < xs.length; k++) worst = Math.max(worst, Math.abs(evaluatePolynomial(coefficients, domain, xs[k]) - ys[k]));
  const given = Object.values(uncertainties).some((v) => v !== undefined && v > 0);
  let middle = NaN, max = NaN;
  if (given) {
    middle = gratingWavelengthUncertainty(setup, uncertainties, (pixels - 1) / 2);
    max = 0;
    for (let k = 0; k <= 40; k++) max = Math.max(max, gratingWavelengthUncertainty(setup, uncertainties, (k / 40) * (pixels - 1)));
  }
  const n = GRATING_SERIES_ORDER + 1;
  return {
    ok: true,
    reason: null,
    message: calibrationMessages.gratingOnlyWarning(given ? max : null),
    method: 'grating-equation',
    calibratedByLamp: false,
    velocityZeroPointMeaningful: false,
    medium: 'air',
    order: GRATING_SERIES_ORDER,
    domain,
    coefficients: [...coefficients],
    covariance: Array.from({ length: n }, () => new Array<number>(n).fill(0)),
    pixels,
    rmsAngstrom: null,
    rmsPixels: null,
    rmsKmPerS: null,
    linesMeasured: 0,
    linesIdentified: 0,
    linesUsed: 0,
    linesRejected: 0,
    resolvingPower: null,
    wavelengthUncertaintyAngstrom: given ? { middle, max } : null,
    lines: [],
    lamp: null,
    grating: setup,
    observation: null,
    warnings: [calibrationMessages.gratingOnlyWarning(given ? max : null)],
    provenance: [provenanceEntry('grating-solution', { setup, pixels, uncertainties, seriesDepartureAngstrom: worst })],
  };
}
