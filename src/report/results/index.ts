/**
 * One entry point for the summaries of every library result: `summarizeResult(x)` picks
 * the summary by the kind of `x`; `describeResult(x)` gives it as plain text.
 */
import type { DispersionSolution } from '../../calibrate/solution.js';
import type { IdentificationResult } from '../../elements/identify.js';
import type { LineFitResult } from '../../fit/line-fit.js';
import type { ContinuumResult } from '../../lines/continuum.js';
import type { FindLinesResult } from '../../lines/find.js';
import type { OrbitFit } from '../../orbit/orbit-fit.js';
import type { Periodogram } from '../../orbit/periodogram.js';
import type { VelocityTable } from '../../orbit/table.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { CrossCorrelationResult } from '../../velocity/ccf.js';
import type { LineVelocityResult } from '../../velocity/lines.js';
import { UsageError } from '../../errors.js';
import { summarizeSolution } from './calibration.js';
import { summarizeIdentification } from './elements.js';
import { resultKind, type LibraryResult } from './kind.js';
import { summarizeFoundLines, summarizeLineFit } from './line-fit.js';
import { summarizeOrbitFit, summarizePeriodogram, summarizeVelocityTable } from './orbit.js';
import { summarizeContinuum, summarizeSpectrum } from './spectrum.js';
import { summaryText, type ResultContext, type ResultSummary } from './summary.js';
import { summarizeCrossCorrelation, summarizeLineVelocities } from './velocity.js';

/**
 * The summary of any library result (spectrum, line fit, found lines, continuum,
 * identification, dispersion solution, velocity from lines or by cross-correlation,
 * velocity table, periodogram, orbit fit), chosen
 * by {@link resultKind}.
 *
 * @param value a library result; not modified.
 * @param context the spectrum or velocity table it came from, when known (titles, units).
 * @returns title, sentences and tables.
 * @throws {UsageError} `report.not-a-result` for anything else.
 * @example summarizeResult(fitLine(star, { centerAngstrom: 6563 }), { spectrum: star }).title; // 'Line fit at 6562.24 Å: LVAC-7, 2026-05-14 03:12:45 UTC'
 */
export function summarizeResult(value: LibraryResult, context: ResultContext = {}): ResultSummary {
  switch (resultKind(value)) {
    case 'spectrum': return summarizeSpectrum(value as Spectrum);
    case 'line-fit': return summarizeLineFit(value as LineFitResult, context);
    case 'found-lines': return summarizeFoundLines(value as FindLinesResult, context);
    case 'continuum': return summarizeContinuum(value as ContinuumResult, context);
    case 'identification': return summarizeIdentification(value as IdentificationResult, context);
    case 'dispersion-solution': return summarizeSolution(value as DispersionSolution);
    case 'velocity-table': return summarizeVelocityTable(value as VelocityTable);
    case 'periodogram': return summarizePeriodogram(value as Periodogram);
    case 'orbit-fit': return summarizeOrbitFit(value as OrbitFit);
    case 'cross-correlation': return summarizeCrossCorrelation(value as CrossCorrelationResult, context);
    case 'line-velocities': return summarizeLineVelocities(value as LineVelocityResult, context);
    default:
      throw new UsageError('report.not-a-result', 'this value is not a lineshift result (a spectrum, line fit, found lines, continuum, identification, dispersion solution, velocity from lines or cross-correlation, velocity table, periodogram or orbit fit)');
  }
}

/**
 * The summary of a library result as plain text (title, sentences, aligned tables), for
 * the command line, logs and `text/plain` in notebooks.
 *
 * @param value a library result; not modified.
 * @param context the spectrum or velocity table it came from, when known.
 * @returns text lines joined with `\n`.
 * @throws {UsageError} `report.not-a-result` as {@link summarizeResult}.
 * @example console.log(describeResult(fitOrbit(table)));
 */
export function describeResult(value: LibraryResult, context: ResultContext = {}): string {
  return summaryText(summarizeResult(value, context));
}
