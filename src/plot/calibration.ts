/**
 * Plot of a wavelength calibration: residuals of the lamp lines against wavelength, used
 * and rejected lines told apart, the RMS noted; optionally the dispersion solution itself.
 */
import { InputError } from '../errors.js';
import type { Medium } from '../spectrum/spectrum.js';
import { SPEED_OF_LIGHT_KM_PER_S, checkSize, finiteRange, formatFixed, isFiniteNumber, sampleFunction, topLevel, wavelengthTitle, type PlotOptions } from './common.js';
import { channel, curveLayer, horizontalRule, pointsWithErrorBars, rms, type AxisChannel } from './layers.js';
import { DASH, inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** One calibration line as matched and fitted. */
export interface CalibrationLinePoint {
  /** Reference (laboratory) wavelength of the line in Å, in the medium of the solution. */
  readonly wavelengthAngstrom: number;
  /** Residual in Å: wavelength given by the solution at the line's measured pixel minus the reference wavelength. */
  readonly residualAngstrom: number;
  /** 1-σ uncertainty of the residual in Å (from the centre's uncertainty), drawn as an error bar. */
  readonly uncertaintyAngstrom?: number;
  /** True when the line was used in the final fit; false when it was rejected. */
  readonly used: boolean;
  /** Measured centre in pixels; needed to draw the line on the dispersion-solution panel. */
  readonly pixel?: number;
  /** Name shown in the tooltip, e.g. `Ne I 6402.25`. */
  readonly label?: string;
}

/** The dispersion solution to draw above the residuals. */
export interface DispersionCurve {
  /** Wavelength in Å at a pixel position. */
  readonly wavelengthAtPixel: (pixel: number) => number;
  /** First and last pixel to draw. */
  readonly pixelRange: readonly [number, number];
}

/** What {@link calibrationResidualPlot} draws. Nothing is modified. */
export interface CalibrationResidualPlotData {
  /** The matched lines, used and rejected. Lines with a non-finite wavelength or residual are left out. */
  readonly lines: readonly CalibrationLinePoint[];
  /** Medium of the wavelengths, for the axis title. */
  readonly medium?: Medium;
  /** RMS of the used lines' residuals in Å, as reported by the fit; computed from the used lines when absent. */
  readonly rmsAngstrom?: number;
  /** When given, a panel above shows wavelength against pixel with the lines on it. */
  readonly dispersion?: DispersionCurve;
}

/** Options of {@link calibrationResidualPlot}. */
export interface CalibrationResidualPlotOptions extends PlotOptions {
  /** Residuals in Å (`angstrom`) or as velocities c·Δλ/λ in km/s (`kmPerS`); default `angstrom`. */
  residualUnit?: 'angstrom' | 'kmPerS';
  /** Height of the residual panel in px when the dispersion panel is shown (default from the theme, 100 × 1.6). */
  residualHeight?: number;
  /**
   * Which difference the residual axis shows: `solution-minus-reference` (default; the
   * sign of {@link CalibrationLinePoint.residualAngstrom}) or `reference-minus-solution`
   * (every residual negated, the sign of a dispersion solution's line table).
   */
  residualSign?: 'solution-minus-reference' | 'reference-minus-solution';
  /**
   * Keep the residual axis to the lines used (their residuals and error bars, and at least
   * ±3 RMS), so that one wild rejected line does not flatten the rest: rejected lines
   * beyond it are drawn at its edge with their value written beside them. Default false.
   */
  fitAxisToUsed?: boolean;
}

/**
 * Builds a Vega-Lite spec of calibration residuals against wavelength: used lines as
 * filled circles, rejected lines as crosses, error bars when given, a zero line and
 * dashed lines at ±RMS; the subtitle gives the RMS (in Å and km/s) and how many lines
 * were used. With `dispersion`, a panel above shows the solution (wavelength against
 * pixel) with the lines on it.
 *
 * Velocity residuals use the classical Doppler relation Δv = c·Δλ/λ with c =
 * 299 792.458 km/s (exact, SI); calibration residuals are far below the scale where the
 * relativistic formula differs.
 *
 * @param data lines, medium, RMS, optional dispersion solution (see {@link CalibrationResidualPlotData}).
 * @param options title (default `Wavelength calibration residuals`), subtitle (default:
 *   RMS and line counts), sizes, residual unit.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.empty` when no line has a finite wavelength and residual.
 * @throws {UsageError} `plot.bad-size` for sizes outside 20–10 000 px.
 * @example
 * const spec = calibrationResidualPlot({ lines: [
 *   { wavelengthAngstrom: 5852.49, residualAngstrom: 0.02, used: true },
 *   { wavelengthAngstrom: 6402.25, residualAngstrom: -0.4, used: false }] });
 * spec.$schema; // 'https://vega.github.io/schema/vega-lite/v5.json'
 */
export function calibrationResidualPlot(data: CalibrationResidualPlotData, options: CalibrationResidualPlotOptions = {}): VegaLiteSpec {
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const velocity = (options.residualUnit ?? 'angstrom') === 'kmPerS';
  const flip = options.residualSign === 'reference-minus-solution' ? -1 : 1;
  const colors = PLOT_THEME.colors;

  const rows: PlotDatum[] = [];
  for (const line of data.lines) {
    const w = line.wavelengthAngstrom;
    const r = flip * line.residualAngstrom;
    if (!isFiniteNumber(w) || !isFiniteNumber(r) || w <= 0) continue;
    const scale = velocity ? SPEED_OF_LIGHT_KM_PER_S / w : 1;
    const s = line.uncertaintyAngstrom;
    const ok = isFiniteNumber(s) && s > 0;
    rows.push({
      x: w,
      y: r * scale,
      low: ok ? (r - s) * scale : null,
      high: ok ? (r + s) * scale : null,
      used: line.used,
      pixel: isFiniteNumber(line.pixel) ? line.pixel : null,
      label: line.label ?? '',
      status: line.used ? 'used' : 'rejected',
    });
  }
  if (rows.length === 0) {
    throw new InputError('plot.empty', 'calibration residual plot: no line has a finite wavelength and residual, nothing to plot', { keyword: 'lines' });
  }
  const usedRows = rows.filter((r) => r.used);
  const rejectedRows = rows.filter((r) => !r.used);
  const usedCount = usedRows.length;
  const rmsA = isFiniteNumber(data.rmsAngstrom) ? data.rmsAngstrom : rms(usedRows.map((r) => (velocity ? ((r.y as number) * (r.x as number)) / SPEED_OF_LIGHT_KM_PER_S : (r.y as number))));
  const meanWavelength = usedCount ? usedRows.reduce((s, r) => s + (r.x as number), 0) / usedCount : NaN;
  const rmsKmPerS = (rmsA / meanWavelength) * SPEED_OF_LIGHT_KM_PER_S;
  const rmsShown = velocity ? rmsKmPerS : rmsA;

  const [lo, hi] = finiteRange(rows.map((r) => r.x as number));
  const pad = Math.max((hi - lo) * 0.03, 1);
  const xScale = { domain: [lo - pad, hi + pad], nice: false, zero: false };
  const xAxis: AxisChannel = { field: 'x', title: wavelengthTitle(data.medium), scale: xScale };
  const yTitle = `${flip > 0 ? 'Solution − reference' : 'Reference − solution'} (${velocity ? 'km/s' : 'Å'})`;
  // With fitAxisToUsed: the axis spans the used lines (and ±3 RMS) with 15 % room; rejected lines beyond sit on its edge.
  const offScale: PlotDatum[] = [];
  let yDomain: [number, number] | undefined;
  if (options.fitAxisToUsed && usedCount > 0) {
    let reach = isFiniteNumber(rmsShown) ? 3 * rmsShown : 0;
    for (const r of usedRows) for (const v of [r.y, r.low, r.high]) if (isFiniteNumber(v)) reach = Math.max(reach, Math.abs(v));
    if (reach > 0) {
      const limit = reach * 1.15;
      yDomain = [-limit, limit];
      for (const r of rejectedRows) {
        const y = r.y as number;
        if (Math.abs(y) <= limit) {
          // Error bars end at the edge too.
          if (r.low !== null) r.low = Math.max(r.low as number, -limit);
          if (r.high !== null) r.high = Math.min(r.high as number, limit);
          continue;
        }
        offScale.push({
          x: r.x, y: Math.sign(y) * limit, value: `${y > 0 ? '+' : '−'}${formatFixed(Math.abs(y), velocity ? 2 : 4)}`,
          // Written inside the panel: above a point on the lower edge, below one on the upper edge, leftwards near the right end.
          dy: y > 0 ? 9 : -9, align: (r.x as number) > lo + 0.8 * (hi - lo) ? 'right' : 'left', dx: (r.x as number) > lo + 0.8 * (hi - lo) ? -6 : 6,
        });
        r.y = Math.sign(y) * limit;
        r.low = null;
        r.high = null;
      }
    }
  }
  const yAxis: AxisChannel = { field: 'y', title: yTitle, ...(yDomain ? { scale: { domain: yDomain, nice: false } } : {}) };

  const legend: LegendEntry[] = [
    { name: 'Used', color: colors.used, symbol: 'point' },
    { name: 'Rejected', color: colors.rejected, symbol: 'cross' },
    { name: '±RMS', color: colors.reference, symbol: 'dashed' },
    ...(data.dispersion ? [{ name: 'Solution', color: colors.solution, symbol: 'line' as const }] : []),
  ];
  const tooltip = [
    { field: 'label', type: 'nominal', title: 'Line' },
    { field: 'x', type: 'quantitative', title: 'Wavelength (Å)', format: '.3f' },
    { field: 'y', type: 'quantitative', title: yAxis.title, format: velocity ? '.2f' : '.4f' },
    { field: 'status', type: 'nominal', title: 'Status' },
  ];
  const residualLayers: Record<string, unknown>[] = [horizontalRule(0)];
  if (isFiniteNumber(rmsShown)) {
    residualLayers.push(inSeries({
      data: { values: [{ y: rmsShown }, { y: -rmsShown }] },
      mark: { type: 'rule', strokeDash: [...DASH.dashed], strokeWidth: 1 },
      encoding: { y: channel(yAxis) },
    }, '±RMS', legend));
  }
  residualLayers.push(
    ...pointsWithErrorBars('lines', xAxis, yAxis, 'Used', legend, { rows: usedRows, filter: 'datum.used', tooltip }),
    ...pointsWithErrorBars('lines', xAxis, yAxis, 'Rejected', legend, { rows: rejectedRows, filter: '!datum.used', shape: 'cross', tooltip }),
  );
  if (offScale.length) {
    residualLayers.push({
      data: { values: offScale },
      mark: { type: 'text', baseline: 'middle', color: colors.rejected, align: { expr: 'datum.align' }, dx: { expr: 'datum.dx' }, dy: { expr: 'datum.dy' } },
      encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' }, text: { field: 'value', type: 'nominal' } },
    });
  }

  const subtitle = options.subtitle ??
    `RMS ${formatFixed(rmsA, 4)} Å (${formatFixed(rmsKmPerS, 2)} km/s) from ${usedCount} of ${rows.length} lines` +
    (rows.length - usedCount ? `; ${rows.length - usedCount} rejected` : '') +
    (offScale.length ? ` (${offScale.length} off the scale, value written)` : '');
  const datasets: Record<string, PlotDatum[]> = { lines: rows };
  const base = topLevel(options.title ?? 'Wavelength calibration residuals', subtitle, datasets, 'Calibration line residuals against wavelength.');

  if (!data.dispersion) {
    return { ...base, width, height, layer: residualLayers };
  }
  const [p0, p1] = data.dispersion.pixelRange;
  const curve = sampleFunction(data.dispersion.wavelengthAtPixel, p0, p1, 400);
  datasets.solution = curve.x.map((x, i) => ({ x, y: curve.y[i] }));
  const linePixels = rows.filter((r) => r.pixel !== null).map((r) => ({ x: r.pixel, y: r.x, used: r.used, label: r.label, status: r.status, low: null, high: null }));
  datasets.linePixels = linePixels;
  const pixelAxis: AxisChannel = { field: 'x', title: 'Pixel', scale: { domain: [Math.min(p0, p1), Math.max(p0, p1)], nice: false, zero: false } };
  const waveAxis: AxisChannel = { field: 'y', title: wavelengthTitle(data.medium), scale: { zero: false } };
  const residualHeight = checkSize('residualHeight', options.residualHeight, Math.round(PLOT_THEME.residualHeight * 1.6));
  return {
    ...base,
    spacing: 24,
    resolve: { scale: { x: 'independent', color: 'shared' } },
    vconcat: [
      {
        width,
        height,
        title: { text: 'Dispersion solution', fontSize: PLOT_THEME.axisTitleFontSize, fontWeight: 'normal' },
        layer: [
          curveLayer('solution', pixelAxis, waveAxis, 'Solution', legend, { strokeWidth: 1.5 }),
          ...pointsWithErrorBars('linePixels', pixelAxis, waveAxis, 'Used', legend, { rows: linePixels.filter((r) => r.used), filter: 'datum.used' }),
          ...pointsWithErrorBars('linePixels', pixelAxis, waveAxis, 'Rejected', legend, { rows: linePixels.filter((r) => !r.used), filter: '!datum.used', shape: 'cross' }),
        ],
      },
      {
        width,
        height: residualHeight,
        title: { text: 'Residuals', fontSize: PLOT_THEME.axisTitleFontSize, fontWeight: 'normal' },
        layer: residualLayers,
      },
    ],
  };
}
