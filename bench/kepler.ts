/**
 * Kepler solver speed and accuracy: solutions per second over random (M, e), and the
 * worst residual |E − e sin E − M| seen. Run: npx tsx bench/kepler.ts
 */
import { solveKepler } from '../src/orbit/kepler.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296);
}

for (const [label, eMax] of [['e in [0, 0.99)', 0.99], ['e in [0.9, 0.99)', -1], ['e in [0, 0.3)', 0.3]] as const) {
  const rand = lcg(42);
  const n = 1_000_000;
  const M = new Float64Array(n);
  const e = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    M[i] = (rand() * 2 - 1) * Math.PI;
    e[i] = eMax < 0 ? 0.9 + 0.09 * rand() : eMax * rand();
  }
  let sink = 0;
  for (let i = 0; i < 100_000; i++) sink += solveKepler(M[i], e[i]); // warm-up
  const t0 = performance.now();
  for (let i = 0; i < n; i++) sink += solveKepler(M[i], e[i]);
  const ms = performance.now() - t0;
  let worst = 0;
  for (let i = 0; i < n; i += 10) {
    const E = solveKepler(M[i], e[i]);
    worst = Math.max(worst, Math.abs(E - e[i] * Math.sin(E) - M[i]));
  }
  console.log(`${label}: ${(n / ms * 1000 / 1e6).toFixed(2)} million solutions/s (${(ms * 1e6 / n).toFixed(0)} ns each), worst residual ${worst.toExponential(2)} rad${sink === 0 ? '' : ''}`);
}
