import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { baluevFalseAlarmProbability, lombScarglePower, velocityPeriodogram, type PeriodogramNormalization } from '../../src/orbit/periodogram.js';
import { createVelocityTable } from '../../src/orbit/table.js';
import { repoPath } from '../helpers/paths.js';
import { gaussian, mulberry32 } from '../helpers/random.js';

interface AstropyCase {
  name: string; t: number[]; y: number[]; dy: number[]; frequency: number[];
  power: Record<PeriodogramNormalization, number[]>;
  maxStandardPower: number; maximumFrequency: number; effectiveMaximumFrequency: number; falseAlarmBaluev: number; falseAlarmDavies: number;
}
// Source: astropy 5.2.1 LombScargle, via test/reference/make_lombscargle_refs.py (calls recorded in the fixture).
const astropy = JSON.parse(readFileSync(repoPath('test/fixtures/lombscargle-astropy.json'), 'utf8')) as { library: string; cases: AstropyCase[] };

/** Nightly sampling over a season: one exposure near local midnight on random clear nights (invented). */
function nightlySeries(seed: number, n: number, spanDays: number, signal: (t: number) => number, sigma: number) {
  const rand = mulberry32(seed);
  const t: number[] = [];
  for (let i = 0; i < n; i++) t.push(2460400 + Math.floor(rand() * spanDays) + 0.35 + 0.1 * (rand() - 0.5));
  t.sort((a, b) => a - b);
  const dy = t.map(() => sigma * (0.8 + 0.4 * rand()));
  const y = t.map((ti, i) => signal(ti) + dy[i] * gaussian(rand));
  return createVelocityTable({ bjdTdb: t, velocityKmPerS: y, uncertaintyKmPerS: dy });
}

describe('lombScarglePower against astropy', () => {
  it(`matches LombScargle powers in all four normalisations to 1e-6 (${astropy.library})`, () => {
    let worstStandard = 0;
    let worstRelative = 0;
    for (const c of astropy.cases) {
      for (const norm of ['standard', 'model', 'log', 'psd'] as const) {
        const p = lombScarglePower(c.t, c.y, c.dy, c.frequency, norm);
        c.power[norm].forEach((ref, k) => {
          const d = Math.abs(p[k] - ref);
          if (norm === 'standard') worstStandard = Math.max(worstStandard, d);
          else worstRelative = Math.max(worstRelative, d / Math.max(1, Math.abs(ref)));
        });
      }
    }
    console.log(`periodogram vs astropy: worst |Δpower| (standard) ${worstStandard.toExponential(2)}, worst relative (model/log/psd) ${worstRelative.toExponential(2)}`);
    expect(worstStandard).toBeLessThan(1e-6);
    expect(worstRelative).toBeLessThan(1e-6);
  });

  it('matches astropy false_alarm_probability(method="baluev") and the Davies bound', () => {
    for (const c of astropy.cases) {
      const fap = baluevFalseAlarmProbability(c.maxStandardPower, c.t, c.dy, c.effectiveMaximumFrequency);
      // astropy (given plain floats) computes Var(t) as E[t²] − E[t]² on the raw times; at
      // BJD ≈ 2.46e6 that loses about eps·mean(t)²/Var(t) of the variance, which reaches the
      // FAP through τ ∝ √Var. Tolerance: 1e-6 relative plus four times that rounding.
      const mean = c.t.reduce((a, b) => a + b, 0) / c.t.length;
      const variance = c.t.reduce((a, b) => a + (b - mean) ** 2, 0) / c.t.length;
      const rel = 1e-6 + 4 * Number.EPSILON * mean * mean / variance;
      expect(Math.abs(fap.baluev - c.falseAlarmBaluev)).toBeLessThan(rel * c.falseAlarmBaluev);
      expect(Math.abs(fap.davies - Math.min(1, c.falseAlarmDavies))).toBeLessThan(rel * Math.min(1, c.falseAlarmDavies));
    }
  });
});

describe('velocityPeriodogram', () => {
  const table = nightlySeries(7, 30, 150, (t) => 12 + 25 * Math.sin((2 * Math.PI * (t - 2460400)) / 4.37), 2);

  it('finds the period, refines the peak, and its grid powers equal direct evaluation', () => {
    const pg = velocityPeriodogram(table);
    expect(Math.abs(pg.best.periodDays - 4.37)).toBeLessThan(0.01);
    expect(pg.falseAlarmProbability).toBeLessThan(1e-6);
    expect(pg.falseAlarmBound).toBeGreaterThanOrEqual(pg.falseAlarmProbability);
    expect(pg.peaks[0]).toEqual(pg.best);
    expect(pg.peaks.length).toBe(5);
    let gridMax = 0;
    for (const p of pg.power) gridMax = Math.max(gridMax, p);
    expect(pg.best.power).toBeGreaterThanOrEqual(gridMax);
    // the recurrence used along the grid against direct cos/sin: 1e-10 is far above rounding (~1e-13)
    const direct = lombScarglePower(table.bjdTdb, table.velocityKmPerS, table.uncertaintyKmPerS, pg.frequencyPerDay);
    let worst = 0;
    direct.forEach((p, k) => (worst = Math.max(worst, Math.abs(p - pg.power[k]))));
    expect(worst).toBeLessThan(1e-10);
    // defaults: 0.5 d to the time span, oversampling 10
    expect(pg.minPeriodDays).toBe(0.5);
    expect(pg.maxPeriodDays).toBe(pg.timeSpanDays);
    expect(pg.frequencyPerDay[1] - pg.frequencyPerDay[0]).toBeCloseTo(1 / (10 * pg.timeSpanDays), 12);
    expect(pg.provenance.at(-1)?.step).toBe('periodogram');
  });

  it('sees the 1 d⁻¹ sampling cycle in the window and lists the daily aliases of the best peak', () => {
    const pg = velocityPeriodogram(table);
    const daily = pg.windowPeaks.find((w) => w.cycle === 'day');
    expect(daily).toBeDefined();
    // one exposure per night near the same clock time: the window peaks within 1/T of 1 d⁻¹ (or 1 sidereal d⁻¹)
    expect(Math.abs(daily!.frequencyPerDay - 1)).toBeLessThan(0.01);
    expect(daily!.power).toBeGreaterThan(0.8);
    const fb = pg.best.frequencyPerDay;
    const plus = pg.aliases.find((a) => a.windowCycle === 'day' && a.sign === 1);
    const minus = pg.aliases.find((a) => a.windowCycle === 'day' && a.sign === -1);
    expect(plus!.frequencyPerDay).toBeCloseTo(fb + daily!.frequencyPerDay, 12);
    expect(minus!.frequencyPerDay).toBeCloseTo(Math.abs(fb - daily!.frequencyPerDay), 12);
    // an alias is a strong but lower peak
    expect(plus!.power).toBeLessThan(pg.best.power);
    expect(plus!.power).toBeGreaterThan(0.3);
  });

  it('gives other normalisations as monotonic transforms of the standard power', () => {
    const std = velocityPeriodogram(table);
    const model = velocityPeriodogram(table, { normalization: 'model' });
    const log = velocityPeriodogram(table, { normalization: 'log' });
    expect(model.best.frequencyPerDay).toBe(std.best.frequencyPerDay);
    expect(model.power[100]).toBeCloseTo(std.power[100] / (1 - std.power[100]), 12);
    expect(log.power[100]).toBeCloseTo(-Math.log(1 - std.power[100]), 12);
  });

  it('gives calibrated false-alarm probabilities on pure noise, conservative under nightly aliasing (simulation)', () => {
    // Baluev's alias-free approximation assumes distinct frequencies carry independent
    // information. With random times it should be calibrated: P(FAP ≤ α) ≈ α. With one
    // exposure per night the grid up to 2 d⁻¹ repeats itself at f ± 1 d⁻¹, so the FAP is
    // over-estimated (conservative): P(FAP ≤ α) ≤ α.
    const trials = 300;
    const run = (nightly: boolean) => {
      let b10 = 0, b50 = 0;
      for (let k = 0; k < trials; k++) {
        const rand = mulberry32(5000 + k);
        const t = Array.from({ length: 25 }, () => (nightly ? Math.floor(rand() * 120) + 0.35 + 0.1 * (rand() - 0.5) : rand() * 120));
        const dy = t.map(() => 1.5 * (0.8 + 0.4 * rand()));
        const pg = velocityPeriodogram(createVelocityTable({ bjdTdb: t, velocityKmPerS: dy.map((d) => 5 + d * gaussian(rand)), uncertaintyKmPerS: dy }));
        if (pg.falseAlarmProbability <= 0.1) b10++;
        if (pg.falseAlarmProbability <= 0.5) b50++;
      }
      return [b10 / trials, b50 / trials];
    };
    const [r10, r50] = run(false);
    const [n10, n50] = run(true);
    console.log(`FAP on noise, random times: P(FAP ≤ 0.1) = ${r10.toFixed(3)}, P(FAP ≤ 0.5) = ${r50.toFixed(3)}; nightly: ${n10.toFixed(3)}, ${n50.toFixed(3)}`);
    // binomial 2σ at n = 300: ±0.035 at 0.1, ±0.058 at 0.5
    expect(Math.abs(r10 - 0.1)).toBeLessThan(0.035);
    expect(Math.abs(r50 - 0.5)).toBeLessThan(0.058);
    expect(n10).toBeLessThan(0.1 + 0.035);
    expect(n50).toBeLessThan(0.5 + 0.058);
  });

  it('does not change its input', () => {
    const before = [Array.from(table.bjdTdb), Array.from(table.velocityKmPerS), Array.from(table.uncertaintyKmPerS)];
    velocityPeriodogram(table, { minPeriodDays: 1 });
    expect([Array.from(table.bjdTdb), Array.from(table.velocityKmPerS), Array.from(table.uncertaintyKmPerS)]).toEqual(before);
  });

  it('rejects too few points, zero span, a huge grid and a bad period range', () => {
    const tiny = createVelocityTable({ bjdTdb: [1, 2, 3], velocityKmPerS: [1, 2, 3], uncertaintyKmPerS: [1, 1, 1] });
    expect(() => velocityPeriodogram(tiny)).toThrow(new InputError('orbit.too-few-points', 'a periodogram needs at least 4 velocities, got 3'));
    const flat = createVelocityTable({ bjdTdb: [5, 5, 5, 5], velocityKmPerS: [1, 2, 3, 4], uncertaintyKmPerS: [1, 1, 1, 1] });
    expect(() => velocityPeriodogram(flat)).toThrow('all times are equal: the time span is zero');
    // times in seconds by mistake: a season is 1.3e7 "days"
    const seconds = createVelocityTable({ bjdTdb: [0, 4e6, 9e6, 1.3e7], velocityKmPerS: [1, 2, 3, 4], uncertaintyKmPerS: [1, 1, 1, 1] });
    expect(() => velocityPeriodogram(seconds)).toThrow(/the frequency grid would hold 2599999\d\d frequencies \(more than 2000000\) for a time span of 13000000 d/);
    expect(() => velocityPeriodogram(table, { minPeriodDays: 10, maxPeriodDays: 5 })).toThrow(UsageError);
    expect(() => velocityPeriodogram(table, { minPeriodDays: 10, maxPeriodDays: 5 })).toThrow('the minimum period (10 d) must be positive and below the maximum period (5 d)');
    expect(() => velocityPeriodogram(table, { oversampling: 0 })).toThrow('option oversampling must be a number ≥ 1, got 0');
  });
});
