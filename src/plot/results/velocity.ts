/**
 * Plots of radial velocities from their results: the cross-correlation function, and the
 * velocity of each line.
 */
import { formatMeasured, formatSignificant } from '../../report/format.js';
import { lineVelocityLabel } from '../../report/results/velocity.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { CrossCorrelationResult } from '../../velocity/ccf.js';
import type { LineVelocityResult } from '../../velocity/lines.js';
import type { PlotOptions } from '../common.js';
import { crossCorrelationPlot } from '../crossCorrelation.js';
import { lineVelocityPlot } from '../lineVelocity.js';
import type { VegaLiteSpec } from '../spec.js';
import { joinParts, objectTitle, observationDate, retitle } from './titles.js';

/** Options of the velocity result plots. */
export interface PlotVelocityResultOptions extends PlotOptions {
  /** The spectrum the velocity was measured in (object and date for the title). */
  spectrum?: Spectrum;
}

/**
 * Plot of a cross-correlation velocity: the normalised CCF against the line-of-sight
 * velocity (observer's frame; the template's own velocity included), the Gaussian +
 * constant fitted to its peak over the fitted range (dashed), and the measured velocity as
 * a rule with its ±1σ band (the second, re-centred pass; it may differ from the first
 * pass's peak model by a fraction of a pixel). Subtitle: the velocity `value ± uncertainty`
 * and the peak; a result without a velocity says why.
 *
 * @param result from `crossCorrelationVelocity`; not modified.
 * @param options the spectrum (for the title), title, subtitle, sizes.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.no-finite-data` when the CCF has no finite sample.
 * @example
 * const spec = plotCrossCorrelation(crossCorrelationVelocity(star, template), { spectrum: star });
 * (spec.title as { text: string }).text; // 'LVAC-7: cross-correlation'
 */
export function plotCrossCorrelation(result: CrossCorrelationResult, options: PlotVelocityResultOptions = {}): VegaLiteSpec {
  const { spectrum, ...plotOptions } = options;
  const m = result.peak.model;
  const v = result.velocity;
  const spec = crossCorrelationPlot({
    velocityKmPerS: result.ccf.velocityKmPerS,
    correlation: result.ccf.correlation,
    peak: Number.isFinite(v.value)
      ? {
        velocityKmPerS: v.value,
        uncertaintyKmPerS: v.uncertainty,
        model: m ? (x: number) => m.baseline + m.amplitude * Math.exp(-0.5 * ((x - m.centerKmPerS) / m.sigmaKmPerS) ** 2) : undefined,
        fitRangeKmPerS: result.peak.fitRangeKmPerS,
      }
      : undefined,
  }, { velocityTitle: "Line-of-sight velocity, observer's frame (km/s)", ...plotOptions });
  const outcome = result.converged
    ? joinParts([
      `v = ${formatMeasured(v.value, v.uncertainty, 'km/s')} (${result.uncertaintyMethod}${result.uncertainties.calibration > 0 ? ' ⊕ calibration' : ''})`,
      `peak height ${formatSignificant(result.peak.height, 3)}`,
      `Tonry–Davis r = ${formatSignificant(result.peak.tonryDavisR, 3)}`,
    ])
    : `no velocity (${result.reason}): ${result.message}`;
  return retitle(spec, objectTitle(`cross-correlation${result.converged ? '' : ' (no velocity)'}`, spectrum), [observationDate(spectrum), outcome], plotOptions, false);
}

/**
 * Plot of a velocity measured line by line: each line's velocity with its error bar
 * against its rest wavelength, lines used and rejected (the reason in the tooltip and the
 * table), and the combined velocity with its ±1σ band. Lines that could not be fitted have
 * no velocity and are left out (counted in the subtitle).
 *
 * @param result from `velocityFromLines`; not modified.
 * @param options the spectrum (for the title), title, subtitle, sizes.
 * @returns a Vega-Lite spec.
 * @throws {InputError} `plot.empty` when no line has a velocity.
 * @example plotLineVelocities(velocityFromLines(star, { species: ['H I', 'Fe I'], resolvingPower: 5000 }), { spectrum: star });
 */
export function plotLineVelocities(result: LineVelocityResult, options: PlotVelocityResultOptions = {}): VegaLiteSpec {
  const { spectrum, ...plotOptions } = options;
  const withVelocity = result.lines.filter((l) => l.velocityKmPerS !== null);
  const spec = lineVelocityPlot({
    lines: withVelocity.map((l) => ({
      restWavelengthAngstrom: l.restWavelengthAngstrom,
      velocityKmPerS: l.velocityKmPerS!.value,
      uncertaintyKmPerS: l.velocityKmPerS!.uncertainty,
      used: l.status === 'used',
      label: lineVelocityLabel(l),
    })),
    meanVelocityKmPerS: result.converged ? result.velocity.value : undefined,
    meanUncertaintyKmPerS: result.converged ? result.velocity.uncertainty : undefined,
    medium: result.medium,
  }, plotOptions);
  const notFitted = result.lines.length - withVelocity.length;
  const about = joinParts([
    result.converged ? `v = ${formatMeasured(result.velocity.value, result.velocity.uncertainty, 'km/s')} from ${result.linesUsed} of ${result.lines.length} lines` : `no velocity: ${result.message}`,
    `χ²/dof = ${formatSignificant(result.reducedChiSquare, 3)}`,
    notFitted ? `${notFitted} line${notFitted === 1 ? '' : 's'} without a velocity not shown` : undefined,
  ]);
  return retitle(spec, objectTitle('velocity from each line', spectrum), [observationDate(spectrum), about], plotOptions, false);
}
