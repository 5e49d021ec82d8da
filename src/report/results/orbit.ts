/**
 * Summaries of velocity tables, periodograms and orbit fits.
 */
import type { OrbitFit } from '../../orbit/orbit-fit.js';
import type { Periodogram } from '../../orbit/periodogram.js';
import type { VelocityTable } from '../../orbit/table.js';
import { formatMeasured, formatNumber, formatProbability, formatSignificant } from '../format.js';
import type { Table, TableCell } from '../table.js';
import { capRows, plural, type ResultSummary } from './summary.js';

function range(values: ArrayLike<number>): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (values[i] < lo) lo = values[i];
    if (values[i] > hi) hi = values[i];
  }
  return [lo, hi];
}

function median(values: ArrayLike<number>): number {
  const v = Array.from(values).filter(Number.isFinite).sort((a, b) => a - b);
  if (!v.length) return NaN;
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/**
 * A velocity table for people: how many velocities over what span, the median
 * uncertainty, whether a second star is measured; a table of the rows.
 *
 * @param table from `readVelocityTable` or `createVelocityTable`; not modified.
 * @returns title, sentences and the rows (at most {@link SUMMARY_MAX_ROWS}).
 * @example summarizeVelocityTable(table).lines[0]; // '24 velocities over 131.2 days, BJD_TDB 2461120.31 to 2461251.52; median uncertainty 1.2 km/s.'
 */
export function summarizeVelocityTable(table: VelocityTable): ResultSummary {
  const n = table.bjdTdb.length;
  const [t0, t1] = range(table.bjdTdb);
  const second = table.velocity2KmPerS ? Array.from(table.velocity2KmPerS).filter(Number.isFinite).length : 0;
  const lines = [
    `${plural(n, 'velocity', 'velocities')} over ${formatNumber(t1 - t0, 1)} days, BJD_TDB ${formatNumber(t0, 2)} to ${formatNumber(t1, 2)}; median uncertainty ${formatSignificant(median(table.uncertaintyKmPerS), 2)} km/s.`,
  ];
  if (table.velocity2KmPerS) lines.push(`Double-lined: the second star is measured in ${second} of ${n} rows.`);
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => table.bjdTdb[a] - table.bjdTdb[b]);
  const capped = capRows(order, 'rows');
  if (capped.note) lines.push(`Table: ${capped.note}.`);
  const hasLabels = table.label.some((l) => l !== '');
  const result: Table = {
    caption: 'Radial velocities (by time)',
    columns: [
      { key: 'bjd', label: 'BJD_TDB', digits: 5 },
      { key: 'v', label: 'Velocity', unit: 'km/s' },
      ...(table.velocity2KmPerS ? [{ key: 'v2', label: 'Velocity of star 2', unit: 'km/s' }] : []),
      ...(hasLabels ? [{ key: 'label', label: 'Label' }] : []),
    ],
    rows: capped.rows.map((i): Record<string, TableCell> => ({
      bjd: table.bjdTdb[i],
      v: { value: table.velocityKmPerS[i], uncertainty: table.uncertaintyKmPerS[i] },
      ...(table.velocity2KmPerS && Number.isFinite(table.velocity2KmPerS[i])
        ? { v2: { value: table.velocity2KmPerS[i], uncertainty: table.uncertainty2KmPerS?.[i] ?? NaN } }
        : {}),
      label: table.label[i],
    })),
  };
  const file = table.source ? `: ${table.source.file}` : '';
  return { title: `Velocity table${file}`, lines, tables: [result] };
}

/**
 * A periodogram for people: the data and the period range searched, the highest peak
 * (period, frequency, power) with its false-alarm probability (Baluev 2008) and its
 * aliases; a table of the highest peaks.
 *
 * @param periodogram from `velocityPeriodogram`; not modified.
 * @returns title, sentences and the peak table.
 * @example summarizePeriodogram(velocityPeriodogram(table)).lines[1]; // 'Highest peak: P = 12.37 days (…), false-alarm probability 2.1 × 10⁻⁹ (Baluev 2008).'
 */
export function summarizePeriodogram(periodogram: Periodogram): ResultSummary {
  const b = periodogram.best;
  const lines = [
    `Generalised Lomb–Scargle periodogram (${periodogram.normalization} power) of ${plural(periodogram.pointCount, 'velocity', 'velocities')} over ${formatNumber(periodogram.timeSpanDays, 1)} days; periods ${formatSignificant(periodogram.minPeriodDays, 3)}–${formatSignificant(periodogram.maxPeriodDays, 3)} days, ${periodogram.frequencyPerDay.length} frequencies.`,
    `Highest peak: P = ${formatSignificant(b.periodDays, 5)} days (${formatSignificant(b.frequencyPerDay, 5)} cycles/day), power ${formatSignificant(b.power, 3)}; false-alarm probability ${formatProbability(periodogram.falseAlarmProbability)} (Baluev 2008; upper bound ${formatProbability(periodogram.falseAlarmBound)}).`,
  ];
  if (periodogram.aliases.length) {
    const aliases = periodogram.aliases.slice(0, 4).map((a) => `${formatSignificant(a.periodDays, 4)} d${a.windowCycle ? ` (${a.windowCycle})` : ''}`);
    lines.push(`Aliases of the highest peak through the sampling: ${aliases.join(', ')}.`);
  }
  const table: Table = {
    caption: 'Highest peaks',
    columns: [
      { key: 'rank', label: 'Rank' },
      { key: 'period', label: 'Period', unit: 'days' },
      { key: 'frequency', label: 'Frequency', unit: 'cycles/day' },
      { key: 'power', label: 'Power', unit: periodogram.normalization },
    ],
    rows: periodogram.peaks.map((p, k): Record<string, TableCell> => ({
      rank: k + 1,
      period: formatSignificant(p.periodDays, 5),
      frequency: formatSignificant(p.frequencyPerDay, 5),
      power: formatSignificant(p.power, 3),
    })),
  };
  return { title: 'Periodogram', lines, tables: [table] };
}

/**
 * An orbit fit for people: the outcome, the elements `value ± uncertainty` (P, T, e, ω,
 * K, γ), χ²/dof and RMS, the Lucy & Sweeney (1971) eccentricity test, and other periods
 * that fit nearly as well; a table of the elements and derived quantities.
 *
 * @param fit from `fitOrbit`; not modified.
 * @returns title, sentences and the elements table.
 * @example summarizeOrbitFit(fitOrbit(table)).lines[1]; // 'P = 12.3712 ± 0.0041 days, e = 0.281 ± 0.012, K = 41.32 ± 0.48 km/s, γ = −17.81 ± 0.31 km/s.'
 */
export function summarizeOrbitFit(fit: OrbitFit): ResultSummary {
  const m = (x: { value: number; uncertainty: number }, unit?: string) => formatMeasured(x.value, x.uncertainty, unit);
  const lines = [
    `${fit.doubleLined ? 'Double-lined' : 'Single-lined'} orbit fit${fit.converged ? '' : ` (NOT converged: ${fit.reason})`}: ${fit.message}`,
    `P = ${m(fit.periodDays, 'days')}, e = ${m(fit.eccentricity)}, K = ${m(fit.semiAmplitudeKmPerS, 'km/s')}, γ = ${m(fit.systemicVelocityKmPerS, 'km/s')}.`,
    `χ²/dof = ${formatSignificant(fit.reducedChiSquare, 3)} (${fit.degreesOfFreedom} dof); residual RMS ${formatSignificant(fit.rmsKmPerS, 2)} km/s${fit.jitterKmPerS > 0 ? `; jitter ${formatSignificant(fit.jitterKmPerS, 2)} km/s added` : ''}.`,
    `Eccentricity test (Lucy & Sweeney 1971): p₁ = ${formatProbability(fit.circularTest.probability)}, ${fit.circularTest.circularPreferred ? 'a circular orbit is preferred (e is not significant)' : 'the eccentricity is significant'}.`,
  ];
  if (fit.alternatives.length) {
    lines.push(`Other periods that fit: ${fit.alternatives.map((a) => `${formatSignificant(a.periodDays, 5)} d (χ² ${formatSignificant(a.chiSquare, 3)} against ${formatSignificant(fit.chiSquare, 3)})`).join(', ')}.`);
  }
  type Row = { element: string; value: TableCell; unit: string };
  const rows: Row[] = [
    { element: 'Period P', value: fit.periodDays, unit: 'days' },
    { element: 'Time of periastron T', value: fit.periastronTimeBjdTdb, unit: 'BJD_TDB' },
    { element: 'Eccentricity e', value: fit.eccentricity, unit: '' },
    { element: 'Argument of periastron ω', value: fit.omegaDeg, unit: 'degrees' },
    { element: 'Semi-amplitude K', value: fit.semiAmplitudeKmPerS, unit: 'km/s' },
    { element: 'Systemic velocity γ', value: fit.systemicVelocityKmPerS, unit: 'km/s' },
    { element: 'Mean longitude λ at the reference time', value: fit.meanLongitudeDeg, unit: 'degrees' },
    { element: 'Mass function f(m)', value: fit.massFunctionSolarMass, unit: 'M☉' },
    { element: 'a₁ sin i', value: fit.projectedSemiMajorAxisKm, unit: 'km' },
  ];
  if (fit.semiAmplitude2KmPerS) rows.push({ element: 'Semi-amplitude K₂', value: fit.semiAmplitude2KmPerS, unit: 'km/s' });
  if (fit.massRatio) rows.push({ element: 'Mass ratio q = m₂/m₁', value: fit.massRatio, unit: '' });
  if (fit.m1SinI3SolarMass) rows.push({ element: 'm₁ sin³i', value: fit.m1SinI3SolarMass, unit: 'M☉' });
  if (fit.m2SinI3SolarMass) rows.push({ element: 'm₂ sin³i', value: fit.m2SinI3SolarMass, unit: 'M☉' });
  rows.push({ element: 'Reference time', value: formatNumber(fit.referenceTimeBjdTdb, 5), unit: 'BJD_TDB' });
  const table: Table = {
    caption: 'Orbital elements (± 1σ)',
    columns: [{ key: 'element', label: 'Element' }, { key: 'value', label: 'Value' }, { key: 'unit', label: 'Unit' }],
    rows,
  };
  return { title: `Orbit: P = ${formatMeasured(fit.periodDays.value, fit.periodDays.uncertainty, 'days')}`, lines, tables: [table] };
}
