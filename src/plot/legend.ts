/**
 * A shared legend for layered plots: each layer names its series in a `series` field
 * coloured over one scale, so Vega-Lite draws one legend that lists every series in a
 * fixed order with fixed colours; the symbol of each entry (line, dashed line, point,
 * band) is chosen by expression so it looks like the layer it names.
 */

/** How a series is drawn, and so how its legend symbol looks. */
export type LegendSymbol = 'line' | 'dashed' | 'dotted' | 'point' | 'cross' | 'triangle' | 'band' | 'rule';

/** One entry of a legend: the series name as shown, its colour and its symbol. */
export interface LegendEntry {
  readonly name: string;
  readonly color: string;
  readonly symbol: LegendSymbol;
}

/** Dash patterns (px on, px off) by symbol; solid lines have none. */
export const DASH: Readonly<Record<LegendSymbol, readonly number[]>> = Object.freeze({
  line: [],
  dashed: [6, 3],
  dotted: [2, 2],
  point: [],
  cross: [],
  triangle: [],
  band: [],
  rule: [4, 3],
});

/** Legend symbol shape by series symbol. */
const SHAPE: Readonly<Record<LegendSymbol, string>> = Object.freeze({
  line: 'stroke',
  dashed: 'stroke',
  dotted: 'stroke',
  point: 'circle',
  cross: 'cross',
  triangle: 'triangle-down',
  band: 'square',
  rule: 'stroke',
});

/** A Vega expression that picks `valueOf(entry)` by the legend entry's name. */
function pick(entries: readonly LegendEntry[], valueOf: (e: LegendEntry) => string): string {
  let expr = valueOf(entries[entries.length - 1]);
  for (let i = entries.length - 2; i >= 0; i--) {
    expr = `datum.value === ${JSON.stringify(entries[i].name)} ? ${valueOf(entries[i])} : (${expr})`;
  }
  return expr;
}

/**
 * Puts a layer into series `name` of `entries`: appends a transform that sets the field
 * `series` to the name, and colours the layer by that field over one shared scale. Every
 * layer of a plot passes the same `entries`, so their legends merge into one that lists
 * every series in order. (A constant `datum` colour would do the same with less data, but
 * the Vega-Lite schema does not allow `scale` and `legend` on it.)
 *
 * @param layer a layer with `data` (and optionally `transform` and `encoding`); not modified.
 * @returns a new layer.
 */
export function inSeries(layer: Record<string, unknown>, name: string, entries: readonly LegendEntry[], legendTitle: string | null = null): Record<string, unknown> {
  const transform = Array.isArray(layer.transform) ? layer.transform : [];
  const encoding = (layer.encoding ?? {}) as Record<string, unknown>;
  return {
    ...layer,
    transform: [...transform, { calculate: JSON.stringify(name), as: 'series' }],
    encoding: {
      ...encoding,
      color: {
        field: 'series',
        type: 'nominal',
        scale: { domain: entries.map((e) => e.name), range: entries.map((e) => e.color) },
        legend: {
          title: legendTitle,
          symbolOpacity: 1,
          symbolType: { expr: pick(entries, (e) => JSON.stringify(SHAPE[e.symbol])) },
          symbolDash: { expr: pick(entries, (e) => JSON.stringify(DASH[e.symbol])) },
          symbolStrokeWidth: { expr: pick(entries, (e) => (e.symbol === 'point' || e.symbol === 'band' || e.symbol === 'triangle' ? '0' : '2')) },
          symbolSize: { expr: pick(entries, (e) => (e.symbol === 'point' || e.symbol === 'cross' || e.symbol === 'triangle' ? '50' : e.symbol === 'band' ? '120' : '260')) },
        },
      },
    },
  };
}
