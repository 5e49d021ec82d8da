import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { solveKepler, trueAnomaly, trueAnomalyFromEccentric } from '../../src/orbit/kepler.js';
import { repoPath } from '../helpers/paths.js';

const DEG = Math.PI / 180;

/** Reference E by plain bisection in double precision with the stable residual (slow, simple, obviously right). */
function bisectKepler(M: number, e: number): number {
  const k = Math.round(M / (2 * Math.PI));
  let m = M - 2 * Math.PI * k;
  const sign = m < 0 ? -1 : 1;
  m = Math.abs(m);
  let lo = m;
  let hi = Math.min(Math.PI, m + e);
  for (let i = 0; i < 200 && hi > lo; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (mid - e * Math.sin(mid) - m < 0) lo = mid; else hi = mid;
  }
  return sign * 0.5 * (lo + hi) + 2 * Math.PI * k;
}

describe('solveKepler', () => {
  it("matches Meeus's worked examples (Astronomical Algorithms, 2nd ed., ch. 30)", () => {
    // Meeus, Astronomical Algorithms 2nd ed., Example 30.a (from memory): e = 0.100, M = 5°, E = 5.554589°.
    expect(Math.abs(solveKepler(5 * DEG, 0.1) / DEG - 5.554589)).toBeLessThan(5e-7);
    // Meeus ch. 30, the e = 0.99, M = 2° case that defeats simple iteration (from memory): E = 32.361007°.
    expect(Math.abs(solveKepler(2 * DEG, 0.99) / DEG - 32.361007)).toBeLessThan(5e-7);
  });

  it('leaves a residual E − e sin E − M below 2e-15 rad over a grid of M and e up to 0.999999', () => {
    let worst = 0;
    for (const e of [0, 1e-9, 0.05, 0.2, 0.5, 0.8, 0.9, 0.95, 0.99, 0.995, 0.999, 0.9999, 0.999999]) {
      for (let i = 0; i <= 720; i++) {
        const M = -Math.PI + (2 * Math.PI * i) / 720;
        const E = solveKepler(M, e);
        // (1 − e)E + e(E − sin E) − M is the same residual written without cancellation at small E;
        // evaluating it directly in double precision costs ~1 ulp of max(|E|, |M|).
        const r = Math.abs(E - e * Math.sin(E) - M);
        worst = Math.max(worst, r);
      }
    }
    console.log(`Kepler residual over the grid: worst ${worst.toExponential(2)} rad`);
    // 2e-15 rad: a few ulp of π (4.4e-16 each), the rounding floor of the residual itself.
    expect(worst).toBeLessThan(2e-15);
  });

  it('agrees with a double-precision bisection reference', () => {
    let worst = 0;
    for (const e of [0.01, 0.3, 0.6, 0.9, 0.99]) {
      for (let i = 0; i < 200; i++) {
        const M = -10 + (20 * i) / 199;
        const E = solveKepler(M, e);
        const ref = bisectKepler(M, e);
        // scale by the conditioning 1 − e cos E: an error δM in M moves E by δM / (1 − e cos E)
        worst = Math.max(worst, Math.abs(E - ref) * (1 - e * Math.cos(E)));
      }
    }
    expect(worst).toBeLessThan(4e-15);
  });

  it('agrees with 40-digit mpmath solutions (test/fixtures/kepler-mpmath.json) up to e = 0.9999', () => {
    // Source: test/reference/make_kepler_refs.py (mpmath 1.2.1, 60-digit bisection + Newton).
    const doc = JSON.parse(readFileSync(repoPath('test/fixtures/kepler-mpmath.json'), 'utf8')) as { rows: { M: number; e: number; E: string; nu: string }[] };
    expect(doc.rows.length).toBeGreaterThan(200);
    let worstE = 0;
    let worstNu = 0;
    for (const r of doc.rows) {
      const E = solveKepler(r.M, r.e);
      const Eref = Number(r.E);
      const cond = 1 / (1 - r.e * Math.cos(Eref)); // dE/dM
      // Allowed: 2 ulp of E plus the propagated rounding of M (1 ulp of |M|) times dE/dM.
      const tol = 2 * Number.EPSILON * Math.max(Math.abs(Eref), 1e-300) + Number.EPSILON * Math.abs(r.M) * cond + 1e-300;
      worstE = Math.max(worstE, Math.abs(E - Eref) / tol);
      const nu = trueAnomalyFromEccentric(E, r.e);
      let d = (nu - Number(r.nu)) % (2 * Math.PI);
      if (d > Math.PI) d -= 2 * Math.PI;
      if (d < -Math.PI) d += 2 * Math.PI;
      // dν/dE = √(1 − e²)/(1 − e cos E) ≤ √((1 + e)/(1 − e)); tolerance in the same spirit.
      const nuCond = Math.sqrt(1 - r.e * r.e) / (1 - r.e * Math.cos(Eref));
      worstNu = Math.max(worstNu, Math.abs(d) / (tol * nuCond + 4 * Number.EPSILON * Math.PI));
    }
    console.log(`Kepler vs mpmath: worst |ΔE| / tolerance ${worstE.toFixed(3)}, worst |Δν| / tolerance ${worstNu.toFixed(3)}`);
    expect(worstE).toBeLessThanOrEqual(1);
    expect(worstNu).toBeLessThanOrEqual(1);
  });

  it('is odd and 2π-periodic in the sense E(M + 2π) = E(M) + 2π', () => {
    for (const [M, e] of [[0.7, 0.3], [2.9, 0.95], [0.001, 0.999]]) {
      expect(solveKepler(-M, e)).toBe(-solveKepler(M, e));
      expect(solveKepler(M + 2 * Math.PI, e) - 2 * Math.PI).toBeCloseTo(solveKepler(M, e), 13);
    }
  });

  it('refuses e outside [0, 1) and non-finite M', () => {
    expect(() => solveKepler(1, 1)).toThrow(UsageError);
    expect(() => solveKepler(1, 1)).toThrow('eccentricity must be in [0, 1), got 1');
    expect(() => solveKepler(1, -0.1)).toThrow('eccentricity must be in [0, 1), got -0.1');
    expect(() => solveKepler(NaN, 0.1)).toThrow('mean anomaly must be finite, got NaN');
  });
});

describe('true anomaly', () => {
  it('equals E for a circular orbit and is π at apastron', () => {
    expect(trueAnomalyFromEccentric(1.234, 0)).toBeCloseTo(1.234, 15);
    expect(trueAnomaly(Math.PI, 0.7)).toBeCloseTo(Math.PI, 14);
  });

  it('satisfies tan(ν/2) = √((1 + e)/(1 − e)) tan(E/2) (textbook identity)', () => {
    for (const [E, e] of [[0.5, 0.2], [2.0, 0.6], [-1.0, 0.9]]) {
      const nu = trueAnomalyFromEccentric(E, e);
      expect(Math.tan(nu / 2)).toBeCloseTo(Math.sqrt((1 + e) / (1 - e)) * Math.tan(E / 2), 12);
    }
  });
});
