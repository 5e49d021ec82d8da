/**
 * Plot of a periodogram: power against period (or frequency), with false-alarm levels and
 * the best peak marked.
 */
import { InputError, UsageError } from '../errors.js';
import { checkColumns, checkSize, formatFixed, isFiniteNumber, topLevel, type PlotOptions } from './common.js';
import { channel, curveLayer, type AxisChannel } from './layers.js';
import { DASH, inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** A power level of given false-alarm probability. */
export interface FalseAlarmLevel {
  /** False-alarm probability, from 0 to 1 (e.g. 0.01). */
  readonly probability: number;
  /** Power of that level, in the periodogram's units. */
  readonly power: number;
}

/** What {@link periodogramPlot} draws. Arrays are not modified; non-finite or non-positive frequencies are left out. */
export interface PeriodogramPlotData {
  /** Trial frequencies in cycles per day (positive). */
  readonly frequencyPerDay: ArrayLike<number>;
  /** Power at each frequency (e.g. normalised generalised Lomb–Scargle power, 0–1). */
  readonly power: ArrayLike<number>;
  /** Levels to draw as horizontal rules, labelled with their probability. */
  readonly falseAlarmLevels?: readonly FalseAlarmLevel[];
  /** Frequency of the peak to mark, cycles per day; default: the highest power. */
  readonly bestFrequencyPerDay?: number;
}

/** Options of {@link periodogramPlot}. */
export interface PeriodogramPlotOptions extends PlotOptions {
  /** Horizontal axis: `period` in days on a logarithmic scale, or `frequency` in cycles per day on a linear one. Default `period`. */
  xAxis?: 'period' | 'frequency';
  /** Title of the power axis (default `Power (normalised)`). */
  powerTitle?: string;
  /** Legend name of the marked peak (default `Highest peak`, or `Chosen peak` when `bestFrequencyPerDay` is given). */
  peakName?: string;
}

/**
 * Builds a Vega-Lite spec of a periodogram: power against period (log scale) or
 * frequency, each false-alarm level as a dashed horizontal rule labelled with its
 * probability, and the best peak marked with a point and its period.
 *
 * @param data frequencies (1/day), power, false-alarm levels, best frequency (see {@link PeriodogramPlotData}).
 * @param options title (default `Periodogram`), subtitle (default: the best period), sizes,
 *   axis choice, power-axis title.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.length-mismatch`, `plot.empty`, `plot.no-finite-data`.
 * @throws {UsageError} `plot.bad-size`; `plot.bad-probability` for a false-alarm probability outside (0, 1).
 * @example
 * const spec = periodogramPlot({ frequencyPerDay: [0.1, 0.2, 0.3], power: [0.1, 0.8, 0.2] });
 * (spec.title as { subtitle: string }).subtitle; // 'Highest peak at P = 5.0000 days (0.20000 cycles/day), power 0.800'
 */
export function periodogramPlot(data: PeriodogramPlotData, options: PeriodogramPlotOptions = {}): VegaLiteSpec {
  const n = checkColumns('periodogram plot', { frequencyPerDay: data.frequencyPerDay, power: data.power });
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const byPeriod = (options.xAxis ?? 'period') === 'period';
  const colors = PLOT_THEME.colors;

  const rows: PlotDatum[] = [];
  for (let i = 0; i < n; i++) {
    const f = data.frequencyPerDay[i];
    const p = data.power[i];
    if (isFiniteNumber(f) && f > 0 && isFiniteNumber(p)) rows.push({ frequency: f, period: 1 / f, power: p });
  }
  if (rows.length === 0) {
    throw new InputError('plot.no-finite-data', 'periodogram plot: no sample has a finite positive frequency and a finite power, nothing to plot', { keyword: 'power' });
  }
  rows.sort((a, b) => (a.frequency as number) - (b.frequency as number));
  let best = rows.reduce((bi, r, i) => ((r.power as number) > (rows[bi].power as number) ? i : bi), 0);
  const given = data.bestFrequencyPerDay;
  const marked = isFiniteNumber(given) && given > 0;
  if (marked) {
    best = rows.reduce((bi, r, i) => (Math.abs((r.frequency as number) - given) < Math.abs((rows[bi].frequency as number) - given) ? i : bi), 0);
  }
  const bestFrequency = marked ? given : (rows[best].frequency as number);
  const bestPower = rows[best].power as number;

  const levels = (data.falseAlarmLevels ?? []).filter((l) => isFiniteNumber(l.power));
  for (const l of levels) {
    if (!isFiniteNumber(l.probability) || l.probability <= 0 || l.probability >= 1) {
      throw new UsageError('plot.bad-probability', `a false-alarm probability must be between 0 and 1, got ${l.probability}`, { keyword: 'falseAlarmLevels' });
    }
  }
  const field = byPeriod ? 'period' : 'frequency';
  const values = rows.map((r) => r[field] as number);
  const xLo = Math.min(...values);
  const xHi = Math.max(...values);
  const xScale = byPeriod
    ? { type: 'log', domain: [xLo, xHi === xLo ? xLo * 2 : xHi], nice: false }
    : { domain: [xLo, xHi === xLo ? xLo + 1 : xHi], nice: false, zero: false };
  const xAxis: AxisChannel = { field, title: byPeriod ? 'Period (days)' : 'Frequency (cycles/day)', scale: xScale };
  const yAxis: AxisChannel = { field: 'power', title: options.powerTitle ?? 'Power (normalised)', scale: { zero: true } };

  const legend: LegendEntry[] = [
    { name: 'Power', color: colors.data, symbol: 'line' },
    ...(levels.length ? [{ name: 'False-alarm level', color: colors.reference, symbol: 'dashed' as const }] : []),
    { name: options.peakName ?? (marked ? 'Chosen peak' : 'Highest peak'), color: colors.peak, symbol: 'triangle' },
  ];
  const peakName = legend[legend.length - 1].name;
  const periodText = `P = ${formatFixed(1 / bestFrequency, 4)} days`;
  const layers: Record<string, unknown>[] = [curveLayer('power', xAxis, yAxis, 'Power', legend, { strokeWidth: 1.1 })];
  const datasets: Record<string, PlotDatum[]> = { power: rows };
  if (levels.length) {
    datasets.falseAlarm = levels.map((l) => ({ power: l.power, label: `FAP ${formatProbability(l.probability)}` }));
    layers.push(
      inSeries({
        data: { name: 'falseAlarm' },
        mark: { type: 'rule', strokeDash: [...DASH.dashed], strokeWidth: 1 },
        encoding: { y: channel(yAxis) },
      }, 'False-alarm level', legend),
      {
        data: { name: 'falseAlarm' },
        mark: { type: 'text', align: 'right', baseline: 'bottom', dx: -2, dy: -2, x: 'width', color: colors.reference },
        encoding: { y: channel(yAxis), text: { field: 'label', type: 'nominal' } },
      },
    );
  }
  const bestX = byPeriod ? 1 / bestFrequency : bestFrequency;
  const bestRow = { [field]: bestX, power: bestPower, label: periodText };
  const [d0, d1] = xScale.domain as [number, number];
  const fraction = byPeriod ? Math.log(bestX / d0) / Math.log(d1 / d0) : (bestX - d0) / (d1 - d0);
  const rightSide = fraction > 2 / 3;
  datasets.peak = [bestRow];
  layers.push(
    inSeries({
      data: { name: 'peak' },
      mark: { type: 'point', shape: 'triangle-down', filled: true, size: 90, yOffset: -9 },
      encoding: { x: channel(xAxis), y: channel(yAxis) },
    }, peakName, legend),
    {
      data: { name: 'peak' },
      // Label to the right of the marker, or to its left when the peak is in the right third of the axis.
      mark: { type: 'text', align: rightSide ? 'right' : 'left', baseline: 'middle', dx: rightSide ? -9 : 9, dy: -10, fontWeight: 'bold', color: colors.annotation },
      encoding: { x: channel(xAxis), y: channel(yAxis), text: { field: 'label', type: 'nominal' } },
    },
  );
  const subtitle = options.subtitle ??
    `${peakName} at ${periodText} (${formatFixed(bestFrequency, 5)} cycles/day), power ${formatFixed(bestPower, 3)}`;
  return { ...topLevel(options.title ?? 'Periodogram', subtitle, datasets, 'Periodogram with false-alarm levels.'), width, height, layer: layers };
}

/** `1%`, `0.1%`, `5%`, `50%` for a probability. */
function formatProbability(p: number): string {
  const percent = p * 100;
  return `${Number(percent.toPrecision(2))}%`;
}
