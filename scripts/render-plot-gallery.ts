/**
 * Renders every plot type on invented sample data to out/gallery/NAME.svg (and NAME.png
 * when chromium is installed), for a person to look at. The data below is synthetic and
 * made up for the gallery; it describes no real star or instrument.
 *
 * Run: npx tsx scripts/render-plot-gallery.ts
 */
import { resolve } from 'node:path';
import { renderGallery } from './gallery-render.js';
import { galleryPlots } from './gallery-data.js';

await renderGallery(galleryPlots(), resolve(process.argv[2] ?? 'out/gallery'));
