/**
 * Plot of a line-profile fit: data with error bars, the model, each component, the
 * continuum, and the residuals in a panel beneath with the same wavelength axis.
 */
import { InputError, UsageError } from '../errors.js';
import type { Medium } from '../spectrum/spectrum.js';
import { checkColumns, checkSize, finiteRange, fluxTitle, formatFixed, formatWithError, isFiniteNumber, sampleFunction, topLevel, wavelengthTitle, type PlotOptions } from './common.js';
import { channel, curveLayer, horizontalRule, pointRows, pointsWithErrorBars, rms, type AxisChannel } from './layers.js';
import { DASH, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** One component of a fitted model (one line profile), as a function of wavelength. */
export interface FitComponent {
  /** Legend name, e.g. `Hα` or `Gaussian 1`. */
  readonly label: string;
  /** The component's own contribution at a wavelength in Å (without continuum), in flux units; negative for absorption. */
  readonly flux: (wavelengthAngstrom: number) => number;
}

/** A fitted line centre to mark. */
export interface FitCentre {
  /** Fitted centre in Å. */
  readonly wavelengthAngstrom: number;
  /** 1-σ uncertainty of the centre in Å, drawn as a shaded band. */
  readonly uncertaintyAngstrom?: number;
}

/**
 * What {@link lineFitPlot} draws. Arrays have one value per data point and are not
 * modified. Points with a non-finite wavelength or flux are left out; a point without a
 * finite positive uncertainty gets no error bar (and no normalised residual).
 */
export interface LineFitPlotData {
  /** Wavelength of each data point in Å. */
  readonly wavelengthAngstrom: ArrayLike<number>;
  /** Flux of each data point. */
  readonly flux: ArrayLike<number>;
  /** 1-σ flux uncertainty of each data point. */
  readonly uncertainty?: ArrayLike<number>;
  /** The whole fitted model (continuum plus every component) at a wavelength in Å. */
  readonly model: (wavelengthAngstrom: number) => number;
  /** The fitted continuum at a wavelength in Å. */
  readonly continuum?: (wavelengthAngstrom: number) => number;
  /** The model's components; each is drawn added to the continuum (when given) so that it sits where it would lie alone. */
  readonly components?: readonly FitComponent[];
  /** Fitted centres to mark with a rule and ±1σ band. */
  readonly centres?: readonly FitCentre[];
  /** Medium of the wavelengths, for the axis title. */
  readonly medium?: Medium;
  /**
   * Unit of the horizontal axis: `angstrom` (default) or `pixel` for a fit on an
   * uncalibrated axis (a lamp line before calibration); every length field is then in
   * pixels despite its name.
   */
  readonly unit?: 'angstrom' | 'pixel';
  /** Flux unit for the axis titles; null or absent = arbitrary units. */
  readonly fluxUnit?: string | null;
  /** True when the flux is continuum-normalised. */
  readonly normalised?: boolean;
}

/** Options of {@link lineFitPlot}. */
export interface LineFitPlotOptions extends PlotOptions {
  /**
   * Residual panel in flux units (`flux`: data − model) or in units of each point's σ
   * (`sigma`: (data − model)/σ, points without a valid σ left out). Default: `sigma` when
   * some point has a finite positive uncertainty, else `flux`.
   */
  residuals?: 'flux' | 'sigma';
  /** Points at which the model curves are sampled across the data range (default 600, at most 20 000). */
  samples?: number;
  /** Height of the residual panel in px (default from the theme, 100). */
  residualHeight?: number;
}

const DEFAULT_SAMPLES = 600;

/**
 * Builds a Vega-Lite spec of a line fit: data points with 1-σ error bars, the model
 * (solid), each component added to the continuum (dotted), the continuum (dashed), fitted
 * centres (rule with ±1σ band), and beneath, with the same wavelength axis, the residuals
 * data − model (or (data − model)/σ) with their error bars and a zero line. The model
 * functions are sampled on a fine grid so that narrow profiles look smooth.
 *
 * @param data data points, model functions, medium and unit (see {@link LineFitPlotData}).
 * @param options title (default `Line fit`), subtitle (default: point count and residual
 *   RMS), sizes, residual units, sampling.
 * @returns a Vega-Lite spec (vconcat of fit panel and residual panel).
 * @throws {InputError} `plot.length-mismatch`, `plot.empty`, `plot.no-finite-data`.
 * @throws {UsageError} `plot.bad-size` for sizes outside 20–10 000 px; `plot.no-uncertainty` for
 *   σ residuals without any uncertainty.
 * @example
 * const spec = lineFitPlot({ wavelengthAngstrom: [6560, 6562, 6564], flux: [1, 0.5, 1],
 *   model: (w) => 1 - 0.5 * Math.exp(-0.5 * ((w - 6562) / 0.8) ** 2) });
 * (spec.vconcat as unknown[]).length; // 2
 */
export function lineFitPlot(data: LineFitPlotData, options: LineFitPlotOptions = {}): VegaLiteSpec {
  checkColumns('line fit plot', { wavelengthAngstrom: data.wavelengthAngstrom, flux: data.flux, uncertainty: data.uncertainty });
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const residualHeight = checkSize('residualHeight', options.residualHeight, PLOT_THEME.residualHeight);
  const samples = Math.min(20_000, Math.max(2, Math.round(options.samples ?? DEFAULT_SAMPLES)));
  const colors = PLOT_THEME.colors;
  const points = pointRows(data.wavelengthAngstrom, data.flux, data.uncertainty);
  if (points.length === 0) {
    throw new InputError('plot.no-finite-data', 'line fit plot: no data point has a finite wavelength and flux, nothing to plot', { keyword: 'flux' });
  }
  const hasSigma = points.some((p) => p.low !== null);
  const residualMode = options.residuals ?? (hasSigma ? 'sigma' : 'flux');
  if (residualMode === 'sigma' && !hasSigma) {
    throw new UsageError('plot.no-uncertainty', 'residuals in units of σ need a finite positive uncertainty for at least one data point', { keyword: 'residuals' });
  }
  const residualRows: PlotDatum[] = [];
  for (const p of points) {
    const m = data.model(p.x as number);
    if (!isFiniteNumber(m)) continue;
    const r = (p.y as number) - m;
    const sigma = p.low === null ? NaN : (p.high as number) - (p.y as number);
    if (residualMode === 'sigma') {
      if (Number.isFinite(sigma)) residualRows.push({ x: p.x, y: r / sigma, low: r / sigma - 1, high: r / sigma + 1 });
    } else {
      residualRows.push({ x: p.x, y: r, low: Number.isFinite(sigma) ? r - sigma : null, high: Number.isFinite(sigma) ? r + sigma : null });
    }
  }

  const [lo, hi] = finiteRange(points.map((p) => p.x as number));
  const domain: [number, number] = lo === hi ? [lo - 0.5, hi + 0.5] : [lo, hi];
  const xScale = { domain, nice: false, zero: false };
  const xTop: AxisChannel = { field: 'x', title: null, scale: xScale, axis: { labels: false, ticks: true, title: null } };
  const pixelAxis = data.unit === 'pixel';
  const xBottom: AxisChannel = { field: 'x', title: pixelAxis ? 'Pixel' : wavelengthTitle(data.medium), scale: xScale };
  const yTop: AxisChannel = { field: 'y', title: fluxTitle(data.fluxUnit, data.normalised), scale: { zero: false } };
  const unit = data.normalised ? 'continuum units' : data.fluxUnit?.trim() || 'flux units';
  const yResidual: AxisChannel = { field: 'y', title: residualMode === 'sigma' ? 'Residual (σ)' : `Residual (${unit})` };

  const curves: PlotDatum[] = [];
  const add = (series: string, f: (w: number) => number) => {
    const s = sampleFunction(f, domain[0], domain[1], samples);
    for (let i = 0; i < s.x.length; i++) curves.push({ series, x: s.x[i], y: s.y[i] });
  };
  const components = data.components ?? [];
  const componentNames = uniqueNames(components.map((c) => c.label));
  const continuum = data.continuum;
  components.forEach((c, k) => add(componentNames[k], continuum ? (w) => continuum(w) + c.flux(w) : c.flux));
  if (continuum) add('Continuum', continuum);
  add('Model', data.model);

  const legend: LegendEntry[] = [
    { name: 'Data', color: colors.data, symbol: 'point' },
    { name: 'Model', color: colors.model, symbol: 'line' },
    ...componentNames.map((name, k) => ({ name, color: colors.components[k % colors.components.length], symbol: 'dotted' as const })),
    ...(continuum ? [{ name: 'Continuum', color: colors.continuum, symbol: 'dashed' as const }] : []),
  ];
  const filterSeries = (name: string) => `datum.series === ${JSON.stringify(name)}`;

  const centres = (data.centres ?? []).filter((c) => isFiniteNumber(c.wavelengthAngstrom));
  const centreRows: PlotDatum[] = centres.map((c) => {
    const s = c.uncertaintyAngstrom;
    const ok = isFiniteNumber(s) && s > 0;
    return { x: c.wavelengthAngstrom, low: ok ? c.wavelengthAngstrom - s : null, high: ok ? c.wavelengthAngstrom + s : null };
  });

  const topLayers: Record<string, unknown>[] = [];
  if (centreRows.length) {
    topLayers.push({
      data: { name: 'centres' },
      transform: [{ filter: 'isValid(datum.low)' }],
      mark: { type: 'rect', color: colors.model, opacity: 0.12 },
      encoding: { x: { field: 'low', type: 'quantitative', scale: xScale, title: null }, x2: { field: 'high' } },
    });
    topLayers.push({
      data: { name: 'centres' },
      mark: { type: 'rule', color: colors.model, strokeDash: [...DASH.rule], strokeWidth: 1 },
      encoding: { x: channel(xTop) },
    });
  }
  topLayers.push(...pointsWithErrorBars('points', xTop, yTop, 'Data', legend, { rows: points }));
  if (continuum) topLayers.push(curveLayer('curves', xTop, yTop, 'Continuum', legend, { strokeDash: DASH.dashed, strokeWidth: 1.5, filter: filterSeries('Continuum') }));
  for (const name of componentNames) {
    topLayers.push(curveLayer('curves', xTop, yTop, name, legend, { strokeDash: DASH.dotted, strokeWidth: 2, filter: filterSeries(name) }));
  }
  topLayers.push(curveLayer('curves', xTop, yTop, 'Model', legend, { strokeWidth: 2, filter: filterSeries('Model') }));

  const residualLayers: Record<string, unknown>[] = [horizontalRule(0), ...pointsWithErrorBars('residuals', xBottom, yResidual, 'Data', legend, { rows: residualRows })];

  const residualRms = rms(residualRows.map((r) => r.y as number));
  const residualUnit = residualMode === 'sigma' ? 'σ' : unit;
  const centreText = centres.length === 1
    ? `; centre ${formatWithError(centres[0].wavelengthAngstrom, centres[0].uncertaintyAngstrom, 3)} ${pixelAxis ? 'pixels' : 'Å'}`
    : '';
  const subtitle = options.subtitle ??
    `${points.length} points; residual RMS ${formatFixed(residualRms, residualMode === 'sigma' ? 2 : 3)} ${residualUnit}${centreText}`;

  const datasets: Record<string, PlotDatum[]> = { points, curves, residuals: residualRows };
  if (centreRows.length) datasets.centres = centreRows;
  return {
    ...topLevel(options.title ?? 'Line fit', subtitle, datasets, 'Line-profile fit with residuals.'),
    spacing: 6,
    resolve: { scale: { x: 'shared', color: 'shared' } },
    vconcat: [
      { width, height, layer: topLayers },
      { width, height: residualHeight, layer: residualLayers },
    ],
  };
}

/** Makes legend names unique (`Gaussian`, `Gaussian (2)`) and never equal to the fixed series names. */
export function uniqueNames(names: readonly string[]): string[] {
  const taken = new Set(['Data', 'Model', 'Continuum']);
  return names.map((raw) => {
    const base = raw.trim() || 'Component';
    let name = base;
    for (let k = 2; taken.has(name); k++) name = `${base} (${k})`;
    taken.add(name);
    return name;
  });
}
