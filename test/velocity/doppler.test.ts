import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/velocity/constants.js';
import {
  applyVelocityCorrection, combineRedshifts, dopplerVelocityKmPerS, redshiftFromVelocity, shiftWavelength, velocityFromRedshift,
} from '../../src/velocity/doppler.js';

describe('Doppler formulas', () => {
  it('uses c = 299 792.458 km/s', () => {
    // Exact by the SI definition of the metre (CGPM 1983).
    expect(SPEED_OF_LIGHT_KM_PER_S).toBe(299792.458);
  });

  it('worked example: a 1 Å redshift of Hα at 6563 Å', () => {
    // By hand: z = 1/6563 = 1.523693e-4.
    // Classical: v = c·z = 299792.458/6563 = 45.679180 km/s (6563 × 45.679180 = 299792.46).
    // Relativistic: v = c((1+z)² − 1)/((1+z)² + 1) = c·z(2 + z)/(2 + 2z + z²)
    //   ≈ c·z(1 − z/2) = 45.679180 − 45.679180 × 7.6185e-5 = 45.679180 − 0.003480 = 45.675700 km/s.
    expect(dopplerVelocityKmPerS(6564, 6563, { formula: 'classical' })).toBeCloseTo(45.67918, 5);
    expect(dopplerVelocityKmPerS(6564, 6563)).toBeCloseTo(45.6757, 5);
    expect(dopplerVelocityKmPerS(6562, 6563)).toBeLessThan(0); // blueshift = approaching = negative
  });

  it('round-trips velocity → wavelength → velocity for both formulas (property)', () => {
    fc.assert(fc.property(
      fc.double({ min: 1000, max: 30000, noNaN: true }),
      fc.double({ min: -20000, max: 20000, noNaN: true }),
      fc.constantFrom('relativistic' as const, 'classical' as const),
      (rest, v, formula) => {
        const back = dopplerVelocityKmPerS(shiftWavelength(rest, v, { formula }), rest, { formula });
        // 1e-9 km/s = 1 µm/s: rounding of a ratio near 1 times c.
        return Math.abs(back - v) < 1e-9 * Math.max(1, Math.abs(v));
      },
    ), { numRuns: 1000 });
  });

  it('agrees between formulas to first order and differs by v²/2c to second order', () => {
    // Relativistic z = √((1+β)/(1−β)) − 1 = β + β²/2 + β³/2 + … (series expansion, from memory);
    // the β³/2 term (1.9e-11 here) sets the tolerance.
    const v = 100;
    const zRel = redshiftFromVelocity(v);
    const zCl = redshiftFromVelocity(v, { formula: 'classical' });
    const beta = v / SPEED_OF_LIGHT_KM_PER_S;
    expect(zRel - zCl).toBeCloseTo(beta * beta / 2, 10);
    expect(zRel - zCl - beta * beta / 2).toBeCloseTo(beta ** 3 / 2, 14);
    expect(velocityFromRedshift(zRel)).toBeCloseTo(v, 10);
  });

  it('combines redshifts multiplicatively and applies a correction as v + v_bc + v·v_bc/c (classical)', () => {
    expect(combineRedshifts(0.001, 0.0001)).toBeCloseTo(0.0011001, 15);
    // v_true = v_meas + v_bc + v_meas·v_bc/c: the application formula in astropy 5.2.1's
    // radial_velocity_correction docstring (attributed there to Wright & Eastman 2014).
    const v = 57.3;
    const vbc = -23.9;
    expect(applyVelocityCorrection(v, vbc, { formula: 'classical' })).toBeCloseTo(v + vbc + (v * vbc) / SPEED_OF_LIGHT_KM_PER_S, 10);
    // Relativistic: the same Doppler factors, so the observed wavelength of a star of barycentric
    // velocity V seen by this observer gives back V.
    const trueV = 40;
    const zB = vbc / SPEED_OF_LIGHT_KM_PER_S;
    const observed = shiftWavelength(5000, trueV) / (1 + zB);
    const measured = dopplerVelocityKmPerS(observed, 5000);
    expect(applyVelocityCorrection(measured, vbc)).toBeCloseTo(trueV, 9);
  });

  it('does not change with the wavelength unit (ratio only)', () => {
    expect(dopplerVelocityKmPerS(656.4, 656.3)).toBeCloseTo(dopplerVelocityKmPerS(6564, 6563), 9);
  });

  it.each([
    [() => dopplerVelocityKmPerS(0, 6563), 'doppler.bad-wavelength', 'observed wavelength 0 must be a positive finite number'],
    [() => dopplerVelocityKmPerS(6563, Number.NaN), 'doppler.bad-wavelength', 'rest wavelength NaN must be a positive finite number'],
    [() => shiftWavelength(6563, 300000), 'doppler.bad-velocity', 'velocity 300000 km/s is not below the speed of light in size'],
    [() => velocityFromRedshift(-1), 'doppler.bad-redshift', 'redshift -1 must be a finite number above -1'],
  ])('refuses bad input (%#)', (call, code, message) => {
    try {
      call();
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe(code);
      expect((e as InputError).message).toBe(message);
    }
  });
});
