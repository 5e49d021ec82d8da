/**
 * MIME bundles: what a notebook kernel sends to show one object, with every
 * representation a viewer may pick from.
 */
import { UsageError } from '../errors.js';
import { renderSvg, type RenderOptions } from '../plot/render.js';
import { VEGA_LITE_MIME_TYPE, isVegaLiteSpec, type VegaLiteSpec } from '../plot/spec.js';
import { isTable, tableHtml, tableText, type Table } from '../report/table.js';

/**
 * One displayed object in several representations, keyed by MIME type. Every bundle has
 * `text/plain`; a plot adds the Vega-Lite spec (a live, zoomable plot in JupyterLab) and
 * an SVG rendered in Node (shown by every viewer, and kept in the saved notebook); a
 * table adds HTML.
 */
export interface MimeBundle {
  'text/plain': string;
  'text/html'?: string;
  'image/svg+xml'?: string;
  'application/vnd.vegalite.v5+json'?: VegaLiteSpec;
}

/** What {@link mimeBundle} and {@link display} accept: a Vega-Lite spec, a {@link Table}, or text. */
export type Displayable = VegaLiteSpec | Table | string;

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
 * The MIME bundle of a plot, a table or a text. For a plot the SVG is rendered here
 * (vega is loaded on first use); the function has no other effect and sends nothing,
 * which makes it the testable half of {@link display}.
 *
 * @param value a Vega-Lite spec (from a plot builder), a {@link Table}, or a string.
 * @param options logger for vega warnings; SVG id prefix.
 * @returns the bundle.
 * @throws {UsageError} `notebook.not-displayable` for anything else.
 * @example
 * const bundle = await mimeBundle(spectrumPlot(data));
 * Object.keys(bundle); // ['application/vnd.vegalite.v5+json', 'image/svg+xml', 'text/plain']
 */
export async function mimeBundle(value: Displayable, options: RenderOptions = {}): Promise<MimeBundle> {
  if (typeof value === 'string') return { 'text/plain': value };
  if (isVegaLiteSpec(value)) return plotBundle(value, await renderSvg(value, options));
  if (isTable(value)) return tableBundle(value);
  throw new UsageError('notebook.not-displayable', 'display() shows a Vega-Lite spec from a plot builder, a table ({ columns, rows }) or a string');
}

/** One line of text for a plot: its title and subtitle. */
function plotText(spec: VegaLiteSpec): string {
  const title = spec.title;
  let text = 'Vega-Lite plot';
  if (typeof title === 'string') text = title;
  else if (title && typeof title === 'object') {
    const t = title as { text?: unknown; subtitle?: unknown };
    const main = Array.isArray(t.text) ? t.text.join(' ') : typeof t.text === 'string' ? t.text : '';
    const sub = Array.isArray(t.subtitle) ? t.subtitle.join(' ') : typeof t.subtitle === 'string' ? t.subtitle : '';
    text = [main, sub].filter(Boolean).join(': ') || text;
  }
  return `${text} (plot)`;
}
