/**
 * Renders every plot type on invented sample data to out/gallery/NAME.svg (and NAME.png
 * when chromium is installed), for a person to look at. The data below is synthetic and
 * made up for the gallery; it describes no real star or instrument.
 *
 * Run: npx tsx scripts/render-plot-gallery.ts
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { tmpdir } from 'node:os';
import { mkdtempSync, rmSync } from 'node:fs';
import { collectingLogger } from '../src/logger.js';
import { renderSvg } from '../src/plot/render.js';
import { galleryPlots } from './gallery-data.js';

const outDir = resolve(process.argv[2] ?? 'out/gallery');
mkdirSync(outDir, { recursive: true });
const chromium = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => existsSync(p));
const profile = mkdtempSync(join(tmpdir(), 'lineshift-gallery-'));
try {
  for (const [name, spec] of Object.entries(galleryPlots())) {
    const logger = collectingLogger();
    const t0 = performance.now();
    const svg = await renderSvg(spec, { logger });
    const ms = performance.now() - t0;
    const file = join(outDir, `${name}.svg`);
    writeFileSync(file, svg);
    const size = /width="(\d+)" height="(\d+)"/.exec(svg);
    console.log(`${name}: ${svg.length} bytes, ${size?.[1]}×${size?.[2]} px, ${ms.toFixed(0)} ms${logger.warnings.length ? `, warnings: ${logger.warnings.map((w) => w.message).join('; ')}` : ''}`);
    if (chromium && size) {
      const html = join(profile, `${name}.html`);
      writeFileSync(html, `<!doctype html><html><body style="margin:0">${svg}</body></html>`);
      execFileSync(chromium, ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
        '--disable-component-update', '--disable-sync', `--user-data-dir=${join(profile, 'profile')}`, '--hide-scrollbars', '--force-device-scale-factor=1',
        `--window-size=${size[1]},${size[2]}`, `--screenshot=${join(outDir, `${name}.png`)}`, `file://${html}`], { stdio: 'ignore' });
    }
  }
} finally {
  rmSync(profile, { recursive: true, force: true });
}
if (!chromium) console.log('chromium not found: wrote SVG only');
