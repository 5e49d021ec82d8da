import { describe, expect, it } from 'vitest';
import { OKABE_ITO, PLOT_THEME, vegaLiteConfig } from '../../src/plot/theme.js';

const hex = (r: number, g: number, b: number) => `#${[r, g, b].map((v) => v.toString(16).padStart(2, '0')).join('')}`.toUpperCase();

describe('theme', () => {
  it('uses the Okabe–Ito palette', () => {
    // RGB values as published by Okabe & Ito (2008), "Color Universal Design" (from memory).
    expect(OKABE_ITO).toEqual({
      black: hex(0, 0, 0),
      orange: hex(230, 159, 0),
      skyBlue: hex(86, 180, 233),
      bluishGreen: hex(0, 158, 115),
      yellow: hex(240, 228, 66),
      blue: hex(0, 114, 178),
      vermillion: hex(213, 94, 0),
      reddishPurple: hex(204, 121, 167),
    });
  });

  it('gives different colours to series drawn together', () => {
    const c = PLOT_THEME.colors;
    const together = [
      [c.data, c.model, c.continuum, ...c.components], // line fit
      [c.used, c.rejected, c.reference, c.solution], // calibration
      [c.data, c.uncertainty, c.continuum, c.region], // spectrum
    ];
    for (const set of together) expect(new Set(set).size).toBe(set.length);
    // Yellow is too pale for lines on white: never used for a series.
    expect(Object.values(c).flat()).not.toContain(OKABE_ITO.yellow);
  });

  it('writes the fonts and the number format into the Vega-Lite config', () => {
    const config = vegaLiteConfig();
    expect(config.font).toBe(PLOT_THEME.fontFamily);
    expect(config.numberFormat).toBe('~r');
    expect(vegaLiteConfig()).not.toBe(config); // a fresh object each time, safe to change
  });
});
