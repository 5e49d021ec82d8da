/**
 * Plot of a dispersion solution: residuals of its lines and the solution itself.
 */
import { solutionDispersion, solutionWavelength, type DispersionSolution } from '../../calibrate/solution.js';
import { formatFixed } from '../common.js';
import { calibrationResidualPlot, type CalibrationLinePoint, type CalibrationResidualPlotOptions } from '../calibration.js';
import type { VegaLiteSpec } from '../spec.js';
import { joinParts, retitle } from './titles.js';

/** Options of {@link plotCalibration}. */
export interface PlotCalibrationOptions extends Omit<CalibrationResidualPlotOptions, 'residualSign'> {
  /** Draw the dispersion solution (wavelength against pixel) above the residuals (default true). */
  dispersion?: boolean;
}

/**
 * Plot of a dispersion solution: the residual of every identified line (list wavelength
 * minus the solution at the line's pixel, the sign of the solution's line table) against
 * wavelength, lines used as filled circles and lines not used as crosses (the reason in the
 * tooltip), error bars from each centre's uncertainty times the local dispersion, ±RMS
 * lines, the axis fitted to the lines used (a rejected line far off sits on the edge
 * with its value written); and above, the solution λ(pixel) with the lines on it. Unidentified lines have
 * no residual and are counted in the subtitle. A solution that was not accepted says so
 * in its title.
 *
 * @param solution a dispersion solution (from `calibrateLamp`, `calibrateOnStarLines`,
 *   `interpolateSolutions`, `readSolution`); not modified.
 * @param options residual unit (Å or km/s), whether to draw the solution panel, and the
 *   builder options (title, subtitle, sizes).
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.empty` when no line is identified (nothing to plot).
 * @example
 * const spec = plotCalibration(calibrateLamp(lamp, { lamp: 'neon,argon' }));
 * (spec.title as { text: string }).text; // 'Wavelength calibration: neon,argon lamp'
 */
export function plotCalibration(solution: DispersionSolution, options: PlotCalibrationOptions = {}): VegaLiteSpec {
  const { dispersion = true, ...plotOptions } = options;
  const hasCurve = solution.coefficients.length > 0;
  const points: CalibrationLinePoint[] = [];
  let unidentified = 0;
  for (const l of solution.lines) {
    if (l.wavelengthAngstrom === null || l.residualAngstrom === null) {
      unidentified++;
      continue;
    }
    const slope = hasCurve ? Math.abs(solutionDispersion(solution, l.pixel)) : NaN;
    points.push({
      wavelengthAngstrom: l.wavelengthAngstrom,
      // The builder's residual is solution − reference; the table's is reference − solution: residualSign flips it back below.
      residualAngstrom: -l.residualAngstrom,
      uncertaintyAngstrom: l.pixelUncertainty === null ? undefined : l.pixelUncertainty * slope,
      used: l.used,
      pixel: l.pixel,
      label: `${l.species ?? ''} ${formatFixed(l.wavelengthAngstrom, 3)}${l.used ? '' : ` (${l.rejection ?? 'not used'})`}`.trim(),
    });
  }
  const spec = calibrationResidualPlot({
    lines: points,
    medium: solution.medium,
    rmsAngstrom: solution.rmsAngstrom ?? undefined,
    dispersion: dispersion && hasCurve
      ? { wavelengthAtPixel: (p) => solutionWavelength(solution, p), pixelRange: [solution.domain.min, solution.domain.max] }
      : undefined,
  }, { fitAxisToUsed: true, ...plotOptions, residualSign: 'reference-minus-solution' });
  const lamp = solution.lamp ? `: ${solution.lamp.name.split(',').map((n) => n.trim()).join(', ')} lamp` : solution.method === 'star-lines' ? ': the star\'s own lines' : '';
  const verdict = solution.ok ? '' : ` — NOT accepted (${solution.reason})`;
  const when = solution.observation ? `${solution.observation.midpointUtc.replace('T', ' ')} UTC` : undefined;
  const about = joinParts([when, `${solution.method} solution, Chebyshev order ${solution.order}`, unidentified ? `${unidentified} unidentified line${unidentified === 1 ? '' : 's'} not shown` : undefined]);
  return retitle(spec, `Wavelength calibration${lamp}${verdict}`, [about], plotOptions);
}
