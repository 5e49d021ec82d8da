/**
 * MIME bundles: what a notebook kernel sends to show one object, with every
 * representation a viewer may pick from.
 */
import { UsageError } from '../errors.js';
import { renderSvg, type RenderOptions } from '../plot/render.js';
import { resultPlot } from '../plot/results/index.js';
import { VEGA_LITE_MIME_TYPE, isVegaLiteSpec, type VegaLiteSpec } from '../plot/spec.js';
import { escapeHtml } from '../report/html.js';
import { summarizeResult } from '../report/results/index.js';
import { isLibraryResult, type LibraryResult } from '../report/results/kind.js';
import { summaryText, type ResultContext, type ResultSummary } from '../report/results/summary.js';
import { isTable, tableHtml, tableText, type Table } from '../report/table.js';

/**
 * One displayed object in several representations, keyed by MIME type. Every bundle has
 * `text/plain`; a plot adds the Vega-Lite spec (a live, zoomable plot in JupyterLab) and
 * an SVG rendered in Node (shown by every viewer, and kept in the saved notebook); a
 * table adds HTML; a library result has both (see {@link displayMessages}).
 */
export interface MimeBundle {
  'text/plain': string;
  'text/html'?: string;
  'image/svg+xml'?: string;
  'application/vnd.vegalite.v5+json'?: VegaLiteSpec;
}

/**
 * What {@link mimeBundle} and `display` accept: a Vega-Lite spec, a {@link Table}, a
 * text, or a library result (spectrum, line fit, found lines, continuum, identification,
 * dispersion solution, velocity from lines or by cross-correlation, velocity table,
 * periodogram, orbit fit).
 */
export type Displayable = VegaLiteSpec | Table | string | LibraryResult;

/** Options of {@link mimeBundle}: rendering options, and the spectrum or velocity table a result came from. */
export interface BundleOptions extends RenderOptions, ResultContext {}

/**
 * The bundle of a plot whose SVG is already rendered. Pure: no rendering, no I/O.
 *
 * @param spec the Vega-Lite spec; copied (as JSON) into the bundle, so later changes to
 *   `spec` do not change it.
 * @param svg the SVG text from {@link renderSvg}.
 * @returns the bundle with the Vega-Lite, SVG and plain-text representations.
 * @example plotBundle(spec, svg)['text/plain']; // 'Spectrum: 988 pixels, 6450.0–6699.8 Å (plot)'
 */
export function plotBundle(spec: VegaLiteSpec, svg: string): MimeBundle {
  return {
    [VEGA_LITE_MIME_TYPE]: JSON.parse(JSON.stringify(spec)) as VegaLiteSpec,
    'image/svg+xml': svg,
    'text/plain': plotText(spec),
  };
}

/**
 * The bundle of a table: escaped HTML and aligned plain text. Pure.
 * @throws {UsageError} `report.bad-table` for a malformed table.
 * @example tableBundle({ columns: [{ key: 'a', label: 'A' }], rows: [{ a: 1 }] })['text/plain']; // 'A\n-\n1'
 */
export function tableBundle(table: Table): MimeBundle {
  return { 'text/html': tableHtml(table), 'text/plain': tableText(table) };
}

/**
 * The bundle of a result summary and, when there is one, its plot. Pure: no rendering.
 * HTML: a `<div class="lineshift-result">` with the title in bold, one paragraph per
 * sentence and the tables, all text escaped. Text: the summary as aligned text, then the
 * note (why there is no plot) or the plot's title line. With a plot, the Vega-Lite spec
 * and the SVG are added; {@link displayMessages} sends the two halves as two messages.
 *
 * @param summary from `summarizeResult`.
 * @param plot the plot and its SVG, when there is one.
 * @param note why there is no plot, shown in the text.
 * @returns the bundle.
 * @example resultBundle({ title: 'Spectrum', lines: ['2048 pixels.'], tables: [] })['text/html'];
 * // '<div class="lineshift-result"><p><strong>Spectrum</strong></p><p>2048 pixels.</p></div>'
 */
export function resultBundle(summary: ResultSummary, plot?: { spec: VegaLiteSpec; svg: string }, note?: string): MimeBundle {
  const html = [
    `<p><strong>${escapeHtml(summary.title)}</strong></p>`,
    ...summary.lines.map((l) => `<p>${escapeHtml(l)}</p>`),
    ...summary.tables.map(tableHtml),
    ...(note ? [`<p><em>${escapeHtml(note)}</em></p>`] : []),
  ].join('');
  const text = [summaryText(summary), ...(note ? [note] : []), ...(plot ? [plotText(plot.spec)] : [])].join('\n\n');
  return {
    'text/html': `<div class="lineshift-result">${html}</div>`,
    'text/plain': text,
    ...(plot ? { [VEGA_LITE_MIME_TYPE]: JSON.parse(JSON.stringify(plot.spec)) as VegaLiteSpec, 'image/svg+xml': plot.svg } : {}),
  };
}

/**
 * The display messages that show a bundle, in order. A notebook front end shows one MIME
 * type per message (the richest it can: the live Vega-Lite plot over HTML, say), so a
 * bundle holding both a table (HTML) and a plot is sent as two messages: the HTML with
 * the text, then the plot (Vega-Lite, SVG and its title line). Any other bundle is one
 * message. Pure.
 *
 * @param bundle from {@link mimeBundle}.
 * @returns one or two bundles.
 * @example displayMessages(await mimeBundle(fit)).length; // 2: the tables, then the plot
 */
export function displayMessages(bundle: MimeBundle): MimeBundle[] {
  const spec = bundle[VEGA_LITE_MIME_TYPE];
  const svg = bundle['image/svg+xml'];
  if (bundle['text/html'] === undefined || spec === undefined || svg === undefined) return [bundle];
  return [
    { 'text/html': bundle['text/html'], 'text/plain': bundle['text/plain'] },
    { [VEGA_LITE_MIME_TYPE]: spec, 'image/svg+xml': svg, 'text/plain': plotText(spec) },
  ];
}

/**
 * The MIME bundle of a plot, a table, a text or a library result. For a plot the SVG is
 * rendered here (vega is loaded on first use); a result gets its summary (title,
 * sentences, tables; see `summarizeResult`) and its plot (see `resultPlot`), which may
 * need the spectrum or velocity table it came from (`options.spectrum`,
 * `options.table`). The function has no other effect and sends nothing, which makes it
 * the testable half of `display`.
 *
 * @param value a Vega-Lite spec (from a plot builder), a {@link Table}, a string, or a library result.
 * @param options logger for vega warnings; SVG id prefix; the spectrum or velocity table of a result.
 * @returns the bundle.
 * @throws {UsageError} `notebook.not-displayable` for anything else; the plot functions'
 *   errors when the context does not match the result.
 * @example
 * const bundle = await mimeBundle(spectrumPlot(data));
 * Object.keys(bundle); // ['application/vnd.vegalite.v5+json', 'image/svg+xml', 'text/plain']
 * @example
 * const fit = fitLine(star, { centerAngstrom: 6563 });
 * Object.keys(await mimeBundle(fit, { spectrum: star })); // ['text/html', 'text/plain', 'application/vnd.vegalite.v5+json', 'image/svg+xml']
 */
export async function mimeBundle(value: Displayable, options: BundleOptions = {}): Promise<MimeBundle> {
  if (typeof value === 'string') return { 'text/plain': value };
  if (isVegaLiteSpec(value)) return plotBundle(value, await renderSvg(value, options));
  if (isTable(value)) return tableBundle(value);
  if (isLibraryResult(value)) {
    const context: ResultContext = { spectrum: options.spectrum, table: options.table };
    const summary = summarizeResult(value, context);
    const plot = resultPlot(value, context);
    return plot.spec
      ? resultBundle(summary, { spec: plot.spec, svg: await renderSvg(plot.spec, options) })
      : resultBundle(summary, undefined, plot.note);
  }
  throw new UsageError('notebook.not-displayable', 'display() shows a Vega-Lite spec from a plot builder, a table ({ columns, rows }), a string, or a lineshift result (spectrum, line fit, found lines, continuum, identification, dispersion solution, velocity from lines or cross-correlation, velocity table, periodogram, orbit fit)');
}

/** One line of text for a plot: its title and subtitle. */
function plotText(spec: VegaLiteSpec): string {
  const title = spec.title;
  let text = 'Vega-Lite plot';
  if (typeof title === 'string') text = title;
  else if (title && typeof title === 'object') {
    const t = title as { text?: unknown; subtitle?: unknown };
    const main = Array.isArray(t.text) ? t.text.join(' ') : typeof t.text === 'string' ? t.text : '';
    const sub = Array.isArray(t.subtitle) ? t.subtitle.join('; ') : typeof t.subtitle === 'string' ? t.subtitle : '';
    text = [main, sub].filter(Boolean).join(': ') || text;
  }
  return `${text} (plot)`;
}
