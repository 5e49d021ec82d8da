import { uniformGenerator } from '../../src/math/random.js';

/**
 * Seeded random numbers for reproducible simulations: mulberry32 (a small 32-bit
 * generator; common practice for test data) and Box–Muller normal deviates.
 */

/** Uniform deviates in [0, 1) from a 32-bit seed (mulberry32). */
export function mulberry32(seed: number): () => number {
  return uniformGenerator(seed);
}

/** Uniform deviates in [0, 1) from a 32-bit seed (the same generator as {@link mulberry32}). */
export const uniform = mulberry32;

/** A standard normal deviate from a uniform generator (Box–Muller). */
export function gaussian(rand: () => number): number {
  let u = 0;
  while (u === 0) u = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** Standard normal deviates from a 32-bit seed. */
export function normal(seed: number): () => number {
  const u = uniform(seed);
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

/** Mean and standard deviation (n − 1) of a sample. */
export function meanStd(a: readonly number[]): { mean: number; std: number } {
  const n = a.length;
  const mean = a.reduce((s, v) => s + v, 0) / n;
  const v = a.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1);
  return { mean, std: Math.sqrt(v) };
}
