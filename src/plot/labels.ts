/**
 * Placement of text labels along an axis in rows, so that labels of close lines do not
 * print over each other.
 */
import { textWidthPx } from './textWidth.js';

/** One label to place: its anchor on the axis (data units) and its text. */
export interface LabelAnchor {
  /** Position on the axis, in data units (e.g. Å). */
  readonly x: number;
  /** The label text. */
  readonly text: string;
}

/** Where a label went. */
export interface PlacedLabel {
  /** Index of the label in the input. */
  readonly index: number;
  /** Row, 0 nearest the axis. */
  readonly row: number;
  /** Centre of the text in data units: the anchor, moved inwards when the text would cross an end of the axis. */
  readonly textX: number;
  /** True when no free row was left and the label overlaps another one. */
  readonly overlaps: boolean;
}

/** Options of {@link placeLabels}. */
export interface LabelPlacementOptions {
  /** Axis range shown, data units, [low, high]. */
  readonly domain: readonly [number, number];
  /** Length of the axis in px. */
  readonly lengthPx: number;
  /** Font size in px. */
  readonly fontSizePx: number;
  /** Most rows to use (default 4). */
  readonly maxRows?: number;
  /** Least free space between two labels in one row, px (default 6). */
  readonly gapPx?: number;
}


/**
 * Puts labels in rows: each label goes into the lowest row where it keeps `gapPx` clear
 * of the label before it (a greedy interval schedule from left to right). When every row
 * is taken, it goes into the row whose last label ends furthest left and is flagged as
 * overlapping. Labels whose anchor lies outside the domain are left out.
 *
 * @param labels anchors in data units and texts; not modified.
 * @param options axis domain and length, font size, row limit.
 * @returns one entry per label inside the domain, in input order.
 * @example
 * placeLabels([{ x: 6562.8, text: 'Hα' }, { x: 6563.5, text: 'Fe I' }],
 *   { domain: [6500, 6600], lengthPx: 600, fontSizePx: 11 }).map((p) => p.row); // [0, 1]
 */
export function placeLabels(labels: readonly LabelAnchor[], options: LabelPlacementOptions): PlacedLabel[] {
  const [lo, hi] = options.domain[0] <= options.domain[1] ? options.domain : [options.domain[1], options.domain[0]];
  const span = hi - lo;
  const pxPerUnit = span > 0 ? options.lengthPx / span : 0;
  const maxRows = Math.max(1, Math.floor(options.maxRows ?? 4));
  const gap = options.gapPx ?? 6;
  const order = labels
    .map((l, index) => ({ l, index }))
    .filter(({ l }) => Number.isFinite(l.x) && l.x >= lo && l.x <= hi)
    .sort((a, b) => a.l.x - b.l.x || a.index - b.index);
  const rowEnds: number[] = [];
  const placed: PlacedLabel[] = [];
  for (const { l, index } of order) {
    const width = textWidthPx(l.text, options.fontSizePx);
    let centre = (l.x - lo) * pxPerUnit;
    centre = Math.min(Math.max(centre, width / 2), Math.max(width / 2, options.lengthPx - width / 2));
    const start = centre - width / 2;
    let row = rowEnds.findIndex((end) => end + gap <= start);
    let overlaps = false;
    if (row < 0) {
      if (rowEnds.length < maxRows) {
        row = rowEnds.length;
        rowEnds.push(-Infinity);
      } else {
        row = rowEnds.indexOf(Math.min(...rowEnds));
        overlaps = true;
      }
    }
    rowEnds[row] = centre + width / 2;
    placed.push({ index, row, textX: pxPerUnit > 0 ? lo + centre / pxPerUnit : l.x, overlaps });
  }
  return placed.sort((a, b) => a.index - b.index);
}
