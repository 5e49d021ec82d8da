/**
 * Hydrogen line wavelengths from first principles, for checking the shipped H I list:
 * the Rydberg formula with the reduced mass, Dirac fine structure, and the blend of the
 * fine-structure components weighted by their line strengths with exact hydrogenic radial
 * integrals (rational arithmetic in BigInt).
 *
 * Constants: CODATA 2018 recommended values (Tiesinga, Mohr, Newell & Taylor, Rev. Mod.
 * Phys. 93, 025010 (2021)), values as published by NIST (from memory):
 *   R∞ = 10 973 731.568 160 m⁻¹, mₑ = 9.109 383 7015 × 10⁻³¹ kg,
 *   mₚ = 1.672 621 923 69 × 10⁻²⁷ kg, α = 7.297 352 5693 × 10⁻³.
 * Not included: the Lamb shift (2S₁/₂ lies 0.035 cm⁻¹ above 2P₁/₂) and hyperfine structure;
 * for the Hα blend the Lamb shift moves the 3p–2s components by +0.015 Å, about 0.003 Å on
 * the blend.
 */

export const CODATA_2018 = Object.freeze({
  rydbergPerMetre: 10_973_731.56816,
  electronMassKg: 9.1093837015e-31,
  protonMassKg: 1.67262192369e-27,
  fineStructureConstant: 7.2973525693e-3,
});

/** Rydberg constant for hydrogen (reduced mass), m⁻¹. */
export const RYDBERG_HYDROGEN_PER_METRE = CODATA_2018.rydbergPerMetre / (1 + CODATA_2018.electronMassKg / CODATA_2018.protonMassKg);

/** Vacuum wavelength (Å) of the n_upper → n_lower line from the Rydberg formula (no fine structure). */
export function bohrWavelengthAngstrom(nUpper: number, nLower: number): number {
  return 1e10 / (RYDBERG_HYDROGEN_PER_METRE * (1 / nLower ** 2 - 1 / nUpper ** 2));
}

/** Dirac energy of level (n, j) with the reduced mass, in m⁻¹ (negative, bound). */
export function diracLevelPerMetre(n: number, j: number): number {
  const a = CODATA_2018.fineStructureConstant;
  const k = j + 0.5;
  const delta = k - Math.sqrt(k * k - a * a);
  const x = (a / (n - delta)) ** 2;
  const s = Math.sqrt(1 + x);
  const fMinus1 = -x / (s * (1 + s)); // (1 + x)^(-1/2) − 1 without cancellation
  // μc² in m⁻¹ is 2 R_M / α².
  return ((2 * RYDBERG_HYDROGEN_PER_METRE) / (a * a)) * fMinus1;
}

// ---- exact rationals --------------------------------------------------------------------

function gcd(a: bigint, b: bigint): bigint {
  a = a < 0n ? -a : a;
  b = b < 0n ? -b : b;
  while (b) [a, b] = [b, a % b];
  return a;
}

class Q {
  readonly num: bigint;
  readonly den: bigint;
  constructor(num: bigint, den = 1n) {
    if (den < 0n) [num, den] = [-num, -den];
    const g = gcd(num, den) || 1n;
    this.num = num / g;
    this.den = den / g;
  }
  add(o: Q): Q {
    return new Q(this.num * o.den + o.num * this.den, this.den * o.den);
  }
  mul(o: Q): Q {
    return new Q(this.num * o.num, this.den * o.den);
  }
  toNumber(): number {
    let n = this.num;
    let d = this.den;
    const limit = 1n << 900n;
    while ((n < 0n ? -n : n) > limit || d > limit) {
      n >>= 64n;
      d >>= 64n;
    }
    return Number(n) / Number(d);
  }
}

const factCache: bigint[] = [1n];
function fact(k: number): bigint {
  for (let i = factCache.length; i <= k; i++) factCache[i] = factCache[i - 1] * BigInt(i);
  return factCache[k];
}

function binom(n: number, k: number): bigint {
  return fact(n) / (fact(k) * fact(n - k));
}

/** |⟨n_a l_a| r |n_b l_b⟩|² in units of a₀² (exact hydrogenic radial functions). */
export function radialIntegralSquared(na: number, la: number, nb: number, lb: number): number {
  // R_nl(r) = N_nl Σ_i c_i (2/n)^(l+i) r^(l+i) e^(−r/n), c_i = (−1)^i C(n+l, n−l−1−i) / i!,
  // N_nl² = (2/n)³ (n−l−1)! / (2n (n+l)!).
  const series = (n: number, l: number) => {
    const k = n - l - 1;
    const terms: { power: number; coef: Q }[] = [];
    for (let i = 0; i <= k; i++) {
      const c = new Q((i % 2 ? -1n : 1n) * binom(n + l, k - i), fact(i));
      // (2/n)^(l+i)
      const p = l + i;
      terms.push({ power: p, coef: c.mul(new Q(2n ** BigInt(p), BigInt(n) ** BigInt(p))) });
    }
    return terms;
  };
  const A = series(na, la);
  const B = series(nb, lb);
  // ∫ r^p e^(−βr) dr = p! / β^(p+1), β = (na + nb)/(na nb)
  const bNum = BigInt(na + nb);
  const bDen = BigInt(na * nb);
  let sum = new Q(0n);
  for (const a of A) {
    for (const b of B) {
      const p = a.power + b.power + 3;
      const integral = new Q(fact(p) * bDen ** BigInt(p + 1), bNum ** BigInt(p + 1));
      sum = sum.add(a.coef.mul(b.coef).mul(integral));
    }
  }
  const norm2 = (n: number, l: number) => new Q(8n * fact(n - l - 1), BigInt(n) ** 3n * 2n * BigInt(n) * fact(n + l));
  return sum.mul(sum).mul(norm2(na, la)).mul(norm2(nb, lb)).toNumber();
}

/** Wigner 6j symbol by Racah's formula; arguments are doubled (2j) integers. */
function sixJ(a2: number, b2: number, c2: number, d2: number, e2: number, f2: number): number {
  const f = (x: number) => Number(fact(x));
  const tri = (x: number, y: number, z: number) => {
    if ((x + y + z) % 2) return null;
    const p = (x + y - z) / 2;
    const q = (x - y + z) / 2;
    const r = (-x + y + z) / 2;
    if (p < 0 || q < 0 || r < 0) return null;
    return Math.sqrt((f(p) * f(q) * f(r)) / f((x + y + z) / 2 + 1));
  };
  const t1 = tri(a2, b2, c2);
  const t2 = tri(a2, e2, f2);
  const t3 = tri(d2, b2, f2);
  const t4 = tri(d2, e2, c2);
  if (t1 === null || t2 === null || t3 === null || t4 === null) return 0;
  const s1 = (a2 + b2 + c2) / 2;
  const s2 = (a2 + e2 + f2) / 2;
  const s3 = (d2 + b2 + f2) / 2;
  const s4 = (d2 + e2 + c2) / 2;
  const u1 = (a2 + b2 + d2 + e2) / 2;
  const u2 = (b2 + c2 + e2 + f2) / 2;
  const u3 = (c2 + a2 + f2 + d2) / 2;
  let sum = 0;
  for (let t = Math.max(s1, s2, s3, s4); t <= Math.min(u1, u2, u3); t++) {
    sum += ((t % 2 ? -1 : 1) * f(t + 1)) / (f(t - s1) * f(t - s2) * f(t - s3) * f(t - s4) * f(u1 - t) * f(u2 - t) * f(u3 - t));
  }
  return t1 * t2 * t3 * t4 * sum;
}

/** One fine-structure component: vacuum wavelength (Å) and line strength (a₀² units). */
export interface Component {
  lower: { l: number; j: number };
  upper: { l: number; j: number };
  vacuumAngstrom: number;
  strength: number;
}

/** All electric-dipole fine-structure components of n_upper → n_lower. */
export function components(nUpper: number, nLower: number): Component[] {
  const out: Component[] = [];
  for (let l = 0; l < nLower; l++) {
    for (const j of l === 0 ? [0.5] : [l - 0.5, l + 0.5]) {
      for (const lu of [l - 1, l + 1]) {
        if (lu < 0 || lu >= nUpper) continue;
        for (const ju of lu === 0 ? [0.5] : [lu - 0.5, lu + 0.5]) {
          if (Math.abs(ju - j) > 1) continue;
          const w6 = sixJ(2 * l, 2 * j, 1, 2 * ju, 2 * lu, 2);
          const strength = (2 * j + 1) * (2 * ju + 1) * w6 * w6 * Math.max(l, lu) * radialIntegralSquared(nLower, l, nUpper, lu);
          if (strength === 0) continue;
          const sigma = diracLevelPerMetre(nUpper, ju) - diracLevelPerMetre(nLower, j);
          out.push({ lower: { l, j }, upper: { l: lu, j: ju }, vacuumAngstrom: 1e10 / sigma, strength });
        }
      }
    }
  }
  return out;
}

/** Line-strength-weighted mean vacuum wavelength (Å) of all components of n_upper → n_lower. */
export function blendVacuumAngstrom(nUpper: number, nLower: number): number {
  const cs = components(nUpper, nLower);
  let s = 0;
  let sw = 0;
  for (const c of cs) {
    s += c.strength;
    sw += c.strength * c.vacuumAngstrom;
  }
  return sw / s;
}
