import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { calibrationResidualPlot } from '../../src/plot/calibration.js';
import { crossCorrelationPlot } from '../../src/plot/crossCorrelation.js';
import { lineFitPlot } from '../../src/plot/lineFit.js';
import { periodogramPlot } from '../../src/plot/periodogram.js';
import { VEGA_LITE_SCHEMA_URL, isVegaLiteSpec, type VegaLiteSpec } from '../../src/plot/spec.js';
import { spectrumPlot, spectrumPlotData } from '../../src/plot/spectrum.js';
import { phaseFoldedVelocityPlot, velocityCurvePlot } from '../../src/plot/velocity.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { deepFreeze, expectValidSpec, forSnapshot } from './contract.js';
import { builderCases, calibrationInput, crossCorrelationInput, lineFitInput, lineVelocityInput, orbitInput, periodogramInput, spectrumInput } from './fixtures.js';
import { lineVelocityPlot } from '../../src/plot/lineVelocity.js';

type Rows = Record<string, unknown>[];
const datasets = (spec: VegaLiteSpec) => spec.datasets as Record<string, Rows>;
const subtitle = (spec: VegaLiteSpec) => (spec.title as { subtitle?: string }).subtitle;
/** Every string in the spec: axis titles and legend names are found by searching them. */
const strings = (spec: unknown): string[] => JSON.stringify(spec).match(/"(?:[^"\\]|\\.)*"/g)?.map((s) => JSON.parse(s) as string) ?? [];

const builders = builderCases();

describe('every plot builder', () => {
  it.each(builders)('%s: validates against the Vega-Lite schema, compiles without warnings, matches its snapshot', async (_name, build) => {
    const spec = build();
    expect(spec.$schema).toBe(VEGA_LITE_SCHEMA_URL);
    expect(isVegaLiteSpec(spec)).toBe(true);
    await expectValidSpec(spec);
    expect(forSnapshot(spec)).toMatchSnapshot();
  });

  it.each(builders)('%s: builds the same spec twice (no hidden state)', (_name, build) => {
    expect(build()).toStrictEqual(build());
  });
});

describe('no builder modifies its input', () => {
  const cases: [string, () => unknown, (input: never) => unknown][] = [
    ['spectrumPlot', spectrumInput, (i) => spectrumPlot(i)],
    ['lineFitPlot', lineFitInput, (i) => lineFitPlot(i)],
    ['calibrationResidualPlot', calibrationInput, (i) => calibrationResidualPlot(i, { residualUnit: 'kmPerS' })],
    ['crossCorrelationPlot', crossCorrelationInput, (i) => crossCorrelationPlot(i)],
    ['velocityCurvePlot', orbitInput, (i) => velocityCurvePlot(i)],
    ['phaseFoldedVelocityPlot', orbitInput, (i) => phaseFoldedVelocityPlot(i)],
    ['periodogramPlot', periodogramInput, (i) => periodogramPlot(i)],
  ];
  it.each(cases)('%s', (_name, make, build) => {
    const input = deepFreeze(make());
    build(input as never); // frozen: any write would throw in strict mode
    expect(JSON.stringify(input)).toBe(JSON.stringify(make()));
  });
});

describe('axis titles carry units', () => {
  it.each([
    ['spectrum', spectrumPlot(spectrumInput()), ['Wavelength (Å, air)', 'Flux (ADU)']],
    ['line fit', lineFitPlot(lineFitInput()), ['Wavelength (Å, vacuum)', 'Flux (ADU)', 'Residual (σ)']],
    ['line fit, flux residuals', lineFitPlot(lineFitInput(), { residuals: 'flux' }), ['Residual (ADU)']],
    ['calibration', calibrationResidualPlot(calibrationInput()), ['Wavelength (Å, air)', 'Solution − reference (Å)', 'Pixel']],
    ['calibration km/s', calibrationResidualPlot(calibrationInput(), { residualUnit: 'kmPerS' }), ['Solution − reference (km/s)']],
    ['cross-correlation', crossCorrelationPlot(crossCorrelationInput()), ['Velocity shift (km/s)', 'Correlation (dimensionless)']],
    ['velocity curve', velocityCurvePlot(orbitInput()), ['BJD_TDB − 2460400 (days)', 'Radial velocity (km/s)', 'O − C (km/s)']],
    ['periodogram', periodogramPlot(periodogramInput()), ['Period (days)', 'Power (normalised)']],
    ['periodogram by frequency', periodogramPlot(periodogramInput(), { xAxis: 'frequency' }), ['Frequency (cycles/day)']],
    ['phase-folded', phaseFoldedVelocityPlot(orbitInput()), ['Orbital phase (cycles)', 'Radial velocity (km/s)']],
  ] as const)('%s', (_name, spec, titles) => {
    const all = strings(spec);
    for (const t of titles) expect(all).toContain(t);
  });

  it('says when the medium or flux unit is not stated', () => {
    const all = strings(spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [3, 4] }));
    expect(all).toContain('Wavelength (Å, medium not stated)');
    expect(all).toContain('Flux (arbitrary units)');
    expect(strings(spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 1], normalised: true }))).toContain('Normalised flux (continuum = 1)');
  });
});

describe('spectrumPlot', () => {
  it('leaves out masked and NaN pixels and breaks the line there', () => {
    const d = datasets(spectrumPlot(spectrumInput()));
    // Pixel 1 is masked and pixel 9 has NaN flux: three runs of good pixels.
    expect(d.spectrum.map((r) => r.wavelength)).toEqual([6550, 6554, 6556, 6558, 6560, 6562, 6564, 6566, 6570, 6572]);
    expect(d.spectrum.map((r) => r.segment)).toEqual([1, 2, 2, 2, 2, 2, 2, 2, 3, 3]);
    // Pixel 3 has σ = 0: no band there, so the band has one more break.
    expect(d.band.map((r) => r.segment)).toEqual([1, 2, 3, 3, 3, 3, 3, 4, 4]);
    expect(d.band[0]).toMatchObject({ wavelength: 6550, fluxLow: (d.spectrum[0].flux as number) - 2, fluxHigh: (d.spectrum[0].flux as number) + 2 });
    // The continuum is finite at pixel 9, so only the masked pixel breaks it.
    expect(d.continuum.map((r) => r.segment)).toEqual([1, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2]);
  });

  it('marks lines inside the range, puts close labels in separate rows and says how many', () => {
    const spec = spectrumPlot(spectrumInput());
    const lines = datasets(spec).lines;
    expect(lines.map((l) => l.label)).toEqual(['Hα', 'Close line', 'Left']);
    expect(lines[0].row).not.toBe(lines[1].row);
    expect(subtitle(spec)).toBe('10 pixels, 6550.0–6572.0 Å; 3 lines marked');
    expect((spec.vconcat as unknown[]).length).toBe(2);
  });

  it('draws a single panel without lines', () => {
    const spec = spectrumPlot({ wavelengthAngstrom: [1, 2, 3], flux: [1, 2, 3] });
    expect(spec.vconcat).toBeUndefined();
    expect(spec.layer).toBeDefined();
    expect(subtitle(spec)).toBe('3 pixels, 1.0–3.0 Å');
  });

  it('does not modify its input', () => {
    const input = deepFreeze(spectrumInput());
    const copy = structuredClone({ ...input, lines: input.lines });
    spectrumPlot(input);
    expect(input).toStrictEqual(copy);
  });

  it('takes a Spectrum in nm and converts it to Å', () => {
    const s = createSpectrum({ wavelength: [656, 656.3, 656.6], flux: [1, 0.5, 1], unit: 'nm', medium: 'vacuum', fluxUnit: 'erg/s/cm2/Å' });
    const data = spectrumPlotData(s, { lines: [{ wavelengthAngstrom: 6563, label: 'Hα' }] });
    expect(Array.from(data.wavelengthAngstrom)).toEqual([6560, 6563, 6566]);
    const spec = spectrumPlot(data);
    expect(strings(spec)).toContain('Wavelength (Å, vacuum)');
    expect(strings(spec)).toContain('Flux (erg/s/cm2/Å)');
    expect(() => spectrumPlotData(createSpectrum({ wavelength: [1, 2], flux: [1, 1], unit: 'pixel' }))).toThrow(UsageError);
  });

  it.each([
    [{ wavelengthAngstrom: [1, 2, 3], flux: [1, 2] }, InputError, 'spectrum plot: flux has 2 values but wavelengthAngstrom has 3'],
    [{ wavelengthAngstrom: [1, 2], flux: [1, 2], continuum: [1] }, InputError, 'spectrum plot: continuum has 1 values but wavelengthAngstrom has 2'],
    [{ wavelengthAngstrom: [], flux: [] }, InputError, 'spectrum plot: wavelengthAngstrom is empty, nothing to plot'],
    [{ wavelengthAngstrom: [1, 2], flux: [NaN, NaN] }, InputError, 'spectrum plot: no pixel has a finite wavelength and flux and a zero mask, nothing to plot'],
  ])('rejects bad input: %j', (input, type, message) => {
    expect(() => spectrumPlot(input)).toThrow(type);
    expect(() => spectrumPlot(input)).toThrow(message);
  });

  it('rejects a size outside 20–10 000 px', () => {
    expect(() => spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 2] }, { width: 5 })).toThrow(UsageError);
    expect(() => spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 2] }, { height: NaN })).toThrow('height must be a number of pixels from 20 to 10000, got NaN');
  });

  it('uses the title and subtitle given', () => {
    const spec = spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 2] }, { title: 'LVAC-7', subtitle: 'invented', width: 300, height: 100 });
    expect(spec.title).toEqual({ text: 'LVAC-7', subtitle: 'invented' });
    expect(spec.width).toBe(300);
    expect(spec.height).toBe(100);
  });
});

describe('lineFitPlot', () => {
  it('plots residuals data − model in units of σ by default when uncertainties are given', () => {
    const input = lineFitInput();
    const spec = lineFitPlot(input);
    const residuals = datasets(spec).residuals;
    const offsets = [0.1, -0.2, 0.15, -0.05, 0.3, -0.1, 0.05, -0.25, 0.2]; // data − model in the fixture; σ = 0.2
    residuals.forEach((r, i) => {
      expect(r.y).toBeCloseTo(offsets[i] / 0.2, 12);
      expect(r.high as number).toBeCloseTo((r.y as number) + 1, 12);
    });
    // RMS of offsets/σ: sqrt(7.0/9) = 0.88
    expect(subtitle(spec)).toBe('9 points; residual RMS 0.88 σ; centre 4999.500 ± 0.020 Å');
  });

  it('plots residuals in flux units on request, and without uncertainties', () => {
    const input = lineFitInput();
    const spec = lineFitPlot({ ...input, uncertainty: undefined });
    const residuals = datasets(spec).residuals;
    expect(residuals[4].y).toBeCloseTo(0.3, 12);
    expect(residuals[4].low).toBeNull();
    expect(strings(spec)).toContain('Residual (ADU)');
  });

  it('samples each curve over the data range, components added to the continuum, with unique legend names', () => {
    const input = lineFitInput();
    const curves = datasets(lineFitPlot(input, { samples: 50 })).curves;
    const series = [...new Set(curves.map((c) => c.series))];
    expect(series).toEqual(['Fe I', 'Fe I (2)', 'Continuum', 'Model']);
    const first = curves.filter((c) => c.series === 'Fe I');
    expect(first).toHaveLength(50);
    expect(first[0].x).toBe(4998);
    expect(first[49].x).toBe(5002);
    const at = first[20].x as number;
    expect(first[20].y).toBeCloseTo(input.continuum!(at) + input.components![0].flux(at), 12);
  });

  it('refuses residuals in σ without any uncertainty', () => {
    expect(() => lineFitPlot({ ...lineFitInput(), uncertainty: undefined }, { residuals: 'sigma' }))
      .toThrow('residuals in units of σ need a finite positive uncertainty for at least one data point');
    expect(datasets(lineFitPlot({ ...lineFitInput(), uncertainty: [0, 0, 0, 0, 0, 0, 0, 0, 0] })).residuals[0].low).toBeNull();
  });

  it('shares the wavelength axis between the fit and the residual panel', () => {
    const spec = lineFitPlot(lineFitInput());
    expect(spec.resolve).toEqual({ scale: { x: 'shared', color: 'shared' } });
    expect((spec.vconcat as unknown[]).length).toBe(2);
  });

  it('does not modify its input', () => {
    const input = deepFreeze(lineFitInput());
    lineFitPlot(input);
    expect(input.flux).toEqual(lineFitInput().flux);
  });
});

describe('calibrationResidualPlot', () => {
  it('computes the RMS from the used lines only and states it in Å and km/s', () => {
    const spec = calibrationResidualPlot(calibrationInput());
    // Used residuals 0.03, −0.04, 0.00 Å: RMS sqrt((0.0009 + 0.0016)/3) = 0.02887 Å; at their mean
    // wavelength 6237.53 Å that is 0.02887/6237.53 × 299792.458 = 1.39 km/s.
    expect(subtitle(spec)).toBe('RMS 0.0289 Å (1.39 km/s) from 3 of 4 lines; 1 rejected');
  });

  it('uses the RMS the fit reported when given', () => {
    expect(subtitle(calibrationResidualPlot({ ...calibrationInput(), rmsAngstrom: 0.05 }))).toMatch(/^RMS 0\.0500 Å /);
  });

  it('converts residuals to km/s with c·Δλ/λ', () => {
    const rows = datasets(calibrationResidualPlot(calibrationInput(), { residualUnit: 'kmPerS' })).lines;
    // c = 299 792.458 km/s (exact, SI)
    expect(rows[2].y).toBeCloseTo((0.5 / 6402.25) * 299792.458, 9);
    expect(rows[0].high).toBeCloseTo(((0.03 + 0.01) / 5852.49) * 299792.458, 9);
    expect(rows.map((r) => r.status)).toEqual(['used', 'used', 'rejected', 'used']);
  });

  it('draws the dispersion solution with the lines at their pixels', () => {
    const spec = calibrationResidualPlot(calibrationInput());
    const d = datasets(spec);
    expect(d.solution).toHaveLength(400);
    expect(d.solution[0]).toEqual({ x: 0, y: 5800 });
    expect(d.linePixels.map((r) => [r.x, r.y])).toEqual([[51.5, 5852.49], [336.2, 6143.06], [590, 6402.25], [899.9, 6717.04]]);
  });

  it('needs at least one usable line', () => {
    expect(() => calibrationResidualPlot({ lines: [{ wavelengthAngstrom: NaN, residualAngstrom: 0, used: true }] }))
      .toThrow('calibration residual plot: no line has a finite wavelength and residual, nothing to plot');
  });
});

describe('crossCorrelationPlot', () => {
  it('sorts by velocity, marks the fitted peak and draws the model over the half-maximum range', () => {
    const spec = crossCorrelationPlot(crossCorrelationInput());
    const d = datasets(spec);
    expect(d.correlation.map((r) => r.x)).toEqual([-40, -30, -20, -10, 0, 10, 20, 30, 40]);
    expect(subtitle(spec)).toBe('Peak at 4.10 ± 0.70 km/s');
    // The highest sample is at 0 km/s; the default range reaches 3 samples each side.
    expect(d.peakModel[0].x).toBe(-30);
    expect(d.peakModel[d.peakModel.length - 1].x).toBe(30);
  });

  it('marks the highest sample when no fitted peak is given', () => {
    expect(subtitle(crossCorrelationPlot({ ...crossCorrelationInput(), peak: undefined })))
      .toBe('Highest sample at 0.00 km/s (no fitted peak given)');
  });
});

describe('velocityCurvePlot and phaseFoldedVelocityPlot', () => {
  it('computes residuals observed − orbit and their RMS', () => {
    const spec = velocityCurvePlot(orbitInput());
    const residuals = datasets(spec).residuals;
    const offsets = [0.5, -1.2, 0.8, 0.1, -0.4, 1.5]; // observed − orbit in the fixture
    residuals.forEach((r, i) => expect(r.y).toBeCloseTo(offsets[i], 9));
    // sqrt((0.25 + 1.44 + 0.64 + 0.01 + 0.16 + 2.25)/6) = 0.89
    expect(subtitle(spec)).toBe('6 spectra over 6.8 days; residual RMS 0.89 km/s');
    expect(datasets(spec).velocities[0].x).toBeCloseTo(1.1, 9);
  });

  it('samples the orbit at 100 points per period across the time span', () => {
    const orbit = datasets(velocityCurvePlot(orbitInput())).orbit;
    // span 6.8 d + 2 × 0.5 d padding = 7.8 d = 3.12 periods of 2.5 d → 312 samples, at least 400.
    expect(orbit).toHaveLength(400);
  });

  it('folds on the period and repeats points near phase 0', () => {
    const spec = phaseFoldedVelocityPlot(orbitInput());
    const rows = datasets(spec).velocities;
    // (BJD − 2460400.25)/2.5 mod 1 for each time of the fixture
    expect(rows.filter((r) => !r.repeat).map((r) => Number((r.x as number).toFixed(9)))).toEqual([0.34, 0.82, 0.12, 0.78, 0.38, 0.06]);
    expect(rows.filter((r) => r.repeat).map((r) => Number((r.x as number).toFixed(9)))).toEqual([1.06]);
    expect(subtitle(spec)).toBe('P = 2.50000 days, phase 0 at BJD_TDB 2460400.2500; 6 spectra; residual RMS 0.89 km/s');
  });

  it('rejects a bad period, epoch or margin', () => {
    expect(() => phaseFoldedVelocityPlot({ ...orbitInput(), periodDays: 0 })).toThrow('the period must be a finite number of days above 0, got 0');
    expect(() => phaseFoldedVelocityPlot({ ...orbitInput(), epochBjdTdb: NaN })).toThrow(UsageError);
    expect(() => phaseFoldedVelocityPlot(orbitInput(), { phaseMargin: 0.7 })).toThrow('phaseMargin must be from 0 to 0.5 cycles, got 0.7');
  });

  it('rejects columns of different length', () => {
    expect(() => velocityCurvePlot({ bjdTdb: [1, 2], velocityKmPerS: [1] }))
      .toThrow('velocity curve plot: velocityKmPerS has 1 values but bjdTdb has 2');
  });
});

describe('periodogramPlot', () => {
  it('marks the highest peak by period and labels the false-alarm levels', () => {
    const spec = periodogramPlot(periodogramInput());
    expect(subtitle(spec)).toBe('Highest peak at P = 2.5000 days (0.40000 cycles/day), power 0.900');
    expect(datasets(spec).falseAlarm.map((r) => r.label)).toEqual(['FAP 1%', 'FAP 0.1%']);
    expect(datasets(spec).peak).toEqual([{ period: 2.5, power: 0.9, label: 'P = 2.5000 days' }]);
  });

  it('marks the chosen frequency when given', () => {
    const spec = periodogramPlot({ ...periodogramInput(), bestFrequencyPerDay: 0.6 }, { xAxis: 'frequency' });
    expect(datasets(spec).peak).toEqual([{ frequency: 0.6, power: 0.3, label: 'P = 1.6667 days' }]);
    // At the right end of the axis the label goes to the left of the marker, inside the plot.
    const label = (spec.layer as { mark: { type: string; fontWeight?: string; align?: string } }[]).find((l) => l.mark.type === 'text' && l.mark.fontWeight === 'bold');
    expect(label?.mark.align).toBe('right');
    const left = (periodogramPlot(periodogramInput()).layer as { mark: { type: string; fontWeight?: string; align?: string } }[]).find((l) => l.mark.type === 'text' && l.mark.fontWeight === 'bold');
    expect(left?.mark.align).toBe('left');
  });

  it('rejects a false-alarm probability outside (0, 1)', () => {
    expect(() => periodogramPlot({ ...periodogramInput(), falseAlarmLevels: [{ probability: 1, power: 0.5 }] }))
      .toThrow('a false-alarm probability must be between 0 and 1, got 1');
  });
});

describe('options the result plots use', () => {
  it('spectrumPlot shades windows, clipped to the data range, under a legend entry', async () => {
    const spec = spectrumPlot({ ...spectrumInput(), windows: [{ startAngstrom: 6560, endAngstrom: 6566 }, { startAngstrom: 6540, endAngstrom: 6552 }, { startAngstrom: 7000, endAngstrom: 7010 }], windowLabel: 'Fit window' });
    expect(datasets(spec).windows).toEqual([{ start: 6560, end: 6566 }, { start: 6550, end: 6552 }]);
    expect(strings(spec)).toContain('Fit window');
    await expectValidSpec(spec);
  });

  it('spectrumPlot with labelOverflow "drop" keeps the lines of highest priority whose labels fit', () => {
    // 40 labels crowded into 20 Å cannot all fit in 1 row: the two of highest priority stay, as far apart as they need.
    const lines = Array.from({ length: 40 }, (_, i) => ({ wavelengthAngstrom: 6552 + 0.5 * i, label: `Line ${i}`, priority: i === 5 ? 10 : i === 30 ? 9 : 0 }));
    const spec = spectrumPlot({ ...spectrumInput(), lines }, { labelOverflow: 'drop', maxLabelRows: 1 });
    const kept = datasets(spec).lines.map((l) => l.label);
    expect(kept).toContain('Line 5');
    expect(kept).toContain('Line 30');
    expect(datasets(spec).lines.every((l) => l.row === 0)).toBe(true);
    expect(subtitle(spec)).toBe(`10 pixels, 6550.0–6572.0 Å; ${kept.length} lines marked, ${40 - kept.length} more left out for lack of room`);
    // The default keeps every label, overlapping.
    expect(datasets(spectrumPlot({ ...spectrumInput(), lines }, { maxLabelRows: 1 })).lines).toHaveLength(40);
  });

  it('lineFitPlot on a pixel axis says so', () => {
    const spec = lineFitPlot({ ...lineFitInput(), unit: 'pixel', centres: [{ wavelengthAngstrom: 4999.5, uncertaintyAngstrom: 0.02 }] });
    expect(strings(spec)).toContain('Pixel');
    expect(subtitle(spec)).toMatch(/centre 4999\.500 ± 0\.020 pixels$/);
  });

  it('calibrationResidualPlot: the other sign, and the axis fitted to the lines used', async () => {
    const flipped = calibrationResidualPlot(calibrationInput(), { residualSign: 'reference-minus-solution' });
    expect(strings(flipped)).toContain('Reference − solution (Å)');
    expect(datasets(flipped).lines.map((l) => l.y)).toEqual(datasets(calibrationResidualPlot(calibrationInput())).lines.map((l) => -(l.y as number)));
    const fitted = calibrationResidualPlot({ ...calibrationInput(), dispersion: undefined }, { fitAxisToUsed: true });
    // Used lines reach 0.04 + 0.02 = 0.06 Å with their error bars, less than 3 RMS (RMS of 0.03, −0.04, 0 = 0.0289 Å):
    // the axis ends at 1.15 × 3 × RMS, and the rejected 0.5 Å line sits on its edge.
    const limit = 1.15 * 3 * Math.sqrt((0.03 ** 2 + 0.04 ** 2 + 0) / 3);
    const layers = fitted.layer as { encoding?: { y?: { scale?: { domain?: number[] } } }; mark: { type: string }; data?: { values?: Record<string, unknown>[] } }[];
    const domain = layers.map((l) => l.encoding?.y?.scale?.domain).find(Boolean)!;
    expect(domain).toEqual([-limit, limit].map((v) => expect.closeTo(v, 12)));
    expect(datasets(fitted).lines.find((l) => !l.used)?.y).toBeCloseTo(limit, 12);
    expect(layers.find((l) => l.mark.type === 'text')?.data?.values?.[0].value).toBe('+0.5000');
    expect(subtitle(fitted)).toContain('(1 off the scale, value written)');
    await expectValidSpec(fitted);
  });

  it('periodogramPlot names the marked peak as told', () => {
    const spec = periodogramPlot({ ...periodogramInput(), bestFrequencyPerDay: 0.4 }, { peakName: 'Highest peak' });
    expect(strings(spec)).toContain('Highest peak');
    expect(strings(spec)).not.toContain('Chosen peak');
  });
});

describe('lineVelocityPlot', () => {
  it('draws used and rejected lines against their rest wavelength and the combined velocity with its band', () => {
    const spec = lineVelocityPlot(lineVelocityInput());
    const rows = datasets(spec).lines;
    expect(rows.map((r) => r.x)).toEqual([4861.33, 5183.6, 5269.54, 6562.8]);
    expect(rows.map((r) => r.status)).toEqual(['used', 'used', 'rejected', 'used']);
    expect(rows[3]).toMatchObject({ low: null, high: null });
    expect(subtitle(spec)).toBe('v = 12.40 ± 0.60 km/s from 3 of 4 lines');
    const band = (spec.layer as { mark: { type: string }; data?: { values?: unknown[] } }[]).find((l) => l.mark.type === 'rect');
    expect(band?.data?.values).toEqual([{ low: 12.4 - 0.6, high: 12.4 + 0.6 }]);
    expect(strings(spec)).toContain('Rest wavelength (Å, air)');
  });

  it('refuses a list without any finite line, and does not modify its input', () => {
    expect(() => lineVelocityPlot({ lines: [{ restWavelengthAngstrom: 5000, velocityKmPerS: NaN, used: false }] }))
      .toThrow('line velocity plot: no line has a finite wavelength and velocity, nothing to plot');
    const input = deepFreeze(lineVelocityInput());
    lineVelocityPlot(input);
    expect(JSON.stringify(input)).toBe(JSON.stringify(lineVelocityInput()));
  });
});
