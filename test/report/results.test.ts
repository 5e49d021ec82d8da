import { describe, expect, it } from 'vitest';
import { calibrateLamp } from '../../src/calibrate/lamp.js';
import { fitLine, fitLineArrays } from '../../src/fit/line-fit.js';
import { readSpectrum } from '../../src/io/read.js';
import { fitContinuum } from '../../src/lines/continuum.js';
import { createVelocityTable } from '../../src/orbit/table.js';
import { spectrumPlot } from '../../src/plot/spectrum.js';
import { formatMeasured } from '../../src/report/format.js';
import { describeResult, summarizeResult } from '../../src/report/results/index.js';
import { resultKind } from '../../src/report/results/kind.js';
import { summarizeFoundLines, summarizeLineFit } from '../../src/report/results/line-fit.js';
import { summarizeIdentification } from '../../src/report/results/elements.js';
import { summarizeOrbitFit, summarizePeriodogram, summarizeVelocityTable } from '../../src/report/results/orbit.js';
import { summarizeSolution } from '../../src/report/results/calibration.js';
import { summarizeContinuum, summarizeSpectrum } from '../../src/report/results/spectrum.js';
import { SUMMARY_MAX_ROWS, summaryText } from '../../src/report/results/summary.js';
import { summarizeCrossCorrelation, summarizeLineVelocities } from '../../src/report/results/velocity.js';
import { tableText } from '../../src/report/table.js';
import { repoPath } from '../helpers/paths.js';
import { galleryResults } from '../plot/result-fixtures.js';

const r = galleryResults();
/** Everything in a value as text (typed arrays included), to prove that summarising does not change it. */
const fingerprint = (v: unknown) => JSON.stringify(v, (_k, x) => (ArrayBuffer.isView(x) ? Array.from(x as Float64Array) : x));

describe('resultKind', () => {
  it('tells every result apart, and nothing else is one', () => {
    expect(resultKind(r.star)).toBe('spectrum');
    expect(resultKind(r.halpha)).toBe('line-fit');
    expect(resultKind(r.found)).toBe('found-lines');
    expect(resultKind(fitContinuum(r.star))).toBe('continuum');
    expect(resultKind(r.starIdentification)).toBe('identification');
    expect(resultKind(r.sampleSolution)).toBe('dispersion-solution');
    expect(resultKind(r.lvac7Table)).toBe('velocity-table');
    expect(resultKind(r.lvac7Periodogram)).toBe('periodogram');
    expect(resultKind(r.lvac7Orbit)).toBe('orbit-fit');
    expect(resultKind(r.ccf)).toBe('cross-correlation');
    expect(resultKind(r.lineVelocities)).toBe('line-velocities');
    for (const other of [spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 2] }), { columns: [], rows: [] }, 'text', {}, null, [], 42]) {
      expect(resultKind(other)).toBeUndefined();
    }
  });
});

describe('summaries of real results', () => {
  it('line fit: outcome, every component value ± uncertainty, both tables holding the measured values', () => {
    const s = summarizeLineFit(r.halpha, { spectrum: r.star });
    const c = r.halpha.components[0];
    expect(s.title).toBe(`Line fit at ${c.center.value.toFixed(2)} Å: LVAC-7, 2026-05-14 03:12:45 UTC`);
    expect(s.lines[0]).toMatch(/^Fit \(gaussian, 1 component, absorption, continuum of order 1\) converged \(chi-square-converged\) in \d+ iterations; χ²\/dof = [0-9.]+ \(\d+ dof\); 391 pixels from 6513\.54 to 6611\.33 Å\.$/);
    expect(s.lines[1]).toBe(`Component 1: centre ${formatMeasured(c.center.value, c.center.uncertainty, 'Å')}, FWHM ${formatMeasured(c.fwhm.value, c.fwhm.uncertainty, 'Å')}, depth ${formatMeasured(c.depth.value, c.depth.uncertainty)}, equivalent width ${formatMeasured(c.equivalentWidth.value, c.equivalentWidth.uncertainty, 'Å')}.`);
    expect(s.tables[0].rows[0].centre).toBe(c.center);
    expect(s.tables[0].columns.find((col) => col.key === 'amplitude')?.unit).toBe('adu');
    expect(s.tables[1].rows.map((row) => row.name)).toEqual(r.halpha.parameters.map((p) => p.name));
  });

  it('line fit: a fit that stopped early says so, and a fit without flux uncertainties reports its scatter', () => {
    const x = Array.from({ length: 41 }, (_, i) => i);
    const flux = x.map((v) => 5 + 100 * Math.exp(-4 * Math.LN2 * ((v - 20.3) / 2.5) ** 2) + 0.5 * Math.sin(v * 1.7));
    const stopped = fitLineArrays({ x, flux, unit: 'pixel' }, { center: 18, solver: { maxIterations: 1 } });
    expect(stopped.converged).toBe(false);
    const s = summarizeLineFit(stopped);
    expect(s.lines[0]).toContain(`did NOT converge (${stopped.reason}): ${stopped.message}`);
    expect(s.lines[0]).toContain('no flux uncertainties: errors from the scatter');
    expect(s.title).toMatch(/^Line fit at [0-9.]+ pixels$/);
  });

  it('found lines: numbered rows with their window, and the threshold and noise source', () => {
    const s = summarizeFoundLines(r.found, { spectrum: r.star });
    expect(s.lines[0]).toBe('3 lines above 5 σ (noise from the uncertainty column) in 3 windows: 3 absorption, 0 emission.');
    expect(s.tables[0].rows.map((row) => row.n)).toEqual([1, 2, 3]);
    expect(s.tables[0].rows.map((row) => row.centre)).toEqual(r.found.lines.map((l) => l.center));
    expect(s.tables[0].rows.map((row) => row.window)).toEqual([1, 2, 3]);
  });

  it('dispersion solution: accepted, RMS, the lines not used counted by reason, the line table', () => {
    const sol = r.syntheticSolution;
    const s = summarizeSolution(sol);
    expect(s.lines[0]).toBe(`Accepted: ${sol.message}`);
    // every reason a line was not used, with its count (this lamp: one unresolved blend and
    // one saturated line; no good line is clipped since lines are judged by their own σ)
    const reasons = new Map<string, number>();
    for (const l of sol.lines) if (!l.used) reasons.set(l.rejection!, (reasons.get(l.rejection!) ?? 0) + 1);
    expect([...reasons.keys()].sort()).toEqual(['blend', 'saturated']);
    for (const [reason, n] of reasons) expect(s.lines.join('\n')).toContain(`${n} ${reason}`);
    expect(s.lines.join('\n')).toContain('1 saturated');
    expect(s.lines.join('\n')).not.toContain('sigma-clipped');
    expect(s.lines[2]).toMatch(/^RMS of the lines used \(weighted like the fit\): /);
    expect(s.tables[0].rows).toHaveLength(sol.lines.length);
    expect(s.tables[0].rows.filter((row) => row.used === 'yes')).toHaveLength(sol.linesUsed);
  });

  it('dispersion solution: a refused one says NOT accepted and why', () => {
    const wrong = calibrateLamp(readSpectrum(repoPath('data', 'samples', 'lamp-ne-ar.fits')), { lamp: 'helium' });
    expect(wrong.ok).toBe(false);
    const s = summarizeSolution(wrong);
    expect(s.lines[0]).toBe(`NOT accepted (${wrong.reason}): ${wrong.message}`);
  });

  it('orbit fit: the elements with uncertainties and the eccentricity test', () => {
    const f = r.lvac7Orbit;
    const s = summarizeOrbitFit(f);
    expect(s.lines[1]).toBe(`P = ${formatMeasured(f.periodDays.value, f.periodDays.uncertainty, 'days')}, e = ${formatMeasured(f.eccentricity.value, f.eccentricity.uncertainty)}, K = ${formatMeasured(f.semiAmplitudeKmPerS.value, f.semiAmplitudeKmPerS.uncertainty, 'km/s')}, γ = ${formatMeasured(f.systemicVelocityKmPerS.value, f.systemicVelocityKmPerS.uncertainty, 'km/s')}.`);
    expect(s.lines[3]).toMatch(/^Eccentricity test \(Lucy & Sweeney 1971\): p₁ = .+, the eccentricity is significant\.$/);
    const rows = s.tables[0].rows;
    expect(rows.find((row) => row.element === 'Period P')?.value).toBe(f.periodDays);
    expect(rows.find((row) => row.element === 'Semi-amplitude K₂')).toBeUndefined();
    // The truth (invented, LVAC-7): P = 12.37 d within 3σ of the fit.
    expect(Math.abs(f.periodDays.value - 12.37)).toBeLessThan(3 * f.periodDays.uncertainty);
  });

  it('periodogram and velocity table', () => {
    const p = summarizePeriodogram(r.lvac7Periodogram);
    expect(p.lines[1]).toMatch(/^Highest peak: P = 12\.\d+ days/);
    expect(p.tables[0].rows).toHaveLength(r.lvac7Periodogram.peaks.length);
    const v = summarizeVelocityTable(r.lvac7Table);
    expect(v.lines[0]).toMatch(/^24 velocities over [0-9.]+ days, BJD_TDB 2461\d+\.\d\d to 2461\d+\.\d\d; median uncertainty [0-9.]+ km\/s\.$/);
    const times = v.tables[0].rows.map((row) => row.bjd as number);
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });

  it('long tables are cut, and say so', () => {
    const n = SUMMARY_MAX_ROWS + 15;
    const t = createVelocityTable({ bjdTdb: Array.from({ length: n }, (_, i) => 2461000 + i), velocityKmPerS: Array.from({ length: n }, () => 1), uncertaintyKmPerS: Array.from({ length: n }, () => 1) });
    const s = summarizeVelocityTable(t);
    expect(s.tables[0].rows).toHaveLength(SUMMARY_MAX_ROWS);
    expect(s.lines).toContain(`Table: first ${SUMMARY_MAX_ROWS} of ${n} rows shown.`);
  });

  it('identification: only species present or possible in the species table', () => {
    const s = summarizeIdentification(r.coolIdentification, { spectrum: r.coolStar });
    const shown = s.tables[0].rows.map((row) => row.verdict);
    expect(shown.length).toBe(r.coolIdentification.elements.filter((e) => e.verdict !== 'not detected').length);
    expect(new Set(shown)).toEqual(new Set(['present', 'possible'].filter((v) => shown.includes(v))));
    expect(s.lines[0]).toMatch(/^Present: .*Fe I/);
    expect(s.tables[0].columns.map((c) => c.label)).toContain('Why not present');
    for (const row of s.tables[0].rows) expect(row.reason === '').toBe(row.verdict === 'present');
    // A measured velocity given to the identification is shown to 0.01 km/s, not with every digit of the double.
    const shifted = summarizeIdentification({ ...r.coolIdentification, velocityKmPerS: 16.016610253665352 });
    expect(shifted.lines.some((l) => l.includes(', list velocity 16.02 km/s, '))).toBe(true);
  });

  it('identification: says why a species with one line in range is only possible', () => {
    const s = summarizeIdentification(r.starIdentification, { spectrum: r.star });
    expect(s.lines[0]).toMatch(/^Present: Si II\. Possible: H I\./);
    expect(s.lines[1]).toMatch(/^H I is at most possible here: only 1 expected line in range \(present needs 2\)/);
    expect(s.tables[0].rows.find((row) => row.species === 'H I')?.reason).toMatch(/^only 1 expected line in range/);
  });

  it('velocities: the value ± uncertainty in the observer\'s frame, the estimates, every line with its status', () => {
    const c = summarizeCrossCorrelation(r.ccf, { spectrum: r.velocityStar });
    expect(c.title).toBe('Cross-correlation velocity: LVAC-7, 2026-05-20 02:10:00 UTC');
    expect(c.lines[0]).toBe(`v = ${formatMeasured(r.ccf.velocity.value, r.ccf.velocity.uncertainty, 'km/s')} (observer's frame, no barycentric correction; uncertainty propagated, relativistic Doppler formula).`);
    expect(c.tables[0].rows[0].value).toBe(r.ccf.velocity);
    const l = summarizeLineVelocities(r.lineVelocities);
    expect(l.lines[0]).toBe(`v = ${formatMeasured(r.lineVelocities.velocity.value, r.lineVelocities.velocity.uncertainty, 'km/s')} (observer's frame, no barycentric correction) from ${r.lineVelocities.linesUsed} of ${r.lineVelocities.lines.length} lines.`);
    expect(l.tables[0].rows.map((row) => row.status)).toEqual(r.lineVelocities.lines.map((line) => (line.status === 'used' ? 'used' : line.note || line.reason)));
    expect(l.tables[0].rows[0].velocity).toBe(r.lineVelocities.lines[0].velocityKmPerS);
  });

  it('spectrum and continuum', () => {
    const s = summarizeSpectrum(r.star);
    expect(s.title).toBe('Spectrum: LVAC-7, 2026-05-14 03:12:45 UTC');
    expect(s.lines[0]).toBe('2048 pixels (2048 usable) from 6300.00 to 6811.75 Å (air); flux in adu, with uncertainties.');
    const c = summarizeContinuum(fitContinuum(r.star), { spectrum: r.star });
    expect(c.lines[1]).toMatch(/^Scatter about the continuum \(1\.4826 × MAD\): [0-9.]+ adu\.$/);
  });

  it('summarizeResult dispatches, describeResult gives the text with the tables, and nothing is modified', () => {
    const all = [r.star, r.halpha, r.found, r.starIdentification, r.sampleSolution, r.lvac7Table, r.lvac7Periodogram, r.lvac7Orbit, r.ccf, r.lineVelocities];
    for (const value of all) {
      const before = fingerprint(value);
      const s = summarizeResult(value, { spectrum: r.star });
      expect(describeResult(value, { spectrum: r.star })).toBe(summaryText(s));
      for (const t of s.tables) expect(describeResult(value, { spectrum: r.star })).toContain(tableText(t));
      expect(fingerprint(value)).toBe(before);
    }
    expect(() => summarizeResult({} as never)).toThrow('this value is not a lineshift result');
  });
});

describe('a fit in a spectrum without uncertainties', () => {
  it('uses the flux unit of the spectrum for the scatter', () => {
    const fit = fitLine(r.blendSpectrum, { centerAngstrom: r.blend.components[0].center.value });
    expect(summarizeLineFit(fit, { spectrum: r.blendSpectrum }).lines[0]).toMatch(/no flux uncertainties: errors from the scatter, [0-9.]+ flux units per pixel/);
  });
});
