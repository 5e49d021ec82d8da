/**
 * Plot of a spectrum: flux against wavelength, with optional 1-σ band, continuum, and
 * marked, labelled lines.
 */
import { InputError } from '../errors.js';
import type { Medium, Spectrum } from '../spectrum/spectrum.js';
import { angstromPerUnit } from '../spectrum/units.js';
import { checkColumns, checkSize, finiteRange, fluxTitle, formatFixed, isFiniteNumber, topLevel, wavelengthTitle, type PlotOptions } from './common.js';
import { placeLabels, type LabelPlacementOptions } from './labels.js';
import { DASH, inSeries, type LegendEntry } from './legend.js';
import type { PlotDatum, VegaLiteSpec } from './spec.js';
import { PLOT_THEME } from './theme.js';

/** A line to mark on a spectrum plot. */
export interface MarkedLine {
  /** Where to draw the marker, in Å, in the same medium and frame as the spectrum (observed, shifted position for a moving star). */
  readonly wavelengthAngstrom: number;
  /** Label text, e.g. `Hα` or `Ne I 6402.25`. */
  readonly label: string;
  /** Which labels win the room when not all fit (`labelOverflow: 'drop'`): higher first; equal ones in input order. Default 0. */
  readonly priority?: number;
}

/**
 * What {@link spectrumPlot} draws. Arrays have one value per pixel and are not modified.
 *
 * Missing data: a pixel whose wavelength or flux is not finite, or whose mask is non-zero,
 * is left out and the line breaks there; a pixel whose uncertainty is not a finite positive
 * number gets no band.
 */
export interface SpectrumPlotData {
  /** Wavelength of each pixel in Å (air or vacuum, see `medium`). */
  readonly wavelengthAngstrom: ArrayLike<number>;
  /** Flux of each pixel, in `fluxUnit`. */
  readonly flux: ArrayLike<number>;
  /** 1-σ flux uncertainty per pixel, same unit as flux; drawn as a band of ±1σ. */
  readonly uncertainty?: ArrayLike<number>;
  /** Per-pixel mask, non-zero = bad pixel (not drawn). */
  readonly mask?: ArrayLike<number>;
  /** Continuum per pixel, same unit as flux. */
  readonly continuum?: ArrayLike<number>;
  /** Medium of the wavelengths, shown in the axis title; null or absent = not stated. */
  readonly medium?: Medium;
  /** Flux unit for the axis title (e.g. `ADU`); null or absent = arbitrary units. */
  readonly fluxUnit?: string | null;
  /** True when the flux is divided by the continuum (axis says so; default false). */
  readonly normalised?: boolean;
  /** Lines to mark with a vertical rule and a label. */
  readonly lines?: readonly MarkedLine[];
  /** Wavelength intervals to shade (e.g. the windows a line finder chose for fitting), in Å; listed in the legend as `windowLabel`. */
  readonly windows?: readonly ShadedWindow[];
  /** Legend name of the shaded windows (default `Fit window`). */
  readonly windowLabel?: string;
}

/** A wavelength interval shaded on a spectrum plot. */
export interface ShadedWindow {
  /** Blue end in Å. */
  readonly startAngstrom: number;
  /** Red end in Å. */
  readonly endAngstrom: number;
}

/** Options of {@link spectrumPlot}. */
export interface SpectrumPlotOptions extends PlotOptions {
  /** Most rows of line labels above the plot (default 4). */
  maxLabelRows?: number;
  /**
   * What happens to labels that find no free row: `overlap` (default) puts them in the row
   * that frees up first, over other labels; `drop` leaves those lines out (marker and
   * label), keeping the lines of highest `priority`, and the subtitle counts them.
   */
  labelOverflow?: 'overlap' | 'drop';
}

const DEFAULT_MAX_LABEL_ROWS = 4;

/**
 * Builds a Vega-Lite spec of a spectrum: flux against wavelength as a line, an optional
 * ±1σ band, an optional continuum (dashed), optional shaded windows, and optional lines
 * marked with dotted rules and labels in a strip above the plot. Labels of close lines go into separate rows
 * ({@link placeLabels}) so they do not print over each other.
 *
 * @param data wavelengths in Å, flux, optional uncertainty, mask, continuum, medium,
 *   flux unit and lines to mark (see {@link SpectrumPlotData}).
 * @param options title (default `Spectrum`), subtitle (default: pixel count and range),
 *   width and height in px, most label rows.
 * @returns a Vega-Lite spec (a plain object you may change before rendering).
 * @throws {InputError} `plot.length-mismatch` when the arrays differ in length,
 *   `plot.empty` when there are no pixels, `plot.no-finite-data` when no pixel is usable.
 * @throws {UsageError} `plot.bad-size` for a width or height outside 20–10 000 px.
 * @example
 * const spec = spectrumPlot({ wavelengthAngstrom: [6550, 6560, 6570], flux: [1, 0.6, 1], medium: 'air',
 *   lines: [{ wavelengthAngstrom: 6562.8, label: 'Hα' }] });
 * spec.$schema; // 'https://vega.github.io/schema/vega-lite/v5.json'
 */
export function spectrumPlot(data: SpectrumPlotData, options: SpectrumPlotOptions = {}): VegaLiteSpec {
  const n = checkColumns('spectrum plot', {
    wavelengthAngstrom: data.wavelengthAngstrom,
    flux: data.flux,
    uncertainty: data.uncertainty,
    mask: data.mask,
    continuum: data.continuum,
  });
  const width = checkSize('width', options.width, PLOT_THEME.width);
  const height = checkSize('height', options.height, PLOT_THEME.height);
  const colors = PLOT_THEME.colors;

  const fluxRows: PlotDatum[] = [];
  const bandRows: PlotDatum[] = [];
  const continuumRows: PlotDatum[] = [];
  let fluxSegment = 0;
  let bandSegment = 0;
  let continuumSegment = 0;
  let fluxOpen = false;
  let bandOpen = false;
  let continuumOpen = false;
  for (let i = 0; i < n; i++) {
    const w = data.wavelengthAngstrom[i];
    const f = data.flux[i];
    const masked = data.mask !== undefined && data.mask[i] !== 0;
    const usable = isFiniteNumber(w) && isFiniteNumber(f) && !masked;
    if (usable) {
      if (!fluxOpen) fluxSegment++;
      fluxRows.push({ wavelength: w, flux: f, segment: fluxSegment });
    }
    fluxOpen = usable;
    const s = data.uncertainty?.[i];
    const banded = usable && isFiniteNumber(s) && s > 0;
    if (banded) {
      if (!bandOpen) bandSegment++;
      bandRows.push({ wavelength: w, fluxLow: f - s, fluxHigh: f + s, segment: bandSegment });
    }
    bandOpen = banded;
    const c = data.continuum?.[i];
    const continued = isFiniteNumber(w) && isFiniteNumber(c) && !masked;
    if (continued) {
      if (!continuumOpen) continuumSegment++;
      continuumRows.push({ wavelength: w, continuum: c, segment: continuumSegment });
    }
    continuumOpen = continued;
  }
  if (fluxRows.length === 0) {
    throw new InputError('plot.no-finite-data', 'spectrum plot: no pixel has a finite wavelength and flux and a zero mask, nothing to plot', { keyword: 'flux' });
  }

  const [wLo, wHi] = finiteRange(fluxRows.map((r) => r.wavelength as number));
  const domain: [number, number] = wLo === wHi ? [wLo - 0.5, wHi + 0.5] : [wLo, wHi];
  const xScale = { domain, nice: false, zero: false };
  const xTitle = wavelengthTitle(data.medium);

  const windowRows: PlotDatum[] = [];
  for (const w of data.windows ?? []) {
    const lo = Math.max(Math.min(w.startAngstrom, w.endAngstrom), domain[0]);
    const hi = Math.min(Math.max(w.startAngstrom, w.endAngstrom), domain[1]);
    if (isFiniteNumber(lo) && isFiniteNumber(hi) && hi > lo) windowRows.push({ start: lo, end: hi });
  }
  const windowName = data.windowLabel?.trim() || 'Fit window';

  const legend: LegendEntry[] = [{ name: 'Flux', color: colors.data, symbol: 'line' }];
  if (bandRows.length > 0) legend.push({ name: '±1σ', color: colors.uncertainty, symbol: 'band' });
  if (continuumRows.length > 0) legend.push({ name: 'Continuum', color: colors.continuum, symbol: 'dashed' });
  if (windowRows.length > 0) legend.push({ name: windowName, color: colors.region, symbol: 'band' });

  const mainLayers: Record<string, unknown>[] = [];
  if (windowRows.length > 0) {
    // Shading first, under everything else.
    mainLayers.push(inSeries({
      data: { name: 'windows' },
      mark: { type: 'rect', opacity: 0.2 },
      encoding: {
        x: { field: 'start', type: 'quantitative', scale: xScale, title: xTitle },
        x2: { field: 'end' },
      },
    }, windowName, legend));
  }
  if (bandRows.length > 0) {
    mainLayers.push(inSeries({
      data: { name: 'band' },
      mark: { type: 'area', opacity: 0.35 },
      encoding: {
        x: { field: 'wavelength', type: 'quantitative', scale: xScale, title: xTitle },
        y: { field: 'fluxLow', type: 'quantitative' },
        y2: { field: 'fluxHigh' },
        detail: { field: 'segment', type: 'nominal' },
      },
    }, '±1σ', legend));
  }
  mainLayers.push(inSeries({
    data: { name: 'spectrum' },
    mark: { type: 'line', strokeWidth: 1.2 },
    encoding: {
      x: { field: 'wavelength', type: 'quantitative', scale: xScale, title: xTitle },
      y: { field: 'flux', type: 'quantitative', scale: { zero: false }, title: fluxTitle(data.fluxUnit, data.normalised) },
      detail: { field: 'segment', type: 'nominal' },
    },
  }, 'Flux', legend));
  if (continuumRows.length > 0) {
    mainLayers.push(inSeries({
      data: { name: 'continuum' },
      mark: { type: 'line', strokeDash: [...DASH.dashed], strokeWidth: 1.6 },
      encoding: {
        x: { field: 'wavelength', type: 'quantitative', scale: xScale, title: xTitle },
        y: { field: 'continuum', type: 'quantitative' },
        detail: { field: 'segment', type: 'nominal' },
      },
    }, 'Continuum', legend));
  }

  const inRange = (data.lines ?? []).filter((l) => isFiniteNumber(l.wavelengthAngstrom) && l.wavelengthAngstrom >= domain[0] && l.wavelengthAngstrom <= domain[1]);
  const placement = { domain, lengthPx: width, fontSizePx: PLOT_THEME.lineLabelFontSize, maxRows: options.maxLabelRows ?? DEFAULT_MAX_LABEL_ROWS };
  const lines = options.labelOverflow === 'drop' ? labelsThatFit(inRange, placement) : inRange;
  const dropped = inRange.length - lines.length;
  const placed = placeLabels(lines.map((l) => ({ x: l.wavelengthAngstrom, text: l.label })), placement);
  const lineRows: PlotDatum[] = placed.map((p) => ({
    wavelength: lines[p.index].wavelengthAngstrom,
    label: lines[p.index].label,
    row: p.row,
    labelWavelength: p.textX,
  }));
  const rows = placed.reduce((m, p) => Math.max(m, p.row + 1), 0);

  const datasets: Record<string, PlotDatum[]> = { spectrum: fluxRows };
  if (bandRows.length > 0) datasets.band = bandRows;
  if (continuumRows.length > 0) datasets.continuum = continuumRows;
  if (windowRows.length > 0) datasets.windows = windowRows;

  const subtitle = options.subtitle ??
    `${fluxRows.length} pixels, ${formatFixed(domain[0], 1)}–${formatFixed(domain[1], 1)} Å` +
    (lineRows.length ? `; ${lineRows.length} line${lineRows.length === 1 ? '' : 's'} marked` : '') +
    (dropped ? `, ${dropped} more left out for lack of room` : '');
  const spec = topLevel(options.title ?? 'Spectrum', subtitle, datasets, 'Flux against wavelength.');

  if (lineRows.length === 0) {
    return { ...spec, width, height, layer: mainLayers };
  }
  datasets.lines = lineRows;
  // Rules at each marked line, under the spectrum so that they never hide it.
  mainLayers.unshift({
    data: { name: 'lines' },
    mark: { type: 'rule', strokeDash: [2, 3], strokeWidth: 1, color: colors.lineMarker },
    encoding: { x: { field: 'wavelength', type: 'quantitative', scale: xScale, title: xTitle } },
  });
  const rowHeight = PLOT_THEME.labelRowHeight;
  const labelStrip = {
    height: rows * rowHeight + 6,
    width,
    data: { name: 'lines' },
    layer: [
      {
        // Leader from the bottom of the strip up to the label's row.
        mark: { type: 'rule', strokeDash: [2, 3], strokeWidth: 1, color: colors.lineMarker },
        encoding: {
          x: { field: 'wavelength', type: 'quantitative', scale: xScale, axis: null },
          y: { field: 'row', type: 'quantitative', scale: { domain: [0, rows], nice: false, zero: true }, axis: null },
          y2: { datum: 0 },
        },
      },
      {
        // White halo under each label, so that a leader passing behind a label of a lower row does not cross its text.
        mark: { type: 'text', baseline: 'bottom', align: 'center', dy: -1, color: 'white', stroke: 'white', strokeWidth: 4, strokeJoin: 'round' },
        encoding: {
          x: { field: 'labelWavelength', type: 'quantitative', scale: xScale, axis: null },
          y: { field: 'row', type: 'quantitative', scale: { domain: [0, rows], nice: false, zero: true }, axis: null },
          text: { field: 'label', type: 'nominal' },
        },
      },
      {
        mark: { type: 'text', baseline: 'bottom', align: 'center', dy: -1, color: colors.annotation },
        encoding: {
          x: { field: 'labelWavelength', type: 'quantitative', scale: xScale, axis: null },
          y: { field: 'row', type: 'quantitative', scale: { domain: [0, rows], nice: false, zero: true }, axis: null },
          text: { field: 'label', type: 'nominal' },
        },
      },
    ],
  };
  return {
    ...spec,
    spacing: 0,
    resolve: { scale: { x: 'shared' } },
    vconcat: [labelStrip, { width, height, layer: mainLayers }],
  };
}

/**
 * The lines whose labels all fit without overlapping: taken in order of priority (then
 * input order), each kept when {@link placeLabels} still finds every kept label a free
 * row. Returned in input order.
 */
function labelsThatFit(lines: readonly MarkedLine[], placement: LabelPlacementOptions): MarkedLine[] {
  const order = lines.map((l, i) => ({ l, i })).sort((a, b) => (b.l.priority ?? 0) - (a.l.priority ?? 0) || a.i - b.i);
  const kept: { l: MarkedLine; i: number }[] = [];
  for (const candidate of order) {
    const trial = [...kept, candidate];
    const placed = placeLabels(trial.map(({ l }) => ({ x: l.wavelengthAngstrom, text: l.label })), placement);
    if (placed.every((p) => !p.overlaps)) kept.push(candidate);
  }
  return kept.sort((a, b) => a.i - b.i).map(({ l }) => l);
}

/**
 * The plot data of a {@link Spectrum}: its wavelengths converted to Å, flux,
 * uncertainty, mask, medium and flux unit, plus optional continuum and lines.
 *
 * @param spectrum a wavelength-calibrated spectrum (unit Å, nm or µm); not modified.
 * @param extras continuum (one value per pixel) and lines to mark.
 * @throws {UsageError} `units.pixel` when the spectrum is not wavelength-calibrated.
 * @example
 * const s = createSpectrum({ wavelength: [656, 656.3, 656.6], flux: [1, 0.5, 1], unit: 'nm', medium: 'air' });
 * spectrumPlotData(s).wavelengthAngstrom; // [6560, 6563, 6566]
 */
export function spectrumPlotData(spectrum: Spectrum, extras: { continuum?: ArrayLike<number>; lines?: readonly MarkedLine[] } = {}): SpectrumPlotData {
  const scale = angstromPerUnit(spectrum.unit);
  return {
    wavelengthAngstrom: Array.from(spectrum.wavelength, (w) => w * scale),
    flux: spectrum.flux,
    uncertainty: spectrum.uncertainty,
    mask: spectrum.mask,
    continuum: extras.continuum,
    medium: spectrum.medium,
    fluxUnit: spectrum.fluxUnit,
    lines: extras.lines,
  };
}
