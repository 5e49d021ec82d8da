/**
 * Line identification on seeded synthetic peak lists (test/calibrate/synthetic-lamp.ts):
 * success rates blind and with hints, with spurious peaks and missing lines.
 * Line positions come from the shipped lists (NIST air wavelengths); the rest is invented.
 */
import { describe, expect, it } from 'vitest';
import { identifyLampLines, mergeUnresolvedLines, type LampIdentifyOptions } from '../../src/calibrate/identify.js';
import { lampLineList, mergeLineLists, parseLineListCsv } from '../../src/lines/linelist.js';
import { STANDARD_CASES, makePeakList } from './synthetic-lamp.js';

type CaseName = keyof typeof STANDARD_CASES;

/**
 * Runs identification on `seeds` peak lists and counts successes: ok, at least 70 % of the
 * real peaks identified, and at most 10 % of the identifications wrong. A match is right
 * when the list wavelength is within a quarter of the line FWHM (in Å) of the truth (the
 * truth of an unresolved blend is its intensity-weighted wavelength).
 */
function successRate(name: CaseName, opts: { seeds: number; lines: number; missing: number; spurious: number; hint?: LampIdentifyOptions['hint'] }) {
  const c = STANDARD_CASES[name];
  const list = lampLineList(c.lamp);
  const disp = Math.abs(c.curve(c.pixels - 1) - c.curve(0)) / (c.pixels - 1);
  let success = 0, wrong = 0, identified = 0;
  for (let seed = 1; seed <= opts.seeds; seed++) {
    const pl = makePeakList({ lamp: c.lamp, pixels: c.pixels, curve: c.curve, fwhmPixels: c.fwhmPixels, lines: opts.lines, missingFraction: opts.missing, spuriousFraction: opts.spurious, seed });
    const r = identifyLampLines(pl.peaks, { list, domain: { min: 0, max: c.pixels - 1 }, hint: opts.hint });
    let good = 0, bad = 0;
    for (const m of r.matches) {
      if (Math.abs(pl.trueWavelengthAngstrom[m.peakIndex] - m.line.wavelengthAngstrom) < 0.25 * c.fwhmPixels * disp) good++;
      else bad++;
    }
    const real = pl.trueWavelengthAngstrom.filter((w) => !Number.isNaN(w)).length;
    if (r.ok && good >= 0.7 * real && bad <= 0.1 * r.matches.length) success++;
    wrong += bad;
    identified += r.matches.length;
  }
  return { rate: success / opts.seeds, wrongFraction: wrong / Math.max(1, identified) };
}

describe('identification without a hint (triplet ratios, voting, growth)', () => {
  // 40 brightest lines of the lamp on the detector, centres scattered by 0.03 pixel.
  for (const name of ['neArRed', 'neArWide', 'neArGrating'] as const) {
    it(`${name}: right in ≥ 90 % of 50 seeds with 30 % spurious peaks and 20 % of the lines missing`, () => {
      const r = successRate(name, { seeds: 50, lines: 40, missing: 0.2, spurious: 0.3 });
      console.log(`identification ${name}, blind, 30 % spurious, 20 % missing: success ${(100 * r.rate).toFixed(0)} % of 50 seeds, wrong identifications ${(100 * r.wrongFraction).toFixed(1)} %`);
      expect(r.rate).toBeGreaterThanOrEqual(0.9);
    });
  }

  for (const name of ['mercury', 'helium'] as const) {
    it(`${name} (a sparse lamp): right in ≥ 95 % of 50 clean seeds, and in ≥ 85 % with spurious peaks and missing lines`, () => {
      const clean = successRate(name, { seeds: 50, lines: 40, missing: 0, spurious: 0 });
      const hard = successRate(name, { seeds: 50, lines: 40, missing: 0.2, spurious: 0.3 });
      console.log(`identification ${name}, blind: clean ${(100 * clean.rate).toFixed(0)} %, 30 % spurious + 20 % missing ${(100 * hard.rate).toFixed(0)} % of 50 seeds`);
      expect(clean.rate).toBeGreaterThanOrEqual(0.95);
      expect(hard.rate).toBeGreaterThanOrEqual(0.85);
    });
  }
});

describe('identification with a hint', () => {
  it('a wavelength range 3 % off in each end makes sparse lamps reliable too', () => {
    for (const name of ['mercury', 'helium'] as const) {
      const c = STANDARD_CASES[name];
      const w0 = c.curve(0), w1 = c.curve(c.pixels - 1);
      const span = w1 - w0;
      const r = successRate(name, { seeds: 50, lines: 40, missing: 0.2, spurious: 0.3, hint: { kind: 'range', minWavelengthAngstrom: w0 + 0.03 * span, maxWavelengthAngstrom: w1 - 0.03 * span } });
      console.log(`identification ${name}, range hint, 30 % spurious + 20 % missing: ${(100 * r.rate).toFixed(0)} % of 50 seeds`);
      expect(r.rate).toBeGreaterThanOrEqual(0.9);
    }
  });

  it('a central wavelength and dispersion (the hint lies 20 Å and 5 % off) identifies the Ne+Ar lines', () => {
    const c = STANDARD_CASES.neArRed;
    const r = successRate('neArRed', { seeds: 20, lines: 40, missing: 0.2, spurious: 0.3, hint: { kind: 'linear', centerWavelengthAngstrom: c.curve(1023.5) + 20, dispersionAngstromPerPixel: 0.55 * 1.05 } });
    expect(r.rate).toBeGreaterThanOrEqual(0.9);
  });

  it('a hint that excludes the truth finds at most a chance pattern of a few lines (which lamp calibration then refuses)', () => {
    const c = STANDARD_CASES.neArRed;
    const pl = makePeakList({ lamp: c.lamp, pixels: c.pixels, curve: c.curve, fwhmPixels: c.fwhmPixels, lines: 40, seed: 5 });
    // The true range is 5826–6948 Å; hint 7800–8900 Å with a 50 Å accuracy.
    const r = identifyLampLines(pl.peaks, { list: lampLineList(c.lamp), domain: { min: 0, max: 2047 }, hint: { kind: 'range', minWavelengthAngstrom: 7800, maxWavelengthAngstrom: 8900, accuracyAngstrom: 50 } });
    expect(r.matches.length).toBeLessThan(0.5 * pl.peaks.length);
  });
});

describe('identification: edge cases and inputs', () => {
  it('fewer than 4 peaks: too-few-peaks', () => {
    const r = identifyLampLines([{ pixel: 10, pixelUncertainty: 0.1, strength: 1 }, { pixel: 50, pixelUncertainty: 0.1, strength: 1 }], { list: lampLineList('neon') });
    expect(r).toMatchObject({ ok: false, reason: 'too-few-peaks', matches: [] });
  });

  it('does not modify its inputs (frozen peaks and list)', () => {
    const c = STANDARD_CASES.mercury;
    const pl = makePeakList({ lamp: c.lamp, pixels: c.pixels, curve: c.curve, fwhmPixels: c.fwhmPixels, lines: 40, seed: 2 });
    const peaks = Object.freeze(pl.peaks.map((p) => Object.freeze({ ...p })));
    const before = JSON.stringify(peaks);
    const r = identifyLampLines(peaks, { list: lampLineList('mercury'), domain: { min: 0, max: 2047 } });
    expect(r.ok).toBe(true);
    expect(JSON.stringify(peaks)).toBe(before);
  });

  it('merges list lines closer than the resolution into one intensity-weighted blend, unless one dominates tenfold', () => {
    const list = lampLineList('mercury');
    // Source: data/linelists/Hg_I.csv (NIST ASD Ritz wavelengths, NIST Handbook intensities).
    // Hg I 5789.6805 (no intensity: counts as the weakest, 25) and 5790.663 (60), NIST Handbook scale: merged at 2 Å.
    const merged = mergeUnresolvedLines(list, 2).find((l) => l.components === 2 && l.wavelengthAngstrom > 5780 && l.wavelengthAngstrom < 5800)!;
    expect(merged.blend).toBe(true);
    expect(merged.wavelengthAngstrom).toBeCloseTo((5789.6805 * 25 + 5790.663 * 60) / 85, 6);
    // An invented list: a line ten times the other keeps its own wavelength; equal lines merge half-way.
    const own = parseLineListCsv('wavelength_air_angstrom,relative_intensity\n5000.0,1000\n5001.0,100\n6000.0,100\n6001.0,100\n7000,5\n', 'invented_X_I.csv');
    const m = mergeUnresolvedLines(own, 1.5);
    expect(m.map((l) => [l.wavelengthAngstrom, l.components, l.blend])).toEqual([[5000, 2, false], [6000.5, 2, true], [7000, 1, false]]);
    expect(m[0].relativeIntensity).toBe(1100);
  });

  it('never takes one element as dominating another: intensities of different lists are not on one scale', () => {
    // The NIST Handbook gives intensities per element, and a lamp's mixture sets how bright each
    // element's lines come out, so a tenfold list ratio between two elements says nothing about
    // the measured blend. Invented lists, same shape as above.
    const x = parseLineListCsv('wavelength_air_angstrom,relative_intensity\n5000.0,1000\n', 'X_I.csv');
    const y = parseLineListCsv('wavelength_air_angstrom,relative_intensity\n5001.0,100\n', 'Y_I.csv');
    const both = mergeLineLists([x, y]);
    const m = mergeUnresolvedLines(both, 1.5);
    expect(m).toHaveLength(1);
    expect(m[0].blend).toBe(true);
    expect(m[0].species).toBe('X I+Y I');
    expect(m[0].wavelengthAngstrom).toBeCloseTo((5000 * 1000 + 5001 * 100) / 1100, 9);
  });
});
