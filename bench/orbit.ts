/**
 * Orbit-fit and periodogram timing on seeded synthetic single- and double-lined binaries
 * (the generator of test/orbit/synthetic.ts; invented data). Run: npx tsx bench/orbit.ts
 */
import { radialVelocityKmPerS } from '../src/orbit/keplerian.js';
import { fitOrbit } from '../src/orbit/orbit-fit.js';
import { velocityPeriodogram } from '../src/orbit/periodogram.js';
import { createVelocityTable } from '../src/orbit/table.js';
import { syntheticOrbit } from '../test/orbit/synthetic.js';

const series = Array.from({ length: 100 }, (_, i) => syntheticOrbit(5000 + i));
for (const s of series.slice(0, 10)) fitOrbit(s.table); // warm-up

let t0 = performance.now();
let freqs = 0;
for (const s of series) freqs += velocityPeriodogram(s.table).frequencyPerDay.length;
let ms = performance.now() - t0;
console.log(`periodogram: ${(ms / series.length).toFixed(2)} ms per series (mean ${Math.round(freqs / series.length)} frequencies, 15–40 points)`);

t0 = performance.now();
let runs = 0;
for (const s of series) runs += fitOrbit(s.table).fitsRun;
ms = performance.now() - t0;
console.log(`single-lined orbit fit, period searched: ${(ms / series.length).toFixed(1)} ms per series (${(runs / series.length).toFixed(1)} Levenberg–Marquardt runs each)`);

t0 = performance.now();
for (const s of series) fitOrbit(s.table, { periodGuessDays: s.truth.periodDays });
ms = performance.now() - t0;
console.log(`single-lined orbit fit, period guess given: ${(ms / series.length).toFixed(1)} ms per series`);

// second star without noise: these series are for timing only
const doubles = series.map((s) => {
  const orbit = { ...s.truth, semiAmplitude2KmPerS: s.truth.semiAmplitudeKmPerS * 1.4 };
  const v2 = radialVelocityKmPerS(orbit, s.table.bjdTdb, 'secondary');
  return createVelocityTable({ ...s.table, velocity2KmPerS: v2, uncertainty2KmPerS: s.table.uncertaintyKmPerS.map((x) => x * 1.5) });
});
t0 = performance.now();
for (const d of doubles) fitOrbit(d, { doubleLined: true });
ms = performance.now() - t0;
console.log(`double-lined orbit fit, period searched: ${(ms / doubles.length).toFixed(1)} ms per series`);
