import { describe, expect, it } from 'vitest';
import { identifyLines } from '../../src/elements/identify.js';
import { verdictReasonMessage } from '../../src/elements/messages.js';
import { identifySpectrum } from '../../src/elements/spectrum.js';
import { telluricBandsFromLines } from '../../src/elements/telluric.js';
import type { ObservedLine, ReferenceLine } from '../../src/elements/types.js';
import { readSpectrum } from '../../src/io/read.js';
import { loadLineList } from '../../src/lines/linelist.js';
import { repoPath } from '../helpers/paths.js';

// Telluric bands against atomic lines, and the reason a species is only `possible`.
// data/samples/lvac7-star.fits is the invented A-type-like sample (6300–6812 Å, air): Hα as a
// Lorentzian of FWHM 18 Å and depth 0.55, Si II 6347/6371, radial velocity −23.4 km/s
// (data/samples/make-samples.ts). Hα lies in the shipped weak H2O 6500 band (6470–6600 Å).

const star = readSpectrum(repoPath('data', 'samples', 'lvac7-star.fits'));
const bands = telluricBandsFromLines(loadLineList(['H2O telluric', 'O2 telluric']).entries);
const cov = (a: number, b: number) => [{ startAngstrom: a, endAngstrom: b }];
const ref = (species: string, waves: number[], intensities?: (number | null)[]): ReferenceLine[] =>
  waves.map((w, i) => ({ wavelengthAngstrom: w, species, relativeIntensity: intensities ? intensities[i] : null }));

describe('a broad, deep stellar line in a weak telluric band', () => {
  for (const velocityKmPerS of [0, -23.4]) {
    it(`Hα of the LVAC-7 sample is H I, not the weak H2O band it lies in (velocity ${velocityKmPerS} km/s)`, () => {
      const r = identifySpectrum(star, { velocityKmPerS });
      const ha = r.lines.find((l) => Math.abs(l.wavelengthAngstrom - 6562.3) < 2)!;
      expect(ha).toBeDefined();
      expect(r.found[ha.index].fwhmAngstrom).toBeGreaterThan(15); // the broad stellar line
      expect(ha.telluric).toBe(true); // it lies inside the band: the flag stays
      expect(ha.candidates[0].species).toBe('H I');
      expect(ha.candidates[0].telluric).toBe(false);
      // a line 0.5 deep and 10 resolution elements wide is no weak water band: not offered
      expect(ha.candidates.some((c) => c.telluric)).toBe(false);
    });
  }

  it('says why H I is only possible there: one Balmer line in range', () => {
    const r = identifySpectrum(star, { velocityKmPerS: -23.4 });
    const h = r.elements.find((e) => e.species === 'H I')!;
    expect(h.verdict).toBe('possible');
    expect(h.linesExpected).toBe(1);
    expect(h.reasons[0]).toBe('too-few-expected-lines');
    expect(h.reason).toMatch(/^only 1 expected line in range \(present needs 2\)/);
    const si = r.elements.find((e) => e.species === 'Si II')!;
    expect(si.verdict).toBe('present');
    expect(si.reasons).toEqual([]);
    expect(si.reason).toBeNull();
  });
});

describe('telluric candidates (identifyLines)', () => {
  const R = 5000;
  // a narrow, shallow absorption line as a water line looks: FWHM λ/R, 3 % deep
  const narrow = (w: number, depth = 0.03): ObservedLine => ({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: 0.02, kind: 'absorption', fwhmAngstrom: w / R, depth });
  const options = { resolvingPower: R, coverage: cov(6300, 6800), telluricBands: bands };

  it('a narrow feature inside a band with no atomic match is telluric', () => {
    const res = identifyLines([narrow(6520)], ref('X I', [6400, 6450, 6700], [100, 80, 60]), options);
    expect(res.lines[0].telluric).toBe(true);
    expect(res.lines[0].candidates.map((c) => c.species)).toEqual(['H2O telluric']);
    expect(res.lines[0].candidates[0].band).toBe('H2O 6500 band');
  });

  it('an atomic line of a present species within the tolerance ranks above the band; the band stays a candidate', () => {
    const list = ref('X I', [6400, 6450, 6520, 6700], [100, 80, 60, 50]);
    const obs = [6400, 6450, 6520, 6700].map((w) => narrow(w, 0.05));
    const res = identifyLines(obs, list, options);
    expect(res.elements.find((e) => e.species === 'X I')!.verdict).toBe('present');
    const inBand = res.lines[2];
    expect(inBand.telluric).toBe(true);
    expect(inBand.candidates.map((c) => c.species)).toEqual(['X I', 'H2O telluric']);
    expect(inBand.candidates[0].score).toBeGreaterThan(inBand.candidates[1].score);
  });

  it('a line too deep or too broad for a weak band gets no telluric candidate; a strong band keeps it', () => {
    const deep = identifyLines([narrow(6520, 0.4)], [], options);
    expect(deep.lines[0].telluric).toBe(true);
    expect(deep.lines[0].candidates).toEqual([]);
    const broad = identifyLines([{ ...narrow(6520), fwhmAngstrom: 20 }], [], options);
    expect(broad.lines[0].candidates).toEqual([]);
    // the O2 A band (strong) can make deep, broad features
    const a = identifyLines([{ ...narrow(7605, 0.6), fwhmAngstrom: 8 }], [], { ...options, coverage: cov(7500, 7700) });
    expect(a.lines[0].candidates.map((c) => c.band)).toEqual(['O2 A band']);
  });

  it('the reason of each verdict names the first unmet condition, in one message format', () => {
    const list = ref('X I', [6400, 6450, 6520, 6700], [100, 80, 60, 50]);
    const res = identifyLines([6450, 6520, 6700].map((w) => narrow(w, 0.05)), list, { ...options, telluricBands: [] });
    const x = res.elements[0];
    expect(x.verdict).toBe('possible');
    expect(x.reasons[0]).toBe('strongest-line-missing');
    expect(x.reason).toBe(x.reasons.map((r) => verdictReasonMessage(r, x, res.thresholds)).join('; '));
    expect(verdictReasonMessage('strongest-line-missing', x, res.thresholds)).toBe('strongest expected line (6400.00 Å) not found');
    const none = identifyLines([], list, { ...options, telluricBands: [] }).elements[0];
    expect(none.verdict).toBe('not detected');
    expect(none.reasons[0]).toBe('no-line-matched');
    expect(none.reason).toMatch(/^none of 4 expected lines matched/);
  });
});
