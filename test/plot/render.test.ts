import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { compileVegaLite, prefixSvgIds, renderSvg } from '../../src/plot/render.js';
import { VEGA_LITE_SCHEMA_URL, isVegaLiteSpec, type VegaLiteSpec } from '../../src/plot/spec.js';
import { spectrumPlot } from '../../src/plot/spectrum.js';
import { periodogramPlot } from '../../src/plot/periodogram.js';
import { installTextMeasure, textWidthPx } from '../../src/plot/textWidth.js';
import { repoPath } from '../helpers/paths.js';
import { schemaErrors } from './contract.js';
import { builderCases, periodogramInput, spectrumInput } from './fixtures.js';

const ids = (svg: string) => [...svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);

describe('renderSvg', () => {
  it('renders a spec to an SVG document with the titles, units and labels in it', async () => {
    const svg = await renderSvg(spectrumPlot(spectrumInput(), { title: 'LVAC-7 (invented)' }));
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg.trimEnd().endsWith('</svg>')).toBe(true);
    for (const text of ['LVAC-7 (invented)', 'Wavelength (Å, air)', 'Flux (ADU)', 'Hα', 'Close line', 'Continuum']) {
      expect(svg).toContain(`>${text}</text>`);
    }
  });

  it('escapes text from titles and labels', async () => {
    const hostile = '<script>alert(1)</script> "&\'';
    const svg = await renderSvg(spectrumPlot({ ...spectrumInput(), lines: [{ wavelengthAngstrom: 6560, label: hostile }] }, { title: hostile }));
    expect(svg).not.toMatch(/<script/i);
    expect(svg).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('prefixes every id so that two plots on one page do not share clip paths', async () => {
    // Clipped marks make vega write clip paths numbered clip1, clip2, … in every SVG.
    const clipped = (spec: VegaLiteSpec): VegaLiteSpec => JSON.parse(JSON.stringify(spec).replaceAll('"mark":{"type":"line"', '"mark":{"type":"line","clip":true'));
    const a = await renderSvg(clipped(spectrumPlot(spectrumInput())));
    const b = await renderSvg(clipped(periodogramPlot(periodogramInput())));
    const idsA = ids(a);
    const idsB = ids(b);
    expect(idsA.length).toBeGreaterThan(0); // vega clips the marks of each panel
    expect(idsA.every((id) => /^ls[0-9a-f]{8}-/.test(id))).toBe(true);
    expect(idsA.filter((id) => idsB.includes(id))).toEqual([]);
    // every reference points at an id of the same SVG
    for (const m of a.matchAll(/url\(#([^)]+)\)/g)) expect(idsA).toContain(m[1]);
    // the same plot renders to the same text (ids come from the content, not a counter)
    expect(await renderSvg(clipped(spectrumPlot(spectrumInput())))).toBe(a);
    const prefixed = await renderSvg(clipped(spectrumPlot(spectrumInput())), { idPrefix: 'fig1-' });
    expect(ids(prefixed).every((id) => id.startsWith('fig1-'))).toBe(true);
  });

  it('passes vega-lite warnings to the logger', async () => {
    const logger = collectingLogger();
    const spec: VegaLiteSpec = {
      $schema: VEGA_LITE_SCHEMA_URL,
      data: { values: [{ a: 1, b: 2 }] },
      mark: 'line',
      encoding: { x: { field: 'a', type: 'quantitative', scale: { type: 'log', zero: true } }, y: { field: 'b', type: 'quantitative' } },
    };
    const svg = await renderSvg(spec, { logger });
    expect(svg.startsWith('<svg')).toBe(true);
    expect(logger.warnings).toHaveLength(1);
    expect(logger.warnings[0].code).toBe('plot.vega-warning');
    expect(logger.warnings[0].message).toBe('vega-lite: x-scale\'s "zero" is dropped as it does not work with log scale.');
    const { warnings } = await compileVegaLite(spec);
    expect(warnings).toHaveLength(1);
  });

  it.each(builderCases())('renders %s without a vega or vega-lite warning', async (_name, build) => {
    const logger = collectingLogger();
    const svg = await renderSvg(build(), { logger });
    expect(logger.warnings).toEqual([]);
    expect(svg.startsWith('<svg')).toBe(true);
  });

  it('does not modify the spec', async () => {
    const spec = spectrumPlot(spectrumInput());
    const copy = structuredClone(spec);
    await renderSvg(spec);
    expect(spec).toStrictEqual(copy);
  });
});

describe('the contract checks themselves', () => {
  it('reject a spec that breaks the schema', () => {
    expect(schemaErrors({ $schema: VEGA_LITE_SCHEMA_URL, mark: 'nonsense', data: { values: [] } })).not.toEqual([]);
    expect(schemaErrors({ $schema: VEGA_LITE_SCHEMA_URL, mark: 'point', data: { values: [] } })).toEqual([]);
  });

  it('isVegaLiteSpec tells specs from other objects', () => {
    expect(isVegaLiteSpec({ $schema: 'https://vega.github.io/schema/vega-lite/v6.json' })).toBe(true);
    expect(isVegaLiteSpec({ $schema: 'https://vega.github.io/schema/vega/v5.json' })).toBe(false);
    expect(isVegaLiteSpec([])).toBe(false);
    expect(isVegaLiteSpec(null)).toBe(false);
  });
});

describe('prefixSvgIds', () => {
  it('prefixes ids and every reference to them', () => {
    expect(prefixSvgIds('<clipPath id="clip1"/><g clip-path="url(#clip1)"/><use xlink:href="#clip1"/><a href="#x"/>', 'a-'))
      .toBe('<clipPath id="a-clip1"/><g clip-path="url(#a-clip1)"/><use xlink:href="#a-clip1"/><a href="#a-x"/>');
  });

  it('refuses a prefix that could break the markup', () => {
    expect(() => prefixSvgIds('<svg/>', '"><script>')).toThrow(UsageError);
    expect(() => prefixSvgIds('<svg/>', '1a')).toThrow('an SVG id prefix must start with a letter and hold only letters, digits, - and _, got "1a"');
  });
});

describe('text width', () => {
  it('measures DejaVu Sans by character, bold wider than normal', () => {
    // DejaVu Sans advance widths: "M" 1767/2048 em, "i" 569/2048 em (from memory of the font's hmtx table; the
    // table itself was measured in chromium by scripts/measure-font-widths.ts).
    expect(textWidthPx('M', 100)).toBeCloseTo((1767 / 2048) * 100, 0);
    expect(textWidthPx('i', 100)).toBeCloseTo((569 / 2048) * 100, 0);
    expect(textWidthPx('Wavelength', 12, true)).toBeGreaterThan(textWidthPx('Wavelength', 12));
    expect(textWidthPx('漢', 10)).toBeCloseTo(6, 9); // not in the table: 0.6 em
  });

  it('replaces only vega’s built-in estimate', () => {
    const own = (): number => 1;
    const estimate = (): number => 2;
    const notOurs = { textMetrics: { width: own, estimateWidth: estimate } };
    installTextMeasure(notOurs);
    expect(notOurs.textMetrics.width).toBe(own);
    const default_: { textMetrics: { width: (item: { fontSize?: number }, text: string) => number; estimateWidth: () => number } } =
      { textMetrics: { width: estimate, estimateWidth: estimate } };
    installTextMeasure(default_);
    expect(default_.textMetrics.width).not.toBe(estimate);
    expect(default_.textMetrics.width({ fontSize: 10 }, 'M')).toBeCloseTo(8.63, 2);
  });
});

describe('the library never imports vega statically', () => {
  // A static import of vega or vega-lite (which have top-level await) anywhere in the library breaks
  // loading it with require() in the notebook kernel (ERR_REQUIRE_ASYNC_MODULE); see DEVELOPERS.md.
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) walk(path);
      else if (path.endsWith('.ts')) files.push(path);
    }
  };
  walk(repoPath('src'));

  it.each(files.map((f) => [f.slice(repoPath('').length)]))('%s', (file) => {
    const text = readFileSync(repoPath(file), 'utf8');
    const staticImports = [...text.matchAll(/^\s*(?:import|export)\s+(?!type\b)[^;]*?from\s+['"](vega|vega-lite)(?:\/[^'"]*)?['"]/gm)];
    expect(staticImports.map((m) => m[0].trim())).toEqual([]);
    expect(text).not.toMatch(/^await\s/m); // no top-level await
  });
});
