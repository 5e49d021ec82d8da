import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { telluricBandsFromLines } from '../../src/elements/telluric.js';
import { repoPath } from '../helpers/paths.js';
import { listsOf } from './lists.js';

const linelist = (name: string) => repoPath('data', 'linelists', name);

/** Peck & Reeder (1972) air from vacuum, Å (the formula of the shipped lists, SOURCES.md PR1972). */
function vacToAir(vac: number): number {
  const s2 = (1e4 / vac) ** 2;
  return vac / (1 + 8.06051e-5 + 2.48099e-2 / (132.274 - s2) + 1.74557e-4 / (39.32957 - s2));
}

interface Level {
  conf: string;
  term: string;
  j: number;
  e: number;
  odd: boolean;
}

function readLevels(path: string): Level[] {
  const rows = readFileSync(path, 'utf8').split('\n').slice(1);
  const out: Level[] = [];
  for (const r of rows) {
    const c = r.split('\t').map((x) => x.trim().replace(/^"|"$/g, ''));
    if (c.length < 5) continue;
    const e = Number(c[4]);
    const [num, den] = c[2].split('/').map(Number);
    const j = den ? num / den : num;
    if (!Number.isFinite(e) || !Number.isFinite(j)) continue;
    out.push({ conf: c[0], term: c[1], j, e, odd: c[1].includes('*') });
  }
  return out;
}

describe('Ti II list (NIST ASD levels; NIST Handbook SRD 108 as second source)', () => {
  const levelsPath = linelist('sources/nistspectrum=Ti+II.webdump.dat');
  const rows = listsOf(['Ti II']);
  const levels = readLevels(levelsPath);

  it('keeps the level file as stored in the mirror (11 740 characters, 252 levels and the limit)', () => {
    // length and row count of the stored file afloers/NIST_ASD_Data energy_levels/nistspectrum=Ti+II.webdump.dat (commit c270577d)
    expect(readFileSync(levelsPath, 'utf8').length).toBe(11_740);
    expect(levels).toHaveLength(252);
    expect(levels[0]).toEqual({ conf: '3d2.(3F).4s', term: 'a 4F', j: 1.5, e: 0, odd: false });
  });

  it('every row is an E1 Ritz wavelength of low-lying levels, recomputed here independently', () => {
    // transitions: parity change, |ΔJ| ≤ 1, not 0–0; lower < 26000 cm⁻¹, upper < 48000 cm⁻¹ (data/linelists/SOURCES.md, "Lists made in this repository")
    const ritz: { air: number; vac: number }[] = [];
    for (const u of levels) {
      for (const l of levels) {
        if (u.e <= l.e || u.odd === l.odd || Math.abs(u.j - l.j) > 1 || (u.j === 0 && l.j === 0)) continue;
        if (l.e >= 26_000 || u.e >= 48_000) continue;
        const vac = 1e8 / (u.e - l.e);
        ritz.push({ air: vacToAir(vac), vac });
      }
    }
    expect(rows).toHaveLength(77);
    let worst = 0;
    for (const r of rows) {
      const best = ritz.reduce((b, t) => (Math.abs(t.air - r.wavelengthAngstrom) < Math.abs(b.air - r.wavelengthAngstrom) ? t : b));
      const d = Math.abs(best.air - r.wavelengthAngstrom);
      worst = Math.max(worst, d);
      // the CSV rounds to 4 decimals
      expect(d, `${r.wavelengthAngstrom}`).toBeLessThanOrEqual(5.0001e-5);
      const vacNote = Number(/vac ([0-9.]+)/.exec(r.note ?? '')?.[1]);
      expect(Math.abs(vacNote - best.vac)).toBeLessThanOrEqual(5.0001e-5);
      expect(r.species).toBe('Ti II');
    }
    console.log(`Ti II: worst |CSV − recomputed Ritz| = ${worst.toExponential(2)} Å over ${rows.length} rows`);
  });

  it('agrees with the NIST Handbook wavelengths within 0.02 Å (Handbook ≈ 0.01 Å longer)', () => {
    // second source: NIST SRD 108 titanium strong lines (scrape subset in data/linelists/sources/)
    const hb = readFileSync(linelist('sources/srd108_titanium_air_subset.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    const withHb = rows.filter((r) => r.relativeIntensity !== null);
    expect(withHb.map((r) => r.wavelengthAngstrom)).toEqual([3504.8907, 3685.1963, 3741.6383, 3759.2915, 3761.3206, 3900.539, 3913.4612]);
    const diffs = withHb.map((r) => {
      const m = /NIST Handbook line ([0-9.]+) \(int (\d+)/.exec(r.note ?? '');
      expect(m).not.toBeNull();
      const hbRow = hb.find((h) => h[1] === m![1]);
      expect(hbRow, `Handbook row ${m![1]}`).toBeDefined();
      expect(Number(hbRow![2])).toBe(r.relativeIntensity); // intensity from the Handbook
      return Number(m![1]) - r.wavelengthAngstrom;
    });
    const mean = diffs.reduce((a, b) => a + b, 0) / diffs.length;
    for (const d of diffs) {
      expect(d).toBeGreaterThan(0);
      expect(d).toBeLessThanOrEqual(0.0201);
    }
    expect(mean).toBeCloseTo(0.0105, 3);
    console.log(`Ti II Handbook − Ritz: ${diffs.map((d) => d.toFixed(4)).join(', ')} (mean ${mean.toFixed(4)} Å)`);
  });

  it('contains the well-known strong Ti II lines', () => {
    // approximate positions from memory (the selection list of build_ti_ii.py), 0.03 Å
    for (const w of [4300.05, 4443.8, 4468.49, 4501.27, 4533.97, 4549.62, 4563.76, 4571.97, 5188.69, 5226.54]) {
      expect(rows.some((r) => Math.abs(r.wavelengthAngstrom - w) < 0.03), `${w}`).toBe(true);
    }
  });
});

describe('telluric H2O bands (from memory) checked against what sources say', () => {
  const h2o = telluricBandsFromLines(listsOf(['H2O telluric']));

  it('has five bands, two marked weak', () => {
    expect(h2o.map((b) => [b.name, b.startAngstrom, b.endAngstrom, b.strength])).toEqual([
      ['H2O 5900 band', 5880, 5990, 'weak'],
      ['H2O 6500 band', 6470, 6600, 'weak'],
      ['H2O 7200 band', 7160, 7350, 'strong'],
      ['H2O 8200 band', 8120, 8350, 'strong'],
      ['H2O 9300 band', 8920, 9500, 'strong'],
    ]);
  });

  it('contains the band centres the sources name', () => {
    const inside = (w: number) => h2o.some((b) => w >= b.startAngstrom && w <= b.endAngstrom);
    // Wikipedia, "Electromagnetic absorption by water": water-vapour absorption "near 930, 820, and 730 nm"
    for (const w of [9300, 8200, 7300]) expect(inside(w), `${w}`).toBe(true);
    // laboratory study (arXiv 2010, "A Laboratory Study of Absorbing Capacity of Water Vapor at the Wavelengths from 6500 to 10500 Å"): bands at 7200, 8200, 9300 Å
    for (const w of [7200, 8200, 9300]) expect(inside(w), `${w}`).toBe(true);
    // Wikipedia "Fraunhofer lines" designations Z 822.696 nm and y 898.765 nm, which the shared CHECKS.md places in water-vapour bands
    for (const w of [8226.96, 8987.65]) expect(inside(w), `${w}`).toBe(true);
  });

  it('does not overlap the O2 a, B and A bands (O2_telluric.csv)', () => {
    const o2 = telluricBandsFromLines(listsOf(['O2 telluric']));
    expect(o2.map((b) => b.name)).toEqual(['O2 a band', 'O2 B band', 'O2 A band']);
    for (const a of o2) for (const b of h2o) expect(a.endAngstrom < b.startAngstrom || b.endAngstrom < a.startAngstrom, `${a.name} / ${b.name}`).toBe(true);
  });
});

describe('key stellar lines of the shipped lists against published values', () => {
  const at = (species: string, w: number, tol = 0.01) => {
    const hit = listsOf([species]).find((l) => Math.abs(l.wavelengthAngstrom - w) < tol);
    expect(hit, `${species} ${w}`).toBeDefined();
    return hit!.wavelengthAngstrom;
  };

  it('Na D', () => {
    const d2 = at('Na I', 5889.95);
    const d1 = at('Na I', 5895.92);
    // RP Photonics, "Standard Spectral Lines", Table 1: Na D (mean of D1, D2) 5892.938 Å
    expect(Math.abs((d1 + d2) / 2 - 5892.938)).toBeLessThan(0.002);
    // Wikipedia "Fraunhofer lines": D1 589.592 nm, D2 588.995 nm (solar; 0.01 nm given)
    expect(Math.abs(d1 - 5895.92)).toBeLessThan(0.01);
    expect(Math.abs(d2 - 5889.95)).toBeLessThan(0.01);
  });

  it('Mg b', () => {
    // Wikipedia "Fraunhofer lines": b1 518.362, b2 517.270, b4 516.733 nm (solar). Solar values run
    // +0.01 to +0.02 Å above laboratory ones (gravitational redshift ≈ 0.011 Å at 5183 Å plus blends,
    // shared CHECKS.md §5), hence 0.03 Å.
    expect(Math.abs(at('Mg I', 5183.6, 0.05) - 5183.62)).toBeLessThan(0.03);
    expect(Math.abs(at('Mg I', 5172.68, 0.05) - 5172.7)).toBeLessThan(0.03);
    expect(Math.abs(at('Mg I', 5167.32, 0.05) - 5167.33)).toBeLessThan(0.03);
  });

  it('Ca II H and K', () => {
    // Wikipedia "Fraunhofer lines": K 393.368 nm, H 396.847 nm (solar; see Mg b for the 0.03 Å)
    expect(Math.abs(at('Ca II', 3933.66) - 3933.68)).toBeLessThan(0.03);
    expect(Math.abs(at('Ca II', 3968.47) - 3968.47)).toBeLessThan(0.03);
  });

  it('Hα and Hβ', () => {
    // Wikipedia "Fraunhofer lines": C (Hα) 656.281 nm, F (Hβ) 486.134 nm (solar)
    const ha = at('H I', 6562.8, 0.05);
    expect(Math.abs(ha - 6562.81)).toBeLessThan(0.03);
    // RP Photonics Table 1: F line (Hβ) 4861.327 Å; our value is the fine-structure blend
    expect(Math.abs(at('H I', 4861.33, 0.05) - 4861.327)).toBeLessThan(0.005);
    // RP Photonics' C line 6562.725 is one fine-structure component; the blend lies 0.07 Å redward (shared CHECKS.md §4)
    expect(ha - 6562.725).toBeCloseTo(0.07, 2);
  });
});
