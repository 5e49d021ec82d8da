/**
 * Small fixed inputs for the plot builders' tests (invented numbers, chosen by hand so
 * that snapshots stay short and every feature of each plot is present).
 */
import { calibrationResidualPlot, type CalibrationResidualPlotData } from '../../src/plot/calibration.js';
import { crossCorrelationPlot, type CrossCorrelationPlotData } from '../../src/plot/crossCorrelation.js';
import { lineFitPlot, type LineFitPlotData } from '../../src/plot/lineFit.js';
import { lineVelocityPlot, type LineVelocityPlotData } from '../../src/plot/lineVelocity.js';
import { periodogramPlot, type PeriodogramPlotData } from '../../src/plot/periodogram.js';
import type { VegaLiteSpec } from '../../src/plot/spec.js';
import { spectrumPlot, type SpectrumPlotData } from '../../src/plot/spectrum.js';
import { phaseFoldedVelocityPlot, velocityCurvePlot, type PhaseFoldedPlotData } from '../../src/plot/velocity.js';

export const gaussian = (x: number, centre: number, sigma: number) => Math.exp(-0.5 * ((x - centre) / sigma) ** 2);

export function spectrumInput(): SpectrumPlotData {
  const wavelengthAngstrom = [6550, 6552, 6554, 6556, 6558, 6560, 6562, 6564, 6566, 6568, 6570, 6572];
  const continuum = wavelengthAngstrom.map((w) => 100 + 0.5 * (w - 6550));
  const flux = continuum.map((c, i) => c * (1 - 0.6 * gaussian(wavelengthAngstrom[i], 6562.8, 3)));
  flux[9] = NaN; // a missing pixel breaks the line
  return {
    wavelengthAngstrom,
    flux,
    uncertainty: flux.map((f, i) => (i === 3 ? 0 : 2)), // pixel 3: no valid σ, no band there
    mask: wavelengthAngstrom.map((_, i) => (i === 1 ? 1 : 0)),
    continuum,
    medium: 'air',
    fluxUnit: 'ADU',
    lines: [
      { wavelengthAngstrom: 6562.8, label: 'Hα' },
      { wavelengthAngstrom: 6563.5, label: 'Close line' },
      { wavelengthAngstrom: 6551.0, label: 'Left' },
      { wavelengthAngstrom: 7000, label: 'Outside' },
    ],
  };
}

export function lineFitInput(): LineFitPlotData {
  const continuum = (w: number) => 10 + 0.1 * (w - 5000);
  const a = (w: number) => -4 * gaussian(w, 4999.5, 0.4);
  const b = (w: number) => -2 * gaussian(w, 5000.6, 0.5);
  const model = (w: number) => continuum(w) + a(w) + b(w);
  const wavelengthAngstrom = [4998, 4998.5, 4999, 4999.5, 5000, 5000.5, 5001, 5001.5, 5002];
  const offsets = [0.1, -0.2, 0.15, -0.05, 0.3, -0.1, 0.05, -0.25, 0.2];
  return {
    wavelengthAngstrom,
    flux: wavelengthAngstrom.map((w, i) => model(w) + offsets[i]),
    uncertainty: wavelengthAngstrom.map(() => 0.2),
    model,
    continuum,
    components: [{ label: 'Fe I', flux: a }, { label: 'Fe I', flux: b }],
    centres: [{ wavelengthAngstrom: 4999.5, uncertaintyAngstrom: 0.02 }],
    medium: 'vacuum',
    fluxUnit: 'ADU',
  };
}

export function calibrationInput(): CalibrationResidualPlotData {
  return {
    medium: 'air',
    lines: [
      { wavelengthAngstrom: 5852.49, residualAngstrom: 0.03, uncertaintyAngstrom: 0.01, used: true, pixel: 51.5, label: 'Ne I 5852.49' },
      { wavelengthAngstrom: 6143.06, residualAngstrom: -0.04, uncertaintyAngstrom: 0.02, used: true, pixel: 336.2, label: 'Ne I 6143.06' },
      { wavelengthAngstrom: 6402.25, residualAngstrom: 0.5, used: false, pixel: 590.0, label: 'Ne I 6402.25' },
      { wavelengthAngstrom: 6717.04, residualAngstrom: 0.0, used: true, pixel: 899.9, label: 'Ne I 6717.04' },
      { wavelengthAngstrom: NaN, residualAngstrom: 0.1, used: true },
    ],
    dispersion: { wavelengthAtPixel: (p) => 5800 + 1.02 * p - 1.5e-5 * p * p, pixelRange: [0, 1000] },
  };
}

export function crossCorrelationInput(): CrossCorrelationPlotData {
  const velocityKmPerS = [40, -40, -30, -20, -10, 0, 10, 20, 30];
  return {
    velocityKmPerS,
    correlation: velocityKmPerS.map((v) => 0.1 + 0.8 * gaussian(v, 4, 9)),
    peak: { velocityKmPerS: 4.1, uncertaintyKmPerS: 0.7, model: (v) => 0.1 + 0.8 * gaussian(v, 4.1, 9) },
  };
}

export function orbitInput(): PhaseFoldedPlotData {
  const periodDays = 2.5;
  const epochBjdTdb = 2460400.25;
  const orbitVelocityKmPerS = (t: number) => -5 + 30 * Math.sin((2 * Math.PI * (t - epochBjdTdb)) / periodDays);
  const bjdTdb = [2460401.1, 2460402.3, 2460403.05, 2460404.7, 2460406.2, 2460407.9];
  const offsets = [0.5, -1.2, 0.8, 0.1, -0.4, 1.5];
  return {
    bjdTdb,
    velocityKmPerS: bjdTdb.map((t, i) => orbitVelocityKmPerS(t) + offsets[i]),
    uncertaintyKmPerS: [1, 1.2, 0.9, 1.1, 1, 1.3],
    orbitVelocityKmPerS,
    systemicVelocityKmPerS: -5,
    periodDays,
    epochBjdTdb,
  };
}

export function periodogramInput(): PeriodogramPlotData {
  const frequencyPerDay = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6];
  return {
    frequencyPerDay,
    power: [0.05, 0.2, 0.1, 0.9, 0.15, 0.3],
    falseAlarmLevels: [{ probability: 0.01, power: 0.5 }, { probability: 0.001, power: 0.62 }],
  };
}

export function lineVelocityInput(): LineVelocityPlotData {
  return {
    medium: 'air',
    meanVelocityKmPerS: 12.4,
    meanUncertaintyKmPerS: 0.6,
    lines: [
      { restWavelengthAngstrom: 4861.33, velocityKmPerS: 12.9, uncertaintyKmPerS: 1.5, used: true, label: 'H I 4861.33' },
      { restWavelengthAngstrom: 5183.6, velocityKmPerS: 11.8, uncertaintyKmPerS: 0.9, used: true, label: 'Mg I 5183.60' },
      { restWavelengthAngstrom: 5269.54, velocityKmPerS: 19.5, uncertaintyKmPerS: 1.1, used: false, label: 'Fe I 5269.54 (outlier)' },
      { restWavelengthAngstrom: 6562.8, velocityKmPerS: 12.6, used: true, label: 'H I 6562.80' },
      { restWavelengthAngstrom: 5890, velocityKmPerS: NaN, used: false, label: 'Na I 5889.95 (not fitted)' },
    ],
  };
}

/** One case per builder and variant: a name and a function building the spec from the fixtures. */
export function builderCases(): [string, () => VegaLiteSpec][] {
  return [
    ['spectrum', () => spectrumPlot(spectrumInput())],
    ['spectrum without lines', () => spectrumPlot({ ...spectrumInput(), lines: undefined, continuum: undefined, uncertainty: undefined })],
    ['line fit', () => lineFitPlot(lineFitInput())],
    ['line fit, flux residuals', () => lineFitPlot(lineFitInput(), { residuals: 'flux' })],
    ['calibration residuals', () => calibrationResidualPlot({ ...calibrationInput(), dispersion: undefined })],
    ['calibration residuals in km/s with dispersion solution', () => calibrationResidualPlot(calibrationInput(), { residualUnit: 'kmPerS' })],
    ['cross-correlation', () => crossCorrelationPlot(crossCorrelationInput())],
    ['cross-correlation without fitted peak', () => crossCorrelationPlot({ ...crossCorrelationInput(), peak: undefined })],
    ['velocity curve', () => velocityCurvePlot(orbitInput())],
    ['velocity curve without orbit or uncertainties', () => velocityCurvePlot({ ...orbitInput(), orbitVelocityKmPerS: undefined, systemicVelocityKmPerS: undefined, uncertaintyKmPerS: undefined })],
    ['calibration residuals, all lines used, no uncertainties', () => calibrationResidualPlot({ lines: calibrationInput().lines.filter((l) => l.used).map((l) => ({ ...l, uncertaintyAngstrom: undefined })) })],
    ['line fit without uncertainties', () => lineFitPlot({ ...lineFitInput(), uncertainty: undefined })],
    ['periodogram by period', () => periodogramPlot(periodogramInput())],
    ['periodogram by frequency', () => periodogramPlot(periodogramInput(), { xAxis: 'frequency' })],
    ['phase-folded velocities', () => phaseFoldedVelocityPlot(orbitInput())],
    ['line velocities', () => lineVelocityPlot(lineVelocityInput())],
    ['line velocities without a combined value', () => lineVelocityPlot({ ...lineVelocityInput(), meanVelocityKmPerS: undefined, meanUncertaintyKmPerS: undefined })],
  ];
}
