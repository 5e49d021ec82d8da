/**
 * Speed of a cross-correlation velocity (crossCorrelationVelocity: 4× oversampled log-λ grid,
 * cubic interpolation, two passes, three uncertainty estimates) for spectra of 4 096 to
 * 262 144 pixels, and how the time grows: time/(N log₂ N) should stay roughly constant if the
 * FFTs and the linear passes dominate. The continuum fits of the default settings are timed
 * apart.
 *
 * Run: npx tsx bench/ccf.ts [MAX_PIXELS]   (default 262 144)
 *
 * Spectra (invented): pixels of 0.05 Å from 3800 Å in air, Gaussian absorption lines at
 * seeded random wavelengths (one per 4 Å on average, depth 0.1–0.6), R = 20 000, S/N 100,
 * at +12.3 km/s; the template is the same line list at rest without noise.
 */
import { normalizeContinuum } from '../src/lines/continuum.js';
import { syntheticSpectrum, type SyntheticLine } from '../src/lines/synthetic.js';
import { uniformGenerator } from '../src/math/random.js';
import { createSpectrum } from '../src/spectrum/spectrum.js';
import { crossCorrelationVelocity } from '../src/velocity/ccf.js';

const maxPixels = Number(process.argv[2] ?? 262_144);
const STEP = 0.05;
const START = 3800;

function spectra(n: number) {
  const end = START + STEP * (n - 1);
  const rand = uniformGenerator(n);
  const lines: SyntheticLine[] = [];
  for (let i = 0; i < (end - START) / 4; i++) {
    lines.push({ wavelengthAngstrom: START + rand() * (end - START), medium: 'air', depth: 0.1 + 0.5 * rand(), fwhmAngstrom: 0.1 });
  }
  const wl = Float64Array.from({ length: n }, (_, i) => START + i * STEP);
  const common = { wavelengthAngstrom: wl, medium: 'air' as const, lines, resolvingPower: 20000, oversampling: 4 };
  const star = syntheticSpectrum({ ...common, velocityKmPerS: 12.3, noise: { peakCounts: 10000, seed: 1 } }).spectrum;
  const rest = syntheticSpectrum(common);
  return { star, template: createSpectrum({ wavelength: wl, flux: rest.model, medium: 'air' }) };
}

function time(f: () => void, repeats: number): number {
  const t: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    f();
    t.push(performance.now() - t0);
  }
  t.sort((a, b) => a - b);
  return t[t.length >> 1];
}

console.log(`crossCorrelationVelocity, Node ${process.version}; median of repeats. The spectra have a flat continuum, so the`);
console.log('core is timed with continuum: \'none\'; the two continuum fits the defaults add are timed apart (up to 32 768 pixels:');
console.log('fitContinuum solves a dense least-squares problem whose size grows with the range, so it grows much faster than N log N).');
console.log('pixels   grid px   core ms   core/(N log2 N) ns   +continuum fits ms   velocity − truth km/s');
for (let n = 4096; n <= maxPixels; n *= 2) {
  const { star, template } = spectra(n);
  const repeats = n <= 16384 ? 7 : n <= 65536 ? 3 : 1;
  const core = { continuum: 'none', templateContinuum: 'none' } as const;
  let result = crossCorrelationVelocity(star, template, core); // warm-up
  const total = time(() => { result = crossCorrelationVelocity(star, template, core); }, repeats);
  const continuum = n <= 32768 ? time(() => { normalizeContinuum(star); normalizeContinuum(template); }, repeats) : NaN;
  const perNLogN = (total * 1e6) / (n * Math.log2(n));
  console.log(`${String(n).padStart(6)}  ${String(result.grid.pixels).padStart(8)}  ${total.toFixed(1).padStart(8)}  ${perNLogN.toFixed(1).padStart(19)}  ${(Number.isNaN(continuum) ? 'not timed' : continuum.toFixed(1)).padStart(19)}  ${(result.velocity.value - 12.3).toFixed(4).padStart(8)} ± ${result.velocity.uncertainty.toFixed(4)}`);
}
