/**
 * Element identification: time per identification and the false-"present" rate on pure-noise
 * line lists, with more realisations than the tests run.
 *
 *   npx tsx bench/elements.ts [N]     (N noise realisations per resolving power and count; default 1000)
 *
 * Uses the seeded simulators of test/elements (invented data).
 */
import { identifyLines } from '../src/elements/identify.js';
import { identifySpectrum } from '../src/elements/spectrum.js';
import { telluricBandsFromLines } from '../src/elements/telluric.js';
import { allLists, listsOf } from '../test/elements/lists.js';
import { SCENARIOS, simulateFoundLines, simulateNoiseLines } from '../test/elements/simulate.js';
import { syntheticSpectrum } from '../test/elements/synthetic-spectrum.js';

const N = Number(process.argv[2] ?? 1000);
const reference = listsOf([...allLists().keys()].filter((s) => !s.includes('telluric')));
const bands = telluricBandsFromLines(listsOf(['O2 telluric', 'H2O telluric']));

console.log('time per identifyLines call (found-line lists, 200 shift offsets):');
for (const R of [500, 2000, 10_000]) {
  const sc = SCENARIOS[0];
  const sims = Array.from({ length: 10 }, (_, i) => simulateFoundLines(sc, R, 50, 900 + i));
  const t0 = performance.now();
  for (const sim of sims) identifyLines(sim.lines, reference, { resolvingPower: R, velocityKmPerS: sim.velocityKmPerS, coverage: [{ startAngstrom: sc.startAngstrom, endAngstrom: sc.endAngstrom }], telluricBands: bands });
  const ms = (performance.now() - t0) / sims.length;
  console.log(`  ${sc.name}, R = ${R}: ${sims[0].lines.length} found lines, ${ms.toFixed(0)} ms`);
}

console.log('time per identifySpectrum call (finder + fitter + identification):');
for (const R of [500, 2000]) {
  const sc = SCENARIOS[0];
  const sim = syntheticSpectrum(sc, R, 50, 77);
  const t0 = performance.now();
  const r = identifySpectrum(sim.spectrum, { resolvingPower: R, velocityKmPerS: sim.velocityKmPerS });
  console.log(`  ${sc.name}, R = ${R}: ${sim.spectrum.flux.length} pixels, ${r.found.length} lines, ${((performance.now() - t0) / 1000).toFixed(2)} s`);
}

console.log(`pure-noise line lists, ${N} per resolving power and mean count:`);
let total = 0;
let presentTotal = 0;
for (const R of [500, 2000, 10_000]) {
  for (const mean of [20, 60]) {
    let present = 0;
    let possible = 0;
    const which: string[] = [];
    for (let r = 0; r < N; r++) {
      const lines = simulateNoiseLines(r % 2 ? 'absorption' : 'emission', 3900, 6900, R, mean, 90_000 + 7919 * r + mean);
      const res = identifyLines(lines, reference, { resolvingPower: R, coverage: [{ startAngstrom: 3900, endAngstrom: 6900 }], shiftTrials: 100 });
      for (const e of res.elements) {
        if (e.verdict === 'present') {
          present++;
          which.push(e.species);
        }
        if (e.verdict === 'possible') possible++;
      }
    }
    total += N;
    presentTotal += present;
    console.log(`  R = ${R}, ${mean} lines: present ${present}/${N} (${which.join(', ') || '—'}), possible ${possible} (${(possible / N).toFixed(2)} per list)`);
  }
}
console.log(`false "present" rate: ${presentTotal}/${total} = ${((100 * presentTotal) / total).toFixed(3)} % of lists`);
