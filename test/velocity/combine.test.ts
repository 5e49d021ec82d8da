import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { combineVelocities, reducedChiSquareQuantile99 } from '../../src/velocity/combine.js';
import { repoPath } from '../helpers/paths.js';
import { meanStd, normal } from '../helpers/random.js';

/** test/fixtures/velocity-references.json (test/reference/make_velocity_refs.py, scipy 1.10.1). */
const refs = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'velocity-references.json'), 'utf8')) as {
  chi2_reduced_q99: { degrees_of_freedom: number[]; values: number[] };
};

describe('combineVelocities', () => {
  it('is the inverse-variance weighted mean with error 1/√Σw', () => {
    const r = combineVelocities([{ value: 10, uncertainty: 1 }, { value: 13, uncertainty: 2 }]);
    // (10·1 + 13·0.25)/1.25 = 10.6; 1/√1.25.
    expect(r.value).toBeCloseTo(10.6, 12);
    expect(r.statisticalUncertainty).toBeCloseTo(1 / Math.sqrt(1.25), 12);
    expect(r.chiSquare).toBeCloseTo(0.6 ** 2 + (2.4 / 2) ** 2, 12);
    expect(r.degreesOfFreedom).toBe(1);
    expect(r.used).toEqual([true, true]);
  });

  it('rejects a wrong line and keeps honest ones', () => {
    const r = combineVelocities([10, 12, 11, 40, 10.5].map((value) => ({ value, uncertainty: 1 })));
    expect(r.used).toEqual([true, true, true, false, true]);
    expect(r.outlier).toEqual([false, false, false, true, false]);
    expect(r.value).toBeCloseTo(10.875, 12);
    expect(r.normalizedResiduals[3]).toBeGreaterThan(20);
  });

  it('ignores values without a usable uncertainty and needs three values to reject', () => {
    const r = combineVelocities([{ value: 1, uncertainty: NaN }, { value: 5, uncertainty: 1 }, { value: 50, uncertainty: 1 }]);
    expect(r.used).toEqual([false, true, true]);
    expect(r.outlier).toEqual([false, false, false]);
    expect(r.value).toBeCloseTo(27.5, 12);
    const none = combineVelocities([]);
    expect(none.value).toBeNaN();
    expect(none.statisticalUncertainty).toBeNaN();
  });

  it('scales the error by √(χ²/ν) only when χ² is improbably large (by default)', () => {
    const spread = [-3, -1, 0, 1, 3].map((d) => ({ value: 20 + d, uncertainty: 0.5 }));
    const r = combineVelocities(spread, { clipThreshold: 100 });
    expect(r.reducedChiSquare).toBeCloseTo((9 + 1 + 0 + 1 + 9) / 0.25 / 4, 12);
    expect(r.uncertaintyScale).toBeCloseTo(Math.sqrt(r.reducedChiSquare), 12);
    const honest = combineVelocities([-1, 0.5, 1].map((value) => ({ value, uncertainty: 1 })));
    expect(honest.reducedChiSquare).toBeGreaterThan(1);
    expect(honest.uncertaintyScale).toBe(1);
    expect(combineVelocities([-1, 0.5, 1].map((value) => ({ value, uncertainty: 1 })), { chiSquareScaling: 'always' }).uncertaintyScale).toBeCloseTo(Math.sqrt(honest.reducedChiSquare), 12);
    expect(combineVelocities(spread, { clipThreshold: 100, chiSquareScaling: 'never' }).uncertaintyScale).toBe(1);
  });

  it('uses the 99th percentile of χ²/ν (scipy.stats.chi2.ppf, scipy 1.10.1)', () => {
    const { degrees_of_freedom: nus, values } = refs.chi2_reduced_q99;
    nus.forEach((nu, i) => {
      // Wilson–Hilferty (1931): within 1 % from ν = 3 on, 4 % below.
      expect(Math.abs(reducedChiSquareQuantile99(nu) / values[i] - 1), `ν = ${nu}`).toBeLessThan(nu >= 3 ? 0.01 : 0.04);
    });
  });

  it('reports an error that matches the scatter of simulated means (rule 7)', () => {
    // 2000 sets of 8 lines with σ from 0.5 to 2 and Gaussian errors: the pull of the mean has
    // unit standard deviation (standard error 1.6 %) and rejection removes few honest lines.
    const gauss = normal(77);
    const sigmas = [0.5, 0.7, 0.9, 1.1, 1.3, 1.5, 1.8, 2];
    const pulls: number[] = [];
    let rejected = 0;
    for (let k = 0; k < 2000; k++) {
      const r = combineVelocities(sigmas.map((s) => ({ value: 5 + s * gauss(), uncertainty: s })));
      pulls.push((r.value - 5) / (r.statisticalUncertainty * r.uncertaintyScale));
      rejected += r.outlier.filter(Boolean).length;
    }
    const { mean, std } = meanStd(pulls);
    console.info(`combination pulls: mean ${mean.toFixed(3)}, std ${std.toFixed(3)}; honest values rejected ${(rejected / 16000 * 100).toFixed(2)} %`);
    expect(Math.abs(std - 1)).toBeLessThan(0.05);
    expect(Math.abs(mean)).toBeLessThan(0.07);
    // A 3σ two-sided cut would take 0.27 %; the leave-one-out test and the robust scale keep it under 1 %.
    expect(rejected / 16000).toBeLessThan(0.01);
  });

  it('does not change its input', () => {
    const input = Object.freeze([Object.freeze({ value: 1, uncertainty: 1 }), Object.freeze({ value: 2, uncertainty: 1 })]);
    expect(combineVelocities(input).value).toBe(1.5);
  });
});
