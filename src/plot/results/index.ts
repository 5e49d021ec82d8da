/**
 * The plot of any library result, chosen by its kind: what `display(result)` shows under
 * the result's table.
 */
import type { DispersionSolution } from '../../calibrate/solution.js';
import type { IdentificationResult } from '../../elements/identify.js';
import type { LineFitResult } from '../../fit/line-fit.js';
import type { ContinuumResult } from '../../lines/continuum.js';
import type { FindLinesResult } from '../../lines/find.js';
import type { OrbitFit } from '../../orbit/orbit-fit.js';
import type { Periodogram } from '../../orbit/periodogram.js';
import type { VelocityTable } from '../../orbit/table.js';
import { resultKind, type LibraryResult } from '../../report/results/kind.js';
import type { ResultContext } from '../../report/results/summary.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { CrossCorrelationResult } from '../../velocity/ccf.js';
import type { LineVelocityResult } from '../../velocity/lines.js';
import type { VegaLiteSpec } from '../spec.js';
import { plotCalibration } from './calibration.js';
import { plotLineFit } from './line-fit.js';
import { plotPeriodogram, plotPhaseFolded, plotVelocityCurve } from './orbit.js';
import { plotFoundLines, plotSpectrum } from './spectrum.js';
import { plotCrossCorrelation, plotLineVelocities } from './velocity.js';

/** The plot of a result, or why there is none. */
export interface ResultPlot {
  /** The plot, when the result (with its context) can be drawn. */
  readonly spec?: VegaLiteSpec;
  /** Why there is no plot (e.g. `pass { spectrum } to draw the found lines`); undefined when there is one. */
  readonly note?: string;
}

/** An orbit fit is shown folded on its period when the data span more than this many periods (the curve against time would be a blur). */
export const FOLD_ABOVE_CYCLES = 20;

/**
 * The natural plot of a library result: a spectrum → {@link plotSpectrum}; a line fit →
 * {@link plotLineFit}; found lines, a continuum or an identification → the spectrum with
 * them (needs `context.spectrum`); a dispersion solution → {@link plotCalibration}; a
 * velocity table → {@link plotVelocityCurve}; a periodogram → {@link plotPeriodogram}
 * (false-alarm levels with `context.table`); an orbit fit → the velocities with the orbit
 * (needs `context.table`), against time, or folded on the period when the data span more
 * than {@link FOLD_ABOVE_CYCLES} periods; a cross-correlation → {@link plotCrossCorrelation};
 * a velocity from lines → {@link plotLineVelocities}.
 *
 * @param value a library result; not modified.
 * @param context the spectrum or velocity table it came from.
 * @returns the spec, or a note saying what is missing.
 * @throws {UsageError} when the context does not match the result (see the plot functions).
 * @example resultPlot(fitOrbit(table), { table }).spec;
 */
export function resultPlot(value: LibraryResult, context: ResultContext = {}): ResultPlot {
  const { spectrum, table } = context;
  const calibrated = (s: Spectrum | undefined): s is Spectrum => s !== undefined && s.unit !== 'pixel';
  const needSpectrum = (what: string) => ({ note: `pass { spectrum } (the wavelength-calibrated spectrum) to draw the ${what}` });
  switch (resultKind(value)) {
    case 'spectrum': {
      const s = value as Spectrum;
      return calibrated(s) ? { spec: plotSpectrum(s) } : { note: 'no plot: the spectrum is not wavelength-calibrated (its axis is in pixels)' };
    }
    case 'line-fit':
      return { spec: plotLineFit(value as LineFitResult, { spectrum }) };
    case 'found-lines': {
      const found = value as FindLinesResult;
      if (found.unit === 'pixel') return { note: 'no plot: the lines were found on a pixel axis' };
      return calibrated(spectrum) ? { spec: plotFoundLines(spectrum, found) } : needSpectrum('found lines');
    }
    case 'continuum':
      return calibrated(spectrum) ? { spec: plotSpectrum(spectrum, { continuum: value as ContinuumResult }) } : needSpectrum('continuum');
    case 'identification':
      return calibrated(spectrum) ? { spec: plotSpectrum(spectrum, { identification: value as IdentificationResult }) } : needSpectrum('identified lines');
    case 'dispersion-solution': {
      const solution = value as DispersionSolution;
      return solution.lines.some((l) => l.residualAngstrom !== null)
        ? { spec: plotCalibration(solution) }
        : { note: 'no plot: no line was identified' };
    }
    case 'velocity-table':
      return { spec: plotVelocityCurve(value as VelocityTable) };
    case 'periodogram':
      return { spec: plotPeriodogram(value as Periodogram, { table }) };
    case 'orbit-fit': {
      const fit = value as OrbitFit;
      if (!table) return { note: 'pass { table } (the velocity table the orbit was fitted to) to draw the velocities with the orbit' };
      let lo = Infinity, hi = -Infinity;
      for (const t of table.bjdTdb) { lo = Math.min(lo, t); hi = Math.max(hi, t); }
      return (hi - lo) / fit.periodDays.value > FOLD_ABOVE_CYCLES ? { spec: plotPhaseFolded(table, fit) } : { spec: plotVelocityCurve(table, fit) };
    }
    case 'cross-correlation':
      return { spec: plotCrossCorrelation(value as CrossCorrelationResult, { spectrum }) };
    case 'line-velocities': {
      const lines = value as LineVelocityResult;
      return lines.lines.some((l) => l.velocityKmPerS !== null) ? { spec: plotLineVelocities(lines, { spectrum }) } : { note: 'no plot: no line could be fitted' };
    }
    default:
      return { note: 'not a lineshift result' };
  }
}
