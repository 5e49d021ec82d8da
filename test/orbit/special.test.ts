import { describe, expect, it } from 'vitest';
import { lnGamma } from '../../src/orbit/special.js';

describe('lnGamma', () => {
  it('gives factorials and Γ(1/2) = √π', () => {
    let fact = 1;
    for (let n = 1; n <= 30; n++) {
      // Γ(n) = (n − 1)! (definition)
      expect(Math.abs(lnGamma(n) - Math.log(fact))).toBeLessThan(1e-13 * Math.max(1, Math.log(fact)));
      fact *= n;
    }
    expect(Math.exp(lnGamma(0.5))).toBeCloseTo(Math.sqrt(Math.PI), 14);
    // Γ(x + 1) = x Γ(x) on non-integers (recurrence)
    for (const x of [0.1, 1.7, 12.3, 57.9]) expect(lnGamma(x + 1) - lnGamma(x)).toBeCloseTo(Math.log(x), 12);
  });
  it('returns NaN outside x > 0', () => {
    expect(lnGamma(0)).toBeNaN();
    expect(lnGamma(-1)).toBeNaN();
  });
});
