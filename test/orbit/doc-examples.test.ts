import { describe, expect, it } from 'vitest';
import {
  createVelocityTable, formatVelocityTableCsv, isDoubleLined, lnGamma, lucySweeneyProbability, massFunction, minimumMasses,
  parseVelocityTable, projectedSemiMajorAxisKm, propagateUncertainty, radialVelocityKmPerS, solveKepler, trueAnomaly, trueAnomalyFromEccentric,
} from '../../src/index.js';

// Sources: E = 5.554589° for M = 5°, e = 0.1 is Meeus, Astronomical Algorithms (2nd ed.), example 30.a
// (from memory); the other values are the docs' own, worked by hand from the formulas they state.
// The results written in the @example lines of the orbit area's TSDoc, checked so the docs stay true.
describe('orbit TSDoc examples', () => {
  it('state the values the functions return', () => {
    expect(createVelocityTable({ bjdTdb: [2460000.5, 2460001.5], velocityKmPerS: [3.1, -2.4], uncertaintyKmPerS: [0.5, 0.5] }).label).toEqual(['', '']);
    expect(parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s\n2460000.5,3.1,0.5\n', 'lvac7.csv').velocityKmPerS[0]).toBe(3.1);
    expect(isDoubleLined(parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,1\n', 'x.csv'))).toBe(false);
    expect(formatVelocityTableCsv(createVelocityTable({ bjdTdb: [2460000.5], velocityKmPerS: [3.1], uncertaintyKmPerS: [0.5] })))
      .toBe('bjd_tdb,velocity_km_s,uncertainty_km_s,label\n2460000.5,3.1,0.5,\n');
    expect((solveKepler((5 * Math.PI) / 180, 0.1) * 180) / Math.PI).toBeCloseTo(5.554589, 6);
    expect(trueAnomalyFromEccentric(Math.PI / 2, 0)).toBeCloseTo(Math.PI / 2, 15);
    expect(trueAnomaly(Math.PI, 0.5)).toBeCloseTo(Math.PI, 14);
    const lvac7 = { periodDays: 12.37, periastronTimeBjdTdb: 2461140.63, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8 };
    expect(radialVelocityKmPerS(lvac7, [2461140.63])[0]).toBeCloseTo(-37.6, 1);
    expect(massFunction(10, 30, 0)).toBeCloseTo(0.027976, 6);
    expect(projectedSemiMajorAxisKm(10, 30, 0) / 4.125e6).toBeCloseTo(1, 3);
    expect(minimumMasses(10, 50, 60, 0).m1SinI3SolarMass).toBeCloseTo(0.752, 3);
    expect(propagateUncertainty([2], [[0.01]])).toBeCloseTo(0.2, 15);
    expect(lucySweeneyProbability(20, 30, 26, 6)).toBeCloseTo(0.0173, 4);
    expect(Math.exp(lnGamma(5))).toBeCloseTo(24, 12);
  });
});
