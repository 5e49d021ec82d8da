import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import {
  componentDerived, evaluateLineModel, lineModelParameterCount, type LineModelShape,
} from '../../src/fit/line-model.js';
import {
  GAUSSIAN_FWHM_PER_SIGMA, lineProfileValue, profileAndGradient, profileArea, profileFwhm, voigtDensity, voigtFwhm,
  type LineProfile,
} from '../../src/fit/profiles.js';
import { repoPath } from '../helpers/paths.js';

const fixture = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'scipy-fits.json'), 'utf8')) as {
  scipy: string;
  voigtProfile: { offset: number; fwhmGaussian: number; fwhmLorentzian: number; value: number }[];
  voigtFwhm: { fwhmGaussian: number; fwhmLorentzian: number; fwhm: number }[];
};

describe('profile identities', () => {
  it('FWHM = 2√(2 ln 2) σ for a Gaussian (definition of the Gaussian; from memory)', () => {
    expect(GAUSSIAN_FWHM_PER_SIGMA).toBeCloseTo(2.3548200450309493, 15);
    // exp(−x²/2σ²) falls to 1/2 at x = FWHM/2 with σ = 1.
    expect(Math.exp(-((GAUSSIAN_FWHM_PER_SIGMA / 2) ** 2) / 2)).toBeCloseTo(0.5, 15);
    for (const p of ['gaussian', 'lorentzian'] as const) {
      expect(lineProfileValue(1.5, { profile: p, fwhm: 3 })).toBeCloseTo(0.5, 15);
      expect(lineProfileValue(0, { profile: p, fwhm: 3 })).toBe(1);
    }
    expect(lineProfileValue(1.5, { profile: 'voigt', fwhmGaussian: 3, fwhmLorentzian: 0 })).toBeCloseTo(0.5, 13);
  });

  it('the area of a Gaussian line is amplitude · σ · √(2π) (Gaussian integral; from memory)', () => {
    const sigma = 1.7;
    expect(profileArea('gaussian', sigma * GAUSSIAN_FWHM_PER_SIGMA, 0, null)).toBeCloseTo(sigma * Math.sqrt(2 * Math.PI), 13);
    // and a Lorentzian's is π·FWHM/2.
    expect(profileArea('lorentzian', 3, 0, null)).toBeCloseTo(1.5 * Math.PI, 13);
    // Voigt areas by direct numerical integration (trapezoid over ±4000 FWHM; the Lorentzian tail beyond adds < 1e-4 relative, so compare at 2e-4).
    for (const [fg, fl] of [[2, 0.5], [1, 3]]) {
      // Midpoint rule: step 0.01 within ±50, 0.5 out to ±4000 (the profile is smooth there).
      let s = 0;
      for (let x = -50 + 0.005; x < 50; x += 0.01) s += profileAndGradient('voigt', x, fg, fl, null) * 0.01;
      for (let x = 50.25; x < 4000; x += 0.5) s += 2 * profileAndGradient('voigt', x, fg, fl, null) * 0.5;
      expect(s / profileArea('voigt', fg, fl, null)).toBeCloseTo(1, 3);
    }
  });

  it('equivalent width of a Gaussian absorption line = depth · σ · √(2π) (from memory)', () => {
    const shape: LineModelShape = { profile: 'gaussian', components: 1, continuumOrder: 1, continuumReference: 5000 };
    const sigma = 1.3, depth = 0.42, cont = 2.5;
    // continuum 2.5 at the centre 5001 (slope 0.01 about 5000), amplitude −depth·continuum.
    const p = [2.49, 0.01, 5001, sigma * GAUSSIAN_FWHM_PER_SIGMA, -depth * cont];
    const d = componentDerived(shape, p, 0);
    expect(d.continuumAtCenter.value).toBeCloseTo(cont, 14);
    expect(d.depth.value).toBeCloseTo(depth, 14);
    expect(d.equivalentWidth.value).toBeCloseTo(depth * sigma * Math.sqrt(2 * Math.PI), 13);
    expect(d.integratedFlux.value).toBeLessThan(0);
  });

  it('Voigt reduces to a Gaussian when the Lorentzian FWHM is 0 and to a Lorentzian when the Gaussian FWHM → 0', () => {
    for (const u of [0, 0.4, 1, 2, 3.5]) {
      expect(lineProfileValue(u, { profile: 'voigt', fwhmGaussian: 2, fwhmLorentzian: 0 })).toBeCloseTo(lineProfileValue(u, { profile: 'gaussian', fwhm: 2 }), 13);
      // F_G = 1e-4 F_L: the Gaussian broadening changes the shape by ~(F_G/F_L)² ≈ 1e-8.
      expect(lineProfileValue(u, { profile: 'voigt', fwhmGaussian: 2e-4, fwhmLorentzian: 2 })).toBeCloseTo(lineProfileValue(u, { profile: 'lorentzian', fwhm: 2 }), 7);
    }
    expect(voigtFwhm(1, 0)).toBeCloseTo(1, 13);
    expect(voigtFwhm(1e-5, 3)).toBeCloseTo(3, 8);
  });
});

describe(`Voigt profile against scipy ${fixture.scipy} voigt_profile`, () => {
  it('agrees to 1e-13 of the peak everywhere and to 1e-9 relative above 1e-6 of the peak', () => {
    // Reference: scipy.special.voigt_profile, values written by test/reference/make_scipy_fits.py.
    // Weideman's N = 32 approximation has an absolute error floor (its error does not shrink
    // with the profile in the far Gaussian wing), hence the two criteria; figures measured here.
    let worstAbs = 0, worstRel = 0;
    for (const v of fixture.voigtProfile) {
      const ours = voigtDensity(v.offset, v.fwhmGaussian, v.fwhmLorentzian);
      const peak = voigtDensity(0, v.fwhmGaussian, v.fwhmLorentzian);
      worstAbs = Math.max(worstAbs, Math.abs(ours - v.value) / peak);
      if (v.value > 1e-6 * peak) worstRel = Math.max(worstRel, Math.abs(ours / v.value - 1));
    }
    console.log(`Voigt vs scipy: worst |Δ|/peak ${worstAbs.toExponential(2)}, worst relative (above 1e-6 of peak) ${worstRel.toExponential(2)}`);
    expect(worstAbs).toBeLessThan(1e-13);
    expect(worstRel).toBeLessThan(1e-9);
  });

  it('total FWHM agrees with the half-maximum point found by scipy brentq', () => {
    for (const v of fixture.voigtFwhm) {
      // Tolerance 1e-12 relative: both sides solve for the half maximum to ~1e-15.
      expect(Math.abs(voigtFwhm(v.fwhmGaussian, v.fwhmLorentzian) / v.fwhm - 1)).toBeLessThan(1e-12);
    }
  });

  it('rejects widths out of range with a UsageError', () => {
    expect(() => voigtDensity(0, 0, 1)).toThrow(UsageError);
    expect(() => lineProfileValue(0, { profile: 'gaussian', fwhm: -1 })).toThrow(/FWHM > 0/);
  });
});

/** Central-difference derivative of f at x with step h. */
function numDiff(f: (x: number) => number, x: number, h: number): number {
  return (f(x + h) - f(x - h)) / (2 * h);
}

describe('analytic derivatives against finite differences', () => {
  const profiles: LineProfile[] = ['gaussian', 'lorentzian', 'voigt'];
  it.each(profiles)('%s: the line-model Jacobian', (profile) => {
    fc.assert(fc.property(
      fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: 0.5, max: 4, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }),
      (du, w0, w1) => {
        const shape: LineModelShape = { profile, components: 2, continuumOrder: 2, continuumReference: 100 };
        const n = lineModelParameterCount(shape);
        const cont = [1.2, 0.03, -0.002];
        const comp = (c: number, a: number) => (profile === 'voigt' ? [c, w0, w1 + 0.1, a] : [c, w0, a]);
        const p = [...cont, ...comp(100 + du, -0.6), ...comp(101.5 - du, 0.3)];
        const x = [97.3, 99.1, 100.2, 101.9, 103.4];
        const out = new Float64Array(x.length);
        const jac = new Float64Array(x.length * n);
        evaluateLineModel(shape, p, x, out, jac);
        for (let j = 0; j < n; j++) {
          const h = 1e-6 * Math.max(1, Math.abs(p[j]));
          const col = x.map((_, i) => numDiff((v) => {
            const q = p.slice(); q[j] = v;
            const o = new Float64Array(x.length);
            evaluateLineModel(shape, q, x, o, null);
            return o[i];
          }, p[j], h));
          // Central differences with h = 1e-6: truncation ~h²·f‴ and rounding ~ε/h, both < 1e-8 here.
          col.forEach((v, i) => expect(Math.abs(jac[i * n + j] - v)).toBeLessThan(1e-7 * Math.max(1, Math.abs(v))));
        }
      },
    ), { numRuns: 25, seed: 7 });
  });

  it.each(profiles)('%s: gradients of FWHM, area, depth and equivalent width', (profile) => {
    const shape: LineModelShape = { profile, components: 1, continuumOrder: 2, continuumReference: 50 };
    const p = profile === 'voigt' ? [1.1, 0.02, -0.001, 50.7, 1.3, 0.9, -0.4] : [1.1, 0.02, -0.001, 50.7, 2.1, -0.4];
    const d = componentDerived(shape, p, 0);
    for (const key of ['fwhm', 'continuumAtCenter', 'depth', 'integratedFlux', 'equivalentWidth'] as const) {
      p.forEach((pj, j) => {
        const h = 1e-6 * Math.max(1, Math.abs(pj));
        const nd = numDiff((v) => { const q = p.slice(); q[j] = v; return componentDerived(shape, q, 0)[key].value; }, pj, h);
        expect(Math.abs(d[key].gradient[j] - nd), `${key} / parameter ${j}`).toBeLessThan(1e-7 * Math.max(1, Math.abs(nd)));
      });
    }
    // Width gradients of the profile functions themselves.
    const g = new Float64Array(2);
    profileFwhm(profile, 1.3, 0.9, g);
    expect(g[0]).toBeCloseTo(numDiff((v) => profileFwhm(profile, v, 0.9, null), 1.3, 1e-6), 7);
    profileArea(profile, 1.3, 0.9, g);
    expect(g[0]).toBeCloseTo(numDiff((v) => profileArea(profile, v, 0.9, null), 1.3, 1e-6), 7);
  });
});
