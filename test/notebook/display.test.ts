import { createRequire } from 'node:module';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { displayMessages, mimeBundle, plotBundle, resultBundle, tableBundle, type MimeBundle } from '../../src/notebook/bundle.js';
import { plotLineFit } from '../../src/plot/results/line-fit.js';
import { summarizeLineFit, summarizeFoundLines } from '../../src/report/results/line-fit.js';
import { summaryText } from '../../src/report/results/summary.js';
import { tableHtml } from '../../src/report/table.js';
import { deriveSpectrum } from '../../src/spectrum/spectrum.js';
import { fitLine } from '../../src/fit/line-fit.js';
import { galleryResults } from '../plot/result-fixtures.js';
import { display, kernelChannel } from '../../src/notebook/display.js';
import { VEGA_LITE_MIME_TYPE } from '../../src/plot/spec.js';
import { spectrumPlot } from '../../src/plot/spectrum.js';
import type { Table } from '../../src/report/table.js';

const spec = () => spectrumPlot({ wavelengthAngstrom: [6560, 6561, 6562], flux: [1, 0.5, 1], medium: 'air' }, { title: 'LVAC-7 (invented)' });
const table: Table = {
  caption: 'Lines <b>found</b>',
  columns: [{ key: 'name', label: 'Line' }, { key: 'w', label: 'Wavelength', unit: 'Å', digits: 2 }],
  rows: [{ name: '<script>alert(1)</script>', w: 6562.8 }, { name: '"&\'', w: { value: 4861.35, uncertainty: 0.04 } }],
};

describe('mimeBundle', () => {
  it('gives a plot its Vega-Lite spec, an SVG and a line of text', async () => {
    const s = spec();
    const bundle = await mimeBundle(s);
    expect(Object.keys(bundle).sort()).toEqual([VEGA_LITE_MIME_TYPE, 'image/svg+xml', 'text/plain'].sort());
    expect(bundle[VEGA_LITE_MIME_TYPE]).toStrictEqual(s); // the spec object itself, not a JSON string
    expect(bundle['image/svg+xml']).toMatch(/^<svg[\s\S]*>LVAC-7 \(invented\)<\/text>[\s\S]*<\/svg>$/);
    expect(bundle['text/plain']).toBe('LVAC-7 (invented): 3 pixels, 6560.0–6562.0 Å (plot)');
    // a copy: changing the spec afterwards does not change what was shown
    s.width = 100;
    expect(bundle[VEGA_LITE_MIME_TYPE]?.width).not.toBe(100);
  });

  it('gives a table escaped HTML and aligned text', async () => {
    const bundle = await mimeBundle(table);
    expect(bundle['text/html']).toBe(
      '<table><caption>Lines &lt;b&gt;found&lt;/b&gt;</caption><thead><tr><th>Line</th><th class="num">Wavelength (Å)</th></tr></thead>' +
        '<tbody><tr><td>&lt;script&gt;alert(1)&lt;/script&gt;</td><td class="num">6562.80</td></tr>' +
        '<tr><td>&quot;&amp;&#39;</td><td class="num">4861.35 ± 0.04</td></tr></tbody></table>',
    );
    expect(bundle['text/plain']).toBe([
      'Lines <b>found</b>',
      'Line                       Wavelength (Å)',
      '-------------------------  --------------',
      '<script>alert(1)</script>         6562.80',
      '"&\'                        4861.35 ± 0.04',
    ].join('\n'));
    expect(tableBundle(table)).toEqual(bundle);
  });

  it('passes text through and refuses anything else', async () => {
    expect(await mimeBundle('hello')).toEqual({ 'text/plain': 'hello' });
    await expect(mimeBundle({ a: 1 } as never)).rejects.toThrow(UsageError);
    await expect(mimeBundle(42 as never)).rejects.toThrow('display() shows a Vega-Lite spec from a plot builder, a table ({ columns, rows }), a string, or a lineshift result (spectrum, line fit, found lines, continuum, identification, dispersion solution, velocity from lines or cross-correlation, velocity table, periodogram, orbit fit)');
  });

  it('plotBundle is pure: same input, same bundle', () => {
    expect(plotBundle(spec(), '<svg></svg>')).toEqual(plotBundle(spec(), '<svg></svg>'));
  });
});

describe('display', () => {
  const cache = createRequire(import.meta.url).cache as Record<string, unknown>;
  const fakeJupyter = '/fake/node_modules/tslab/dist/jupyter.js';
  const fakePublic = '/fake/node_modules/tslab/dist/public.js';
  afterEach(() => {
    delete cache[fakeJupyter];
    delete cache[fakePublic];
  });

  it('hands the bundle to a given send function', async () => {
    const sent: MimeBundle[] = [];
    await display(table, { send: (b) => sent.push(b) });
    expect(sent).toEqual([tableBundle(table)]);
  });

  it('outside a notebook, sends nothing and tells the logger', async () => {
    expect(kernelChannel()).toBeUndefined();
    const logger = collectingLogger();
    await display('text', { logger });
    expect(logger.warnings).toEqual([{ code: 'notebook.no-kernel', message: 'display(): no notebook kernel is running, nothing was shown (use mimeBundle() or renderSvg() outside a notebook)' }]);
  });

  it("sends one message with every MIME type through tslab's display writer", async () => {
    const write = vi.fn();
    cache[fakeJupyter] = { exports: { lastWriteDisplayData: write } };
    expect(kernelChannel()?.kind).toBe('bundle');
    await display(spec());
    expect(write).toHaveBeenCalledTimes(1);
    const [message, update] = write.mock.calls[0] as [{ data: MimeBundle; metadata: object; transient: object }, boolean];
    expect(update).toBe(false);
    expect(Object.keys(message.data).sort()).toEqual([VEGA_LITE_MIME_TYPE, 'image/svg+xml', 'text/plain'].sort());
    expect(message.metadata).toEqual({});
  });

  it("falls back to tslab's public display.raw with the SVG alone", async () => {
    const raw = vi.fn();
    cache[fakePublic] = { exports: { display: { raw } } };
    expect(kernelChannel()?.kind).toBe('single');
    await display(spec());
    expect(raw).toHaveBeenCalledTimes(1);
    expect(raw.mock.calls[0][0]).toBe('image/svg+xml');
    await display(table);
    expect(raw.mock.calls[1][0]).toBe('text/html');
  });

  it('says so when the kernel is not running a cell', async () => {
    cache[fakeJupyter] = { exports: { lastWriteDisplayData: null } };
    await expect(display('x')).rejects.toThrow('the notebook kernel is not running a cell');
  });
});

describe('library results', () => {
  const r = galleryResults();

  it('a line fit: escaped HTML of its summary and tables, the text, and its plot', async () => {
    const bundle = await mimeBundle(r.halpha, { spectrum: r.star });
    expect(Object.keys(bundle).sort()).toEqual(['text/html', 'text/plain', VEGA_LITE_MIME_TYPE, 'image/svg+xml'].sort());
    const summary = summarizeLineFit(r.halpha, { spectrum: r.star });
    const spec = plotLineFit(r.halpha, { spectrum: r.star });
    expect(bundle[VEGA_LITE_MIME_TYPE]).toStrictEqual(spec);
    expect(bundle['text/html']).toBe(`<div class="lineshift-result"><p><strong>${summary.title}</strong></p>${summary.lines.map((l) => `<p>${l}</p>`).join('')}${summary.tables.map(tableHtml).join('')}</div>`);
    expect(bundle['text/plain'].startsWith(summaryText(summary))).toBe(true);
    expect(bundle['text/plain']).toMatch(/\n\nLVAC-7: line fit at 6562\.24 Å: .* \(plot\)$/);
    expect(bundle['image/svg+xml']).toMatch(/^<svg[\s\S]*<\/svg>$/);
  });

  it('is sent as two display messages: the tables, then the plot', async () => {
    const sent: MimeBundle[] = [];
    await display(r.halpha, { spectrum: r.star, send: (b) => sent.push(b) });
    expect(sent).toHaveLength(2);
    expect(Object.keys(sent[0]).sort()).toEqual(['text/html', 'text/plain']);
    expect(Object.keys(sent[1]).sort()).toEqual([VEGA_LITE_MIME_TYPE, 'image/svg+xml', 'text/plain'].sort());
    expect(sent[1]['text/plain']).toMatch(/^LVAC-7: line fit at 6562\.24 Å: 2026-05-14 03:12:45 UTC · gaussian profile/);
    expect(displayMessages(sent[0])).toEqual([sent[0]]);
    expect(displayMessages(sent[1])).toEqual([sent[1]]);
  });

  it('without the context a plot needs: the tables and a note, one message', async () => {
    const bundle = await mimeBundle(r.found);
    expect(Object.keys(bundle).sort()).toEqual(['text/html', 'text/plain']);
    expect(bundle['text/html']).toContain('<p><em>pass { spectrum } (the wavelength-calibrated spectrum) to draw the found lines</em></p>');
    expect(bundle['text/plain']).toBe(`${summaryText(summarizeFoundLines(r.found))}\n\npass { spectrum } (the wavelength-calibrated spectrum) to draw the found lines`);
    expect(displayMessages(bundle)).toEqual([bundle]);
    const withSpectrum = await mimeBundle(r.found, { spectrum: r.star });
    expect(displayMessages(withSpectrum)).toHaveLength(2);
  });

  it('escapes text from the header in the HTML and in the SVG', async () => {
    const hostile = '<script>alert(1)</script>';
    const star = deriveSpectrum(r.star, { header: r.star.header.with('OBJECT', hostile) });
    const fit = fitLine(star, { centerAngstrom: 6563 });
    const bundle = await mimeBundle(fit, { spectrum: star });
    for (const text of [bundle['text/html'], bundle['image/svg+xml']]) {
      expect(text).not.toMatch(/<script/i);
      expect(text).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    }
  });

  it('every kind of result makes a bundle with a summary', async () => {
    for (const [value, context] of [
      [r.star, {}], [r.starIdentification, { spectrum: r.star }], [r.sampleSolution, {}], [r.lvac7Table, {}],
      [r.lvac7Periodogram, { table: r.lvac7Table }], [r.lvac7Orbit, { table: r.lvac7Table }], [r.ccf, {}], [r.lineVelocities, { spectrum: r.velocityStar }],
    ] as const) {
      const bundle = await mimeBundle(value, context);
      expect(bundle['text/html']).toMatch(/^<div class="lineshift-result"><p><strong>/);
      expect(bundle['image/svg+xml']).toMatch(/^<svg/);
    }
  });

  it('resultBundle is pure', () => {
    const s = { title: 'A & B', lines: ['x < y'], tables: [] };
    expect(resultBundle(s)).toEqual({ 'text/html': '<div class="lineshift-result"><p><strong>A &amp; B</strong></p><p>x &lt; y</p></div>', 'text/plain': 'A & B\nx < y' });
    expect(resultBundle(s)).toEqual(resultBundle(s));
  });
});
