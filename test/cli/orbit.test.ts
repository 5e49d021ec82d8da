import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatMeasured } from '../../src/cli/commands/orbit.js';
import { runCli } from '../../src/cli/run.js';
import { radialVelocityKmPerS, type KeplerianOrbit } from '../../src/orbit/keplerian.js';
import { createVelocityTable, formatVelocityTableCsv, formatVelocityTableJson } from '../../src/orbit/table.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

// LVAC-7's invented orbit (data/demo/scenario.json), with an invented K₂ = 63 km/s for the double-lined case.
const LVAC7: KeplerianOrbit = { periodDays: 12.37, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8, periastronTimeBjdTdb: 2461140.63, semiAmplitude2KmPerS: 63 };

function table(seed: number, n: number, double: boolean) {
  const rand = mulberry32(seed);
  const nights = new Set<number>();
  while (nights.size < n) nights.add(Math.floor(rand() * 160));
  const t = [...nights].sort((a, b) => a - b).map((d) => 2461143 + d + 0.38 + 0.08 * (rand() - 0.5));
  const v = radialVelocityKmPerS(LVAC7, t);
  const v2 = radialVelocityKmPerS(LVAC7, t, 'secondary');
  const dy = t.map(() => 1.2 + 0.6 * rand());
  const dy2 = t.map((_, i) => (i % 5 === 2 ? NaN : 2.0 + 0.6 * rand()));
  return createVelocityTable({
    bjdTdb: t, velocityKmPerS: Array.from(v, (x, i) => x + dy[i] * gaussian(rand)), uncertaintyKmPerS: dy,
    ...(double ? { velocity2KmPerS: Array.from(v2, (x, i) => (Number.isNaN(dy2[i]) ? NaN : x + dy2[i] * gaussian(rand))), uncertainty2KmPerS: dy2 } : {}),
  });
}

const dir = mkdtempSync(join(tmpdir(), 'lineshift-cli-orbit-'));
const sb1 = join(dir, 'lvac7.csv');
writeFileSync(sb1, formatVelocityTableCsv(table(21, 24, false)));
const sb2 = join(dir, 'lvac7-double.json');
writeFileSync(sb2, formatVelocityTableJson(table(22, 22, true)));

type M = { value: number; uncertainty: number };

describe('lineshift orbit', () => {
  it('prints the orbit as JSON, each parameter with its uncertainty, and the eccentricity test', async () => {
    const io = capture();
    expect(await runCli(['orbit', sb1, '--json'], io)).toBe(0);
    expect(io.err).toBe('');
    const r = JSON.parse(io.out);
    expect(r.converged).toBe(true);
    // the invented truth lies within 3σ of each fitted element
    const near = (m: M, truth: number) => expect(Math.abs(m.value - truth)).toBeLessThan(3 * m.uncertainty);
    near(r.period, 12.37);
    near(r.eccentricity, 0.28);
    near(r.omega, 112);
    near(r.semiAmplitude, 41.3);
    near(r.systemicVelocity, -17.8);
    const T = 2461140.63 + Math.round((r.periastronTime.value - 2461140.63) / 12.37) * 12.37;
    near(r.periastronTime, T);
    for (const k of ['period', 'periastronTime', 'eccentricity', 'omega', 'semiAmplitude', 'systemicVelocity', 'massFunction']) {
      expect(r[k].uncertainty).toBeGreaterThan(0);
    }
    // f(m) = 1.0361e-7 (1 − e²)^{3/2} K³ P M☉ (textbook constant, from memory)
    expect(r.massFunction.value / (1.0361e-7 * (1 - r.eccentricity.value ** 2) ** 1.5 * r.semiAmplitude.value ** 3 * r.period.value)).toBeCloseTo(1, 4);
    expect(r.rms).toBeGreaterThan(0.8);
    expect(r.rms).toBeLessThan(2.5);
    expect(r.lucySweeney.circularPreferred).toBe(false);
    expect(r.lucySweeney.probability).toBeLessThan(0.05);
    expect(r.residuals).toHaveLength(24);
    expect(r.provenance.map((p: { step: string }) => p.step)).toEqual(['read-velocity-table', 'orbit-fit']);
  });

  it('prints a readable table of the elements', async () => {
    const io = capture();
    expect(await runCli(['orbit', sb1, '--period-guess', '12.4'], io)).toBe(0);
    const lines = io.out.trimEnd().split('\n');
    expect(lines[0]).toMatch(/lvac7\.csv: 24 epochs, single-lined orbit fit converged \(converged: /);
    expect(io.out).toMatch(/\n {2}period P {14}12\.3\d+ ± 0\.0\d+ d\n/);
    expect(io.out).toMatch(/\n {2}omega \(star 1\) {8}1[01]\d\.\d ± \d\.\d deg\n/);
    expect(io.out).toMatch(/\n {2}mass function f\(m\) {4}0\.0\d+ ± 0\.00\d+ solar masses\n/);
    expect(io.out).toMatch(/eccentricity test {5}p = [\d.e-]+ \(Lucy & Sweeney 1971\): significant at 5%, the orbit is eccentric/);
  });

  it('fits both stars with --double: K₂, q and minimum masses', async () => {
    const io = capture();
    expect(await runCli(['orbit', sb2, '--double', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out);
    expect(r.doubleLined).toBe(true);
    expect(Math.abs(r.semiAmplitude2.value - 63)).toBeLessThan(3 * r.semiAmplitude2.uncertainty);
    expect(Math.abs(r.massRatio.value - 41.3 / 63)).toBeLessThan(3 * r.massRatio.uncertainty);
    expect(r.m1SinI3.value).toBeGreaterThan(r.m2SinI3.value);
    expect(r.residuals2.filter((x: number | null) => x === null)).toHaveLength(4);
  });

  it('reports bad input and usage on one line', async () => {
    let io = capture();
    expect(await runCli(['orbit', sb1, '--double'], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${sb1}: a double-lined fit needs velocity2_km_s and uncertainty2_km_s columns with at least one value\n`);
    io = capture();
    expect(await runCli(['orbit', sb1, '--jitter', 'lots'], io)).toBe(2);
    expect(io.err).toBe('lineshift: option --jitter needs "estimate" or a number ≥ 0 (km/s), got "lots"\n');
    const few = join(dir, 'few.csv');
    writeFileSync(few, 'bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,1\n2,3,1\n3,1,1\n4,0,1\n');
    io = capture();
    expect(await runCli(['orbit', few], io)).toBe(1);
    expect(io.err).toBe('lineshift: an orbit fit needs at least 7 velocities, got 4\n');
  });

  it('formats a value with two significant digits of its uncertainty', () => {
    expect(formatMeasured({ value: 12.371234, uncertainty: 0.0021 })).toBe('12.3712 ± 0.0021');
    expect(formatMeasured({ value: 2461140.634567, uncertainty: 0.031 })).toBe('2461140.635 ± 0.031');
    expect(formatMeasured({ value: 112.34, uncertainty: 2.1 })).toBe('112.3 ± 2.1');
  });
});
