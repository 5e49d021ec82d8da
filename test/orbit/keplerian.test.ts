import { describe, expect, it } from 'vitest';
import { solveKepler, trueAnomalyFromEccentric } from '../../src/orbit/kepler.js';
import { radialVelocityKmPerS, trueLongitude, type KeplerianOrbit } from '../../src/orbit/keplerian.js';

// LVAC-7's invented orbit (data/demo/scenario.json), with an invented K₂ for the double-lined checks.
const ORBIT: KeplerianOrbit = { periodDays: 12.37, periastronTimeBjdTdb: 2461140.63, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8, semiAmplitude2KmPerS: 63.0 };

describe('radialVelocityKmPerS', () => {
  const P = ORBIT.periodDays;
  const n = 20000;
  const t = Array.from({ length: n }, (_, i) => ORBIT.periastronTimeBjdTdb + 3 * P + (P * i) / n);
  const v = radialVelocityKmPerS(ORBIT, t);
  const e = ORBIT.eccentricity, w = (ORBIT.omegaDeg * Math.PI) / 180, K = ORBIT.semiAmplitudeKmPerS, g = ORBIT.systemicVelocityKmPerS;

  it('has extremes γ + K(±1 + e cos ω), so half the range is K (textbook identities)', () => {
    const max = Math.max(...v), min = Math.min(...v);
    // dense sampling: 20000 points per period resolve the extremes to < 1e-5 km/s
    expect(max).toBeCloseTo(g + K * (1 + e * Math.cos(w)), 4);
    expect(min).toBeCloseTo(g + K * (-1 + e * Math.cos(w)), 4);
    expect((max - min) / 2).toBeCloseTo(K, 4);
  });

  it('averages to γ over one period in time (the mean of cos(ν + ω) over time is −e cos ω)', () => {
    const mean = v.reduce((a, b) => a + b, 0) / n;
    expect(mean).toBeCloseTo(g, 6);
  });

  it('gives γ + K(1 + e) cos ω at periastron and mirrors star 1 in star 2', () => {
    // 5e-8 km/s: a time near BJD 2.46e6 carries ~2e-10 d of rounding, which moves v by up to ~1e-8 km/s here
    expect(radialVelocityKmPerS(ORBIT, [ORBIT.periastronTimeBjdTdb + 7 * P])[0]).toBeCloseTo(g + K * (1 + e) * Math.cos(w), 7);
    const v2 = radialVelocityKmPerS(ORBIT, t.slice(0, 50), 'secondary');
    for (let i = 0; i < 50; i++) expect(v2[i] - g).toBeCloseTo((-(v[i] - g) * ORBIT.semiAmplitude2KmPerS!) / K, 9);
  });

  it('does not change its input and refuses a secondary without K₂', () => {
    const times = Object.freeze([1, 2, 3]);
    radialVelocityKmPerS(ORBIT, times);
    expect(times).toEqual([1, 2, 3]);
    const { semiAmplitude2KmPerS: _, ...sb1 } = ORBIT;
    expect(() => radialVelocityKmPerS(sb1, [1], 'secondary')).toThrow('the orbit has no semiAmplitude2KmPerS for the secondary star');
  });
});

describe('trueLongitude (equinoctial form used by the orbit fit)', () => {
  const cases = [[0.3, 0.1, 0.2], [2.5, -0.5, 0.3], [-1, 0, 0], [4, 0.7, -0.6], [1, 1e-9, 0], [5.5, 0, 0.85], [0.01, 0.9, 0.05]];
  it('equals ν + ω from the eccentric anomaly', () => {
    const o = new Float64Array(5);
    for (const [lam, h, k] of cases) {
      expect(trueLongitude(lam, h, k, o)).toBe(true);
      const e = Math.hypot(h, k), w = Math.atan2(k, h);
      const nu = trueAnomalyFromEccentric(solveKepler(lam - w, e), e);
      expect(o[0]).toBeCloseTo(Math.cos(nu + w), 13);
      expect(o[1]).toBeCloseTo(Math.sin(nu + w), 13);
    }
  });

  it('has derivatives equal to central finite differences, also at e = 0', () => {
    const o = new Float64Array(5), a = new Float64Array(5);
    const u = (l: number, h: number, k: number) => (trueLongitude(l, h, k, a), Math.atan2(a[1], a[0]));
    const d = 1e-6;
    const fd = (f: (x: number) => number, x: number) => {
      const r = f(x + d) - f(x - d);
      return Math.atan2(Math.sin(r), Math.cos(r)) / (2 * d);
    };
    for (const [lam, h, k] of cases) {
      trueLongitude(lam, h, k, o);
      // central differences with step 1e-6 are good to ~1e-9 here (truncation d² u''' and rounding 1e-16/d)
      expect(Math.abs(o[2] - fd((x) => u(x, h, k), lam))).toBeLessThan(1e-7);
      expect(Math.abs(o[3] - fd((x) => u(lam, x, k), h))).toBeLessThan(1e-7);
      expect(Math.abs(o[4] - fd((x) => u(lam, h, x), k))).toBeLessThan(1e-7);
      // dν/dM = √(1 − e²) / (1 − e cos E)² (textbook)
      const e = Math.hypot(h, k), E = solveKepler(lam - Math.atan2(k, h), e);
      expect(o[2]).toBeCloseTo(Math.sqrt(1 - e * e) / (1 - e * Math.cos(E)) ** 2, 10);
    }
  });

  it('refuses e ≥ 1', () => {
    expect(trueLongitude(1, 0.8, 0.6, new Float64Array(5))).toBe(false);
  });
});
