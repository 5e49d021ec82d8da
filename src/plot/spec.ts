/**
 * The Vega-Lite spec type that the plot builders return, and the schema they declare.
 *
 * Specs are plain JSON-compatible objects: change any property (`spec.width = 900`,
 * `spec.title = 'My title'`) before rendering or displaying them.
 */

/**
 * The `$schema` every builder writes: Vega-Lite major version 5.
 *
 * JupyterLab 4 renders the MIME type `application/vnd.vegalite.v5+json` with Vega-Lite 5
 * (its `@jupyterlab/vega5-extension`; there is no v6 MIME type), and its embedding code
 * warns when a spec declares a different major version. The builders therefore declare
 * v5 and use only features that Vega-Lite 5 and 6 share; our own renderer (Vega-Lite 6)
 * compiles them without warnings, which the tests check.
 */
export const VEGA_LITE_SCHEMA_URL = 'https://vega.github.io/schema/vega-lite/v5.json';

/** The notebook MIME type that carries a Vega-Lite spec of {@link VEGA_LITE_SCHEMA_URL}'s major version. */
export const VEGA_LITE_MIME_TYPE = 'application/vnd.vegalite.v5+json';

/**
 * A top-level Vega-Lite specification as a plain object (JSON-compatible: numbers,
 * strings, booleans, null, arrays, objects). The builders fill `$schema`, `title`,
 * `config`, `datasets` and the views; see https://vega.github.io/vega-lite/docs/ for the
 * meaning of each property.
 */
export interface VegaLiteSpec {
  /** Schema URL, {@link VEGA_LITE_SCHEMA_URL} for specs made here. */
  $schema: string;
  /** Any other Vega-Lite top-level property. */
  [property: string]: unknown;
}

/** One row of inline plot data. */
export type PlotDatum = Record<string, number | string | boolean | null>;

/**
 * True when `value` looks like a top-level Vega-Lite spec: a plain object whose
 * `$schema` names a Vega-Lite schema.
 * @example isVegaLiteSpec({ $schema: VEGA_LITE_SCHEMA_URL, mark: 'point' }); // true
 */
export function isVegaLiteSpec(value: unknown): value is VegaLiteSpec {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) return false;
  const schema = (value as { $schema?: unknown }).$schema;
  return typeof schema === 'string' && /\/schema\/vega-lite\/v\d+(\.\d+)*\.json$/.test(schema);
}
