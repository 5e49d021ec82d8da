/**
 * Seeded synthetic single-lined binaries observed the way a club observes (invented data
 * for injection–recovery tests and benchmarks).
 *
 * Truth: P log-uniform in [1, 300] d, e uniform in [0, 0.8], ω uniform in [0°, 360°), K
 * uniform in [10, 60] km/s, γ uniform in [−40, 40] km/s, T uniform over one period.
 * Sampling: 15–40 epochs on distinct random nights within observing seasons of 120–200
 * nights (one season for P ≤ 60 d, two for P ≤ 150 d, three beyond, a year apart), one
 * exposure per night within ±2.4 h of the same clock time, so the 1 d⁻¹ alias is real.
 * Noise: each epoch's σ is 2–5 % of K (the level for the whole orbit) times 0.8–1.2, and
 * the velocity is offset by σ times a standard normal deviate.
 */
import { radialVelocityKmPerS, type KeplerianOrbit } from '../../src/orbit/keplerian.js';
import { createVelocityTable, type VelocityTable } from '../../src/orbit/table.js';
import { gaussian, mulberry32 } from '../helpers/random.js';

export interface SyntheticOrbit {
  truth: KeplerianOrbit;
  table: VelocityTable;
  seasons: number;
}

export function syntheticOrbit(seed: number): SyntheticOrbit {
  const rand = mulberry32(seed);
  const P = Math.exp(Math.log(1) + rand() * (Math.log(300) - Math.log(1)));
  const e = 0.8 * rand();
  const omegaDeg = 360 * rand();
  const K = 10 + 50 * rand();
  const gamma = -40 + 80 * rand();
  const n = 15 + Math.floor(rand() * 26);
  const seasons = P <= 60 ? 1 : P <= 150 ? 2 : 3;
  const seasonLength = 120 + Math.floor(rand() * 81);
  const start = 2460400 + Math.floor(rand() * 365);
  const nights = new Set<number>();
  while (nights.size < n) nights.add(Math.floor(rand() * seasons) * 365 + Math.floor(rand() * seasonLength));
  const t = [...nights].sort((a, b) => a - b).map((night) => start + night + 0.3 + 0.2 * (rand() - 0.5));
  const truth: KeplerianOrbit = {
    periodDays: P, periastronTimeBjdTdb: start + P * rand(), eccentricity: e, omegaDeg, semiAmplitudeKmPerS: K, systemicVelocityKmPerS: gamma,
  };
  const level = K * (0.02 + 0.03 * rand());
  const sigma = t.map(() => level * (0.8 + 0.4 * rand()));
  const model = radialVelocityKmPerS(truth, t);
  const v = Array.from(model, (x, i) => x + sigma[i] * gaussian(rand));
  return { truth, table: createVelocityTable({ bjdTdb: t, velocityKmPerS: v, uncertaintyKmPerS: sigma }), seasons };
}
