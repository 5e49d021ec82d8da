import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitLineArrays } from '../../src/fit/line-fit.js';
import type { ContinuumOrder } from '../../src/fit/line-model.js';
import type { LineProfile } from '../../src/fit/profiles.js';
import { repoPath } from '../helpers/paths.js';

// Source: scipy.optimize.curve_fit (method='lm', MINPACK lmder, analytic Jacobian,
// ftol = xtol = gtol = 1e-13) from Debian's scipy 1.10.1, run by the committed script
// test/reference/make_scipy_fits.py, which recorded the data, the exact call, scipy's
// parameters and standard errors (√diag(pcov)) in test/fixtures/scipy-fits.json.
// Same model and parametrisation on both sides (see the script's docstring).
interface ScipyCase {
  name: string;
  profile: LineProfile;
  continuumOrder: ContinuumOrder;
  components: number;
  continuumReference: number;
  parameterNames: string[];
  x: number[];
  y: number[];
  sigma: number[] | null;
  absoluteSigma: boolean;
  p0: number[];
  call: string;
  parameters: number[];
  standardErrors: number[];
  chiSquare: number;
}
const fixture = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'scipy-fits.json'), 'utf8')) as { scipy: string; cases: ScipyCase[] };

describe(`line fits agree with scipy ${fixture.scipy} curve_fit`, () => {
  it('uses the recorded scipy version', () => {
    expect(fixture.scipy).toBe('1.10.1');
  });
  let worst = 0;
  for (const c of fixture.cases) {
    it(c.name, () => {
      const span = c.x[c.x.length - 1] - c.x[0];
      // Approximate centres only (scipy started from the truth moved by 0.3 pixel; we start from our own guesses).
      const centers = c.parameterNames.flatMap((n, j) => (n.startsWith('center') ? [c.p0[j]] : []));
      const r = fitLineArrays(
        { x: c.x, flux: c.y, uncertainty: c.sigma ?? undefined },
        {
          center: centers,
          window: 4 * span, // every pixel, so that the continuum reference is (x₀ + x_last)/2 as in the script
          profile: c.profile,
          components: c.components,
          continuumOrder: c.continuumOrder,
          uncertaintySource: c.sigma && c.absoluteSigma ? 'data' : 'scaled-by-reduced-chi-square',
          solver: { relativeChiSquareTolerance: 1e-13, relativeStepTolerance: 1e-13, gradientTolerance: 1e-13 },
        },
      );
      expect(r.converged, r.message).toBe(true);
      expect(r.window.pixelsUsed).toBe(c.x.length);
      expect(r.continuum.reference).toBeCloseTo(c.continuumReference, 9);
      expect(r.parameters.map((p) => p.name)).toEqual(c.parameterNames);
      r.parameters.forEach((p, j) => {
        const dp = Math.abs(p.value - c.parameters[j]) / Math.abs(c.parameters[j]);
        const ds = Math.abs(p.uncertainty - c.standardErrors[j]) / c.standardErrors[j];
        worst = Math.max(worst, dp, ds);
        // Tolerance 1e-5 relative: the two solvers stop at slightly different points within
        // their tolerances, and scipy's pcov comes from its own final Jacobian.
        expect(dp, `${p.name}: ${p.value} vs ${c.parameters[j]}`).toBeLessThan(1e-5);
        expect(ds, `σ(${p.name}): ${p.uncertainty} vs ${c.standardErrors[j]}`).toBeLessThan(1e-5);
      });
      expect(r.chiSquare / c.chiSquare - 1).toBeLessThan(1e-9);
    });
  }
  it('prints the worst relative difference', () => {
    console.log(`worst relative difference from scipy (parameters and standard errors): ${worst.toExponential(2)}`);
    expect(worst).toBeLessThan(1e-5);
  });
});
