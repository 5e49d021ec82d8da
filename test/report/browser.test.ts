/**
 * Opens the sample HTML report and the notebooks' HTML exports in Debian's chromium,
 * headless and offline: no console error, no script run, nothing fetched from outside,
 * every plot present and drawn. Screenshots go to out/browser/ for a person to look at.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { reportHtml, writeReportFile } from '../../src/report/document.js';
import { sampleReport } from '../../scripts/render-sample-report.js';
import { describeWithChromium, expectClean, launchChromium, openPage, type PageCheck } from '../helpers/browser.js';
import { repoPath } from '../helpers/paths.js';
import { distProblem, executeNotebook, jupyterMissing, notebookNames } from '../notebook/run.js';

let browser: Browser | undefined;

async function open(file: string, screenshot: string): Promise<PageCheck> {
  if (!browser) throw new Error('chromium did not start');
  return openPage(browser, file, screenshot);
}

describeWithChromium('browser check', () => {
  const work = mkdtempSync(join(tmpdir(), 'lineshift-browser-'));

  beforeAll(async () => {
    browser = await launchChromium();
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    rmSync(work, { recursive: true, force: true });
  });

  it('notices console errors, dialogs and external loads (the check itself)', async () => {
    const file = join(work, 'bad.html');
    writeReportFile(file, '<!DOCTYPE html><html><body><script>console.error("boom"); alert("hi")</script><img src="https://example.org/x.png"><svg></svg></body></html>');
    const check = await open(file, 'check-self-test.png');
    expect(check.consoleErrors.some((e) => e.includes('boom'))).toBe(true);
    expect(check.dialogs).toEqual(['hi']);
    expect(check.externalRequests).toEqual(['https://example.org/x.png']);
    expect(check.svgCount).toBe(1);
  });

  it('opens the sample report offline with every plot drawn, no console error and no script run', async () => {
    const doc = await sampleReport();
    const html = reportHtml(doc);
    const file = join(work, 'sample-report.html');
    writeReportFile(file, html);
    writeReportFile(repoPath('out', 'report', 'sample-report.html'), html);
    const plots = doc.sections.flatMap((s) => s.blocks).filter((b) => b.kind === 'plot').length;
    expect(plots).toBe(9);
    const check = await open(file, 'sample-report.png');
    expectClean(check, plots);
  });

  for (const name of notebookNames()) {
    it(`opens the HTML export of ${name} offline with its plots drawn and no console error`, async (ctx) => {
      const stem = basename(name, '.ipynb');
      let html = repoPath('out', 'notebooks', `${stem}.html`);
      const fresh = existsSync(html) && statSync(html).mtimeMs > statSync(repoPath('notebooks', name)).mtimeMs &&
        existsSync(repoPath('dist', 'index.js')) && statSync(html).mtimeMs > statSync(repoPath('dist', 'index.js')).mtimeMs;
      if (!fresh) {
        // The notebook test writes the export; when it has not run (or is older than the notebook), run the notebook here.
        if (jupyterMissing) {
          console.warn(`SKIPPED browser check of ${name}: ${jupyterMissing}`);
          ctx.skip();
          return;
        }
        const problem = distProblem();
        if (problem) throw new Error(problem);
        html = executeNotebook(name).html;
      }
      const check = await open(html, `notebook-${stem}.png`);
      expectClean(check, plotCellCount(name));
    }, 240_000);
  }
});

/** How many cells of a notebook show a plot: those tagged `plot`, and those tagged `result` (a result's tables, then its plot). */
function plotCellCount(name: string): number {
  const nb = JSON.parse(readFileSync(repoPath('notebooks', name), 'utf8')) as { cells: { metadata?: { tags?: string[] } }[] };
  return nb.cells.filter((c) => c.metadata?.tags?.includes('plot') || c.metadata?.tags?.includes('result')).length;
}
