import { readFileSync } from 'node:fs';
import { beforeAll, expect, it } from 'vitest';
import { KERNEL_NAME } from '../../scripts/install-kernel.js';
import { VEGA_LITE_MIME_TYPE, VEGA_LITE_SCHEMA_URL } from '../../src/plot/spec.js';
import { repoPath } from '../helpers/paths.js';
import { describeWithJupyter, distProblem, executeNotebook, joined, notebookNames, type ExecutedNotebook } from './run.js';

const names = notebookNames();

it('there are notebooks to run, committed without outputs', () => {
  expect(names.length).toBeGreaterThan(0);
  for (const name of names) {
    const nb = JSON.parse(readFileSync(repoPath('notebooks', name), 'utf8')) as { cells: { cell_type: string; source: string[] | string; outputs?: unknown[]; execution_count?: unknown }[]; metadata: { kernelspec?: { name?: string } } };
    // Every example runs on invented data, and its opening cell says so (the project's rule for demo data).
    expect(nb.cells[0].cell_type, `${name}: the first cell`).toBe('markdown');
    expect(joined(nb.cells[0].source), `${name}: the opening cell says the data are invented`).toMatch(/invented/i);
    // Outputs stay out of git: they are large (an SVG and a spec per plot) and change with every library change.
    for (const cell of nb.cells.filter((c) => c.cell_type === 'code')) {
      expect(cell.outputs, `${name}: a code cell has outputs`).toEqual([]);
      expect(cell.execution_count ?? null).toBeNull();
    }
    expect(nb.metadata.kernelspec?.name).toBe(KERNEL_NAME);
  }
});

describeWithJupyter('notebooks run headless with the project kernel', () => {
  for (const name of names) {
    describeWithJupyter(name, () => {
      let nb: ExecutedNotebook;
      beforeAll(() => {
        const problem = distProblem();
        if (problem) throw new Error(problem);
        nb = executeNotebook(name);
        console.log(`${name}: executed in ${nb.seconds.toFixed(1)} s`);
      }, 240_000);

      it('runs every code cell without an error or anything on stderr', () => {
        const code = nb.cells.filter((c) => c.cell_type === 'code');
        expect(code.length).toBeGreaterThan(0);
        for (const cell of code) {
          for (const out of cell.outputs ?? []) {
            expect(out.output_type, `cell ${cell.id}: ${out.ename ?? ''} ${out.evalue ?? ''}`).not.toBe('error');
            if (out.output_type === 'stream') expect(out.name, `cell ${cell.id} wrote to stderr: ${joined(out.text)}`).toBe('stdout');
          }
        }
      });

      it('shows each plot cell as one display message with the Vega-Lite spec, the SVG and text', () => {
        const plotCells = nb.cells.filter((c) => c.metadata.tags?.includes('plot'));
        for (const cell of plotCells) {
          const displays = (cell.outputs ?? []).filter((o) => o.output_type === 'display_data');
          expect(displays, `cell ${cell.id}`).toHaveLength(1);
          const data = displays[0].data ?? {};
          expect(Object.keys(data).sort()).toEqual([VEGA_LITE_MIME_TYPE, 'image/svg+xml', 'text/plain'].sort());
          expect((data[VEGA_LITE_MIME_TYPE] as { $schema?: string }).$schema).toBe(VEGA_LITE_SCHEMA_URL);
          expect(joined(data['image/svg+xml'] as string[])).toMatch(/^<svg[\s\S]*<\/svg>$/);
        }
      });

      it('shows each table cell as escaped HTML and text', () => {
        for (const cell of nb.cells.filter((c) => c.metadata.tags?.includes('table'))) {
          const displays = (cell.outputs ?? []).filter((o) => o.output_type === 'display_data');
          expect(displays, `cell ${cell.id}`).toHaveLength(1);
          expect(joined(displays[0].data?.['text/html'] as string[])).toMatch(/^<table>/);
          expect(typeof displays[0].data?.['text/plain']).not.toBe('undefined');
        }
      });

      it('shows each result cell as two display messages: the summary and tables, then the plot', () => {
        for (const cell of nb.cells.filter((c) => c.metadata.tags?.includes('result'))) {
          const displays = (cell.outputs ?? []).filter((o) => o.output_type === 'display_data');
          expect(displays, `cell ${cell.id}`).toHaveLength(2);
          expect(Object.keys(displays[0].data ?? {}).sort()).toEqual(['text/html', 'text/plain']);
          expect(joined(displays[0].data?.['text/html'] as string[])).toMatch(/^<div class="lineshift-result"><p><strong>[^<]+<\/strong><\/p>[\s\S]*<table>/);
          expect(Object.keys(displays[1].data ?? {}).sort()).toEqual([VEGA_LITE_MIME_TYPE, 'image/svg+xml', 'text/plain'].sort());
          expect(joined(displays[1].data?.['image/svg+xml'] as string[])).toMatch(/^<svg[\s\S]*<\/svg>$/);
        }
      });

      it('exports to HTML with every plot inlined as SVG and no script', () => {
        const html = readFileSync(nb.html, 'utf8');
        const plots = nb.cells.filter((c) => c.metadata.tags?.includes('plot') || c.metadata.tags?.includes('result')).length;
        expect(html.match(/<svg[\s>]/g) ?? []).toHaveLength(plots);
        expect(html).not.toMatch(/<script\b/i);
      });
    });
  }
});
