import { describe, expect, it } from 'vitest';
import { placeLabels } from '../../src/plot/labels.js';
import { textWidthPx } from '../../src/plot/textWidth.js';

const opts = { domain: [6500, 6600] as const, lengthPx: 600, fontSizePx: 11 }; // 6 px per Å

describe('placeLabels', () => {
  it('keeps labels of distant lines in one row', () => {
    const placed = placeLabels([{ x: 6510, text: 'Fe I' }, { x: 6550, text: 'Hα' }, { x: 6590, text: 'He I' }], opts);
    expect(placed.map((p) => p.row)).toEqual([0, 0, 0]);
    expect(placed.every((p) => !p.overlaps)).toBe(true);
  });

  it('moves the label of a close line to the next row, and never lets two labels of a row overlap', () => {
    const labels = [{ x: 6550, text: 'Ne I 6550.0' }, { x: 6553, text: 'Ne I 6553.0' }, { x: 6556, text: 'Ne I 6556.0' }, { x: 6580, text: 'x' }];
    const placed = placeLabels(labels, opts);
    expect(placed.map((p) => p.row)).toEqual([0, 1, 2, 0]);
    // In each row, the extents (centre ± width/2, in px) keep the 6 px gap.
    const extent = (i: number) => {
      const centre = (placed[i].textX - 6500) * 6;
      const half = textWidthPx(labels[i].text, 11) / 2;
      return [centre - half, centre + half];
    };
    for (let i = 0; i < labels.length; i++) {
      for (let j = i + 1; j < labels.length; j++) {
        if (placed[i].row !== placed[j].row) continue;
        const [a0, a1] = extent(i);
        const [b0, b1] = extent(j);
        expect(Math.max(b0 - a1, a0 - b1)).toBeGreaterThanOrEqual(6);
      }
    }
  });

  it('flags the overlap when the rows run out', () => {
    const placed = placeLabels([{ x: 6550, text: 'first' }, { x: 6550.5, text: 'second' }], { ...opts, maxRows: 1 });
    expect(placed.map((p) => [p.row, p.overlaps])).toEqual([[0, false], [0, true]]);
  });

  it('moves a label inwards at the ends of the axis and leaves out anchors outside it', () => {
    const placed = placeLabels([{ x: 6500, text: 'At the left end' }, { x: 6700, text: 'outside' }, { x: 6600, text: 'right end' }], opts);
    expect(placed.map((p) => p.index)).toEqual([0, 2]);
    const halfLeft = textWidthPx('At the left end', 11) / 2 / 6; // in Å
    expect(placed[0].textX).toBeCloseTo(6500 + halfLeft, 9);
    expect(placed[1].textX).toBeCloseTo(6600 - textWidthPx('right end', 11) / 2 / 6, 9);
  });

  it('returns the labels in input order and does not modify the input', () => {
    const labels = Object.freeze([Object.freeze({ x: 6590, text: 'b' }), Object.freeze({ x: 6510, text: 'a' })]);
    const placed = placeLabels(labels, opts);
    expect(placed.map((p) => p.index)).toEqual([0, 1]);
    expect(labels).toEqual([{ x: 6590, text: 'b' }, { x: 6510, text: 'a' }]);
  });
});
