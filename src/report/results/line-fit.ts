/**
 * Summaries of line fits and of found lines.
 */
import type { LineFitResult } from '../../fit/line-fit.js';
import type { FindLinesResult } from '../../lines/find.js';
import { formatMeasured, formatNumber, formatSignificant } from '../format.js';
import type { Table, TableCell } from '../table.js';
import { titleWithObservation } from './spectrum.js';
import { capRows, plural, type ResultContext, type ResultSummary } from './summary.js';

/** `Å` or `pixels`: the unit of every length in a fit or line list. */
function lengthUnit(unit: 'angstrom' | 'pixel'): string {
  return unit === 'angstrom' ? 'Å' : 'pixels';
}

/**
 * How well a line fit matches its data, in words: `χ²/dof = 1.02` for a fit weighted by
 * the flux uncertainties (`…, uncertainties scaled by √(χ²/dof)` when asked for); for a
 * fit without uncertainties (every pixel weighted 1, errors from the scatter: the default
 * when the spectrum has none, and assumed when no spectrum is given) the scatter itself,
 * √(χ²/dof) in flux units per pixel.
 *
 * @param result a line fit.
 * @param context the spectrum it was made in, when known.
 * @returns a phrase without a final full stop.
 * @example fitQuality(fitLine(star, { centerAngstrom: 6563 }), { spectrum: star }); // 'χ²/dof = 1.91'
 */
export function fitQuality(result: LineFitResult, context: ResultContext = {}): string {
  const chi = `χ²/dof = ${formatSignificant(result.reducedChiSquare, 3)}`;
  if (result.uncertaintySource === 'data') return chi;
  if (context.spectrum?.uncertainty) return `${chi}, uncertainties scaled by √(χ²/dof)`;
  const unit = context.spectrum?.fluxUnit?.trim() || 'flux units';
  return `no flux uncertainties: errors from the scatter, ${formatSignificant(Math.sqrt(result.reducedChiSquare), 2)} ${unit} per pixel`;
}

/**
 * A line fit for people: the outcome (converged or not, and why), χ²/dof, the window, and
 * per component the centre, FWHM, depth and equivalent width, each `value ± uncertainty`
 * (uncertainty to two significant digits); tables of the components and of the model
 * parameters (fixed, tied and at-bound parameters marked).
 *
 * @param result from `fitLine`, `fitLineArrays` or `fitWindow`; not modified.
 * @param context the spectrum it was fitted in (object and date for the title, flux unit).
 * @returns title, sentences and two tables (components, parameters).
 * @example summarizeLineFit(fitLine(star, { centerAngstrom: 6563 }), { spectrum: star }).lines[1];
 * // 'Component 1: centre 6562.239 ± 0.056 Å, FWHM 19.06 ± 0.15 Å, depth 0.4403 ± 0.0021, equivalent width 10.177 ± 0.076 Å.'
 */
export function summarizeLineFit(result: LineFitResult, context: ResultContext = {}): ResultSummary {
  const u = lengthUnit(result.unit);
  const fluxUnit = context.spectrum?.fluxUnit?.trim() || 'flux units';
  const shape = `${result.profile}, ${plural(result.components.length, 'component')}, ${result.sign}, continuum of order ${result.continuum.order}`;
  const outcome = result.converged
    ? `converged (${result.reason}) in ${plural(result.iterations, 'iteration')}`
    : `did NOT converge (${result.reason}): ${result.message}`;
  const lines = [
    `Fit (${shape}) ${outcome}; ${fitQuality(result, context)} (${result.degreesOfFreedom} dof); ${result.window.pixelsUsed} pixels from ${formatNumber(result.window.start, 2)} to ${formatNumber(result.window.end, 2)} ${u}.`,
    ...result.components.map((c, k) =>
      `Component ${k + 1}: centre ${formatMeasured(c.center.value, c.center.uncertainty, u)}, FWHM ${formatMeasured(c.fwhm.value, c.fwhm.uncertainty, u)}, ` +
      `depth ${formatMeasured(c.depth.value, c.depth.uncertainty)}, equivalent width ${formatMeasured(c.equivalentWidth.value, c.equivalentWidth.uncertainty, u)}.`),
  ];
  const atBound = result.parameters.filter((p) => p.atBound).map((p) => p.name);
  if (atBound.length) lines.push(`At a bound (treat with care): ${atBound.join(', ')}.`);
  const components: Table = {
    caption: 'Fitted components (± 1σ)',
    columns: [
      { key: 'component', label: 'Component' },
      { key: 'centre', label: 'Centre', unit: u },
      { key: 'fwhm', label: 'FWHM', unit: u },
      { key: 'amplitude', label: 'Amplitude', unit: fluxUnit },
      { key: 'depth', label: 'Depth', unit: 'of continuum' },
      { key: 'ew', label: 'Equivalent width', unit: u },
    ],
    rows: result.components.map((c, k) => ({
      component: String(k + 1),
      centre: c.center,
      fwhm: c.fwhm,
      amplitude: c.amplitude,
      depth: c.depth,
      ew: c.equivalentWidth,
    })),
  };
  const parameters: Table = {
    caption: 'Model parameters (± 1σ)',
    columns: [
      { key: 'name', label: 'Parameter' },
      { key: 'value', label: 'Value' },
      { key: 'note', label: 'Note' },
    ],
    rows: result.parameters.map((p) => ({
      name: p.name,
      value: p.fixed ? formatSignificant(p.value, 6) : { value: p.value, uncertainty: p.uncertainty },
      note: [p.fixed ? 'fixed' : '', p.tiedTo ? `tied to ${p.tiedTo}` : '', p.atBound ? 'at bound' : ''].filter(Boolean).join(', '),
    })),
  };
  const where = result.components.length === 1 ? ` at ${formatNumber(result.components[0].center.value, 2)} ${u}` : '';
  return { title: titleWithObservation(`Line fit${where}`, context), lines, tables: [components, parameters] };
}

/**
 * Found lines for people: how many above which threshold, where the noise came from, how
 * many windows (blends), and a table numbered from 1 (the numbers `plotFoundLines` can
 * label the lines with).
 *
 * @param result from `findLines`; not modified.
 * @param context the spectrum they were found in (for the title and flux unit).
 * @returns title, sentences and a table of the lines (at most {@link SUMMARY_MAX_ROWS} rows).
 * @example summarizeFoundLines(findLines(star)).lines[0]; // '3 lines above 5 σ (noise from the uncertainty column) in 3 windows: 3 absorption, 0 emission.'
 */
export function summarizeFoundLines(result: FindLinesResult, context: ResultContext = {}): ResultSummary {
  const u = lengthUnit(result.unit);
  const absorption = result.lines.filter((l) => l.sign === 'absorption').length;
  const windowOf = new Map<object, number>();
  result.windows.forEach((w, k) => w.lines.forEach((l) => windowOf.set(l, k + 1)));
  const blends = result.windows.filter((w) => w.components > 1).length;
  const noise = result.noiseSource === 'uncertainty' ? 'noise from the uncertainty column' : `noise ${formatSignificant(result.noisePerPixel ?? NaN, 3)} per pixel from DER_SNR`;
  const lines = [
    `${plural(result.lines.length, 'line')} above ${formatNumber(result.significance)} σ (${noise}) in ${plural(result.windows.length, 'window')}: ${absorption} absorption, ${result.lines.length - absorption} emission${blends ? `; ${plural(blends, 'window')} with blends` : ''}.`,
    'Centres and widths are the finder\'s estimates (starting values for a fit), without uncertainties.',
  ];
  const capped = capRows(result.lines, 'lines');
  if (capped.note) lines.push(`Table: ${capped.note}.`);
  const fluxUnit = context.spectrum?.fluxUnit?.trim() || 'flux units';
  const table: Table = {
    caption: 'Found lines',
    columns: [
      { key: 'n', label: '#' },
      { key: 'centre', label: 'Centre', unit: u, digits: 2 },
      { key: 'fwhm', label: 'FWHM', unit: u, digits: 2 },
      { key: 'amplitude', label: 'Amplitude', unit: fluxUnit },
      { key: 'kind', label: 'Kind' },
      { key: 'significance', label: 'Significance', unit: 'σ', digits: 1 },
      { key: 'window', label: 'Window' },
    ],
    rows: capped.rows.map((l, k): Record<string, TableCell> => ({
      n: k + 1,
      centre: l.center,
      fwhm: l.fwhm,
      amplitude: formatSignificant(l.amplitude, 3),
      kind: l.sign,
      significance: l.significance,
      window: windowOf.get(l) ?? null,
    })),
  };
  return { title: titleWithObservation('Found lines', context), lines, tables: [table] };
}
