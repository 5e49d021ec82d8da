/**
 * Layer pieces shared by the builders: data points with 1-σ error bars, a model curve,
 * a zero line, a residual panel. Internal to the plot area.
 */
import { isFiniteNumber } from './common.js';
import { inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** A quantitative axis: field, title and scale options of one channel. */
export interface AxisChannel {
  readonly field: string;
  readonly title: string | null;
  readonly scale?: Record<string, unknown>;
  readonly axis?: Record<string, unknown> | null;
}

/** Encoding of one quantitative channel. */
export function channel(c: AxisChannel): Record<string, unknown> {
  const out: Record<string, unknown> = { field: c.field, type: 'quantitative', title: c.title };
  if (c.scale) out.scale = c.scale;
  if (c.axis !== undefined) out.axis = c.axis;
  return out;
}

/**
 * Rows `{x, y, low, high}` for points with optional 1-σ errors, skipping points whose x
 * or y is not finite; `low`/`high` are null where σ is not a finite positive number.
 * Extra columns are copied per row from `extra(i)`.
 */
export function pointRows(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  sigma: ArrayLike<number> | undefined,
  extra?: (i: number) => PlotDatum,
): PlotDatum[] {
  const rows: PlotDatum[] = [];
  for (let i = 0; i < x.length; i++) {
    const xi = x[i];
    const yi = y[i];
    if (!isFiniteNumber(xi) || !isFiniteNumber(yi)) continue;
    const s = sigma?.[i];
    const ok = isFiniteNumber(s) && s > 0;
    rows.push({ x: xi, y: yi, low: ok ? yi - s : null, high: ok ? yi + s : null, ...(extra ? extra(i) : {}) });
  }
  return rows;
}

/**
 * Layers for points with error bars from a dataset of {@link pointRows}: vertical rules
 * from `low` to `high`, then filled points, both in the colour of series `name`. `rows`
 * are the rows the layers will show (after `filter`): without rows there is no layer, and
 * without any error there is no rule layer, because vega warns about the infinite extent
 * of an empty layer.
 */
export function pointsWithErrorBars(
  dataset: string,
  xAxis: AxisChannel,
  yAxis: AxisChannel,
  name: string,
  legend: readonly LegendEntry[],
  options: { rows: readonly PlotDatum[]; shape?: string; opacity?: number; tooltip?: readonly Record<string, unknown>[]; filter?: string },
): Record<string, unknown>[] {
  if (options.rows.length === 0) return [];
  const transform = options.filter ? [{ filter: options.filter }] : [];
  const errorFilter = [...transform, { filter: 'isValid(datum.low) && isValid(datum.high)' }];
  const hasErrors = options.rows.some((r) => r.low !== null && r.low !== undefined && r.high !== null && r.high !== undefined);
  const layers = [
    inSeries({
      data: { name: dataset },
      transform: errorFilter,
      mark: { type: 'rule', strokeWidth: 1.2, opacity: (options.opacity ?? 1) * 0.8 },
      encoding: { x: channel(xAxis), y: { field: 'low', type: 'quantitative' }, y2: { field: 'high' } },
    }, name, legend),
    inSeries({
      data: { name: dataset },
      transform,
      mark: { type: 'point', shape: options.shape ?? 'circle', filled: true, size: 30, opacity: options.opacity ?? 1 },
      encoding: {
        x: channel(xAxis),
        y: channel(yAxis),
        ...(options.tooltip ? { tooltip: options.tooltip } : {}),
      },
    }, name, legend),
  ];
  return hasErrors ? layers : layers.slice(1);
}

/** A line layer drawing `y` against `x` from `dataset`, in the colour and dash of series `name`. */
export function curveLayer(
  dataset: string,
  xAxis: AxisChannel,
  yAxis: AxisChannel,
  name: string,
  legend: readonly LegendEntry[],
  style: { strokeDash?: readonly number[]; strokeWidth?: number; filter?: string; detail?: string } = {},
): Record<string, unknown> {
  return inSeries({
    data: { name: dataset },
    transform: style.filter ? [{ filter: style.filter }] : [],
    mark: { type: 'line', strokeWidth: style.strokeWidth ?? 1.8, ...(style.strokeDash && style.strokeDash.length ? { strokeDash: [...style.strokeDash] } : {}) },
    encoding: {
      x: channel(xAxis),
      y: channel(yAxis),
      ...(style.detail ? { detail: { field: style.detail, type: 'nominal' } } : {}),
    },
  }, name, legend);
}

/** A horizontal rule at y = `value` across the panel (e.g. zero residual), grey and thin. */
export function horizontalRule(value: number, style: { strokeDash?: readonly number[]; color?: string } = {}): Record<string, unknown> {
  return {
    mark: {
      type: 'rule',
      color: style.color ?? PLOT_THEME.colors.reference,
      strokeWidth: 1,
      ...(style.strokeDash ? { strokeDash: [...style.strokeDash] } : {}),
    },
    encoding: { y: { datum: value, type: 'quantitative' } },
  };
}

/** Root mean square of the finite values; NaN when none is finite. */
export function rms(values: readonly number[]): number {
  let sum = 0;
  let n = 0;
  for (const v of values) {
    if (Number.isFinite(v)) {
      sum += v * v;
      n++;
    }
  }
  return n ? Math.sqrt(sum / n) : NaN;
}
