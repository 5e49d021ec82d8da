import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bernoulliSumUpperTail, erfc, normalUpperTail, sigmaFromTailProbability } from '../../src/elements/statistics.js';
import { repoPath } from '../helpers/paths.js';
import { mulberry32 } from '../helpers/random.js';

// Reference values from scipy 1.10.1 (Debian python3-scipy), written by
// test/reference/make_elements_refs.py: scipy.special.erfc, scipy.stats.norm.sf, scipy.stats.norm.isf.
const ref = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'elements-scipy.json'), 'utf8')) as {
  library: string;
  erfc: [number, number][];
  normalUpperTail: [number, number][];
  sigmaFromTail: [number, number][];
};

describe('erfc and the normal tail against scipy', () => {
  it('records the library version', () => {
    expect(ref.library).toBe('scipy 1.10.1');
  });

  it('erfc agrees with scipy.special.erfc to 1e-13 relative over -3…26', () => {
    let worst = 0;
    for (const [x, want] of ref.erfc) {
      const rel = Math.abs(erfc(x) - want) / want;
      worst = Math.max(worst, rel);
      // tolerance: both are double-precision evaluations; 1e-13 allows for the series/continued-fraction switch at x = 2
      expect(rel, `x=${x}`).toBeLessThan(1e-13);
    }
    console.log(`erfc worst relative error vs scipy: ${worst.toExponential(2)}`);
  });

  it('normalUpperTail agrees with scipy.stats.norm.sf to 5e-13 relative', () => {
    for (const [x, want] of ref.normalUpperTail) {
      // tolerance: Q(26) = erfc(18.4)/2 ≈ 1e-149; the continued fraction's rounding reaches ~1e-13 there
      expect(Math.abs(normalUpperTail(x) - want) / want, `x=${x}`).toBeLessThan(5e-13);
    }
  });

  it('sigmaFromTailProbability agrees with scipy.stats.norm.isf to 1e-9 sigma', () => {
    let worst = 0;
    for (const [p, want] of ref.sigmaFromTail) {
      const d = Math.abs(sigmaFromTailProbability(p) - want);
      worst = Math.max(worst, d);
      // tolerance: bisection stops at 1e-12 in x; 1e-9 leaves room for the tail's own rounding
      expect(d, `p=${p}`).toBeLessThan(1e-9);
    }
    console.log(`sigma worst error vs scipy: ${worst.toExponential(2)}`);
  });

  it('three and five sigma are the usual one-sided tails', () => {
    // common practice (one-sided): 3 sigma ↔ 1.35e-3, 5 sigma ↔ 2.87e-7 (scipy values in the fixture)
    expect(sigmaFromTailProbability(1.3498980316301e-3)).toBeCloseTo(3, 9);
    expect(sigmaFromTailProbability(2.866515718791939e-7)).toBeCloseTo(5, 9);
  });

  it('handles the ends and bad input', () => {
    expect(sigmaFromTailProbability(0)).toBe(Infinity);
    expect(sigmaFromTailProbability(1)).toBe(-Infinity);
    expect(sigmaFromTailProbability(-0.1)).toBeNaN();
    expect(sigmaFromTailProbability(NaN)).toBeNaN();
    expect(erfc(NaN)).toBeNaN();
    expect(erfc(40)).toBe(0);
    expect(erfc(-40)).toBe(2);
  });

  it('round-trips tail → sigma → tail', () => {
    fc.assert(
      // below −4 the tail is 1 − ε and the inverse loses digits in double precision
      fc.property(fc.double({ min: -4, max: 8, noNaN: true }), (x) => {
        expect(sigmaFromTailProbability(normalUpperTail(x))).toBeCloseTo(x, 8);
      }),
    );
  });
});

/** Exact tail by enumerating all 2^n outcomes. */
function bruteTail(w: number[], p: number[], threshold: number): number {
  let total = 0;
  for (let mask = 0; mask < 1 << w.length; mask++) {
    let s = 0;
    let pr = 1;
    for (let j = 0; j < w.length; j++) {
      if (mask & (1 << j)) {
        s += w[j];
        pr *= p[j];
      } else pr *= 1 - p[j];
    }
    if (s >= threshold) total += pr;
  }
  return total;
}

describe('bernoulliSumUpperTail', () => {
  it('is exact for weights on the grid', () => {
    expect(bernoulliSumUpperTail([1, 1], [0.5, 0.5], 2)).toBeCloseTo(0.25, 15);
    expect(bernoulliSumUpperTail([1, 1, 1], [0.1, 0.2, 0.3], 2)).toBeCloseTo(bruteTail([1, 1, 1], [0.1, 0.2, 0.3], 2), 14);
    expect(bernoulliSumUpperTail([2, 3], [0.5, 0.5], 0)).toBe(1);
    expect(bernoulliSumUpperTail([2, 3], [0.5, 0.5], 5.5)).toBe(0);
  });

  it('lies between the exact tail and the exact tail at a threshold lowered by 0.2%, for random cases', () => {
    const rand = mulberry32(42);
    let worst = 0;
    for (let t = 0; t < 300; t++) {
      const n = 1 + Math.floor(rand() * 12);
      const w = Array.from({ length: n }, () => 0.2 + rand() * 6);
      const p = Array.from({ length: n }, () => rand() * 0.6);
      const sum = w.reduce((a, b) => a + b, 0);
      const threshold = rand() * sum;
      const exact = bruteTail(w, p, threshold);
      const got = bernoulliSumUpperTail(w, p, threshold);
      expect(got).toBeGreaterThanOrEqual(exact - 1e-12); // 1e-12: summation rounding of the DP
      // rounding lowers the effective threshold by at most (n + 1)·h, h = threshold / max(4000, 1000 n)
      const h = threshold / Math.max(4000, 1000 * n);
      expect(got, `case ${t}`).toBeLessThanOrEqual(bruteTail(w, p, threshold - (n + 1) * h) + 1e-12); // 1e-12: summation rounding of the DP
      worst = Math.max(worst, exact > 0 ? (got - exact) / exact : got);
    }
    console.log(`Bernoulli-sum tail: worst excess over the exact value ${worst.toExponential(2)} (relative)`);
  });

  it('agrees with a Monte Carlo estimate for 40 terms', () => {
    const rand = mulberry32(7);
    const n = 40;
    const w = Array.from({ length: n }, () => 0.5 + 3 * rand());
    const p = Array.from({ length: n }, () => 0.05 + 0.3 * rand());
    const threshold = 0.45 * w.reduce((a, b) => a + b, 0) * 0.5;
    const got = bernoulliSumUpperTail(w, p, threshold);
    let hits = 0;
    const trials = 40000;
    for (let t = 0; t < trials; t++) {
      let s = 0;
      for (let j = 0; j < n; j++) if (rand() < p[j]) s += w[j];
      if (s >= threshold) hits++;
    }
    const mc = hits / trials;
    const se = Math.sqrt((mc * (1 - mc)) / trials);
    // 4 standard errors of the Monte Carlo estimate, plus the grid's conservative excess (a few %)
    expect(Math.abs(got - mc)).toBeLessThan(4 * se + 0.03 * mc);
  });

  it('does not modify its inputs', () => {
    const w = Object.freeze([1.5, 2.5, 0.7]);
    const p = Object.freeze([0.2, 0.1, 0.4]);
    bernoulliSumUpperTail(w, p, 2);
    expect(w).toEqual([1.5, 2.5, 0.7]);
    expect(p).toEqual([0.2, 0.1, 0.4]);
  });
});
