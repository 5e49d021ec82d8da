import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { radialVelocityKmPerS } from '../../src/orbit/keplerian.js';
import { formatVelocityTableCsv, createVelocityTable } from '../../src/orbit/table.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

// LVAC-7's invented orbit (data/demo/scenario.json): P 12.37 d, e 0.28, ω 112°, K 41.3 km/s, γ −17.8 km/s.
const LVAC7 = { periodDays: 12.37, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8, periastronTimeBjdTdb: 2461140.63 };

function lvac7Table(seed: number, n: number) {
  const rand = mulberry32(seed);
  const t = Array.from({ length: n }, () => 2461143 + Math.floor(rand() * 160) + 0.38 + 0.08 * (rand() - 0.5)).sort((a, b) => a - b);
  const v = radialVelocityKmPerS(LVAC7, t);
  const dy = t.map(() => 1.2 + 0.6 * rand());
  return createVelocityTable({ bjdTdb: t, velocityKmPerS: Array.from(v, (x, i) => x + dy[i] * gaussian(rand)), uncertaintyKmPerS: dy, label: t.map((_, i) => `night ${i + 1}`) });
}

const dir = mkdtempSync(join(tmpdir(), 'lineshift-cli-pg-'));
const csv = join(dir, 'lvac7.csv');
writeFileSync(csv, formatVelocityTableCsv(lvac7Table(3, 24)));

describe('lineshift periodogram', () => {
  it('prints JSON with the best period, FAP, grid, power and aliases', async () => {
    const io = capture();
    expect(await runCli(['periodogram', csv, '--min-period', '1', '--json'], io)).toBe(0);
    expect(io.err).toBe('');
    const r = JSON.parse(io.out);
    // true period of the invented LVAC-7 orbit: 12.37 d
    expect(Math.abs(r.bestPeriod - 12.37)).toBeLessThan(0.1);
    expect(r.falseAlarmProbability).toBeLessThan(1e-3);
    expect(r.frequency.length).toBe(r.power.length);
    expect(r.window.length).toBe(r.power.length);
    expect(r.minPeriod).toBe(1);
    expect(Math.max(...r.frequency)).toBeLessThanOrEqual(1);
    expect(r.aliases.length).toBeGreaterThan(0);
    for (const a of r.aliases as { period: number; frequency: number; windowFrequency: number; sign: number }[]) {
      expect(a.frequency).toBeCloseTo(Math.abs(r.bestFrequency + a.sign * a.windowFrequency), 12);
      expect(a.period).toBeCloseTo(1 / a.frequency, 12);
    }
    expect(r.provenance.at(-1).step).toBe('periodogram');
  });

  it('prints a readable summary with the daily aliases', async () => {
    const io = capture();
    expect(await runCli(['periodogram', csv], io)).toBe(0);
    expect(io.out).toMatch(/^.*lvac7\.csv: 24 velocities over \d+\.\d d; periods 0\.5000 to \d+\.\d+ d searched \(\d+ frequencies\)\n/);
    expect(io.out).toMatch(/best period: 12\.3\d\d d \(power 0\.\d{3}, false-alarm probability [\d.e-]+\)/);
    expect(io.out).toMatch(/aliases of the best period/);
    // 1/(1/12.37 ± 1) d: the daily aliases of LVAC-7's period
    expect(io.out).toMatch(/\+ daily sampling: 0\.92\d\d d/);
    expect(io.out).toMatch(/- daily sampling: 1\.08\d\d d/);
  });

  it('reports bad tables and options on one line with exit codes 1 and 2', async () => {
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,3\n2,x,3\n');
    let io = capture();
    expect(await runCli(['periodogram', bad], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${bad}: line 3: column velocity_km_s: not a number: "x"\n`);
    io = capture();
    expect(await runCli(['periodogram', csv, '--min-period', '20', '--max-period', '10'], io)).toBe(2);
    expect(io.err).toBe('lineshift: the minimum period (20 d) must be positive and below the maximum period (10 d)\n');
    io = capture();
    expect(await runCli(['periodogram', join(dir, 'missing.csv')], io)).toBe(1);
    expect(io.err).toMatch(/^lineshift: .*missing\.csv: no such file\n$/);
  });
});
