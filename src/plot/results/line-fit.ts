/**
 * Plot of a line fit from its result.
 */
import type { LineFitResult } from '../../fit/line-fit.js';
import { evaluateLineModel, type LineModelShape } from '../../fit/line-model.js';
import { profileAndGradient } from '../../fit/profiles.js';
import { formatMeasured } from '../../report/format.js';
import { fitQuality } from '../../report/results/line-fit.js';
import { angstromPerUnit } from '../../spectrum/units.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { formatFixed } from '../common.js';
import { lineFitPlot, type FitComponent, type LineFitPlotOptions } from '../lineFit.js';
import type { VegaLiteSpec } from '../spec.js';
import { joinParts, objectTitle, observationDate, retitle } from './titles.js';

/** Options of {@link plotLineFit}. */
export interface PlotLineFitOptions extends LineFitPlotOptions {
  /**
   * The spectrum the fit was made in: gives the object and date for the title, the medium
   * and flux unit for the axes, and each pixel's uncertainty for error bars and residuals
   * in σ. Without it the plot has no error bars and shows residuals in flux units.
   */
  spectrum?: Spectrum;
  /** Legend names of the components, in order (default `Component 1`, …); e.g. `['Hα']`. */
  labels?: readonly string[];
}

/** Components whose numbers are written in the subtitle; more are left to the table. */
const MAX_COMPONENTS_IN_SUBTITLE = 2;

/**
 * Plot of a line fit: the fitted pixels with their error bars (when the spectrum is given),
 * the model, each component added to the continuum (for blends), the continuum, each
 * centre with its ±1σ band, and the residuals beneath. The model is evaluated from the
 * fitted parameters on a fine grid, so narrow lines look smooth. Title: object and
 * `line fit at λ`; subtitle: date, profile, χ²/dof, and centre, FWHM and equivalent width
 * `value ± uncertainty` per component. A fit that did not converge says so in its title.
 *
 * @param result from `fitLine`, `fitLineArrays` or `fitWindow`; not modified.
 * @param options the spectrum (for uncertainties, units, title), component labels, and
 *   the {@link lineFitPlot} options (residual units, sampling, sizes, title, subtitle).
 * @returns a Vega-Lite spec (fit panel over residual panel).
 * @throws {InputError} `plot.no-finite-data` for a fit without finite points.
 * @example
 * const fit = fitLine(star, { centerAngstrom: 6563 });
 * const spec = plotLineFit(fit, { spectrum: star, labels: ['Hα'] });
 * (spec.title as { text: string }).text; // 'LVAC-7: line fit at 6562.24 Å'
 */
export function plotLineFit(result: LineFitResult, options: PlotLineFitOptions = {}): VegaLiteSpec {
  const { spectrum, labels, ...plotOptions } = options;
  const pixelAxis = result.unit === 'pixel';
  const u = pixelAxis ? 'pixels' : 'Å';
  const n = result.components.length;
  const shape: LineModelShape = { profile: result.profile, components: n, continuumOrder: result.continuum.order, continuumReference: result.continuum.reference };
  const p = result.parameters.map((q) => q.value);
  const byName = new Map(result.parameters.map((q) => [q.name, q.value]));
  const at = new Float64Array(1);
  const one = new Float64Array(1);
  const model = (x: number) => {
    at[0] = x;
    evaluateLineModel(shape, p, at, one, null);
    return one[0];
  };
  const c = result.continuum.coefficients.map((k) => k.value);
  const continuum = (x: number) => {
    const t = x - result.continuum.reference;
    return c.reduce((sum, ck, j) => sum + ck * t ** j, 0);
  };
  const components: FitComponent[] = n < 2 ? [] : result.components.map((_, k) => {
    const j = k + 1;
    const centre = byName.get(`center${j}`) ?? NaN;
    const amplitude = byName.get(`amplitude${j}`) ?? NaN;
    const w0 = result.profile === 'voigt' ? byName.get(`fwhmGaussian${j}`) ?? NaN : byName.get(`fwhm${j}`) ?? NaN;
    const w1 = result.profile === 'voigt' ? byName.get(`fwhmLorentzian${j}`) ?? NaN : 0;
    return { label: labels?.[k] ?? `Component ${j}`, flux: (x: number) => amplitude * profileAndGradient(result.profile, x - centre, w0, w1, null) };
  });
  const spec = lineFitPlot({
    wavelengthAngstrom: result.curve.x,
    flux: result.curve.flux,
    uncertainty: spectrum ? pixelUncertainties(result, spectrum) : undefined,
    model,
    continuum,
    components,
    centres: result.components.map((k) => ({ wavelengthAngstrom: k.center.value, uncertaintyAngstrom: k.center.uncertainty })),
    medium: spectrum?.medium ?? undefined,
    fluxUnit: spectrum?.fluxUnit,
    unit: result.unit,
  }, plotOptions);

  const where = n === 1 ? ` at ${formatFixed(result.components[0].center.value, 2)} ${u}` : ` of ${n} components`;
  const failed = result.converged ? '' : ` (did not converge: ${result.reason})`;
  const name = n === 1 && labels?.[0] ? `${labels[0]} fit` : 'line fit';
  const title = objectTitle(`${name}${where}${failed}`, spectrum);
  const fitLine = joinParts([observationDate(spectrum), `${result.profile} profile`, fitQuality(result, { spectrum }), `${result.window.pixelsUsed} pixels`]);
  const numbers = result.components.slice(0, MAX_COMPONENTS_IN_SUBTITLE).map((k, i) => joinParts([
    n > 1 ? `${labels?.[i] ?? `component ${i + 1}`}: centre ${formatMeasured(k.center.value, k.center.uncertainty, u)}` : `centre ${formatMeasured(k.center.value, k.center.uncertainty, u)}`,
    `FWHM ${formatMeasured(k.fwhm.value, k.fwhm.uncertainty, u)}`,
    `EW ${formatMeasured(k.equivalentWidth.value, k.equivalentWidth.uncertainty, u)}`,
  ]));
  if (n > MAX_COMPONENTS_IN_SUBTITLE) numbers.push(`… and ${n - MAX_COMPONENTS_IN_SUBTITLE} more components (see the table)`);
  return retitle(spec, title, [fitLine, ...numbers], plotOptions, false);
}

/**
 * The spectrum's 1-σ uncertainty at each fitted pixel, matched by position (the fit's
 * positions are the spectrum's, converted to Å the same way); NaN where none matches.
 */
function pixelUncertainties(result: LineFitResult, spectrum: Spectrum): number[] | undefined {
  const sigma = spectrum.uncertainty;
  if (!sigma) return undefined;
  if ((result.unit === 'pixel') !== (spectrum.unit === 'pixel')) return undefined;
  const scale = spectrum.unit === 'pixel' ? 1 : angstromPerUnit(spectrum.unit);
  const byPosition = new Map<number, number>();
  for (let i = 0; i < spectrum.wavelength.length; i++) byPosition.set(spectrum.wavelength[i] * scale, sigma[i]);
  const out = result.curve.x.map((x) => byPosition.get(x) ?? NaN);
  return out.some(Number.isFinite) ? out : undefined;
}
