import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { GM_SUN_M3_PER_S2, METERS_PER_AU, SECONDS_PER_DAY } from '../../src/velocity/constants.js';
import { massFunction, minimumMasses, projectedSemiMajorAxisKm, propagateUncertainty } from '../../src/orbit/mass-function.js';
import { gaussian, mulberry32 } from '../helpers/random.js';

/** K of star 1 for masses m1, m2 (solar), inclination i, period P (d), eccentricity e, from Kepler's third law. */
function k1FromMasses(m1: number, m2: number, iDeg: number, P: number, e: number): number {
  const Ps = P * SECONDS_PER_DAY;
  const a = Math.cbrt((GM_SUN_M3_PER_S2 * (m1 + m2) * Ps * Ps) / (4 * Math.PI * Math.PI)); // relative orbit, m
  const a1 = (a * m2) / (m1 + m2);
  return (2 * Math.PI * a1 * Math.sin((iDeg * Math.PI) / 180)) / (Ps * Math.sqrt(1 - e * e)) / 1000;
}

describe('massFunction', () => {
  it('gives the textbook constant 1.0361e-7 M☉ for P = 1 d, K = 1 km/s, e = 0', () => {
    // f(m) = 1.0361 × 10⁻⁷ (1 − e²)^{3/2} K³ P M☉ (K in km/s, P in d): the usual textbook form (from memory).
    expect(Math.abs(massFunction(1, 1, 0) / 1.0361e-7 - 1)).toBeLessThan(1e-4);
  });

  it('returns one solar mass for a massless body on the Gaussian orbit (a = 1 au, P = 2π/k days)', () => {
    // Gaussian gravitational constant k = 0.01720209895 au^{3/2} d⁻¹ M☉^{-1/2} (IAU 1976, exact, from memory):
    // a massless body at a = 1 au circles the Sun in 2π/k = 365.2568983 d. Seen edge-on, its
    // velocity K = 2π a/P and f(m) = M☉³/(M☉ + 0)² = 1 M☉, to the 1e-9 by which the IAU 2015 nominal
    // (GM)☉ and the au of IAU 2012 reproduce k² au³/d².
    const k = 0.01720209895;
    const P = (2 * Math.PI) / k;
    const K = (METERS_PER_AU * k) / SECONDS_PER_DAY / 1000;
    expect(Math.abs(massFunction(P, K, 0) - 1)).toBeLessThan(1e-8);
    expect(projectedSemiMajorAxisKm(P, K, 0)).toBeCloseTo(METERS_PER_AU / 1000, 0);
  });

  it('equals m₂³ sin³i / (m₁ + m₂)² for orbits built from Kepler\'s third law (analytic identity)', () => {
    for (const [m1, m2, i, P, e] of [[2.1, 0.8, 63, 12.37, 0.28], [1, 1, 90, 3.5, 0], [0.6, 0.1, 30, 410, 0.7]]) {
      const K = k1FromMasses(m1, m2, i, P, e);
      const s = Math.sin((i * Math.PI) / 180);
      expect(massFunction(P, K, e) / ((m2 * s) ** 3 / (m1 + m2) ** 2) - 1).toBeLessThan(1e-12);
      const K2 = k1FromMasses(m2, m1, i, P, e);
      const mm = minimumMasses(P, K, K2, e);
      expect(mm.m1SinI3SolarMass / (m1 * s ** 3)).toBeCloseTo(1, 12);
      expect(mm.m2SinI3SolarMass / (m2 * s ** 3)).toBeCloseTo(1, 12);
    }
  });

  it('refuses impossible elements', () => {
    expect(() => massFunction(0, 10, 0.1)).toThrow(UsageError);
    expect(() => massFunction(0, 10, 0.1)).toThrow('period must be positive and finite, got 0 d');
    expect(() => massFunction(1, 10, 1)).toThrow('eccentricity must be in [0, 1), got 1');
  });
});

describe('propagateUncertainty', () => {
  it('matches the scatter of f(m) over simulated (P, K, e) with correlated errors (simulation)', () => {
    const P = 12.37, K = 41.3, e = 0.28; // LVAC-7's invented orbit
    const sP = 0.004, sK = 0.5, sE = 0.012, rhoKE = 0.4;
    const cov = [[sP * sP, 0, 0], [0, sK * sK, rhoKE * sK * sE], [0, rhoKE * sK * sE, sE * sE]];
    const f = massFunction(P, K, e);
    const grad = [f / P, (3 * f) / K, (-3 * e * f) / (1 - e * e)];
    const predicted = propagateUncertainty(grad, cov);
    const rand = mulberry32(11);
    const n = 20000;
    let s = 0, s2 = 0;
    for (let j = 0; j < n; j++) {
      const z1 = gaussian(rand), z2 = gaussian(rand), z3 = gaussian(rand);
      const dK = sK * z2;
      const dE = sE * (rhoKE * z2 + Math.sqrt(1 - rhoKE * rhoKE) * z3);
      const x = massFunction(P + sP * z1, K + dK, e + dE);
      s += x; s2 += x * x;
    }
    const std = Math.sqrt(s2 / n - (s / n) ** 2);
    // first-order propagation of ~4% errors: agreement within 3% (sampling error of a std from 20000 draws: 0.5%)
    expect(Math.abs(std / predicted - 1)).toBeLessThan(0.03);
  });

  it('checks the covariance size', () => {
    expect(() => propagateUncertainty([1, 2], [[1]])).toThrow('the covariance must be 2×2 for 2 gradient values');
  });
});
