/**
 * Width of text in the plots' font, from a table of DejaVu Sans advance widths measured in
 * a browser (src/plot/fontWidths.ts). Node has no canvas, so without this vega would guess
 * 0.8 em per character and lay out legends and titles far too wide.
 */
import { DEJAVU_SANS_BOLD_EM, DEJAVU_SANS_EM } from './fontWidths.js';

/** Width in em assumed for a character missing from the table (common practice: about 0.6 em for sans-serif text). */
const UNKNOWN_CHAR_EM = 0.6;

/**
 * Width in px of `text` set in DejaVu Sans at `fontSizePx` (kerning ignored; within a few
 * per cent of a browser's measure for Latin and Greek text).
 * @example Math.round(textWidthPx('Hα', 10)); // 13
 */
export function textWidthPx(text: string, fontSizePx: number, bold = false): number {
  const table = bold ? DEJAVU_SANS_BOLD_EM : DEJAVU_SANS_EM;
  let em = 0;
  for (const c of text) em += table[c] ?? UNKNOWN_CHAR_EM;
  return em * fontSizePx;
}

/** The part of vega's `textMetrics` object that the renderer replaces. */
interface VegaTextMetrics {
  width: (item: { fontSize?: number | string; fontWeight?: number | string }, text: unknown) => number;
  estimateWidth: (...args: never[]) => number;
}

/**
 * Makes vega measure text with {@link textWidthPx} when it would otherwise estimate it
 * (no canvas in Node). vega documents `textMetrics.width` as replaceable for this purpose;
 * a measure installed by someone else, or a canvas measure, is left alone.
 */
export function installTextMeasure(vega: unknown): void {
  const metrics = (vega as { textMetrics?: VegaTextMetrics }).textMetrics;
  if (!metrics || metrics.width !== metrics.estimateWidth) return;
  metrics.width = (item, text) => {
    const size = item.fontSize != null ? Number(item.fontSize) || 0 : 11;
    const weight = item.fontWeight;
    const bold = weight === 'bold' || weight === 'bolder' || (typeof weight === 'number' && weight >= 600) || (typeof weight === 'string' && Number(weight) >= 600);
    return textWidthPx(text == null ? '' : String(text).trim(), size, bold);
  };
}
