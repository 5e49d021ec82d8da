import { describe, expect, it } from 'vitest';
import { fitLineArrays } from '../../src/fit/line-fit.js';
import { GAUSSIAN_FWHM_PER_SIGMA } from '../../src/fit/profiles.js';
import { meanStd, normal } from '../helpers/random.js';

// Rule 7 of the project: uncertainties are checked by simulation. A Gaussian absorption
// line (depth 0.5, FWHM 4 Å, on a flat continuum 1, 64 pixels of 1 Å) with Gaussian noise at
// S/N 30 and 100; 1000 seeded realisations each. The pull (fitted − true)/reported σ must
// have a standard deviation in 0.9–1.1 (1000 draws: the sampling error of a standard
// deviation is 1/√2000 ≈ 2.2 %, so this band is ±4.5 of it).
const N = 1000;
const TRUE = { center: 6562.3, fwhm: 4, depth: 0.5 };
const TRUE_EW = TRUE.depth * (TRUE.fwhm / GAUSSIAN_FWHM_PER_SIGMA) * Math.sqrt(2 * Math.PI); // depth·σ·√(2π)
const x = Array.from({ length: 64 }, (_, i) => 6530 + i);
const clean = x.map((v) => 1 - TRUE.depth * Math.exp(-4 * Math.LN2 * ((v - TRUE.center) / TRUE.fwhm) ** 2));

function simulate(snr: number, known: boolean, seed: number) {
  const gauss = normal(seed);
  const pulls = { center: [] as number[], fwhm: [] as number[], equivalentWidth: [] as number[] };
  let failed = 0;
  const sigma = 1 / snr;
  const unc = x.map(() => sigma);
  for (let k = 0; k < N; k++) {
    const flux = clean.map((v) => v + sigma * gauss());
    const r = fitLineArrays({ x, flux, uncertainty: known ? unc : undefined }, { center: 6562, window: 64 });
    if (!r.converged) { failed++; continue; }
    const c = r.components[0];
    pulls.center.push((c.center.value - TRUE.center) / c.center.uncertainty);
    pulls.fwhm.push((c.fwhm.value - TRUE.fwhm) / c.fwhm.uncertainty);
    pulls.equivalentWidth.push((c.equivalentWidth.value - TRUE_EW) / c.equivalentWidth.uncertainty);
    expect(r.uncertaintySource).toBe(known ? 'data' : 'scaled-by-reduced-chi-square');
  }
  return { pulls, failed };
}

describe('reported uncertainties match the scatter of simulated fits', () => {
  const table: string[] = [];
  for (const snr of [30, 100]) {
    for (const known of [true, false]) {
      it(`S/N ${snr}, ${known ? 'known σ' : 'σ scaled by the reduced χ²'}`, () => {
        const t0 = performance.now();
        const { pulls, failed } = simulate(snr, known, 1000 * snr + (known ? 1 : 2));
        const ms = performance.now() - t0;
        expect(failed).toBe(0);
        const row = [`S/N ${snr}`, known ? 'known σ   ' : 'scaled    '];
        for (const key of ['center', 'fwhm', 'equivalentWidth'] as const) {
          const { mean, std } = meanStd(pulls[key]);
          row.push(`${key}: std ${std.toFixed(3)} mean ${mean.toFixed(3)}`);
          expect(std, key).toBeGreaterThanOrEqual(0.9);
          expect(std, key).toBeLessThanOrEqual(1.1);
          // Bias well under the scatter (the fit is nearly linear at these S/N): |mean| < 0.15 σ.
          expect(Math.abs(mean), key).toBeLessThan(0.15);
        }
        row.push(`${N} fits in ${ms.toFixed(0)} ms`);
        table.push(row.join('  '));
      });
    }
  }
  it('prints the figures', () => {
    console.log(table.join('\n'));
    expect(table).toHaveLength(4);
  });
});
