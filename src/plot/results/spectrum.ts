/**
 * Plots of spectra from library results: a spectrum with its continuum and identified
 * lines, and a spectrum with the lines the finder found.
 */
import { UsageError } from '../../errors.js';
import type { IdentificationResult } from '../../elements/identify.js';
import type { SpectrumIdentification } from '../../elements/spectrum.js';
import type { LineCandidate, Verdict } from '../../elements/types.js';
import type { ContinuumResult } from '../../lines/continuum.js';
import type { FindLinesResult } from '../../lines/find.js';
import { formatNumber } from '../../report/format.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { formatFixed } from '../common.js';
import type { VegaLiteSpec } from '../spec.js';
import { spectrumPlot, spectrumPlotData, type MarkedLine, type ShadedWindow, type SpectrumPlotOptions } from '../spectrum.js';
import { joinParts, objectTitle, observationDate, retitle } from './titles.js';

/** Options of {@link plotSpectrum}. */
export interface PlotSpectrumOptions extends SpectrumPlotOptions {
  /** The continuum: a `fitContinuum` result or one value per pixel (flux units); drawn dashed. */
  continuum?: ContinuumResult | ArrayLike<number>;
  /** An element identification of this spectrum: its found lines whose best candidate has one of `verdicts` are labelled `species λ`. */
  identification?: IdentificationResult;
  /** Verdicts of the best candidate that get a label (default `['present']`; add `possible`, `telluric`). */
  verdicts?: readonly (Verdict | 'telluric')[];
  /** More lines to mark (Å, the spectrum's medium). */
  lines?: readonly MarkedLine[];
  /** Wavelength intervals to shade, Å. */
  windows?: readonly ShadedWindow[];
  /** True when the flux is continuum-normalised (axis title says so). */
  normalised?: boolean;
}

const DEFAULT_VERDICTS: readonly (Verdict | 'telluric')[] = ['present'];

/** Plot label of a candidate: `Si II 6347`, `H2O telluric`. */
function candidateLabel(c: LineCandidate): string {
  if (c.telluric) return /telluric/i.test(c.species) ? c.species : `${c.species} telluric`;
  return `${c.species} ${formatFixed(c.restWavelengthAngstrom, 0)}`;
}

/**
 * Plot of a spectrum read or computed by the library: flux against wavelength in Å
 * (converted from nm or µm) with the ±1σ band, masked pixels left out, and optionally the
 * continuum, the lines identified as belonging to species judged present, and any other
 * marked lines. When not all labels fit in the label rows, the lines of the strongest
 * detections keep theirs and the rest are left out (counted in the subtitle). Title: the
 * OBJECT card; subtitle: DATE-OBS and the builder's summary (pixels, range, lines marked). Axis titles carry the unit,
 * medium and flux unit.
 *
 * @param spectrum a wavelength-calibrated spectrum; not modified.
 * @param options continuum, identification and verdicts to label, more lines, windows,
 *   normalised flag, and the {@link spectrumPlot} options (title, subtitle, sizes).
 * @returns a Vega-Lite spec.
 * @throws {UsageError} `plot.uncalibrated` for a spectrum on a pixel axis;
 *   `plot.length-mismatch` (InputError) for a continuum of another length.
 * @example
 * const star = readSpectrum('data/samples/lvac7-star.fits');
 * const spec = plotSpectrum(star, { identification: identifySpectrum(star) });
 * (spec.title as { text: string }).text; // 'LVAC-7'
 */
export function plotSpectrum(spectrum: Spectrum, options: PlotSpectrumOptions = {}): VegaLiteSpec {
  if (spectrum.unit === 'pixel') {
    throw new UsageError('plot.uncalibrated', 'the spectrum has no wavelength scale (its axis is in pixels): calibrate it first (see calibrateLamp and applySolution)');
  }
  const { continuum, identification, verdicts = DEFAULT_VERDICTS, lines = [], windows, normalised, ...plotOptions } = options;
  const continuumValues = continuum === undefined ? undefined : isContinuumResult(continuum) ? continuum.continuum : continuum;
  const marked: MarkedLine[] = [...lines];
  let labelled = 0;
  if (identification) {
    const found = 'found' in identification ? (identification as SpectrumIdentification).found : undefined;
    for (const l of identification.lines) {
      // The best-ranked candidate with a wanted verdict (a line may rank a telluric band above a species).
      const c = l.candidates.find((k) => verdicts.includes(k.verdict));
      if (!c || l.centreTooUncertain) continue;
      // Stronger detections keep their labels when not all fit.
      marked.push({ wavelengthAngstrom: l.wavelengthAngstrom, label: candidateLabel(c), priority: found?.[l.index]?.significance ?? c.score });
      labelled++;
    }
  }
  const data = { ...spectrumPlotData(spectrum, { continuum: continuumValues, lines: marked }), windows, normalised };
  const spec = spectrumPlot(data, { labelOverflow: 'drop', ...plotOptions });
  const identified = identification ? `labelled: lines of ${verdicts.map((v) => (v === 'telluric' ? 'telluric bands' : `species ${v}`)).join(', ')} (${labelled} lines)` : undefined;
  return retitle(spec, objectTitle('spectrum', spectrum), [joinParts([observationDate(spectrum), identified])], plotOptions);
}

/** Options of {@link plotFoundLines}. */
export interface PlotFoundLinesOptions extends SpectrumPlotOptions {
  /** Label each line with its number in the result (`number`, as in `summarizeFoundLines`) or its centre in Å (`wavelength`, default). */
  label?: 'number' | 'wavelength';
  /** Shade each line's fitting window (default true). */
  showWindows?: boolean;
}

/**
 * Plot of the lines `findLines` found in a spectrum: the spectrum with each line marked
 * and labelled (its centre in Å, or its number), and the windows the finder grouped the
 * lines into for fitting shaded. When not all labels fit, the most significant lines keep
 * theirs and the rest are left out (counted in the subtitle).
 *
 * @param spectrum the wavelength-calibrated spectrum the lines were found in; not modified.
 * @param found the `findLines(spectrum)` result (positions in Å).
 * @param options label style, windows, and the {@link spectrumPlot} options.
 * @returns a Vega-Lite spec.
 * @throws {UsageError} `plot.uncalibrated` when the spectrum or the result is on a pixel axis.
 * @example
 * const spec = plotFoundLines(star, findLines(star));
 * (spec.datasets as { lines: unknown[] }).lines.length; // 3
 */
export function plotFoundLines(spectrum: Spectrum, found: FindLinesResult, options: PlotFoundLinesOptions = {}): VegaLiteSpec {
  if (spectrum.unit === 'pixel' || found.unit === 'pixel') {
    throw new UsageError('plot.uncalibrated', 'found lines on a pixel axis cannot be drawn on a wavelength plot: calibrate the spectrum first, or show the table (summarizeFoundLines)');
  }
  const { label = 'wavelength', showWindows = true, ...plotOptions } = options;
  const lines: MarkedLine[] = found.lines.map((l, k) => ({
    wavelengthAngstrom: l.center,
    label: label === 'number' ? String(k + 1) : formatFixed(l.center, 1),
    priority: l.significance,
  }));
  const windows = showWindows ? found.windows.map((w) => ({ startAngstrom: w.start, endAngstrom: w.end })) : undefined;
  const spec = spectrumPlot({ ...spectrumPlotData(spectrum, { lines }), windows }, { labelOverflow: 'drop', ...plotOptions });
  const absorption = found.lines.filter((l) => l.sign === 'absorption').length;
  const what = `${found.lines.length} line${found.lines.length === 1 ? '' : 's'} above ${formatNumber(found.significance)} σ (${absorption} absorption, ${found.lines.length - absorption} emission) in ${found.windows.length} window${found.windows.length === 1 ? '' : 's'}`;
  return retitle(spec, objectTitle('found lines', spectrum), [joinParts([observationDate(spectrum), what])], plotOptions);
}

function isContinuumResult(c: ContinuumResult | ArrayLike<number>): c is ContinuumResult {
  return (c as ContinuumResult).continuum instanceof Float64Array && (c as ContinuumResult).used instanceof Uint8Array;
}
