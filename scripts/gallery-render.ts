/**
 * Writes plots to NAME.svg and, when chromium is installed, NAME.png (a screenshot of the
 * SVG at its own size), printing size, render time and any vega warning per plot. Shared
 * by the gallery scripts.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { collectingLogger } from '../src/logger.js';
import { renderSvg } from '../src/plot/render.js';
import type { VegaLiteSpec } from '../src/plot/spec.js';

/** Renders every plot of `plots` into `outDir`; returns the file names written. */
export async function renderGallery(plots: Record<string, VegaLiteSpec>, outDir: string): Promise<string[]> {
  mkdirSync(outDir, { recursive: true });
  const chromium = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => existsSync(p));
  const profile = mkdtempSync(join(tmpdir(), 'lineshift-gallery-'));
  const written: string[] = [];
  try {
    for (const [name, spec] of Object.entries(plots)) {
      const logger = collectingLogger();
      const t0 = performance.now();
      const svg = await renderSvg(spec, { logger });
      const ms = performance.now() - t0;
      const file = join(outDir, `${name}.svg`);
      writeFileSync(file, svg);
      written.push(file);
      const size = /width="(\d+)" height="(\d+)"/.exec(svg);
      console.log(`${name}: ${svg.length} bytes, ${size?.[1]}×${size?.[2]} px, ${ms.toFixed(0)} ms${logger.warnings.length ? `, warnings: ${logger.warnings.map((w) => w.message).join('; ')}` : ''}`);
      if (chromium && size) {
        const html = join(profile, `${name}.html`);
        writeFileSync(html, `<!doctype html><html><body style="margin:0">${svg}</body></html>`);
        execFileSync(chromium, ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
          '--disable-component-update', '--disable-sync', `--user-data-dir=${join(profile, 'profile')}`, '--hide-scrollbars', '--force-device-scale-factor=1',
          `--window-size=${size[1]},${size[2]}`, `--screenshot=${join(outDir, `${name}.png`)}`, `file://${html}`], { stdio: 'ignore' });
        written.push(join(outDir, `${name}.png`));
      }
    }
  } finally {
    rmSync(profile, { recursive: true, force: true });
  }
  if (!chromium) console.log('chromium not found: wrote SVG only');
  return written;
}
