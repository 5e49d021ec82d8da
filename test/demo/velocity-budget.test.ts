/**
 * Where the demo's LVAC-7 velocity errors come from (scripts/demo/velocity-budget.ts): the
 * generator puts the lines where the truth says, the measurement on the TRUE wavelengths has
 * no bias beyond its noise, and the season's nightly errors are the realised noise. These
 * compare with our OWN INVENTED truth (data/demo/truth.json), not with the world.
 *
 * Why: the demo's nightly velocities came out low on average (mean pull −0.40, γ −1.95 σ).
 * Measured (bench/demo-velocity-budget.ts): on the true wavelengths the line method is off by
 * −0.257 ± 0.107 km/s on average, and the realised noise projected on the model's velocity
 * derivative accounts for −0.236 ± 0.100 km/s of it; the calibration adds +0.031 km/s. So the
 * offset is this season's noise, which the checks below separate from a bias.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { DemoTruth, Scenario } from '../../data/demo/generate.js';
import { readSpectrum } from '../../src/io/read.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { measureLvac7, noiseFreeStar, noiseProjectionKmPerS, onTrueGrid, trueWavelengths } from '../../scripts/demo/velocity-budget.js';
import { repoPath } from '../helpers/paths.js';

const demo = repoPath('data', 'demo');
const scenario = JSON.parse(readFileSync(join(demo, 'scenario.json'), 'utf8')) as Scenario;
const truth = JSON.parse(readFileSync(join(demo, 'truth.json'), 'utf8')) as DemoTruth;
const good = truth.exposures.filter((e) => !e.damaged);
const mean = (a: readonly number[]) => a.reduce((s, x) => s + x, 0) / a.length;

describe('the demo velocity budget (against the invented truth)', () => {
  // The fastest approaching, the fastest receding and the slowest night of the season.
  const byVelocity = [...good].sort((a, b) => a.topocentricVelocityKmPerS - b.topocentricVelocityKmPerS);
  const slowest = [...good].sort((a, b) => Math.abs(a.topocentricVelocityKmPerS) - Math.abs(b.topocentricVelocityKmPerS))[0];
  const nights = [byVelocity[0], byVelocity[byVelocity.length - 1], slowest];

  it('the generator\'s noise-free star model is what the committed frames were made from (residuals are white noise of the stated size)', () => {
    const g = scenario.instrument.gainElectronsPerAdu;
    const rn = scenario.instrument.readNoiseElectrons;
    for (const e of nights) {
      const raw = readSpectrum(join(demo, e.files.star));
      const model = noiseFreeStar(scenario, e);
      const r = Array.from(model, (m, i) => (raw.flux[i] - m) / (Math.sqrt(m * g + rn * rn) / g));
      // 2048 unit normal deviates: mean within 4/√2048 = 0.09 of 0, rms within 0.9–1.1 (the
      // standard error of an rms of 2048 is 1/√4096 = 0.016); a wrong velocity, grid or
      // continuum in the model would leave line-shaped residuals far above this.
      expect(Math.abs(mean(r)), e.night).toBeLessThan(0.09);
      expect(Math.sqrt(mean(r.map((x) => x * x))), e.night).toBeGreaterThan(0.9);
      expect(Math.sqrt(mean(r.map((x) => x * x))), e.night).toBeLessThan(1.1);
    }
  });

  it('the noise-free star on its true wavelengths gives back the true velocity (lines within 0.01 km/s, each metal line within 0.003 km/s; cross-correlation within 0.03 km/s)', () => {
    const g = scenario.instrument.gainElectronsPerAdu;
    const rn = scenario.instrument.readNoiseElectrons;
    for (const e of nights) {
      const model = noiseFreeStar(scenario, e);
      const s = createSpectrum({
        wavelength: trueWavelengths(e.dispersion.star.setup), flux: model, uncertainty: model.map((m) => Math.sqrt(m * g + rn * rn) / g), unit: 'angstrom', medium: 'air',
      });
      const v = e.topocentricVelocityKmPerS;
      const lines = measureLvac7(s, 'lines');
      // Measured: −0.003 to −0.007 km/s, nearly all from Hα (−0.014 km/s: the continuum fit
      // under its 9.5 Å Lorentzian wings), against nightly errors of 0.4–0.8 km/s; 0.01 km/s
      // is 1/40 of the smallest. Without the continuum normalisation (an additive line model on
      // the sloping Planck × response continuum) it is −0.21 km/s.
      expect(Math.abs(lines.velocityKmPerS - v), e.night).toBeLessThan(0.01);
      expect(lines.lines.filter((l) => l.status === 'used').length, e.night).toBe(9);
      for (const l of lines.lines) {
        if (l.species === 'H I' || !l.velocityKmPerS) continue;
        // Reference: the generator's own noise-free star on its true wavelengths (no outside source).
        // Measured ≤ 0.0013 km/s (the metal lines are 1 Å wide on a nearly flat normalised continuum).
        expect(Math.abs(l.velocityKmPerS.value - v), `${e.night} ${l.species} ${l.restWavelengthAngstrom}`).toBeLessThan(0.003);
      }
      // Measured −0.017 to −0.022 km/s (the Gaussian line-list template against Hα's Voigt
      // wings), 1/40 of the cross-correlation's nightly error of 0.6–1.2 km/s.
      expect(Math.abs(measureLvac7(s, 'ccf').velocityKmPerS - v), e.night).toBeLessThan(0.03);
    }
  });

  it('on the true wavelengths the season\'s line velocities differ from the truth by their noise and nothing more', () => {
    const errors: number[] = [];
    const noise: number[] = [];
    for (const e of good) {
      const raw = readSpectrum(join(demo, e.files.star));
      const lines = measureLvac7(onTrueGrid(raw, trueWavelengths(e.dispersion.star.setup)), 'lines');
      errors.push(lines.velocityKmPerS - e.topocentricVelocityKmPerS);
      noise.push(noiseProjectionKmPerS(scenario, e, raw.flux).deltaKmPerS);
    }
    // The errors follow the realised noise night by night (measured correlation 0.89)…
    const me = mean(errors);
    const mn = mean(noise);
    const cov = mean(errors.map((x, i) => (x - me) * (noise[i] - mn)));
    const corr = cov / Math.sqrt(mean(errors.map((x) => (x - me) ** 2)) * mean(noise.map((x) => (x - mn) ** 2)));
    expect(corr).toBeGreaterThan(0.8);
    // …and what the noise leaves is no offset: measured −0.021 km/s (rms 0.23 km/s per night,
    // so a standard error of 0.05 km/s over 24 nights); 0.1 km/s catches a bias of a fifth of
    // a nightly error. Without continuum normalisation it is −0.21 km/s and this fails.
    expect(Math.abs(mean(errors.map((x, i) => x - noise[i])))).toBeLessThan(0.1);
    // The season's noise itself is low: this is where the demo's mean pull of −0.40 comes from.
    expect(mn).toBeLessThan(-0.15);
  }, 60_000);
});
