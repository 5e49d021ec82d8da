/**
 * Summary of a dispersion solution.
 */
import type { DispersionSolution } from '../../calibrate/solution.js';
import { formatNumber, formatSignificant } from '../format.js';
import type { Table, TableCell } from '../table.js';
import { capRows, plural, type ResultSummary } from './summary.js';

/**
 * A dispersion solution for people: accepted or not (and why), method, order and medium,
 * the RMS of the lines used (Å, pixels, km/s; weighted like the fit), lines measured, identified, used and
 * rejected (by reason), resolving power, the solution's own wavelength error and its
 * warnings; a table of the lines.
 *
 * @param solution from `calibrateLamp`, `calibrateOnStarLines`, `gratingSolution`,
 *   `interpolateSolutions` or `readSolution`; not modified.
 * @returns title, sentences and the line table (at most {@link SUMMARY_MAX_ROWS} rows).
 * @example summarizeSolution(calibrateLamp(lamp, { lamp: 'neon,argon' })).lines[0];
 * // 'Accepted: dispersion solution of order 3 from 15 lines: RMS 0.00444 Å (0.0133 pixel)'
 */
export function summarizeSolution(solution: DispersionSolution): ResultSummary {
  const lamp = solution.lamp ? `, ${solution.lamp.name} lamp` : '';
  const lines = [
    `${solution.ok ? 'Accepted' : `NOT accepted (${solution.reason})`}: ${solution.message}`,
    `Method ${solution.method}${lamp}; Chebyshev series of order ${solution.order} over pixels ${formatNumber(solution.domain.min)}–${formatNumber(solution.domain.max)}; ${solution.medium} wavelengths.`,
  ];
  if (solution.rmsAngstrom !== null) {
    lines.push(`RMS of the lines used (weighted like the fit): ${formatSignificant(solution.rmsAngstrom, 3)} Å = ${formatSignificant(solution.rmsPixels ?? NaN, 3)} pixel = ${formatSignificant(solution.rmsKmPerS ?? NaN, 3)} km/s.`);
  }
  const reasons = new Map<string, number>();
  for (const l of solution.lines) if (!l.used && l.rejection) reasons.set(l.rejection, (reasons.get(l.rejection) ?? 0) + 1);
  const rejected = [...reasons].map(([r, n]) => `${n} ${r}`).join(', ');
  lines.push(`Lines: ${solution.linesMeasured} measured, ${solution.linesIdentified} identified, ${solution.linesUsed} used${rejected ? `; not used: ${rejected}` : ''}.`);
  if (solution.resolvingPower) {
    lines.push(`Resolving power λ/FWHM: ${formatSignificant(solution.resolvingPower.median, 3)} (spread ${formatSignificant(solution.resolvingPower.spread, 2)}, ${plural(solution.resolvingPower.lines, 'line')}).`);
  }
  if (solution.wavelengthUncertaintyAngstrom) {
    lines.push(`Error of the solution itself (1σ): ${formatSignificant(solution.wavelengthUncertaintyAngstrom.middle, 2)} Å at the middle, ${formatSignificant(solution.wavelengthUncertaintyAngstrom.max, 2)} Å at most.`);
  }
  if (!solution.velocityZeroPointMeaningful) lines.push('The wavelength zero point absorbs the star\'s radial velocity: do not measure velocities with it.');
  for (const w of solution.warnings) lines.push(`Warning: ${w}`);
  const capped = capRows(solution.lines, 'lines');
  if (capped.note) lines.push(`Line table: ${capped.note}.`);
  const table: Table = {
    caption: 'Calibration lines (residual = list − solution)',
    columns: [
      { key: 'pixel', label: 'Pixel', digits: 3 },
      { key: 'sigma', label: '±σ', unit: 'pixel', digits: 4 },
      { key: 'species', label: 'Species' },
      { key: 'wavelength', label: 'List λ', unit: 'Å', digits: 3 },
      { key: 'residual', label: 'Residual', unit: 'Å', digits: 4 },
      { key: 'residualKmPerS', label: 'Residual', unit: 'km/s', digits: 2 },
      { key: 'used', label: 'Used' },
    ],
    rows: capped.rows.map((l): Record<string, TableCell> => ({
      pixel: l.pixel,
      sigma: l.pixelUncertainty,
      species: l.species ?? '',
      wavelength: l.wavelengthAngstrom,
      residual: l.residualAngstrom,
      residualKmPerS: l.residualKmPerS,
      used: l.used ? 'yes' : `no (${l.rejection ?? 'not used'})`,
    })),
  };
  const title = `Dispersion solution${solution.lamp ? `: ${solution.lamp.name} lamp` : ''}${solution.observation ? `, ${solution.observation.midpointUtc.replace('T', ' ')} UTC` : ''}`;
  return { title, lines, tables: [table] };
}
