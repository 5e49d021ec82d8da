import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { binEdges, linearGrid, logLinearGrid } from '../../src/spectrum/grid.js';
import { resampleSpectrum } from '../../src/spectrum/resample.js';
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { gaussian, mulberry32 } from '../helpers/random.js';

/** ∫ f dλ of a spectrum read as piecewise constant over its bins (edges from binEdges), skipping NaN. */
function integral(s: Spectrum): number {
  const e = binEdges(s.wavelength);
  let sum = 0;
  for (let i = 0; i < s.flux.length; i++) if (Number.isFinite(s.flux[i])) sum += s.flux[i] * Math.abs(e[i + 1] - e[i]);
  return sum;
}

/** An irregularly sampled spectrum around Hα (invented values), 2000 pixels. */
function irregular(seed: number): Spectrum {
  const rand = mulberry32(seed);
  const w: number[] = [];
  let x = 6400;
  for (let i = 0; i < 2000; i++) {
    w.push(x);
    x += 0.05 + 0.1 * rand();
  }
  return createSpectrum({ wavelength: w, flux: w.map((l) => 100 + 50 * Math.sin(l / 7) + 20 * rand()), medium: 'air' });
}

describe('resampleSpectrum: flux conservation', () => {
  it('conserves ∫ f dλ to 1e-12 (relative) on linear and log-linear grids covering the same range', () => {
    let worstRel = 0;
    for (const seed of [1, 2, 3]) {
      const s = irregular(seed);
      const E = binEdges(s.wavelength);
      const E0 = E[0];
      const En = E[E.length - 1];
      const total = integral(s);
      for (const m of [137, 1000, 5003]) {
        const step = (En - E0) / m;
        const lin = resampleSpectrum(s, linearGrid({ start: E0 + step / 2, end: En - step / 2, count: m }));
        const d = Math.log(En / E0) / m;
        const log = resampleSpectrum(s, logLinearGrid({ start: E0 * Math.exp(d / 2), end: En * Math.exp(-d / 2), count: m }));
        for (const [name, r, edges] of [
          ['linear', lin, linearGrid({ start: E0 + step / 2, end: En - step / 2, count: m }).edges],
          ['log-linear', log, logLinearGrid({ start: E0 * Math.exp(d / 2), end: En * Math.exp(-d / 2), count: m }).edges],
        ] as const) {
          let out = 0;
          for (let j = 0; j < m; j++) out += r.flux[j] * (edges[j + 1] - edges[j]);
          const rel = Math.abs(out / total - 1);
          worstRel = Math.max(worstRel, rel);
          expect(rel, `${name} grid of ${m} pixels, seed ${seed}`).toBeLessThan(1e-12);
        }
      }
    }
    console.info(`flux conservation: worst relative change of the integral ${worstRel.toExponential(2)}`);
  });

  it('conserves flux from a decreasing input axis too, and gives the same result as the increasing one', () => {
    const s = irregular(4);
    const rev = createSpectrum({ wavelength: s.wavelength.slice().reverse(), flux: s.flux.slice().reverse() });
    const g = linearGrid({ start: 6450, end: 6550, step: 0.7 });
    expect(Array.from(resampleSpectrum(rev, g).flux)).toEqual(Array.from(resampleSpectrum(s, g).flux));
    // A decreasing array of centres gives the output in that order.
    const centres = Array.from(g.wavelength).reverse();
    expect(Array.from(resampleSpectrum(s, centres).flux)).toEqual(Array.from(resampleSpectrum(s, g.wavelength).flux).reverse());
  });
});

describe('resampleSpectrum: known results', () => {
  it('keeps a constant spectrum constant', () => {
    const s = irregular(5);
    const c = createSpectrum({ wavelength: s.wavelength, flux: s.flux.map(() => 3.7), uncertainty: s.flux.map(() => 0.1) });
    for (const g of [linearGrid({ start: 6410, end: 6590, step: 0.013 }), logLinearGrid({ start: 6410, end: 6590, velocityStepKmPerS: 25 })]) {
      const r = resampleSpectrum(c, g);
      for (const f of r.flux) expect(Math.abs(f - 3.7)).toBeLessThan(3.7 * 1e-14);
    }
  });

  it('gives the exact bin average of an analytic function when bins align, and stays within the interpolation bound otherwise', () => {
    // f(λ) = 2 + sin(λ/50); each input pixel holds its exact bin average, from F(λ) = 2λ − 50 cos(λ/50).
    const F = (x: number) => 2 * x - 50 * Math.cos(x / 50);
    const h = 0.25;
    const w = Array.from({ length: 4000 }, (_, i) => 5000 + i * h);
    const e = binEdges(w);
    const s = createSpectrum({ wavelength: w, flux: w.map((_, i) => (F(e[i + 1]) - F(e[i])) / (e[i + 1] - e[i])) });
    // Aligned: groups of 5 input pixels.
    const centres = Array.from({ length: 800 }, (_, j) => w[5 * j + 2]);
    const r = resampleSpectrum(s, centres);
    const g = binEdges(centres);
    let worst = 0;
    for (let j = 0; j < 800; j++) worst = Math.max(worst, Math.abs(r.flux[j] - (F(g[j + 1]) - F(g[j])) / (g[j + 1] - g[j])));
    console.info(`aligned bins: worst deviation from the exact bin average ${worst.toExponential(2)}`);
    expect(worst).toBeLessThan(1e-11);
    // Not aligned (log-linear, 12 km/s ≈ 0.2–0.25 Å): error ≤ 2·max|f'|·h²/Δ_out, max|f'| = 1/50.
    const lg = logLinearGrid({ start: 5010, end: 5990, velocityStepKmPerS: 12 });
    const rl = resampleSpectrum(s, lg);
    let worstL = 0;
    let worstRatio = 0;
    for (let j = 0; j < lg.wavelength.length; j++) {
      const dOut = lg.edges[j + 1] - lg.edges[j];
      const err = Math.abs(rl.flux[j] - (F(lg.edges[j + 1]) - F(lg.edges[j])) / dOut);
      worstL = Math.max(worstL, err);
      worstRatio = Math.max(worstRatio, err / ((2 * h * h) / 50 / dOut));
    }
    console.info(`unaligned log grid: worst deviation ${worstL.toExponential(2)}, ${(100 * worstRatio).toFixed(1)}% of the bound`);
    expect(worstRatio).toBeLessThanOrEqual(1);
  });

  it('averages whole pixels by width: [1,1,3,3] onto two pixels gives [1,3]', () => {
    const s = createSpectrum({ wavelength: [1, 2, 3, 4], flux: [1, 1, 3, 3] });
    expect(Array.from(resampleSpectrum(s, [1.5, 3.5]).flux)).toEqual([1, 3]);
  });

  it('takes a grid in another unit and returns the grid unit', () => {
    const s = irregular(6);
    const inNm = resampleSpectrum(s, linearGrid({ start: 645, end: 655, step: 0.05, unit: 'nm' }));
    const inA = resampleSpectrum(s, linearGrid({ start: 6450, end: 6550, step: 0.5 }));
    expect(inNm.unit).toBe('nm');
    expect(inNm.wavelength[1]).toBe(645.05);
    for (let j = 0; j < inA.flux.length; j++) expect(inNm.flux[j]).toBeCloseTo(inA.flux[j], 9);
  });
});

describe('resampleSpectrum: uncertainties (checked by simulation)', () => {
  it('reports σ that matches the scatter of resampled noisy realisations, and the stated correlation between neighbours', () => {
    const rand = mulberry32(42);
    const n = 300;
    const w = Array.from({ length: n }, (_, i) => 6000 + i * 0.3 + 0.05 * Math.sin(i));
    const sigma = w.map((_, i) => 0.5 + (i % 7) * 0.3);
    const truth = w.map((l) => 100 + 10 * Math.sin(l / 3));
    // Output pixels about 1.7 input pixels wide, not aligned: most take 2–3 input pixels, partially.
    const grid = logLinearGrid({ start: 6002, end: 6085, velocityStepKmPerS: 25 });
    const m = grid.wavelength.length;
    const N = 3000;
    const sum = new Float64Array(m);
    const sum2 = new Float64Array(m);
    let reported: Float64Array | undefined;
    let cross = 0;
    const J = 10;
    for (let k = 0; k < N; k++) {
      const s = createSpectrum({ wavelength: w, flux: truth.map((t, i) => t + sigma[i] * gaussian(rand)), uncertainty: sigma });
      const r = resampleSpectrum(s, grid);
      reported ??= r.uncertainty!;
      for (let j = 0; j < m; j++) {
        sum[j] += r.flux[j];
        sum2[j] += r.flux[j] ** 2;
      }
      cross += r.flux[J] * r.flux[J + 1];
    }
    let meanRatio = 0;
    let worst = 0;
    const std = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      const mean = sum[j] / N;
      std[j] = Math.sqrt((sum2[j] - N * mean * mean) / (N - 1));
      const ratio = std[j] / reported![j];
      meanRatio += ratio / m;
      worst = Math.max(worst, Math.abs(ratio - 1));
    }
    console.info(`resampling σ check (${N} realisations, ${m} output pixels): mean scatter/σ = ${meanRatio.toFixed(4)}, worst pixel off by ${(100 * worst).toFixed(1)}%`);
    // The scatter of N = 3000 samples estimates σ to 1/√(2N) = 1.3% per pixel: 1% on the mean
    // ratio over ~165 correlated pixels, and 6 % (4.6 standard errors) for the worst pixel.
    expect(Math.abs(meanRatio - 1)).toBeLessThan(0.01);
    expect(worst).toBeLessThan(0.06);
    // Neighbours share input pixels: predicted covariance Σᵢ oᵢⱼ oᵢₖ σᵢ² / (Wⱼ Wₖ).
    const e = binEdges(w);
    const ov = (i: number, j: number) => Math.max(0, Math.min(e[i + 1], grid.edges[j + 1]) - Math.max(e[i], grid.edges[j]));
    let cov = 0;
    for (let i = 0; i < n; i++) cov += ov(i, J) * ov(i, J + 1) * sigma[i] ** 2;
    cov /= (grid.edges[J + 1] - grid.edges[J]) * (grid.edges[J + 2] - grid.edges[J + 1]);
    const empirical = cross / N - (sum[J] / N) * (sum[J + 1] / N);
    const corr = cov / (reported![J] * reported![J + 1]);
    console.info(`neighbour correlation: predicted ${corr.toFixed(3)}, simulated ${(empirical / (std[J] * std[J + 1])).toFixed(3)}`);
    expect(corr).toBeGreaterThan(0.05);
    // Standard error of a correlation coefficient from N samples ≈ (1 − ρ²)/√N ≈ 0.018.
    expect(Math.abs(empirical / (std[J] * std[J + 1]) - corr)).toBeLessThan(0.08);
  });
});

describe('resampleSpectrum: missing data', () => {
  const w = Array.from({ length: 40 }, (_, i) => 5000 + i);
  const flux = w.map(() => 2);
  flux[10] = NaN;
  const mask = w.map((_, i) => (i === 20 ? 1 : 0));
  const unc = w.map(() => 0.1);
  unc[30] = 0;
  const s = createSpectrum({ wavelength: w, flux, mask, uncertainty: unc });

  it('makes output pixels lying on a bad input pixel NaN and masked (finer grid)', () => {
    const r = resampleSpectrum(s, linearGrid({ start: 5000, end: 5039, step: 0.25 }));
    for (let j = 0; j < r.flux.length; j++) {
      const x = r.wavelength[j];
      const onBad = [10, 20, 30].some((i) => Math.abs(x - (5000 + i)) < 0.5);
      expect(Number.isNaN(r.flux[j]), `pixel at ${x}`).toBe(onBad);
      expect(r.mask![j]).toBe(onBad ? 1 : 0);
      if (onBad) expect(r.uncertainty![j]).toBeNaN();
    }
  });

  it('averages over the good part when the bad fraction is at most maxBadFraction (default 0.5), NaN beyond', () => {
    // Bins of 4 pixels: pixel 10 lies in the bin 8–11 (bad fraction 1/4).
    const centres = Array.from({ length: 10 }, (_, j) => 5001.5 + 4 * j);
    const r = resampleSpectrum(s, centres);
    expect(r.flux[2]).toBe(2);
    expect(r.uncertainty![2]).toBeCloseTo(0.1 / Math.sqrt(3), 14);
    expect(r.mask![2]).toBe(0);
    const strict = resampleSpectrum(s, centres, { maxBadFraction: 0.2 });
    expect(strict.flux[2]).toBeNaN();
    expect(strict.mask![2]).toBe(1);
    expect(Array.from(strict.mask!)).toEqual([0, 0, 1, 0, 0, 1, 0, 1, 0, 0]);
  });

  it('makes output pixels outside the input coverage NaN and masked', () => {
    const r = resampleSpectrum(s, [4990, 4995, 5000.2, 5039, 5045]);
    expect(Array.from(r.mask!)).toEqual([1, 1, 0, 0, 1]);
    expect(r.flux[2]).toBe(2);
  });

  it('does not modify its input, and records provenance', () => {
    const before = [s.wavelength.slice(), s.flux.slice(), s.uncertainty!.slice(), s.mask!.slice()];
    const r = resampleSpectrum(s, linearGrid({ start: 5000, end: 5039, step: 0.5 }));
    expect([s.wavelength, s.flux, s.uncertainty, s.mask]).toEqual(before);
    expect(r.provenance.at(-1)).toMatchObject({ step: 'resample', parameters: { maxBadFraction: 0.5, grid: { spacing: 'linear', unit: 'angstrom', count: 79, step: 0.5 } } });
  });

  it('rejects bad calls', () => {
    expect(() => resampleSpectrum(s, [1, 2], { maxBadFraction: 2 })).toThrow(UsageError);
    expect(() => resampleSpectrum(s, [1, 1, 2])).toThrow('the output grid is not usable: wavelength 1 is repeated at pixels 0 and 1');
    expect(() => resampleSpectrum(createSpectrum({ wavelength: [1], flux: [1] }), [1, 2])).toThrow(InputError);
  });
});
