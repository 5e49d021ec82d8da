/**
 * Plots of velocity tables, periodograms and orbit fits from their results.
 */
import { UsageError } from '../../errors.js';
import { radialVelocityKmPerS } from '../../orbit/keplerian.js';
import type { OrbitFit } from '../../orbit/orbit-fit.js';
import { baluevFalseAlarmProbability, type Periodogram, type PeriodogramNormalization } from '../../orbit/periodogram.js';
import type { VelocityTable } from '../../orbit/table.js';
import { formatMeasured, formatProbability, formatSignificant } from '../../report/format.js';
import { periodogramPlot, type FalseAlarmLevel, type PeriodogramPlotOptions } from '../periodogram.js';
import type { VegaLiteSpec } from '../spec.js';
import { phaseFoldedVelocityPlot, velocityCurvePlot, type PhaseFoldedPlotOptions, type VelocityCurvePlotOptions } from '../velocity.js';
import { joinParts, retitle } from './titles.js';

/** `P = … days · e = … · K = … km/s · γ = … km/s` of an orbit fit. */
function elementsLine(fit: OrbitFit): string {
  const m = (x: { value: number; uncertainty: number }, unit?: string) => formatMeasured(x.value, x.uncertainty, unit);
  return joinParts([`P = ${m(fit.periodDays, 'days')}`, `e = ${m(fit.eccentricity)}`, `K = ${m(fit.semiAmplitudeKmPerS, 'km/s')}`, `γ = ${m(fit.systemicVelocityKmPerS, 'km/s')}`]);
}

/** Checks that an orbit fit was made from a table of this many rows. */
function checkSameTable(table: VelocityTable, fit: OrbitFit): void {
  if (fit.residualKmPerS.length !== table.bjdTdb.length) {
    throw new UsageError('plot.table-mismatch', `the orbit fit was made from a velocity table of ${fit.residualKmPerS.length} rows, but this table has ${table.bjdTdb.length}: pass the table the orbit was fitted to`, { keyword: 'table' });
  }
}

/** The orbit of star 1 as a function of BJD_TDB. */
function orbitCurve(fit: OrbitFit): (bjdTdb: number) => number {
  const t = new Float64Array(1);
  return (bjd) => {
    t[0] = bjd;
    return radialVelocityKmPerS(fit.orbit, t)[0];
  };
}

/**
 * Plot of a velocity table against time, with the fitted orbit when given: velocities
 * (star 1) with their 1-σ error bars against BJD_TDB, the orbit, γ, and the residuals
 * observed − orbit beneath. Subtitle: count, span, residual RMS and the elements
 * `value ± uncertainty`. A double-lined table shows star 1 only.
 *
 * @param table the velocities; not modified.
 * @param fit the `fitOrbit(table)` result, optional.
 * @param options the {@link velocityCurvePlot} options (BJD offset, sizes, title, subtitle).
 * @returns a Vega-Lite spec (one panel, or velocities over residuals with an orbit).
 * @throws {UsageError} `plot.table-mismatch` when the fit was made from a table of another length.
 * @example
 * const spec = plotVelocityCurve(table, fitOrbit(table));
 * (spec.vconcat as unknown[]).length; // 2
 */
export function plotVelocityCurve(table: VelocityTable, fit?: OrbitFit, options: VelocityCurvePlotOptions = {}): VegaLiteSpec {
  if (fit) checkSameTable(table, fit);
  const spec = velocityCurvePlot({
    bjdTdb: table.bjdTdb,
    velocityKmPerS: table.velocityKmPerS,
    uncertaintyKmPerS: table.uncertaintyKmPerS,
    orbitVelocityKmPerS: fit ? orbitCurve(fit) : undefined,
    systemicVelocityKmPerS: fit?.systemicVelocityKmPerS.value,
    periodDays: fit?.periodDays.value,
  }, options);
  const second = table.velocity2KmPerS ? 'star 1 only' : undefined;
  const title = fit ? 'Radial velocity and the fitted orbit' : 'Radial velocity';
  return retitle(spec, title, fit ? [joinParts([elementsLine(fit), second])] : [second], options);
}

/**
 * Plot of a velocity table folded on the fitted period, phase 0 at periastron T: the
 * velocities (star 1), the orbit over one cycle, γ, and the residuals beneath; points
 * near phase 0 and 1 are repeated beyond the ends.
 *
 * @param table the velocities the orbit was fitted to; not modified.
 * @param fit the `fitOrbit(table)` result.
 * @param options the {@link phaseFoldedVelocityPlot} options (phase margin, sizes, title, subtitle).
 * @returns a Vega-Lite spec.
 * @throws {UsageError} `plot.table-mismatch` as {@link plotVelocityCurve}.
 * @example plotPhaseFolded(table, fitOrbit(table));
 */
export function plotPhaseFolded(table: VelocityTable, fit: OrbitFit, options: PhaseFoldedPlotOptions = {}): VegaLiteSpec {
  checkSameTable(table, fit);
  const spec = phaseFoldedVelocityPlot({
    bjdTdb: table.bjdTdb,
    velocityKmPerS: table.velocityKmPerS,
    uncertaintyKmPerS: table.uncertaintyKmPerS,
    orbitVelocityKmPerS: orbitCurve(fit),
    systemicVelocityKmPerS: fit.systemicVelocityKmPerS.value,
    periodDays: fit.periodDays.value,
    epochBjdTdb: fit.periastronTimeBjdTdb.value,
  }, options);
  const about = joinParts([
    `phase 0 at periastron, BJD_TDB ${fit.periastronTimeBjdTdb.value.toFixed(4)}`,
    `${table.bjdTdb.length} spectra`,
    `residual RMS ${formatSignificant(fit.rmsKmPerS, 2)} km/s`,
    table.velocity2KmPerS ? 'star 1 only' : undefined,
  ]);
  return retitle(spec, 'Radial velocity folded on the fitted period', [elementsLine(fit), about], options, false);
}

/** Options of {@link plotPeriodogram}. */
export interface PlotPeriodogramOptions extends PeriodogramPlotOptions {
  /** The velocity table the periodogram was computed from: needed for the false-alarm levels (their power depends on the times and weights). */
  table?: VelocityTable;
  /** False-alarm probabilities of the levels drawn (default 10 %, 1 %, 0.1 %), each in (0, 1). */
  falseAlarmProbabilities?: readonly number[];
}

/** Default false-alarm levels (common practice: 10 %, 1 %, 0.1 %). */
const DEFAULT_FALSE_ALARM_PROBABILITIES: readonly number[] = [0.1, 0.01, 0.001];

/**
 * The power (in the periodogram's normalisation) at which the Baluev (2008) false-alarm
 * probability equals `probability`, for the times and uncertainties of `table` and the
 * highest frequency searched. Method: bisection on the standard power z in [0, 1] (the
 * probability falls monotonically with z) to 10⁻¹² in z, then z in the periodogram's
 * normalisation (`model` z/(1 − z), `log` −ln(1 − z), `psd` proportional to z).
 *
 * @param periodogram the periodogram (for the normalisation and the frequency range).
 * @param table the velocities it was computed from.
 * @param probability false-alarm probability, 0 < p < 1.
 * @returns the power; NaN when even z = 1 does not reach so small a probability.
 * @example
 * const z = falseAlarmLevel(velocityPeriodogram(table), table, 0.01);
 * baluevFalseAlarmProbability(z, table.bjdTdb, table.uncertaintyKmPerS, 2).baluev; // 0.01 (minimum period 0.5 d: f_max = 2)
 */
export function falseAlarmLevel(periodogram: Periodogram, table: VelocityTable, probability: number): number {
  const fMax = 1 / periodogram.minPeriodDays;
  const fap = (z: number) => baluevFalseAlarmProbability(z, table.bjdTdb, table.uncertaintyKmPerS, fMax).baluev;
  if (!(fap(1 - 1e-15) <= probability)) return NaN;
  let lo = 0;
  let hi = 1;
  while (hi - lo > 1e-12) {
    const mid = (lo + hi) / 2;
    if (fap(mid) > probability) lo = mid;
    else hi = mid;
  }
  return toNormalization((lo + hi) / 2, periodogram);
}

function toNormalization(z: number, periodogram: Periodogram): number {
  const how: PeriodogramNormalization = periodogram.normalization;
  switch (how) {
    case 'standard': return z;
    case 'model': return z / (1 - z);
    case 'log': return -Math.log1p(-z);
    case 'psd': return (periodogram.best.power / periodogram.best.powerStandard) * z;
  }
}

const POWER_TITLES: Readonly<Record<PeriodogramNormalization, string>> = Object.freeze({
  standard: 'Power (fraction of variance explained)',
  model: 'Power (model normalisation)',
  log: 'Power (log normalisation)',
  psd: 'Power (PSD normalisation)',
});

/**
 * Plot of a velocity periodogram: power against period (log scale), the highest peak
 * marked, and with the velocity table the power levels of false-alarm probability 10 %,
 * 1 % and 0.1 % (Baluev 2008, the same formula as the periodogram's own false-alarm
 * probability, see {@link falseAlarmLevel}). Subtitle: the peak and its false-alarm
 * probability.
 *
 * @param periodogram from `velocityPeriodogram`; not modified.
 * @param options the velocity table (for the levels), the probabilities, and the
 *   {@link periodogramPlot} options (axis, sizes, title, subtitle).
 * @returns a Vega-Lite spec.
 * @throws {UsageError} `plot.table-mismatch` when the table has another number of rows
 *   than the periodogram used; `plot.bad-probability` for a probability outside (0, 1).
 * @example
 * const spec = plotPeriodogram(velocityPeriodogram(table), { table });
 * (spec.datasets as { falseAlarm: unknown[] }).falseAlarm.length; // 3
 */
export function plotPeriodogram(periodogram: Periodogram, options: PlotPeriodogramOptions = {}): VegaLiteSpec {
  const { table, falseAlarmProbabilities = DEFAULT_FALSE_ALARM_PROBABILITIES, ...plotOptions } = options;
  let levels: FalseAlarmLevel[] = [];
  if (table) {
    if (table.bjdTdb.length !== periodogram.pointCount) {
      throw new UsageError('plot.table-mismatch', `the periodogram was computed from ${periodogram.pointCount} velocities, but this table has ${table.bjdTdb.length}: pass the table it was computed from`, { keyword: 'table' });
    }
    for (const p of falseAlarmProbabilities) {
      if (!(p > 0 && p < 1)) throw new UsageError('plot.bad-probability', `a false-alarm probability must be between 0 and 1, got ${p}`, { keyword: 'falseAlarmProbabilities' });
    }
    levels = falseAlarmProbabilities.map((p) => ({ probability: p, power: falseAlarmLevel(periodogram, table, p) })).filter((l) => Number.isFinite(l.power));
  }
  const spec = periodogramPlot({
    frequencyPerDay: periodogram.frequencyPerDay,
    power: periodogram.power,
    bestFrequencyPerDay: periodogram.best.frequencyPerDay,
    falseAlarmLevels: levels,
  }, { powerTitle: POWER_TITLES[periodogram.normalization], peakName: 'Highest peak', ...plotOptions });
  const about = joinParts([
    `${periodogram.pointCount} velocities over ${periodogram.timeSpanDays.toFixed(1)} days`,
    `false-alarm probability of the peak ${formatProbability(periodogram.falseAlarmProbability)} (Baluev 2008)`,
    table ? undefined : 'levels need the velocity table',
  ]);
  return retitle(spec, 'Periodogram of the radial velocities', [about], plotOptions);
}
