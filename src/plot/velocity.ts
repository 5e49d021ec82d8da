/**
 * Plots of radial velocities: against time (BJD_TDB) and folded on the orbital period,
 * each with the orbit model and a residual panel.
 */
import { InputError, UsageError } from '../errors.js';
import { bjdOffset, bjdTitle, checkColumns, checkSize, finiteRange, formatFixed, isFiniteNumber, sampleFunction, topLevel, type PlotOptions } from './common.js';
import { curveLayer, horizontalRule, pointsWithErrorBars, rms, type AxisChannel } from './layers.js';
import { DASH, inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/**
 * Radial velocities over time. Arrays have one value per spectrum and are not modified;
 * a point with a non-finite time or velocity is left out, one without a finite positive
 * uncertainty gets no error bar.
 */
export interface VelocityCurvePlotData {
  /** Mid-exposure time of each spectrum, BJD in the TDB time scale (days). */
  readonly bjdTdb: ArrayLike<number>;
  /** Barycentric radial velocity of each spectrum in km/s (positive = receding). */
  readonly velocityKmPerS: ArrayLike<number>;
  /** 1-σ uncertainty of each velocity in km/s. */
  readonly uncertaintyKmPerS?: ArrayLike<number>;
  /** The fitted orbit: radial velocity in km/s at a BJD_TDB. Adds the curve and a residual panel. */
  readonly orbitVelocityKmPerS?: (bjdTdb: number) => number;
  /** Systemic velocity γ in km/s, drawn as a dashed line. */
  readonly systemicVelocityKmPerS?: number;
  /** Orbital period in days, when known: the orbit curve is then sampled at 100 points per period. */
  readonly periodDays?: number;
}

/** Options of {@link velocityCurvePlot}. */
export interface VelocityCurvePlotOptions extends PlotOptions {
  /** Height of the residual panel in px (default from the theme, 100). */
  residualHeight?: number;
  /** Subtracted from every BJD on the axis (days); default: the earliest BJD rounded down to a multiple of 10 (0 for values under 100 000). */
  bjdOffset?: number;
}

/** What {@link phaseFoldedVelocityPlot} draws: velocities, period and epoch of phase zero, optional orbit. */
export interface PhaseFoldedPlotData extends VelocityCurvePlotData {
  /** Orbital period in days (positive). */
  readonly periodDays: number;
  /** BJD_TDB of phase zero (e.g. the time of periastron or of maximum velocity), days. */
  readonly epochBjdTdb: number;
}

/** Options of {@link phaseFoldedVelocityPlot}. */
export interface PhaseFoldedPlotOptions extends PlotOptions {
  /** Height of the residual panel in px (default from the theme, 100). */
  residualHeight?: number;
  /** Extra phase shown before 0 and after 1, in cycles, with the points there repeated in lighter colour (default 0.1; 0 to 0.5). */
  phaseMargin?: number;
}

const DEFAULT_PHASE_MARGIN = 0.1;
const SAMPLES_PER_PERIOD = 100;
const SAMPLES_WITHOUT_PERIOD = 2000;
const MAX_SAMPLES = 20_000;

/**
 * Builds a Vega-Lite spec of radial velocity against time: velocities with 1-σ error
 * bars against BJD_TDB (minus a whole-day offset, shown in the axis title), the fitted
 * orbit as a curve, the systemic velocity as a dashed line, and beneath, with the same
 * time axis, the residuals observed − orbit in km/s.
 *
 * @param data times (BJD_TDB), velocities (km/s), uncertainties, orbit, γ (see {@link VelocityCurvePlotData}).
 * @param options title (default `Radial velocity`), subtitle (default: count, time span,
 *   residual RMS), sizes, BJD offset.
 * @returns a Vega-Lite spec; a single panel when no orbit is given.
 * @throws {InputError} `plot.length-mismatch`, `plot.empty`, `plot.no-finite-data`.
 * @throws {UsageError} `plot.bad-size`.
 * @example
 * const spec = velocityCurvePlot({ bjdTdb: [2460010.5, 2460011.5], velocityKmPerS: [-12.1, 20.4],
 *   uncertaintyKmPerS: [1.1, 1.3] });
 * (spec.layer as unknown[]).length > 0; // true
 */
export function velocityCurvePlot(data: VelocityCurvePlotData, options: VelocityCurvePlotOptions = {}): VegaLiteSpec {
  const rows = velocityRows('velocity curve plot', data, (t) => t);
  const [tLo, tHi] = finiteRange(rows.map((r) => r.t as number));
  const offset = options.bjdOffset ?? bjdOffset(tLo);
  for (const r of rows) r.x = (r.t as number) - offset;
  const span = tHi - tLo;
  const pad = Math.max(span * 0.03, 0.5);
  const from = tLo - pad;
  const to = tHi + pad;
  const period = data.periodDays;
  const samples = isFiniteNumber(period) && period > 0
    ? Math.min(MAX_SAMPLES, Math.max(400, Math.ceil(((to - from) / period) * SAMPLES_PER_PERIOD)))
    : SAMPLES_WITHOUT_PERIOD;
  const orbit = data.orbitVelocityKmPerS;
  const curve = orbit ? sampleFunction(orbit, from, to, samples) : undefined;
  const curveRows = curve ? curve.x.map((t, i) => ({ x: t - offset, y: curve.y[i] })) : [];
  const xScale = { domain: [from - offset, to - offset], nice: false, zero: false };
  const subtitle = (rms: string) => `${rows.length} spectra over ${formatFixed(span, 1)} days${rms}`;
  return velocityPanels(rows, curveRows, {
    ...options,
    xTitle: bjdTitle(offset),
    xScale,
    systemic: data.systemicVelocityKmPerS,
    title: options.title ?? 'Radial velocity',
    subtitle: options.subtitle,
    defaultSubtitle: subtitle,
    description: 'Radial velocity against BJD_TDB with orbit and residuals.',
  });
}

/**
 * Builds a Vega-Lite spec of radial velocities folded on the orbital period: velocity
 * against orbital phase φ = frac((BJD_TDB − epoch)/P), with 1-σ error bars, the orbit
 * model over one cycle, the systemic velocity, and the residuals beneath. Points within
 * `phaseMargin` of either end are repeated beyond it in a lighter colour so that the
 * curve reads continuously across phase 0.
 *
 * @param data times, velocities, uncertainties, period and epoch, orbit, γ (see {@link PhaseFoldedPlotData}).
 * @param options title (default `Radial velocity folded on the period`), subtitle
 *   (default: period, epoch, residual RMS), sizes, phase margin.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.length-mismatch`, `plot.empty`, `plot.no-finite-data`.
 * @throws {UsageError} `plot.bad-period` for a period that is not a finite positive number
 *   or an epoch that is not finite; `plot.bad-phase-margin`; `plot.bad-size`.
 * @example
 * const spec = phaseFoldedVelocityPlot({ bjdTdb: [2460010.5, 2460013.1], velocityKmPerS: [-12.1, 20.4],
 *   periodDays: 4.2, epochBjdTdb: 2460009.0 });
 * spec.$schema; // 'https://vega.github.io/schema/vega-lite/v5.json'
 */
export function phaseFoldedVelocityPlot(data: PhaseFoldedPlotData, options: PhaseFoldedPlotOptions = {}): VegaLiteSpec {
  const period = data.periodDays;
  const epoch = data.epochBjdTdb;
  if (!isFiniteNumber(period) || period <= 0) {
    throw new UsageError('plot.bad-period', `the period must be a finite number of days above 0, got ${period}`, { keyword: 'periodDays' });
  }
  if (!isFiniteNumber(epoch)) {
    throw new UsageError('plot.bad-period', `the epoch of phase zero must be a finite BJD_TDB, got ${epoch}`, { keyword: 'epochBjdTdb' });
  }
  const margin = options.phaseMargin ?? DEFAULT_PHASE_MARGIN;
  if (!isFiniteNumber(margin) || margin < 0 || margin > 0.5) {
    throw new UsageError('plot.bad-phase-margin', `phaseMargin must be from 0 to 0.5 cycles, got ${margin}`, { keyword: 'phaseMargin' });
  }
  const phaseOf = (t: number) => {
    const p = (t - epoch) / period;
    return p - Math.floor(p);
  };
  const rows = velocityRows('phase-folded velocity plot', data, phaseOf);
  const repeats: PlotDatum[] = [];
  for (const r of rows) {
    r.x = r.t;
    const phase = r.t as number;
    if (margin > 0 && phase >= 1 - margin) repeats.push({ ...r, x: phase - 1, repeat: true });
    if (margin > 0 && phase <= margin) repeats.push({ ...r, x: phase + 1, repeat: true });
  }
  const orbit = data.orbitVelocityKmPerS;
  const curve = orbit ? sampleFunction((phase) => orbit(epoch + phase * period), -margin, 1 + margin, Math.ceil((1 + 2 * margin) * 4 * SAMPLES_PER_PERIOD)) : undefined;
  const curveRows = curve ? curve.x.map((x, i) => ({ x, y: curve.y[i] })) : [];
  const digits = period < 10 ? 5 : 3;
  const subtitle = (rms: string) => `P = ${formatFixed(period, digits)} days, phase 0 at BJD_TDB ${formatFixed(epoch, 4)}; ${rows.length} spectra${rms}`;
  return velocityPanels([...rows, ...repeats], curveRows, {
    ...options,
    xTitle: 'Orbital phase (cycles)',
    xScale: { domain: [-margin, 1 + margin], nice: false, zero: false },
    systemic: data.systemicVelocityKmPerS,
    title: options.title ?? 'Radial velocity folded on the period',
    subtitle: options.subtitle,
    defaultSubtitle: subtitle,
    description: 'Radial velocity against orbital phase with orbit and residuals.',
  });
}

/** Rows `{t, y, low, high, residual, …}` of the usable velocities; `t` is `position(bjd)`. */
function velocityRows(what: string, data: VelocityCurvePlotData, position: (bjd: number) => number): PlotDatum[] {
  checkColumns(what, { bjdTdb: data.bjdTdb, velocityKmPerS: data.velocityKmPerS, uncertaintyKmPerS: data.uncertaintyKmPerS });
  const rows: PlotDatum[] = [];
  for (let i = 0; i < data.bjdTdb.length; i++) {
    const t = data.bjdTdb[i];
    const v = data.velocityKmPerS[i];
    if (!isFiniteNumber(t) || !isFiniteNumber(v)) continue;
    const s = data.uncertaintyKmPerS?.[i];
    const ok = isFiniteNumber(s) && s > 0;
    const model = data.orbitVelocityKmPerS?.(t);
    const residual = isFiniteNumber(model) ? v - model : null;
    rows.push({
      t: position(t),
      bjdTdb: t,
      y: v,
      low: ok ? v - s : null,
      high: ok ? v + s : null,
      residual,
      residualLow: ok && residual !== null ? residual - s : null,
      residualHigh: ok && residual !== null ? residual + s : null,
      repeat: false,
    });
  }
  if (rows.length === 0) {
    throw new InputError('plot.no-finite-data', `${what}: no point has a finite BJD_TDB and velocity, nothing to plot`, { keyword: 'velocityKmPerS' });
  }
  return rows;
}

interface PanelSettings extends PlotOptions {
  residualHeight?: number;
  xTitle: string;
  xScale: Record<string, unknown>;
  systemic: number | undefined;
  title: string;
  defaultSubtitle: (rmsText: string) => string;
  description: string;
}

/** Velocity panel (points, orbit, γ) and, when an orbit is drawn, a residual panel beneath. */
function velocityPanels(rows: PlotDatum[], curveRows: PlotDatum[], s: PanelSettings): VegaLiteSpec {
  const width = checkSize('width', s.width, PLOT_THEME.width);
  const height = checkSize('height', s.height, PLOT_THEME.height);
  const residualHeight = checkSize('residualHeight', s.residualHeight, PLOT_THEME.residualHeight);
  const colors = PLOT_THEME.colors;
  const hasOrbit = curveRows.length > 0;
  const hasSystemic = isFiniteNumber(s.systemic);
  const hasRepeats = rows.some((r) => r.repeat);
  const legend: LegendEntry[] = [
    { name: 'Measured', color: colors.data, symbol: 'point' },
    ...(hasRepeats ? [{ name: 'Repeated', color: colors.uncertainty, symbol: 'point' as const }] : []),
    ...(hasOrbit ? [{ name: 'Orbit', color: colors.model, symbol: 'line' as const }] : []),
    ...(hasSystemic ? [{ name: 'Systemic velocity γ', color: colors.reference, symbol: 'dashed' as const }] : []),
  ];
  const xTop: AxisChannel = { field: 'x', title: hasOrbit ? null : s.xTitle, scale: s.xScale, ...(hasOrbit ? { axis: { labels: false, title: null } } : {}) };
  const xBottom: AxisChannel = { field: 'x', title: s.xTitle, scale: s.xScale };
  const yAxis: AxisChannel = { field: 'y', title: 'Radial velocity (km/s)', scale: { zero: false } };
  const tooltip = [
    { field: 'bjdTdb', type: 'quantitative', title: 'BJD_TDB', format: '.5f' },
    { field: 'y', type: 'quantitative', title: 'Velocity (km/s)', format: '.2f' },
  ];
  const layers: Record<string, unknown>[] = [];
  if (hasSystemic) {
    layers.push(inSeries({
      data: { values: [{ y: s.systemic }] },
      mark: { type: 'rule', strokeDash: [...DASH.dashed], strokeWidth: 1 },
      encoding: { y: { field: 'y', type: 'quantitative' } },
    }, 'Systemic velocity γ', legend));
  }
  layers.push(...pointsWithErrorBars('velocities', xTop, yAxis, 'Repeated', legend, { rows: rows.filter((r) => r.repeat), filter: 'datum.repeat', tooltip }));
  if (hasOrbit) layers.push(curveLayer('orbit', xTop, yAxis, 'Orbit', legend, { strokeWidth: 1.8 }));
  layers.push(...pointsWithErrorBars('velocities', xTop, yAxis, 'Measured', legend, { rows: rows.filter((r) => !r.repeat), filter: '!datum.repeat', tooltip }));

  const residuals = rows.filter((r) => !r.repeat && r.residual !== null).map((r) => r.residual as number);
  const rmsText = hasOrbit ? `; residual RMS ${formatFixed(rms(residuals), 2)} km/s` : '';
  const datasets: Record<string, PlotDatum[]> = { velocities: rows };
  if (hasOrbit) datasets.orbit = curveRows;
  const base = topLevel(s.title, s.subtitle ?? s.defaultSubtitle(rmsText), datasets, s.description);
  if (!hasOrbit) return { ...base, width, height, layer: layers };

  const residualRows: PlotDatum[] = rows.filter((r) => r.residual !== null).map((r) => ({ ...r, y: r.residual, low: r.residualLow, high: r.residualHigh }));
  datasets.residuals = residualRows;
  const yResidual: AxisChannel = { field: 'y', title: 'O − C (km/s)' };
  const residualLayers: Record<string, unknown>[] = [horizontalRule(0)];
  residualLayers.push(
    ...pointsWithErrorBars('residuals', xBottom, yResidual, 'Repeated', legend, { rows: residualRows.filter((r) => r.repeat), filter: 'datum.repeat' }),
    ...pointsWithErrorBars('residuals', xBottom, yResidual, 'Measured', legend, { rows: residualRows.filter((r) => !r.repeat), filter: '!datum.repeat' }),
  );
  return {
    ...base,
    spacing: 6,
    resolve: { scale: { x: 'shared' } },
    vconcat: [
      { width, height, layer: layers },
      { width, height: residualHeight, layer: residualLayers },
    ],
  };
}
