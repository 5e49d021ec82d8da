import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { spectrumPlot } from '../../src/plot/spectrum.js';
import { INVENTED_DATA_NOTICE, SAFETY_CAUTIONS, plotBlock, reportHtml, writeReportFile, type ReportDocument } from '../../src/report/document.js';
import { escapeHtml, inlineSvg } from '../../src/report/html.js';
import { formatCell, tableHtml } from '../../src/report/table.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import { repoPath } from '../helpers/paths.js';

const HOSTILE = '<script>alert(1)</script> "&\'';
const ESCAPED = '&lt;script&gt;alert(1)&lt;/script&gt; &quot;&amp;&#39;';

/** A report with the hostile text in every place a header value or user text can go. */
function hostileReport(): ReportDocument {
  return {
    title: HOSTILE,
    subtitle: HOSTILE,
    inventedData: HOSTILE,
    generatedAt: HOSTILE,
    sections: [{
      heading: HOSTILE,
      blocks: [
        { kind: 'heading', text: HOSTILE },
        { kind: 'paragraph', text: HOSTILE },
        { kind: 'list', items: [HOSTILE] },
        { kind: 'facts', items: [[HOSTILE, HOSTILE], ['OBJECT', { card: HOSTILE }]] },
        { kind: 'table', table: { caption: HOSTILE, columns: [{ key: 'a', label: HOSTILE, unit: HOSTILE }], rows: [{ a: HOSTILE }] } },
        { kind: 'plot', svg: '<svg xmlns="http://www.w3.org/2000/svg"><text>a &lt; b</text></svg>', caption: HOSTILE },
        { kind: 'code', text: HOSTILE },
      ],
    }],
    provenance: [provenanceEntry(HOSTILE, { object: HOSTILE })],
    provenanceFacts: [[HOSTILE, HOSTILE]],
  };
}

describe('escapeHtml', () => {
  it.each([
    [HOSTILE, ESCAPED],
    ['Hα 6562.8 Å', 'Hα 6562.8 Å'],
    [null, ''],
    [undefined, ''],
    [42, '42'],
    [{ toString: () => '<b>' }, '&lt;b&gt;'],
  ])('%j', (input, expected) => {
    expect(escapeHtml(input)).toBe(expected);
  });
});

describe('reportHtml', () => {
  it('escapes every text that comes from the document', () => {
    const html = reportHtml(hostileReport());
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toContain(HOSTILE);
    // title (twice: <title> and <h1>), subtitle, banner, heading (section + contents), sub-heading, paragraph,
    // list, facts (2), table caption, column heading (label and unit in one), cell, plot caption, code,
    // provenance step, provenance facts (2), footer date
    const count = html.split(ESCAPED).length - 1;
    expect(count).toBeGreaterThanOrEqual(19);
    // the JSON of objects (card value, provenance parameters) is escaped too
    expect(html).toContain('{&quot;card&quot;:&quot;&lt;script&gt;');
    expect(html).toContain('{&quot;object&quot;:&quot;&lt;script&gt;');
  });

  it('is self-contained: no script, no external load, a policy that forbids both', () => {
    const html = reportHtml(hostileReport());
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`);
    expect(html).not.toMatch(/\ssrc\s*=/i);
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/@import/i);
    expect(html).not.toMatch(/href="(?!#)/);
    expect(html).not.toMatch(/url\((?!#)/);
  });

  it('carries the invented-data banner when asked, with the standard or given wording', () => {
    const base: ReportDocument = { title: 'LVAC-7', sections: [] };
    expect(reportHtml({ ...base, inventedData: true })).toContain(`<strong>Invented data.</strong> ${escapeHtml(INVENTED_DATA_NOTICE)}`);
    expect(reportHtml({ ...base, inventedData: 'Made up.' })).toContain('<strong>Invented data.</strong> Made up.');
    expect(reportHtml(base)).not.toContain('Invented data.');
  });

  it('carries the safety cautions unless told not to', () => {
    const base: ReportDocument = { title: 'LVAC-7', sections: [] };
    const html = reportHtml(base);
    for (const c of SAFETY_CAUTIONS) expect(html).toContain(escapeHtml(c));
    expect(html).toContain('<a href="#safety">Safety</a>');
    expect(reportHtml({ ...base, safety: false })).not.toContain('id="safety"');
    // The README carries the full cautions on the same three hazards.
    const readme = readFileSync(repoPath('README.md'), 'utf8');
    for (const word of ['solar filter', 'high voltage', 'Laser pointers']) expect(readme).toContain(word);
  });

  it('lists the provenance steps with their parameters and version', () => {
    const html = reportHtml({ title: 't', sections: [], provenance: [provenanceEntry('calibrate', { lamp: 'neon', order: 3 })] });
    expect(html).toContain('<li><span class="step">calibrate</span> <span class="version">lineshift 0.1.0</span><code>{&quot;lamp&quot;:&quot;neon&quot;,&quot;order&quot;:3}</code></li>');
    expect(reportHtml({ title: 't', sections: [] })).toContain('<p>No processing steps were recorded.</p>');
  });

  it('gives the same file for the same document (no hidden date)', () => {
    expect(reportHtml(hostileReport())).toBe(reportHtml(hostileReport()));
    expect(reportHtml({ title: 't', sections: [] })).toContain('<footer>Made with lineshift 0.1.0.</footer>');
  });

  it('refuses unknown blocks and unsafe plots', () => {
    const bad = (block: unknown) => () => reportHtml({ title: 't', sections: [{ heading: 'h', blocks: [block as never] }] });
    expect(bad({ kind: 'html', text: '<b>x</b>' })).toThrow('unknown report block kind "html" (heading, paragraph, list, facts, table, plot, code)');
    expect(bad({ kind: 'plot', svg: '<svg><script>alert(1)</script></svg>' })).toThrow(UsageError);
    expect(bad({ kind: 'plot', svg: '<img src=x onerror=alert(1)>' })).toThrow('a plot must be one SVG element');
  });

  it('inlines a plot rendered by the library', async () => {
    const block = await plotBlock(spectrumPlot({ wavelengthAngstrom: [6560, 6561], flux: [1, 0.5] }, { title: HOSTILE }), 'caption');
    const html = reportHtml({ title: 't', sections: [{ heading: 'Plots', blocks: [block] }] });
    expect(html.match(/<svg[\s>]/g)).toHaveLength(1);
    expect(html).toContain('<figcaption>caption</figcaption>');
    expect(html).not.toMatch(/<script/i);
  });
});

describe('inlineSvg', () => {
  it.each([
    ['<svg><script>x</script></svg>', 'a <script> element'],
    ['<svg onload="alert(1)"></svg>', 'an event-handler attribute (onload)'],
    ['<svg><a href="https://example.org">x</a></svg>', 'a <a> element'],
    ['<svg><rect fill="url(https://example.org/x)"/></svg>', 'a reference to something outside the plot'],
    ['<svg><rect xlink:href="javascript:alert(1)"/></svg>', 'a link to something outside the plot'],
    ['<svg><foreignObject><div/></foreignObject></svg>', 'a <foreignObject> element'],
    ['<svg><!-- a comment --></svg>', 'markup that is not a plain tag'],
    ['<svg><!-- <script> --></svg>', 'a <script> element'],
  ])('refuses %s', (svg, what) => {
    expect(() => inlineSvg(svg)).toThrow(`the SVG plot holds ${what}; only plots made by renderSvg can be inlined`);
  });

  it('accepts references inside the plot and escaped text, and drops an XML prolog', () => {
    const svg = '<svg xmlns="http://www.w3.org/2000/svg"><defs><clipPath id="c"/></defs><g clip-path="url(#c)"><text aria-label="x on=1">a &lt; b</text></g></svg>';
    expect(inlineSvg(`<?xml version="1.0"?>\n${svg}\n`)).toBe(svg);
  });
});

describe('tables', () => {
  it.each([
    [-12.345, 2, '−12.35'],
    [NaN, 2, 'NaN'],
    [Infinity, undefined, '∞'],
    [0.1 + 0.2, undefined, '0.30000000000000004'],
    [true, undefined, 'yes'],
    [null, undefined, ''],
    [{ value: -1.5, uncertainty: 0.25 }, 2, '−1.50 ± 0.25'],
  ])('formatCell(%j) with %s decimals', (value, digits, text) => {
    expect(formatCell(value, { key: 'k', label: 'K', digits })).toBe(text);
  });

  it('refuses a repeated column key', () => {
    expect(() => tableHtml({ columns: [{ key: 'a', label: 'A' }, { key: 'a', label: 'B' }], rows: [] }))
      .toThrow('column a: the table has two columns with key "a"');
  });
});

describe('writeReportFile', () => {
  const dir = mkdtempSync(join(tmpdir(), 'lineshift-report-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('writes through a temporary file and replaces an old report', () => {
    const path = join(dir, 'sub', 'report.html');
    writeReportFile(path, 'one');
    writeReportFile(path, 'two');
    expect(readFileSync(path, 'utf8')).toBe('two');
    expect(readdirSync(join(dir, 'sub'))).toEqual(['report.html']);
  });

  it('leaves no temporary file behind when it fails', () => {
    const blocker = join(dir, 'file');
    writeFileSync(blocker, 'x');
    expect(() => writeReportFile(join(blocker, 'report.html'), 'x')).toThrow();
    expect(existsSync(join(blocker, 'report.html'))).toBe(false);
  });
});
