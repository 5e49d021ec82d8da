// Public API of the plot area: Vega-Lite spec builders, theme, SVG rendering.
export { VEGA_LITE_SCHEMA_URL, VEGA_LITE_MIME_TYPE, isVegaLiteSpec, type VegaLiteSpec, type PlotDatum } from './spec.js';
export { OKABE_ITO, PLOT_THEME, vegaLiteConfig, type PlotTheme } from './theme.js';
export type { PlotOptions } from './common.js';
export { textWidthPx } from './textWidth.js';
export { placeLabels, type LabelAnchor, type PlacedLabel, type LabelPlacementOptions } from './labels.js';
export { spectrumPlot, spectrumPlotData, type SpectrumPlotData, type SpectrumPlotOptions, type MarkedLine, type ShadedWindow } from './spectrum.js';
export { lineFitPlot, type LineFitPlotData, type LineFitPlotOptions, type FitComponent, type FitCentre } from './lineFit.js';
export {
  calibrationResidualPlot,
  type CalibrationResidualPlotData,
  type CalibrationResidualPlotOptions,
  type CalibrationLinePoint,
  type DispersionCurve,
} from './calibration.js';
export { crossCorrelationPlot, type CrossCorrelationPlotData, type CrossCorrelationPeak, type CrossCorrelationPlotOptions } from './crossCorrelation.js';
export {
  velocityCurvePlot,
  phaseFoldedVelocityPlot,
  type VelocityCurvePlotData,
  type VelocityCurvePlotOptions,
  type PhaseFoldedPlotData,
  type PhaseFoldedPlotOptions,
} from './velocity.js';
export { lineVelocityPlot, type LineVelocityPlotData, type LineVelocityPoint } from './lineVelocity.js';
export { periodogramPlot, type PeriodogramPlotData, type PeriodogramPlotOptions, type FalseAlarmLevel } from './periodogram.js';
export { renderSvg, compileVegaLite, prefixSvgIds, type RenderOptions, type CompiledPlot } from './render.js';
export { plotSpectrum, plotFoundLines, type PlotSpectrumOptions, type PlotFoundLinesOptions } from './results/spectrum.js';
export { plotLineFit, type PlotLineFitOptions } from './results/line-fit.js';
export { plotCalibration, type PlotCalibrationOptions } from './results/calibration.js';
export { plotVelocityCurve, plotPhaseFolded, plotPeriodogram, falseAlarmLevel, type PlotPeriodogramOptions } from './results/orbit.js';
export { plotCrossCorrelation, plotLineVelocities, type PlotVelocityResultOptions } from './results/velocity.js';
export { resultPlot, FOLD_ABOVE_CYCLES, type ResultPlot } from './results/index.js';
