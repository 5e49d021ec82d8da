/**
 * Plot of a cross-correlation function against velocity shift, with its peak marked and
 * the model fitted to the peak.
 */
import { InputError } from '../errors.js';
import { checkColumns, checkSize, finiteRange, formatWithError, isFiniteNumber, sampleFunction, topLevel, type PlotOptions } from './common.js';
import { channel, curveLayer, type AxisChannel } from './layers.js';
import { DASH, inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** The fitted peak of a cross-correlation function. */
export interface CrossCorrelationPeak {
  /** Velocity shift of the peak in km/s. */
  readonly velocityKmPerS: number;
  /** 1-σ uncertainty of the peak velocity in km/s, drawn as a shaded band. */
  readonly uncertaintyKmPerS?: number;
  /** The fitted peak model (e.g. a Gaussian on a baseline) at a velocity in km/s, in correlation units. */
  readonly model?: (velocityKmPerS: number) => number;
  /**
   * Velocity range in km/s over which the model was fitted and is drawn. Default: from the
   * highest sample out to where the correlation falls half way to its lowest value, and at
   * least 3 samples each side.
   */
  readonly fitRangeKmPerS?: readonly [number, number];
}

/** What {@link crossCorrelationPlot} draws. Arrays are not modified; non-finite samples are left out. */
export interface CrossCorrelationPlotData {
  /** Velocity shift of each sample in km/s (positive = template shifted to the red). */
  readonly velocityKmPerS: ArrayLike<number>;
  /** Correlation value of each sample (dimensionless, e.g. normalised to 1 for a perfect match). */
  readonly correlation: ArrayLike<number>;
  /** The fitted peak; when absent, the highest sample is marked. */
  readonly peak?: CrossCorrelationPeak;
}

/** Options of {@link crossCorrelationPlot}. */
export interface CrossCorrelationPlotOptions extends PlotOptions {
  /** Title of the velocity axis (default `Velocity shift (km/s)`; e.g. the line-of-sight velocity when the template's own velocity is included). */
  velocityTitle?: string;
}

/**
 * Builds a Vega-Lite spec of a cross-correlation function: the correlation against
 * velocity shift (line with sample points), the fitted peak model over its fit range
 * (dashed), the peak velocity as a rule with a ±1σ band, and the value in the subtitle.
 *
 * @param data velocities in km/s, correlation values, fitted peak (see {@link CrossCorrelationPlotData}).
 * @param options title (default `Cross-correlation`), subtitle (default: the peak
 *   velocity ± σ), sizes.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.length-mismatch`, `plot.empty`, `plot.no-finite-data`.
 * @throws {UsageError} `plot.bad-size`.
 * @example
 * const v = [-20, -10, 0, 10, 20];
 * const spec = crossCorrelationPlot({ velocityKmPerS: v, correlation: [0.1, 0.5, 0.9, 0.5, 0.1],
 *   peak: { velocityKmPerS: 0.2, uncertaintyKmPerS: 0.4 } });
 * (spec.title as { subtitle: string }).subtitle; // 'Peak at 0.20 ± 0.40 km/s'
 */
export function crossCorrelationPlot(data: CrossCorrelationPlotData, options: CrossCorrelationPlotOptions = {}): VegaLiteSpec {
  const n = checkColumns('cross-correlation plot', { velocityKmPerS: data.velocityKmPerS, correlation: data.correlation });
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const colors = PLOT_THEME.colors;

  const rows: PlotDatum[] = [];
  for (let i = 0; i < n; i++) {
    const v = data.velocityKmPerS[i];
    const c = data.correlation[i];
    if (isFiniteNumber(v) && isFiniteNumber(c)) rows.push({ x: v, y: c });
  }
  rows.sort((a, b) => (a.x as number) - (b.x as number));
  let best = -1;
  rows.forEach((r, i) => {
    if (best < 0 || (r.y as number) > (rows[best].y as number)) best = i;
  });
  if (rows.length === 0) {
    throw new InputError('plot.no-finite-data', 'cross-correlation plot: no sample has a finite velocity and correlation, nothing to plot', { keyword: 'correlation' });
  }
  const [vLo, vHi] = finiteRange(rows.map((r) => r.x as number));
  const xScale = { domain: vLo === vHi ? [vLo - 1, vHi + 1] : [vLo, vHi], nice: false, zero: false };
  const xAxis: AxisChannel = { field: 'x', title: options.velocityTitle ?? 'Velocity shift (km/s)', scale: xScale };
  const yAxis: AxisChannel = { field: 'y', title: 'Correlation (dimensionless)', scale: { zero: false } };

  const peak = data.peak;
  const peakVelocity = peak && isFiniteNumber(peak.velocityKmPerS) ? peak.velocityKmPerS : (rows[best].x as number);
  const sigma = peak?.uncertaintyKmPerS;
  const hasBand = isFiniteNumber(sigma) && sigma > 0;

  const legend: LegendEntry[] = [
    { name: 'Correlation', color: colors.data, symbol: 'line' },
    ...(peak?.model ? [{ name: 'Peak model', color: colors.model, symbol: 'dashed' as const }] : []),
    { name: peak ? 'Fitted peak' : 'Highest sample', color: colors.peak, symbol: 'rule' },
  ];
  const peakName = legend[legend.length - 1].name;
  const datasets: Record<string, PlotDatum[]> = { correlation: rows };
  const layers: Record<string, unknown>[] = [];
  if (hasBand) {
    layers.push({
      data: { values: [{ low: peakVelocity - sigma, high: peakVelocity + sigma }] },
      mark: { type: 'rect', color: colors.peak, opacity: 0.15 },
      encoding: { x: { field: 'low', type: 'quantitative', scale: xScale, title: xAxis.title }, x2: { field: 'high' } },
    });
  }
  layers.push(
    inSeries({
      data: { values: [{ x: peakVelocity }] },
      mark: { type: 'rule', strokeDash: [...DASH.rule], strokeWidth: 1.3 },
      encoding: { x: channel(xAxis) },
    }, peakName, legend),
    curveLayer('correlation', xAxis, yAxis, 'Correlation', legend, { strokeWidth: 1.4 }),
    inSeries({
      data: { name: 'correlation' },
      mark: { type: 'point', filled: true, size: 12, opacity: 0.9 },
      encoding: { x: channel(xAxis), y: channel(yAxis) },
    }, 'Correlation', legend),
  );
  if (peak?.model) {
    const range = peak.fitRangeKmPerS ?? defaultFitRange(rows, best);
    const curve = sampleFunction(peak.model, Math.max(range[0], vLo), Math.min(range[1], vHi), 300);
    datasets.peakModel = curve.x.map((x, i) => ({ x, y: curve.y[i] }));
    layers.push(curveLayer('peakModel', xAxis, yAxis, 'Peak model', legend, { strokeDash: DASH.dashed, strokeWidth: 2 }));
  }
  const subtitle = options.subtitle ??
    (peak ? `Peak at ${formatWithError(peakVelocity, sigma, 2)} km/s` : `Highest sample at ${formatWithError(peakVelocity, undefined, 2)} km/s (no fitted peak given)`);
  return { ...topLevel(options.title ?? 'Cross-correlation', subtitle, datasets, 'Cross-correlation function against velocity shift.'), width, height, layer: layers };
}

/** Velocity range around the highest sample: out to where the correlation falls to half way between the peak and the lowest value, at least 3 samples each side. */
function defaultFitRange(rows: readonly PlotDatum[], best: number): [number, number] {
  const ys = rows.map((r) => r.y as number);
  const floor = Math.min(...ys);
  const half = (ys[best] + floor) / 2;
  let i = best;
  while (i > 0 && (ys[i] > half || best - i < 3)) i--;
  let j = best;
  while (j < rows.length - 1 && (ys[j] > half || j - best < 3)) j++;
  return [rows[i].x as number, rows[j].x as number];
}
