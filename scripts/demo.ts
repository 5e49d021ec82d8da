/**
 * `npm run demo`: the whole pipeline on the invented demo data, each step through the
 * command-line tool (dist/, built first by npm run demo), then one shareable HTML report.
 *
 *     npm run demo                                   # writes out/demo/
 *     npx tsx scripts/demo.ts --out out/other --workers 2
 *
 * Writes, under the output folder: report.html (open it in a browser), results.json (every
 * number and the comparison with the truth), truth-comparison.csv (one row per night), the
 * outputs of every step (steps/, lvac7/, lvac12/). Exit code 0 when every step did what it
 * should — the batch's one failure is the deliberately damaged file, and is expected.
 */
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeFileAtomic } from '../src/io/atomic-write.js';
import { reportHtml, writeReportFile } from '../src/report/document.js';
import { VERSION } from '../src/version.js';
import { DemoStepError } from './demo/cli.js';
import { REPO } from './demo/paths.js';
import { runDemo, type DemoOptions, type DemoRun } from './demo/pipeline.js';
import { demoReport } from './demo/report.js';

/** Writes results.json, truth-comparison.csv and report.html for a finished run; returns the report's path (relative to the repository). */
export async function writeDemoOutputs(run: DemoRun): Promise<string> {
  const c = run.comparison;
  const results = {
    format: 'lineshift-demo-results',
    formatVersion: 1,
    note: 'INVENTED data: results of npm run demo on data/demo/ and their comparison with data/demo/truth.json (our own truth, not the world).',
    version: VERSION,
    wallSeconds: run.wallSeconds,
    steps: run.steps,
    orbit: run.orbit,
    periodogram: { bestPeriod: run.periodogram.bestPeriod, falseAlarmProbability: run.periodogram.falseAlarmProbability, aliases: run.periodogram.aliases },
    velocities: run.batch.results.map((r) => ({ label: r.label, bjdTdb: r.bjdTdb, radialVelocity: r.radialVelocity, measuredVelocity: r.measuredVelocity, barycentricCorrectionKmPerS: r.barycentricCorrectionKmPerS })),
    failures: run.batch.failures,
    lvac12: { velocity: run.lvac12.velocity.radialVelocity, elements: run.lvac12.elements.elements.map((e) => ({ species: e.species, verdict: e.verdict })) },
    comparison: c,
  };
  writeFileAtomic(join(REPO, run.outDir, 'results.json'), JSON.stringify(results, null, 1) + '\n');
  const csv = [
    '# INVENTED demo data: measured against the truth the data were made from',
    'night,bjd_tdb,velocity_km_s,uncertainty_km_s,true_velocity_km_s,pull,bjd_difference_s,correction_difference_m_s,wavelength_error_max_km_s',
    ...c.nights.map((n) => [n.night, n.bjdTdb, n.measured.value, n.measured.uncertainty, n.trueKmPerS, n.pull, n.bjdDifferenceSeconds, n.correctionDifferenceMPerS, n.wavelengthErrorMaxKmPerS].join(',')),
  ].join('\n') + '\n';
  writeFileAtomic(join(REPO, run.outDir, 'truth-comparison.csv'), csv);
  const report = join(run.outDir, 'report.html');
  writeReportFile(join(REPO, report), reportHtml(await demoReport(run)));
  return report;
}

async function main(argv: readonly string[]): Promise<number> {
  const options: { outDir?: string; workers?: number } = {};
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === '--out') options.outDir = argv[++i];
    else if (argv[i] === '--workers') options.workers = Number(argv[++i]);
    else {
      process.stderr.write(`demo: unknown argument ${argv[i]} (options: --out DIR, --workers N)\n`);
      return 2;
    }
  }
  const t0 = performance.now();
  const say = (line: string) => process.stdout.write(line + '\n');
  say('lineshift demo — everything below runs on INVENTED data (data/demo/README.md)\n');
  let run: DemoRun;
  try {
    run = await runDemo({ ...options, log: say } satisfies DemoOptions);
  } catch (e) {
    if (e instanceof DemoStepError) {
      process.stderr.write(`demo: ${e.message}\n`);
      return 1;
    }
    throw e;
  }
  const report = await writeDemoOutputs(run);
  const c = run.comparison;
  const o = run.orbit;
  say('');
  say(`LVAC-7: ${run.batch.results.length} nights reduced; 1 file reported as failed, as expected (the deliberately truncated ${run.truth.damagedFile.file}).`);
  say(`Orbit: P = ${o.period.value.toFixed(4)} ± ${o.period.uncertainty.toFixed(4)} d, e = ${o.eccentricity.value.toFixed(3)} ± ${o.eccentricity.uncertainty.toFixed(3)}, K = ${o.semiAmplitude.value.toFixed(2)} ± ${o.semiAmplitude.uncertainty.toFixed(2)} km/s, γ = ${o.systemicVelocity.value.toFixed(2)} ± ${o.systemicVelocity.uncertainty.toFixed(2)} km/s.`);
  say(`Against the invented truth: orbital elements within ${Math.max(...c.orbit.map((e) => Math.abs(e.pull))).toFixed(1)} σ; nightly velocities χ² = ${c.pulls.chiSquare.toFixed(1)} for ${c.pulls.count} (mean pull ${c.pulls.meanPull.toFixed(2)}).`);
  say(`LVAC-12: present ${run.lvac12.elements.elements.filter((e) => e.verdict === 'present').map((e) => e.species).join(', ') || 'none'}; possible ${run.lvac12.elements.elements.filter((e) => e.verdict === 'possible').map((e) => e.species).join(', ') || 'none'}.`);
  say(`\nReport: ${report}  (open it in a browser; it is one self-contained file to share)`);
  say(`Demo finished in ${((performance.now() - t0) / 1000).toFixed(1)} s.`);
  return 0;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main(process.argv.slice(2)).then((code) => { process.exitCode = code; });
}
