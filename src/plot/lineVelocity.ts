/**
 * Plot of a radial velocity measured line by line: each line's velocity against its rest
 * wavelength, used and rejected lines told apart, and the combined velocity with its ±1σ
 * band.
 */
import { InputError } from '../errors.js';
import type { Medium } from '../spectrum/spectrum.js';
import { checkSize, finiteRange, formatWithError, isFiniteNumber, topLevel, wavelengthTitle, type PlotOptions } from './common.js';
import { channel, pointsWithErrorBars, type AxisChannel } from './layers.js';
import { inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** One line's velocity. */
export interface LineVelocityPoint {
  /** Rest wavelength of the line in Å (the horizontal position). */
  readonly restWavelengthAngstrom: number;
  /** Velocity measured from this line, km/s. */
  readonly velocityKmPerS: number;
  /** Its 1-σ uncertainty, km/s, drawn as an error bar. */
  readonly uncertaintyKmPerS?: number;
  /** True when the line entered the combined velocity. */
  readonly used: boolean;
  /** Name shown in the tooltip, e.g. `Fe I 5269.54 (outlier)`. */
  readonly label?: string;
}

/** What {@link lineVelocityPlot} draws. Nothing is modified; lines without a finite wavelength and velocity are left out. */
export interface LineVelocityPlotData {
  readonly lines: readonly LineVelocityPoint[];
  /** The combined velocity, km/s, drawn as a solid rule. */
  readonly meanVelocityKmPerS?: number;
  /** Its 1-σ uncertainty, km/s, drawn as a band around the rule. */
  readonly meanUncertaintyKmPerS?: number;
  /** Medium of the rest wavelengths, for the axis title. */
  readonly medium?: Medium;
}

/**
 * Builds a Vega-Lite spec of per-line radial velocities: each line's velocity with its
 * 1-σ error bar against its rest wavelength, lines used as filled circles and rejected
 * ones as crosses, and the combined velocity as a rule with a ±1σ band. It shows at a
 * glance whether one line stands apart, or the velocities drift with wavelength (a
 * calibration problem).
 *
 * @param data the lines, the combined velocity and its uncertainty, the medium.
 * @param options title (default `Velocity from each line`), subtitle (default: the
 *   combined velocity and line counts), sizes.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.empty` when no line has a finite wavelength and velocity.
 * @throws {UsageError} `plot.bad-size`.
 * @example
 * const spec = lineVelocityPlot({ lines: [{ restWavelengthAngstrom: 4861.33, velocityKmPerS: 12.1, uncertaintyKmPerS: 0.8, used: true }],
 *   meanVelocityKmPerS: 12.1, meanUncertaintyKmPerS: 0.8 });
 * (spec.title as { subtitle: string }).subtitle; // 'v = 12.10 ± 0.80 km/s from 1 of 1 lines'
 */
export function lineVelocityPlot(data: LineVelocityPlotData, options: PlotOptions = {}): VegaLiteSpec {
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const colors = PLOT_THEME.colors;
  const rows: PlotDatum[] = [];
  for (const l of data.lines) {
    const w = l.restWavelengthAngstrom;
    const v = l.velocityKmPerS;
    if (!isFiniteNumber(w) || !isFiniteNumber(v)) continue;
    const s = l.uncertaintyKmPerS;
    const ok = isFiniteNumber(s) && s > 0;
    rows.push({ x: w, y: v, low: ok ? v - s : null, high: ok ? v + s : null, used: l.used, label: l.label ?? '', status: l.used ? 'used' : 'rejected' });
  }
  if (rows.length === 0) {
    throw new InputError('plot.empty', 'line velocity plot: no line has a finite wavelength and velocity, nothing to plot', { keyword: 'lines' });
  }
  const [lo, hi] = finiteRange(rows.map((r) => r.x as number));
  const pad = Math.max((hi - lo) * 0.04, 5);
  const xAxis: AxisChannel = { field: 'x', title: `Rest ${wavelengthTitle(data.medium).charAt(0).toLowerCase()}${wavelengthTitle(data.medium).slice(1)}`, scale: { domain: [lo - pad, hi + pad], nice: false, zero: false } };
  const yAxis: AxisChannel = { field: 'y', title: 'Radial velocity (km/s)', scale: { zero: false } };
  const mean = data.meanVelocityKmPerS;
  const sigma = data.meanUncertaintyKmPerS;
  const hasMean = isFiniteNumber(mean);
  const hasBand = hasMean && isFiniteNumber(sigma) && sigma > 0;
  const used = rows.filter((r) => r.used);
  const rejected = rows.filter((r) => !r.used);
  const legend: LegendEntry[] = [
    { name: 'Used', color: colors.used, symbol: 'point' },
    ...(rejected.length ? [{ name: 'Rejected', color: colors.rejected, symbol: 'cross' as const }] : []),
    ...(hasMean ? [{ name: 'Combined velocity', color: colors.model, symbol: 'line' as const }] : []),
  ];
  const tooltip = [
    { field: 'label', type: 'nominal', title: 'Line' },
    { field: 'x', type: 'quantitative', title: 'Rest wavelength (Å)', format: '.2f' },
    { field: 'y', type: 'quantitative', title: 'Velocity (km/s)', format: '.2f' },
    { field: 'status', type: 'nominal', title: 'Status' },
  ];
  const layers: Record<string, unknown>[] = [];
  if (hasBand) {
    layers.push({
      data: { values: [{ low: mean - sigma, high: mean + sigma }] },
      mark: { type: 'rect', color: colors.model, opacity: 0.15 },
      encoding: { y: { field: 'low', type: 'quantitative', title: yAxis.title }, y2: { field: 'high' } },
    });
  }
  if (hasMean) {
    layers.push(inSeries({
      data: { values: [{ y: mean }] },
      mark: { type: 'rule', strokeWidth: 1.5 },
      encoding: { y: channel(yAxis) },
    }, 'Combined velocity', legend));
  }
  layers.push(
    ...pointsWithErrorBars('lines', xAxis, yAxis, 'Used', legend, { rows: used, filter: 'datum.used', tooltip }),
    ...pointsWithErrorBars('lines', xAxis, yAxis, 'Rejected', legend, { rows: rejected, filter: '!datum.used', shape: 'cross', tooltip }),
  );
  const subtitle = options.subtitle ??
    `${hasMean ? `v = ${formatWithError(mean, sigma, 2)} km/s from ` : ''}${used.length} of ${rows.length} lines${hasMean ? '' : ' used'}`;
  return { ...topLevel(options.title ?? 'Velocity from each line', subtitle, { lines: rows }, 'Radial velocity of each line against its rest wavelength.'), width, height, layer: layers };
}
