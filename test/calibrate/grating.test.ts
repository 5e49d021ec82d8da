/**
 * The grating equation and the set-up geometry: textbook values, identities, and the
 * approximate solution with its error estimate checked by simulation.
 */
import { describe, expect, it } from 'vitest';
import {
  angularDispersionRadPerAngstrom, describeGrating, diffractionAngleDeg, gratingDispersion, gratingPixelToWavelength,
  gratingResolvingPower, gratingWavelengthAngstrom, gratingWavelengthToPixel, gratingWavelengthUncertainty, type GratingSetup,
} from '../../src/calibrate/grating.js';
import { gratingSolution } from '../../src/calibrate/grating-solution.js';
import { solutionWavelength } from '../../src/calibrate/solution.js';
import { UsageError } from '../../src/errors.js';
import { gaussian, mulberry32, meanStd } from '../helpers/random.js';

const DEG = Math.PI / 180;
const slit: GratingSetup = { kind: 'slit', linesPerMm: 1200, incidenceDeg: 25, deviationDeg: 10, focalLengthMm: 200, pixelSizeUm: 9, pixels: 2048, tiltDeg: 3 };
const transmission: GratingSetup = { kind: 'transmission', linesPerMm: 100, distanceMm: 50, pixelSizeUm: 5.4, zeroOrderPixel: 200 };

describe('grating equation: textbook values', () => {
  it('first-order angle for 600 lines/mm at 5000 Å, normal incidence: sin β = mλ/d = 0.3, β = 17.4576°', () => {
    // Worked example of the kind in Hecht, Optics (4th ed.), §10.2.8, and Palmer & Loewen,
    // Diffraction Grating Handbook, eq. 2-1 (from memory): d = 1/600 mm = 16 666.7 Å, sin β = 5000/16 666.7 = 0.3.
    expect(diffractionAngleDeg(5000, 600, 1, 0)).toBeCloseTo(Math.asin(0.3) / DEG, 10);
    expect(diffractionAngleDeg(5000, 600, 1, 0)).toBeCloseTo(17.4576, 4);
    // Second order at 5000 Å: sin β = 0.6, β = 36.8699° (the 3-4-5 triangle).
    expect(diffractionAngleDeg(5000, 600, 2, 0)).toBeCloseTo(36.8699, 4);
    // An order that does not exist: sin β would be 1.2.
    expect(diffractionAngleDeg(5000, 600, 4, 0)).toBeNaN();
  });

  it('Littrow: mλ = 2d sin α, so 1200 lines/mm sends 5000 Å back at 17.4576° (Palmer & Loewen, eq. 2-7, from memory)', () => {
    const alpha = Math.asin((1 * 5000) / (2 * 1e7 / 1200)) / DEG;
    expect(alpha).toBeCloseTo(17.4576, 4);
    expect(diffractionAngleDeg(5000, 1200, 1, alpha)).toBeCloseTo(alpha, 10);
    expect(gratingWavelengthAngstrom(alpha, 1200, 1, alpha)).toBeCloseTo(5000, 8);
  });

  it('angular dispersion dβ/dλ = m/(d cos β): 1.2579e-4 rad/Å for 1200 lines/mm at 17.4576°, equal to the numerical derivative', () => {
    // Palmer & Loewen, eq. 2-12 (from memory): 1/(8333.33 Å × cos 17.4576°) = 1.25794e-4 rad/Å.
    expect(angularDispersionRadPerAngstrom(17.4576, 1200, 1)).toBeCloseTo(1.25794e-4, 8);
    for (const [lambda, lines, m, alpha] of [[5000, 1200, 1, 10], [6563, 600, 2, -5], [4000, 300, 1, 30]] as const) {
      const beta = diffractionAngleDeg(lambda, lines, m, alpha);
      const h = 0.01;
      const numeric = ((diffractionAngleDeg(lambda + h, lines, m, alpha) - diffractionAngleDeg(lambda - h, lines, m, alpha)) * DEG) / (2 * h);
      expect(angularDispersionRadPerAngstrom(beta, lines, m) / numeric - 1).toBeLessThan(1e-8);
    }
  });

  it('resolving power R = mN: the sodium D lines (5889.95, 5895.92 Å) need R ≈ 987, i.e. about 1000 illuminated grooves in first order', () => {
    // Hecht, Optics, §10.2.8 (from memory): λ/Δλ = 5892.9/5.97 = 987. NIST ASD Na I air wavelengths 5889.950, 5895.924 Å (data/linelists/Na_I.csv).
    const needed = 5892.94 / (5895.924 - 5889.95);
    expect(needed).toBeCloseTo(986.4, 0);
    expect(gratingResolvingPower(600, 1, 1.65)).toBeCloseTo(990, 9);
    expect(gratingResolvingPower(600, 1, 1.65)).toBeGreaterThan(needed);
    expect(gratingResolvingPower(600, -2, 25)).toBe(30000); // |m| N
    expect(describeGrating({ ...transmission, illuminatedWidthMm: 3 }, 1600).theoreticalResolvingPower).toBe(300);
  });

  it('transmission grating in front of a camera: dispersion d·pixel/(mL) at the zero order (common practice: 100 lines/mm, 50 mm, 5.4 µm → 10.8 Å/pixel)', () => {
    expect(gratingDispersion(transmission, 200)).toBeCloseTo(10.8, 10);
    expect(gratingPixelToWavelength(transmission, 200)).toBeCloseTo(0, 9);
  });
});

describe('grating geometry: identities', () => {
  it('pixel → wavelength → pixel is the identity (slit with tilt; transmission with incidence and tilt; reversed read-out)', () => {
    const setups: GratingSetup[] = [
      slit,
      { ...slit, pixelDirection: 'decreasing', axisPixel: 700.5, tiltDeg: -4 },
      { ...transmission, incidenceDeg: 2, tiltDeg: 5 },
      { ...transmission, order: 2, pixelDirection: 'decreasing', zeroOrderPixel: 1500 },
    ];
    for (const s of setups) {
      for (const p of [0, 333.3, 1024, 1500.25]) {
        if (s.kind === 'transmission' && (s.pixelDirection === 'decreasing' ? p >= 1500 : p <= 200)) continue;
        const w = gratingPixelToWavelength(s, p);
        expect(Math.abs(gratingWavelengthToPixel(s, w) - p)).toBeLessThan(1e-8); // pixels: float64 round trip through asin/atan
      }
    }
  });

  it('the analytic dispersion equals the numerical derivative of λ(pixel)', () => {
    for (const s of [slit, { ...transmission, incidenceDeg: 3, tiltDeg: 2 } as GratingSetup]) {
      for (const p of [250, 900, 1800]) {
        const numeric = (gratingPixelToWavelength(s, p + 0.01) - gratingPixelToWavelength(s, p - 0.01)) / 0.02;
        expect(Math.abs(gratingDispersion(s, p) / numeric - 1)).toBeLessThan(1e-7);
      }
    }
  });

  it('the exact projection tan β = x/L departs from the small-angle x/L as 1 − cos³β (to second order in β)', () => {
    // Transmission, normal incidence, no tilt: dλ/dx = d cos³β/(mL) exactly; the small-angle value is d/(mL).
    for (const p of [300, 800, 1400]) {
      const x = (p - 200) * 5.4e-3;
      const beta = Math.atan(x / 50);
      const ratio = gratingDispersion(transmission, p) / 10.8;
      expect(ratio).toBeCloseTo(Math.cos(beta) ** 3, 12);
      expect(Math.abs(1 - ratio - 1.5 * beta * beta)).toBeLessThan(2 * beta ** 4); // next term of 1 − cos³β
    }
  });

  it('a slit spectrograph at the camera axis has dλ/dp = d cos β_c · pixel/(m f)', () => {
    const d = describeGrating(slit, 2048);
    const expected = ((1e7 / 1200) * Math.cos(15 * DEG) * 9e-3) / 200;
    // Tilt 3°: at the axis dβ/ds = cos τ / f.
    expect(gratingDispersion(slit, 1023.5)).toBeCloseTo(expected * Math.cos(3 * DEG), 12);
    expect(d.diffractionAngleMiddleDeg).toBeCloseTo(15, 10);
    expect(d.wavelengthAngstrom.middle).toBeCloseTo((1e7 / 1200) * (Math.sin(25 * DEG) + Math.sin(15 * DEG)), 8);
  });

  it('refuses impossible set-ups with a usage error', () => {
    expect(() => gratingPixelToWavelength({ ...slit, deviationDeg: undefined }, 0)).toThrow(UsageError);
    expect(() => gratingPixelToWavelength({ ...slit, order: 0 }, 0)).toThrow('the diffraction order must be a non-zero whole number, got 0');
    expect(() => gratingPixelToWavelength({ ...transmission, distanceMm: -1 }, 0)).toThrow('distanceMm must be a positive number, got -1');
    expect(() => gratingPixelToWavelength({ kind: 'slit', linesPerMm: 1200, incidenceDeg: 10, centerWavelengthAngstrom: 30000, focalLengthMm: 100, pixelSizeUm: 9, pixels: 100 }, 0)).toThrow('does not exist');
  });
});

describe('approximate solution from the grating equation', () => {
  it('reproduces the model to 10⁻⁴ pixel, is flagged as not calibrated by a lamp, and carries the warning', () => {
    // The extracted spectrum starts 300 pixels beyond the zero order (which lies off its pixels).
    const offset: GratingSetup = { ...transmission, zeroOrderPixel: -300 };
    const s = gratingSolution(offset, 1600, { distanceMm: 0.5, zeroOrderPixel: 1 });
    for (const p of [0, 777.7, 1599]) {
      const err = (solutionWavelength(s, p) - gratingPixelToWavelength(offset, p)) / gratingDispersion(offset, p);
      expect(Math.abs(err)).toBeLessThan(1e-4);
    }
    expect(s).toMatchObject({ ok: true, method: 'grating-equation', calibratedByLamp: false, velocityZeroPointMeaningful: false });
    expect(s.warnings[0]).toMatch(/^approximate solution from the grating equation and the set-up's geometry, not calibrated by a lamp \(estimated error up to \d+(\.\d+)? Å\)$/);
    expect(() => gratingSolution(transmission, 1600)).toThrow('the set-up gives no positive wavelength at pixel 0.0; check the order, angles and zero-order pixel');
    expect(gratingSolution(slit, 2048).warnings[0]).toContain('error unknown: no uncertainties of the geometry were given');
  });

  it('its error estimate matches the scatter of simulated set-ups (first-order propagation, 2000 draws, within 10 %)', () => {
    const sigma = { distanceMm: 0.5, zeroOrderPixel: 1.5, pixelSizeUm: 0.02 };
    const rand = mulberry32(4242);
    const pixel = 1200;
    const w: number[] = [];
    for (let k = 0; k < 2000; k++) {
      w.push(gratingPixelToWavelength({
        ...transmission,
        distanceMm: 50 + sigma.distanceMm * gaussian(rand),
        zeroOrderPixel: 200 + sigma.zeroOrderPixel * gaussian(rand),
        pixelSizeUm: 5.4 + sigma.pixelSizeUm * gaussian(rand),
      }, pixel));
    }
    const predicted = gratingWavelengthUncertainty(transmission, sigma, pixel);
    // 2000 draws: the sample σ is known to ±1.6 % (1/√(2·2000)); the model is linearised, so allow 10 %.
    expect(Math.abs(meanStd(w).std / predicted - 1)).toBeLessThan(0.1);
  });
});
