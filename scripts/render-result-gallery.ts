/**
 * Renders the plots of real library results (the invented sample files and seeded
 * synthetic data, see test/plot/result-fixtures.ts) to out/result-gallery/NAME.svg and, with
 * chromium, NAME.png, for a person to look at. Nothing here is an observation.
 *
 * Run: npx tsx scripts/render-result-gallery.ts [OUT_DIR]
 */
import { resolve } from 'node:path';
import { renderGallery } from './gallery-render.js';
import { resultGalleryPlots } from '../test/plot/result-fixtures.js';

const t0 = performance.now();
const plots = resultGalleryPlots();
console.log(`results computed and plots built in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
await renderGallery(plots, resolve(process.argv[2] ?? 'out/result-gallery'));
