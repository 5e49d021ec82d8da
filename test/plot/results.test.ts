/**
 * The plots of library results (src/plot/results/): every spec meets the contract and
 * matches its snapshot, and draws what the result holds (checked value by value).
 */
import { describe, expect, it } from 'vitest';
import { solutionDispersion } from '../../src/calibrate/solution.js';
import { UsageError } from '../../src/errors.js';
import { radialVelocityKmPerS } from '../../src/orbit/keplerian.js';
import { baluevFalseAlarmProbability, velocityPeriodogram } from '../../src/orbit/periodogram.js';
import { placeLabels } from '../../src/plot/labels.js';
import { plotCalibration } from '../../src/plot/results/calibration.js';
import { resultPlot } from '../../src/plot/results/index.js';
import { plotLineFit } from '../../src/plot/results/line-fit.js';
import { falseAlarmLevel, plotPeriodogram, plotPhaseFolded, plotVelocityCurve } from '../../src/plot/results/orbit.js';
import { plotFoundLines, plotSpectrum } from '../../src/plot/results/spectrum.js';
import type { VegaLiteSpec } from '../../src/plot/spec.js';
import { PLOT_THEME } from '../../src/plot/theme.js';
import { formatMeasured, formatSignificant } from '../../src/report/format.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { crossCorrelationVelocity } from '../../src/velocity/ccf.js';
import { plotCrossCorrelation, plotLineVelocities } from '../../src/plot/results/velocity.js';
import { expectValidSpec, forSnapshot } from './contract.js';
import { galleryResults, resultGalleryPlots } from './result-fixtures.js';

type Rows = Record<string, unknown>[];
const datasets = (spec: VegaLiteSpec) => spec.datasets as Record<string, Rows>;
const title = (spec: VegaLiteSpec) => spec.title as { text: string; subtitle?: string | string[] };
const subtitleText = (spec: VegaLiteSpec) => [title(spec).subtitle ?? []].flat().join('\n');
const strings = (spec: unknown): string[] => JSON.stringify(spec).match(/"(?:[^"\\]|\\.)*"/g)?.map((s) => JSON.parse(s) as string) ?? [];
const fingerprint = (v: unknown) => JSON.stringify(v, (_k, x) => (ArrayBuffer.isView(x) ? Array.from(x as Float64Array) : x));

const r = galleryResults();
const cases = Object.entries(resultGalleryPlots(r));

describe('every plot of a result', () => {
  it.each(cases)('%s: validates against the Vega-Lite schema, compiles without warnings, matches its snapshot', async (_name, spec) => {
    await expectValidSpec(spec);
    expect(forSnapshot(spec)).toMatchSnapshot();
  });

  it('leaves every result as it was', () => {
    const inputs = [r.star, r.found, r.halpha, r.starIdentification, r.sampleSolution, r.lvac7Table, r.lvac7Orbit, r.lvac7Periodogram, r.ccf, r.lineVelocities];
    const before = inputs.map(fingerprint);
    resultGalleryPlots(r);
    expect(inputs.map(fingerprint)).toEqual(before);
  });
});

describe('plotLineFit', () => {
  it('evaluates the fitted model from the parameters: residuals equal the fit\'s own data − model', () => {
    const spec = plotLineFit(r.halpha, { residuals: 'flux' });
    const residuals = datasets(spec).residuals;
    expect(residuals).toHaveLength(r.halpha.curve.x.length);
    residuals.forEach((row, i) => {
      // Same model, same parameters: equal to rounding (1e-9 of the flux, 2.3e3 adu here).
      expect(Math.abs((row.y as number) - (r.halpha.curve.flux[i] - r.halpha.curve.model[i]))).toBeLessThan(1e-9 * 2300);
    });
  });

  it('takes error bars, medium, flux unit and title from the spectrum', () => {
    const spec = plotLineFit(r.halpha, { spectrum: r.star, labels: ['Hα'] });
    const points = datasets(spec).points;
    const sigmaAt = new Map(Array.from(r.star.wavelength, (w, i) => [w, r.star.uncertainty![i]]));
    for (const p of points) expect((p.high as number) - (p.y as number)).toBeCloseTo(sigmaAt.get(p.x as number)!, 9);
    expect(title(spec).text).toBe(`LVAC-7: Hα fit at ${r.halpha.components[0].center.value.toFixed(2)} Å`);
    expect(subtitleText(spec)).toMatch(/^2026-05-14 03:12:45 UTC · gaussian profile · χ²\/dof = [0-9.]+ · 391 pixels\ncentre 6562\.\d{3} ± 0\.\d{3} Å · FWHM \d+\.\d+ ± 0\.\d+ Å · EW \d+\.\d+ ± 0\.\d+ Å$/);
    const all = strings(spec);
    for (const t of ['Wavelength (Å, air)', 'Flux (adu)', 'Residual (σ)']) expect(all).toContain(t);
  });

  it('draws each component of a blend so that continuum + components = model', () => {
    const spec = plotLineFit(r.blend, { spectrum: r.blendSpectrum });
    const curves = datasets(spec).curves;
    const series = (name: string) => curves.filter((c) => c.series === name);
    const model = series('Model');
    const continuum = series('Continuum');
    const c1 = series('Component 1');
    const c2 = series('Component 2');
    expect(c1.length).toBe(model.length);
    model.forEach((m, i) => {
      // Each component is drawn added to the continuum: c1 + c2 − continuum = model.
      expect((c1[i].y as number) + (c2[i].y as number) - (continuum[i].y as number)).toBeCloseTo(m.y as number, 9);
    });
    expect(datasets(spec).centres).toHaveLength(2);
    // No uncertainties in this spectrum: no error bars, residuals in flux units, the scatter in the subtitle.
    expect(strings(spec)).toContain('Residual (flux units)');
    expect(subtitleText(spec)).toContain('no flux uncertainties: errors from the scatter');
  });
});

describe('plotCalibration', () => {
  const sol = r.syntheticSolution;

  it('plots list − solution, the sign of the line table, with centre errors times the dispersion', () => {
    const spec = plotCalibration(sol, { dispersion: false });
    const rows = datasets(spec).lines;
    const identified = sol.lines.filter((l) => l.residualAngstrom !== null);
    expect(rows).toHaveLength(identified.length);
    const used = rows.filter((row) => row.used);
    const usedLines = identified.filter((l) => l.used);
    used.forEach((row, i) => {
      expect(row.y).toBeCloseTo(usedLines[i].residualAngstrom!, 12);
      const sigma = usedLines[i].pixelUncertainty! * Math.abs(solutionDispersion(sol, usedLines[i].pixel));
      expect((row.high as number) - (row.y as number)).toBeCloseTo(sigma, 12);
    });
    expect(strings(spec)).toContain('Reference − solution (Å)');
    expect(title(spec).text).toBe('Wavelength calibration: neon, argon lamp');
  });

  it('in km/s, matches the table\'s residuals in km/s', () => {
    const rows = datasets(plotCalibration(sol, { residualUnit: 'kmPerS' })).lines.filter((row) => row.used);
    const usedLines = sol.lines.filter((l) => l.used);
    // The plot divides by the list wavelength, the table by the fitted one (λ_list − Δλ): they
    // differ by the factor 1 − Δλ/λ_list, i.e. relatively by the line's own |Δλ|/λ (< 2e-5 here).
    rows.forEach((row, i) => {
      const l = usedLines[i];
      const relative = Math.abs(l.residualAngstrom!) / l.wavelengthAngstrom!;
      expect(relative).toBeLessThan(2e-5);
      expect(Math.abs((row.y as number) - l.residualKmPerS!)).toBeLessThanOrEqual(relative * Math.abs(l.residualKmPerS!) * (1 + 1e-9) + 1e-12);
    });
  });

  it('fits the axis to the lines used and writes the value of a rejected line beyond it', () => {
    const spec = plotCalibration(r.sampleSolution);
    const residualPanel = (spec.vconcat as { layer: Record<string, unknown>[] }[])[1];
    const domain = (residualPanel.layer.flatMap((l) => [(l.encoding as { y?: { scale?: { domain?: number[] } } } | undefined)?.y?.scale?.domain]).find(Boolean)) as number[];
    const limit = domain[1];
    const blend = r.sampleSolution.lines.find((l) => l.rejection === 'blend')!;
    expect(Math.abs(blend.residualAngstrom!)).toBeGreaterThan(limit);
    const text = residualPanel.layer.find((l) => (l.mark as { type: string }).type === 'text')!;
    const values = (text.data as { values: Rows }).values;
    expect(values.map((v) => v.value)).toContain(`−${Math.abs(blend.residualAngstrom!).toFixed(4)}`);
    // Every used line and its error bar lies inside the axis.
    for (const row of datasets(spec).lines.filter((l) => l.used)) {
      for (const v of [row.y, row.low, row.high]) if (typeof v === 'number') expect(Math.abs(v)).toBeLessThanOrEqual(limit);
    }
    expect(subtitleText(spec)).toContain('(2 off the scale, value written)');
  });

  it('says when a solution was not accepted', () => {
    const refused = { ...sol, ok: false, reason: 'large-residuals' as const };
    expect(title(plotCalibration(refused)).text).toBe('Wavelength calibration: neon, argon lamp — NOT accepted (large-residuals)');
  });
});

describe('orbit plots', () => {
  it('draws the fitted orbit and its residuals, the same as the fit\'s own', () => {
    const spec = plotVelocityCurve(r.lvac7Table, r.lvac7Orbit);
    const d = datasets(spec);
    const offset = Number(/BJD_TDB − (\d+)/.exec(strings(spec).find((s) => s.startsWith('BJD_TDB − '))!)![1]);
    for (const row of d.orbit.filter((_, i) => i % 97 === 0)) {
      expect(row.y).toBeCloseTo(radialVelocityKmPerS(r.lvac7Orbit.orbit, [(row.x as number) + offset])[0], 9);
    }
    const byTime = new Map(Array.from(r.lvac7Table.bjdTdb, (t, i) => [t, r.lvac7Orbit.residualKmPerS[i]]));
    // The fit evaluates its model through the eccentric longitude, the plot through Kepler's
    // equation: the same velocities to ~1e-9 km/s; 1e-6 km/s (1 mm/s) is far below any error bar.
    for (const row of d.residuals) expect(Math.abs((row.y as number) - byTime.get(row.bjdTdb as number)!)).toBeLessThan(1e-6);
    expect(subtitleText(spec)).toContain(`P = ${r.lvac7Orbit.periodDays.value.toFixed(4)} ± ${r.lvac7Orbit.periodDays.uncertainty.toFixed(4)} days`);
  });

  it('folds on the fitted period with phase 0 at periastron', () => {
    const spec = plotPhaseFolded(r.lvac7Table, r.lvac7Orbit);
    const { periodDays, periastronTimeBjdTdb } = r.lvac7Orbit;
    for (const row of datasets(spec).velocities.filter((v) => !v.repeat)) {
      const phase = ((row.bjdTdb as number) - periastronTimeBjdTdb.value) / periodDays.value;
      expect(row.x).toBeCloseTo(phase - Math.floor(phase), 9);
    }
    expect(subtitleText(spec)).toContain(`phase 0 at periastron, BJD_TDB ${periastronTimeBjdTdb.value.toFixed(4)}`);
  });

  it('refuses a table the orbit was not fitted to', () => {
    expect(() => plotVelocityCurve(r.longTable, r.lvac7Orbit)).toThrow(UsageError);
    expect(() => plotPhaseFolded(r.longTable, r.lvac7Orbit)).toThrow('the orbit fit was made from a velocity table of 24 rows, but this table has 42: pass the table the orbit was fitted to');
  });
});

describe('plotPeriodogram', () => {
  it('draws the 10 %, 1 % and 0.1 % levels where the Baluev probability equals them', () => {
    const pg = r.lvac7Periodogram;
    const spec = plotPeriodogram(pg, { table: r.lvac7Table });
    const levels = datasets(spec).falseAlarm;
    expect(levels.map((l) => l.label)).toEqual(['FAP 10%', 'FAP 1%', 'FAP 0.1%']);
    const fMax = 1 / pg.minPeriodDays;
    [0.1, 0.01, 0.001].forEach((p, i) => {
      const fap = baluevFalseAlarmProbability(levels[i].power as number, r.lvac7Table.bjdTdb, r.lvac7Table.uncertaintyKmPerS, fMax).baluev;
      expect(Math.abs(fap - p) / p).toBeLessThan(1e-6);
    });
    expect((levels[0].power as number) < (levels[1].power as number) && (levels[1].power as number) < (levels[2].power as number)).toBe(true);
    // The marked peak is the periodogram's refined best period.
    expect(datasets(spec).peak[0].period).toBeCloseTo(pg.best.periodDays, 12);
  });

  it('converts the levels to the periodogram\'s normalisation', () => {
    const standard = falseAlarmLevel(r.lvac7Periodogram, r.lvac7Table, 0.01);
    const model = velocityPeriodogram(r.lvac7Table, { minPeriodDays: 1, normalization: 'model' });
    const log = velocityPeriodogram(r.lvac7Table, { minPeriodDays: 1, normalization: 'log' });
    expect(falseAlarmLevel(model, r.lvac7Table, 0.01)).toBeCloseTo(standard / (1 - standard), 9);
    expect(falseAlarmLevel(log, r.lvac7Table, 0.01)).toBeCloseTo(-Math.log(1 - standard), 9);
  });

  it('without the table: no levels, and the subtitle says why; a wrong table is refused', () => {
    const spec = plotPeriodogram(r.lvac7Periodogram);
    expect(datasets(spec).falseAlarm).toBeUndefined();
    expect(subtitleText(spec)).toContain('levels need the velocity table');
    expect(() => plotPeriodogram(r.lvac7Periodogram, { table: r.longTable })).toThrow('the periodogram was computed from 24 velocities, but this table has 42: pass the table it was computed from');
    expect(() => plotPeriodogram(r.lvac7Periodogram, { table: r.lvac7Table, falseAlarmProbabilities: [1.5] })).toThrow(UsageError);
  });
});

describe('plotSpectrum and plotFoundLines', () => {
  it('labels the lines of species judged present, by default and with more verdicts', () => {
    const present = datasets(plotSpectrum(r.star, { identification: r.starIdentification })).lines.map((l) => l.label);
    expect(present).toEqual(['Si II 6347', 'Si II 6371']);
    const more = datasets(plotSpectrum(r.star, { identification: r.starIdentification, verdicts: ['present', 'possible', 'telluric'] })).lines.map((l) => l.label);
    expect(more).toHaveLength(3);
    expect(more).toContain('H I 6563'); // Hα, not the weak H2O band it lies in
    expect(title(plotSpectrum(r.star)).text).toBe('LVAC-7: spectrum');
  });

  it('keeps the labels of the strongest lines when not all fit, and no label overlaps another', () => {
    const spec = plotSpectrum(r.coolStar, { identification: r.coolIdentification });
    const lines = datasets(spec).lines;
    const marked = r.coolIdentification.lines.filter((l) => l.candidates.some((c) => c.verdict === 'present')).length;
    expect(lines.length).toBeLessThan(marked);
    expect(subtitleText(spec)).toContain(`${lines.length} lines marked, ${marked - lines.length} more left out for lack of room`);
    const placed = placeLabels(lines.map((l) => ({ x: l.wavelength as number, text: l.label as string })), {
      domain: [r.coolStar.wavelength[0], r.coolStar.wavelength[r.coolStar.wavelength.length - 1]], lengthPx: PLOT_THEME.width, fontSizePx: PLOT_THEME.lineLabelFontSize,
    });
    expect(placed.every((p) => !p.overlaps)).toBe(true);
    // The strongest detection keeps its label.
    const significance = (i: number) => r.coolIdentification.found[i].significance;
    const strongest = r.coolIdentification.lines.filter((l) => l.candidates.some((c) => c.verdict === 'present')).sort((a, b) => significance(b.index) - significance(a.index))[0];
    expect(lines.map((l) => l.wavelength)).toContain(strongest.wavelengthAngstrom);
  });

  it('marks the found lines and shades their windows', () => {
    const spec = plotFoundLines(r.star, r.found);
    expect(datasets(spec).lines.map((l) => l.label)).toEqual(r.found.lines.map((l) => l.center.toFixed(1)));
    expect(datasets(spec).windows).toEqual(r.found.windows.map((w) => ({ start: w.start, end: w.end })));
    expect(subtitleText(spec)).toContain('2026-05-14 03:12:45 UTC · 3 lines above 5 σ (3 absorption, 0 emission) in 3 windows');
    expect(datasets(plotFoundLines(r.star, r.found, { label: 'number', showWindows: false })).lines.map((l) => l.label)).toEqual(['1', '2', '3']);
  });

  it('refuses a spectrum without a wavelength scale', () => {
    const pixels = createSpectrum({ wavelength: [0, 1, 2], flux: [1, 2, 1], unit: 'pixel' });
    expect(() => plotSpectrum(pixels)).toThrow('the spectrum has no wavelength scale (its axis is in pixels): calibrate it first (see calibrateLamp and applySolution)');
  });
});

describe('resultPlot', () => {
  it('picks the plot by kind, and says what is missing', () => {
    expect(resultPlot(r.found).note).toBe('pass { spectrum } (the wavelength-calibrated spectrum) to draw the found lines');
    expect(resultPlot(r.found, { spectrum: r.star }).spec).toStrictEqual(plotFoundLines(r.star, r.found));
    expect(resultPlot(r.lvac7Orbit).note).toBe('pass { table } (the velocity table the orbit was fitted to) to draw the velocities with the orbit');
    // LVAC-7: 135 days = 11 periods, drawn against time; the long baseline (>200 periods) folded.
    expect(resultPlot(r.lvac7Orbit, { table: r.lvac7Table }).spec).toStrictEqual(plotVelocityCurve(r.lvac7Table, r.lvac7Orbit));
    expect(resultPlot(r.longOrbit, { table: r.longTable }).spec).toStrictEqual(plotPhaseFolded(r.longTable, r.longOrbit));
    expect(resultPlot(r.halpha, { spectrum: r.star }).spec).toStrictEqual(plotLineFit(r.halpha, { spectrum: r.star }));
    expect(resultPlot(r.ccf).spec).toStrictEqual(plotCrossCorrelation(r.ccf));
    expect(resultPlot(r.lineVelocities, { spectrum: r.velocityStar }).spec).toStrictEqual(plotLineVelocities(r.lineVelocities, { spectrum: r.velocityStar }));
  });
});

describe('velocity plots', () => {
  it('plotCrossCorrelation draws the CCF, the fitted Gaussian + constant and the measured velocity ± σ', () => {
    const spec = plotCrossCorrelation(r.ccf, { spectrum: r.velocityStar });
    const d = datasets(spec);
    expect(d.correlation.map((row) => row.x)).toEqual(Array.from(r.ccf.ccf.velocityKmPerS));
    const m = r.ccf.peak.model!;
    for (const row of d.peakModel) {
      expect(row.y).toBeCloseTo(m.baseline + m.amplitude * Math.exp(-0.5 * (((row.x as number) - m.centerKmPerS) / m.sigmaKmPerS) ** 2), 12);
      expect(row.x as number).toBeGreaterThanOrEqual(r.ccf.peak.fitRangeKmPerS[0]);
      expect(row.x as number).toBeLessThanOrEqual(r.ccf.peak.fitRangeKmPerS[1]);
    }
    const band = (spec.layer as { mark: { type: string }; data?: { values?: Rows } }[]).find((l) => l.mark.type === 'rect')!.data!.values![0];
    expect(band).toEqual({ low: r.ccf.velocity.value - r.ccf.velocity.uncertainty, high: r.ccf.velocity.value + r.ccf.velocity.uncertainty });
    expect(title(spec).text).toBe('LVAC-7: cross-correlation');
    expect(subtitleText(spec)).toBe(`2026-05-20 02:10:00 UTC\nv = ${formatMeasured(r.ccf.velocity.value, r.ccf.velocity.uncertainty, 'km/s')} (propagated) · peak height ${formatSignificant(r.ccf.peak.height, 3)} · Tonry–Davis r = ${formatSignificant(r.ccf.peak.tonryDavisR, 3)}`);
    expect(strings(spec)).toContain("Line-of-sight velocity, observer's frame (km/s)");
    // The synthetic star moves at +37.9 km/s (invented truth): within 3σ.
    expect(Math.abs(r.ccf.velocity.value - 37.9)).toBeLessThan(3 * r.ccf.velocity.uncertainty);
  });

  it('plotCrossCorrelation of a CCF without a velocity says why', async () => {
    const edge = crossCorrelationVelocity(r.velocityStar, r.velocityStar, { velocityRangeKmPerS: { min: 50, max: 400 } });
    expect(edge.converged).toBe(false);
    const spec = plotCrossCorrelation(edge);
    expect(title(spec).text).toBe('Cross-correlation (no velocity)');
    expect(subtitleText(spec)).toBe(`no velocity (${edge.reason}): ${edge.message}`);
    await expectValidSpec(spec);
  });

  it('plotLineVelocities draws every line with a velocity and the combined value', () => {
    const lv = r.lineVelocities;
    const spec = plotLineVelocities(lv, { spectrum: r.velocityStar });
    const rows = datasets(spec).lines;
    const fitted = lv.lines.filter((l) => l.velocityKmPerS !== null);
    expect(rows.map((row) => row.y)).toEqual(fitted.map((l) => l.velocityKmPerS!.value));
    expect(rows.map((row) => row.used)).toEqual(fitted.map((l) => l.status === 'used'));
    expect(rows.filter((row) => row.used)).toHaveLength(lv.linesUsed);
    const rule = (spec.layer as { mark: { type: string }; data?: { values?: Rows } }[]).find((l) => l.mark.type === 'rule' && l.data?.values)!;
    expect(rule.data!.values).toEqual([{ y: lv.velocity.value }]);
    expect(subtitleText(spec)).toContain(`${lv.lines.length - fitted.length} lines without a velocity not shown`);
  });
});
