/**
 * NIST StRD Gauss1–3 and Eckerle4 from both certified starting points: our
 * Levenberg–Marquardt against ml-levenberg-marquardt 5.1.0 (analytic Jacobian, and
 * finite differences). Prints the smallest log relative error over the parameters, the
 * LRE of the residual sum of squares, the SSR and the time per fit.
 *
 * Run: npx tsx bench/strd-solvers.ts
 * Data: NIST ITL Statistical Reference Datasets (copies in test/fixtures/nist-strd/).
 */
import { resolve } from 'node:path';
import { fitCurve } from '../src/fit/curve.js';
import { lre, readStrd } from '../test/helpers/strd.js';
import { fitWithMlLm } from './lib/ml-lm.js';

const strdFolder = resolve(import.meta.dirname, '..', 'test', 'fixtures', 'nist-strd');

/** Milliseconds per call: the fastest of 3 rounds of ≥ 100 ms (the machine may be shared). */
function time(f: () => void): number {
  let best = Infinity;
  for (let round = 0; round < 3; round++) {
    let reps = 0;
    const t0 = performance.now();
    do { f(); reps++; } while (performance.now() - t0 < 100);
    best = Math.min(best, (performance.now() - t0) / reps);
  }
  return best;
}

const rows: string[][] = [['problem', 'start', 'solver', 'stop', 'min LRE params', 'LRE SSR', 'SSR', 'ms/fit']];
for (const name of ['Gauss1', 'Gauss2', 'Gauss3', 'Eckerle4']) {
  const prob = readStrd(resolve(strdFolder, `${name}.dat`), name);
  for (const s of [0, 1] as const) {
    const data = { x: prob.x, y: prob.y };
    const ours = fitCurve(data, prob.model, { initial: prob.start[s] });
    const ms = time(() => fitCurve(data, prob.model, { initial: prob.start[s] }));
    const fmt = (ps: number[], ssr: number) => [
      Math.min(...ps.map((v, j) => lre(v, prob.certified[j]))).toFixed(1),
      lre(ssr, prob.certifiedSsr).toFixed(1),
      ssr.toPrecision(8),
    ];
    rows.push([name, String(s + 1), 'ours', `${ours.reason} (${ours.iterations} steps)`, ...fmt(ours.parameters, ours.chiSquare), ms.toFixed(3)]);
    for (const [label, analytic, iters] of [['ml-lm analytic J, 200 it', true, 200], ['ml-lm analytic J, 2000 it', true, 2000], ['ml-lm finite diff., 200 it', false, 200]] as const) {
      const out = fitWithMlLm(data, prob.model, prob.start[s], { maxIterations: iters, analyticJacobian: analytic });
      const t = time(() => fitWithMlLm(data, prob.model, prob.start[s], { maxIterations: iters, analyticJacobian: analytic }));
      rows.push([name, String(s + 1), label, out.reason, ...fmt(out.parameters, out.chiSquare), t.toFixed(3)]);
    }
  }
}
const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
for (const r of rows) console.log(r.map((v, c) => v.padEnd(widths[c])).join('  '));
