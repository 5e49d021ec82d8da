/**
 * Summaries of radial velocities: from a cross-correlation and from individual lines.
 */
import type { CrossCorrelationResult } from '../../velocity/ccf.js';
import type { LineVelocityResult } from '../../velocity/lines.js';
import { formatMeasured, formatNumber, formatSignificant } from '../format.js';
import type { Table, TableCell } from '../table.js';
import { titleWithObservation } from './spectrum.js';
import { capRows, type ResultContext, type ResultSummary } from './summary.js';

/** How a velocity's frame is stated everywhere: measured velocities are topocentric. */
const FRAME = "observer's frame, no barycentric correction";

/**
 * A cross-correlation velocity for people: the velocity with its uncertainty (which
 * estimate, and the calibration term), the peak (height, FWHM, Tonry–Davis r), the three
 * statistical estimates, the grid; or why there is no velocity.
 *
 * @param result from `crossCorrelationVelocity`; not modified.
 * @param context the spectrum (for the title).
 * @returns title, sentences and a table of the quantities.
 * @example summarizeCrossCorrelation(crossCorrelationVelocity(star, template)).lines[0]; // 'v = 37.91 ± 0.93 km/s (observer's frame, …)'
 */
export function summarizeCrossCorrelation(result: CrossCorrelationResult, context: ResultContext = {}): ResultSummary {
  const u = result.uncertainties;
  const lines = result.converged
    ? [
      `v = ${formatMeasured(result.velocity.value, result.velocity.uncertainty, 'km/s')} (${FRAME}; uncertainty ${result.uncertaintyMethod}${u.calibration > 0 ? ' ⊕ calibration' : ''}, ${result.formula} Doppler formula).`,
      `Peak: height ${formatSignificant(result.peak.height, 3)}, FWHM ${formatSignificant(result.peak.fwhmKmPerS, 3)} km/s, Tonry–Davis r = ${formatSignificant(result.peak.tonryDavisR, 3)}.`,
    ]
    : [`No velocity (${result.reason}): ${result.message}.`];
  lines.push(`Grid: ${formatNumber(result.grid.startAngstrom, 1)}–${formatNumber(result.grid.endAngstrom, 1)} Å (vacuum), ${result.grid.pixels} pixels of ${formatSignificant(result.grid.velocityStepKmPerS, 3)} km/s; template at ${formatNumber(result.templateVelocityKmPerS)} km/s.`);
  const row = (quantity: string, value: TableCell, unit: string) => ({ quantity, value, unit });
  const sig = (x: number) => (Number.isFinite(x) ? formatSignificant(x, 2) : 'n/a');
  const table: Table = {
    caption: 'Cross-correlation',
    columns: [{ key: 'quantity', label: 'Quantity' }, { key: 'value', label: 'Value' }, { key: 'unit', label: 'Unit' }],
    rows: [
      row('Velocity', result.velocity, 'km/s'),
      row('Uncertainty, propagated', sig(u.propagated), 'km/s'),
      row('Uncertainty, Zucker 2003', sig(u.zucker2003), 'km/s'),
      row('Uncertainty, Tonry & Davis 1979', sig(u.tonryDavis1979), 'km/s'),
      row('Calibration term', sig(u.calibration), 'km/s'),
      row('Peak height', Number.isFinite(result.peak.height) ? formatSignificant(result.peak.height, 3) : 'n/a', ''),
      row('Peak FWHM', Number.isFinite(result.peak.fwhmKmPerS) ? formatSignificant(result.peak.fwhmKmPerS, 3) : 'n/a', 'km/s'),
      row('Tonry–Davis r', Number.isFinite(result.peak.tonryDavisR) ? formatSignificant(result.peak.tonryDavisR, 3) : 'n/a', ''),
    ],
  };
  return { title: titleWithObservation('Cross-correlation velocity', context), lines, tables: [table] };
}

/**
 * A velocity from individual lines for people: the combined velocity with its
 * uncertainty (statistical, scale, calibration term), χ²/dof, lines used and rejected;
 * a table of every line (rest and observed wavelength, velocity, status and why).
 *
 * @param result from `velocityFromLines`; not modified.
 * @param context the spectrum (for the title).
 * @returns title, sentences and the line table (at most {@link SUMMARY_MAX_ROWS} rows).
 * @example summarizeLineVelocities(velocityFromLines(star, { species: ['H I'], resolvingPower: 5000 })).lines[0];
 */
export function summarizeLineVelocities(result: LineVelocityResult, context: ResultContext = {}): ResultSummary {
  const lines = [
    result.converged
      ? `v = ${formatMeasured(result.velocity.value, result.velocity.uncertainty, 'km/s')} (${FRAME}) from ${result.linesUsed} of ${result.linesUsed + result.linesRejected} lines.`
      : `No velocity: ${result.message}`,
    `Combination: ${result.combination}; χ²/dof = ${formatSignificant(result.reducedChiSquare, 3)} (${result.degreesOfFreedom} dof), error scaled by ${formatSignificant(result.uncertaintyScale, 3)}; statistical ${formatSignificant(result.statisticalUncertaintyKmPerS, 2)} km/s${result.calibrationUncertaintyKmPerS > 0 ? `, calibration ${formatSignificant(result.calibrationUncertaintyKmPerS, 2)} km/s` : ''}.`,
    `${result.profile} profiles, resolving power ${formatSignificant(result.resolvingPower, 3)}, ${result.formula} Doppler formula, ${result.medium} wavelengths; approximate velocity ${formatNumber(result.approximateVelocityKmPerS, 1)} km/s (${result.approximateVelocitySource}).`,
  ];
  const capped = capRows(result.lines, 'lines');
  if (capped.note) lines.push(`Table: ${capped.note}.`);
  const table: Table = {
    caption: 'Velocity of each line (± 1σ)',
    columns: [
      { key: 'species', label: 'Species' },
      { key: 'rest', label: 'Rest λ', unit: 'Å', digits: 2 },
      { key: 'observed', label: 'Observed λ', unit: 'Å' },
      { key: 'velocity', label: 'Velocity', unit: 'km/s' },
      { key: 'status', label: 'Status' },
    ],
    rows: capped.rows.map((l): Record<string, TableCell> => ({
      species: l.species,
      rest: l.restWavelengthAngstrom,
      observed: l.observedWavelengthAngstrom,
      velocity: l.velocityKmPerS,
      status: l.status === 'used' ? 'used' : l.note || (l.reason ?? 'rejected'),
    })),
  };
  return { title: titleWithObservation('Velocity from lines', context), lines, tables: [table] };
}

/** The label of a line row: `Fe I 5269.54`, with the reason when it was rejected. */
export function lineVelocityLabel(l: LineVelocityResult['lines'][number]): string {
  return `${l.species} ${formatNumber(l.restWavelengthAngstrom, 2)}${l.status === 'used' ? '' : ` (${l.reason ?? 'rejected'})`}`;
}

