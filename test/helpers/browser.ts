/**
 * The browser check's harness, shared by the tests that open HTML pages: Debian's chromium
 * (playwright-core, headless, a fresh profile per page, network refused), and what a page
 * showed — console errors, page errors, dialogs, external requests, and every drawn SVG.
 * Screenshots go to out/browser/ for a person to look at.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { describe, expect } from 'vitest';
import { repoPath } from './paths.js';

/** Debian's chromium, when installed. */
export const CHROMIUM = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => existsSync(p));
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** What opening a page showed. */
export interface PageCheck {
  consoleErrors: string[];
  pageErrors: string[];
  dialogs: string[];
  externalRequests: string[];
  svgCount: number;
  /** Width × height in px of each SVG as laid out, and how many text elements it has. */
  svgs: { width: number; height: number; texts: number }[];
}

/** Starts chromium (headless). */
export function launchChromium(): Promise<Browser> {
  if (!CHROMIUM) throw new Error('chromium not found at /usr/bin/chromium');
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: FLAGS });
}

/** Opens a local HTML file offline, records what happened, and saves a full-page screenshot as out/browser/NAME. */
export async function openPage(browser: Browser, file: string, screenshot: string): Promise<PageCheck> {
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

/** Asserts a clean page: no console or page error, no dialog, no external request, and `plots` SVGs drawn at a readable size. */
export function expectClean(check: PageCheck, plots: number): void {
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

/** A describe block that needs chromium; skipped with a printed reason when it is absent. */
export function describeWithChromium(title: string, body: () => void): void {
  if (!CHROMIUM) {
    console.warn(`SKIPPED "${title}": chromium not found at /usr/bin/chromium (Debian: apt install chromium)`);
    describe.skip(`${title} [SKIPPED: chromium not found]`, body);
  } else {
    describe(title, body);
  }
}
