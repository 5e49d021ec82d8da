/**
 * Seeded pseudo-random numbers for reproducible simulations (synthetic spectra, demo
 * data): the mulberry32 generator (a 32-bit state, common practice for test data; not for
 * cryptography) and standard normal deviates by the Box–Muller transform (Box & Muller
 * 1958, Ann. Math. Stat. 29, 610). The same seed always gives the same sequence.
 */

/**
 * Uniform deviates in [0, 1) from a 32-bit seed (mulberry32).
 * @param seed any number; only its low 32 bits (as an unsigned integer) are used.
 */
export function uniformGenerator(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Standard normal deviates (mean 0, variance 1) from a 32-bit seed: Box–Muller on pairs of
 * mulberry32 uniforms, using both outputs of each pair.
 * @param seed any number; only its low 32 bits are used.
 */
export function normalGenerator(seed: number): () => number {
  const u = uniformGenerator(seed);
  let spare = NaN;
  return () => {
    if (!Number.isNaN(spare)) {
      const s = spare;
      spare = NaN;
      return s;
    }
    const r = Math.sqrt(-2 * Math.log(1 - u()));
    const t = 2 * Math.PI * u();
    spare = r * Math.sin(t);
    return r * Math.cos(t);
  };
}
