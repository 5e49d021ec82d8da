/**
 * Builds a sample HTML report from the gallery's invented data (every plot type, a table,
 * header facts, provenance) and writes it to out/report/sample-report.html. The browser
 * check (test/report/browser.test.ts) opens the same report.
 *
 * Run: npx tsx scripts/render-sample-report.ts
 */
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { VegaLiteSpec } from '../src/plot/spec.js';
import { plotBlock, reportHtml, writeReportFile, type ReportBlock, type ReportDocument } from '../src/report/document.js';
import { provenanceEntry } from '../src/spectrum/provenance.js';
import { galleryPlots } from './gallery-data.js';

const CAPTIONS: Record<string, string> = {
  spectrum: 'The spectrum with its lines marked; the band is ±1σ, the dashed line the continuum.',
  'line-fit': 'A blend of two lines fitted with two profiles; residuals in units of each point’s σ.',
  calibration: 'Dispersion solution and the residuals of the lamp lines; crosses were rejected.',
  'calibration-km-s': 'The same residuals as velocities.',
  'cross-correlation': 'Cross-correlation with a template; the dashed curve is the model fitted to the peak.',
  'velocity-curve': 'Radial velocities over the season with the fitted orbit.',
  periodogram: 'Periodogram of the velocities with false-alarm levels.',
  'periodogram-frequency': 'The same periodogram against frequency.',
  'phase-folded': 'The velocities folded on the period.',
};

/** The sample report: invented data, every plot type, and text that must be escaped. */
export async function sampleReport(): Promise<ReportDocument> {
  const plots: ReportBlock[] = [];
  const specs: Record<string, VegaLiteSpec> = galleryPlots();
  for (const [name, spec] of Object.entries(specs)) plots.push(await plotBlock(spec, CAPTIONS[name] ?? name));
  return {
    title: 'LVAC-7 over one season (sample report, invented data)',
    subtitle: 'Larkspur Valley Astronomy Club — a made-up example of what lineshift reports look like',
    inventedData: true,
    sections: [
      {
        heading: 'The star and the set-up',
        blocks: [
          { kind: 'paragraph', text: 'Every number below comes from a program that invents spectra; nothing here was observed.' },
          // Header values are shown as given, escaped: this OBJECT card tries to inject a script.
          { kind: 'facts', items: [['OBJECT', '<script>alert("header")</script> LVAC-7 "&\''], ['DATE-OBS', '2025-03-14T21:04:00'], ['Grating', '1200 lines/mm (invented)']] },
        ],
      },
      {
        heading: 'Lines measured',
        blocks: [{
          kind: 'table',
          table: {
            caption: 'Fitted lines (invented)',
            columns: [
              { key: 'line', label: 'Line' },
              { key: 'centre', label: 'Centre', unit: 'Å', digits: 3 },
              { key: 'velocity', label: 'Velocity', unit: 'km/s', digits: 1 },
              { key: 'used', label: 'Used' },
            ],
            rows: [
              { line: 'Hα', centre: { value: 6563.71, uncertainty: 0.031 }, velocity: { value: 42.1, uncertainty: 1.4 }, used: true },
              { line: 'Hβ', centre: { value: 4862.02, uncertainty: 0.044 }, velocity: { value: 41.3, uncertainty: 2.7 }, used: true },
              { line: '<b>not bold</b>', centre: NaN, velocity: null, used: false },
            ],
          },
        }],
      },
      { heading: 'Plots', blocks: plots },
    ],
    provenance: [
      provenanceEntry('read-fits', { file: 'lvac7-2025-03-14.fits', hdu: 0 }),
      provenanceEntry('calibrate', { lamp: 'neon', order: 2, rejected: 2 }),
      provenanceEntry('fit-lines', { profile: 'gaussian', window: 12 }),
    ],
    provenanceFacts: [['Demo data', 'generated from a fixed seed (invented)']],
  };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const path = resolve(process.argv[2] ?? 'out/report/sample-report.html');
  writeReportFile(path, reportHtml(await sampleReport()));
  console.log(`wrote ${path}`);
}
