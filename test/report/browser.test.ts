/**
 * Opens the sample HTML report and the notebooks' HTML exports in Debian's chromium,
 * headless and offline: no console error, no script run, nothing fetched from outside,
 * every plot present and drawn. Screenshots go to out/browser/ for a person to look at.
 */
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reportHtml, writeReportFile } from '../../src/report/document.js';
import { sampleReport } from '../../scripts/render-sample-report.js';
import { repoPath } from '../helpers/paths.js';
import { distProblem, executeNotebook, jupyterMissing, notebookNames } from '../notebook/run.js';

const CHROMIUM = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => existsSync(p));
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** What opening a page showed. */
interface PageCheck {
  consoleErrors: string[];
  pageErrors: string[];
  dialogs: string[];
  externalRequests: string[];
  svgCount: number;
  /** Width × height in px of each SVG as laid out, and how many text elements it has. */
  svgs: { width: number; height: number; texts: number }[];
}

let browser: Browser | undefined;

async function open(file: string, screenshot: string): Promise<PageCheck> {
  if (!browser) throw new Error('chromium did not start');
  // Playwright gives every context a fresh temporary profile (user data dir).
  const context = await browser.newContext({ viewport: { width: 1100, height: 900 }, javaScriptEnabled: true });
  const page = await context.newPage();
  const check: PageCheck = { consoleErrors: [], pageErrors: [], dialogs: [], externalRequests: [], svgCount: 0, svgs: [] };
  page.on('console', (m) => { if (m.type() === 'error') check.consoleErrors.push(m.text()); });
  page.on('pageerror', (e) => check.pageErrors.push(e.message));
  page.on('dialog', (d) => { check.dialogs.push(d.message()); void d.dismiss(); });
  // Offline: anything but the file itself is refused and recorded.
  await page.route('**/*', (route) => {
    const url = route.request().url();
    if (url.startsWith('file:') || url.startsWith('data:')) return route.continue();
    check.externalRequests.push(url);
    return route.abort();
  });
  await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
  check.svgs = await page.$$eval('svg', (els) => els.map((el) => {
    const box = el.getBoundingClientRect();
    return { width: Math.round(box.width), height: Math.round(box.height), texts: el.querySelectorAll('text').length };
  }));
  check.svgCount = check.svgs.length;
  mkdirSync(repoPath('out', 'browser'), { recursive: true });
  await page.screenshot({ path: repoPath('out', 'browser', screenshot), fullPage: true });
  await context.close();
  return check;
}

function expectClean(check: PageCheck, plots: number): void {
  expect(check.consoleErrors).toEqual([]);
  expect(check.pageErrors).toEqual([]);
  expect(check.dialogs).toEqual([]);
  expect(check.externalRequests).toEqual([]);
  expect(check.svgCount).toBe(plots);
  for (const svg of check.svgs) {
    // Drawn at a readable size, with its axis labels and titles.
    expect(svg.width).toBeGreaterThan(300);
    expect(svg.height).toBeGreaterThan(150);
    expect(svg.texts).toBeGreaterThan(5);
  }
}

const describeWithChromium = CHROMIUM ? describe : describe.skip;
if (!CHROMIUM) console.warn('SKIPPED "browser check": chromium not found at /usr/bin/chromium (Debian: apt install chromium)');

describeWithChromium(`browser check${CHROMIUM ? '' : ' [SKIPPED: chromium not found]'}`, () => {
  const work = mkdtempSync(join(tmpdir(), 'lineshift-browser-'));

  beforeAll(async () => {
    browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: FLAGS });
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
