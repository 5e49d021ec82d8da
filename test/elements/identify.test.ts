import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { DEFAULT_EVIDENCE_THRESHOLDS, IDENTIFY_DEFAULTS, identifyLines, matchToleranceAngstrom } from '../../src/elements/identify.js';
import { elementOfSpecies, isAtomicSpecies, selectSpecies } from '../../src/elements/species.js';
import { telluricBandAt, telluricBandsFromLines } from '../../src/elements/telluric.js';
import type { ObservedLine, ReferenceLine } from '../../src/elements/types.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/velocity/constants.js';
import { mulberry32 } from '../helpers/random.js';

// The lists in this file are invented (round numbers), to test the logic; checks against
// published wavelengths are in linelists.test.ts.

const ref = (species: string, waves: number[], intensities?: (number | null)[], note = ''): ReferenceLine[] =>
  waves.map((w, i) => ({ wavelengthAngstrom: w, species, relativeIntensity: intensities ? intensities[i] : null, note }));
const found = (waves: number[], kind: 'absorption' | 'emission' = 'absorption', sigma = 0.02): ObservedLine[] =>
  waves.map((w) => ({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: sigma, kind }));
const cov = (a: number, b: number) => [{ startAngstrom: a, endAngstrom: b }];

/** Uniformly spread filler lines (unrelated to any list), deterministic. */
function filler(n: number, a: number, b: number, seed: number, kind: 'absorption' | 'emission' = 'absorption'): ObservedLine[] {
  const r = mulberry32(seed);
  return found(Array.from({ length: n }, () => a + r() * (b - a)), kind);
}

describe('matchToleranceAngstrom', () => {
  it('adds the terms in quadrature and multiplies by k', () => {
    // σ² = 0.03² + 0.04² + (0.15·5000/10000)² + 0² + 0² = 0.0009 + 0.0016 + 0.005625 → σ = 0.090139
    const t = matchToleranceAngstrom({ wavelengthAngstrom: 5000, centreUncertaintyAngstrom: 0.03, calibrationRmsAngstrom: 0.04, resolvingPower: 10_000 });
    expect(t.sigmaAngstrom).toBeCloseTo(Math.sqrt(0.0009 + 0.0016 + 0.005625), 12);
    expect(t.toleranceAngstrom).toBeCloseTo(3 * t.sigmaAngstrom, 12);
  });

  it('includes the blend spread and the velocity uncertainty', () => {
    // λ σ_v / c = 6000 · 3 / 299792.458 Å
    const vel = (6000 * 3) / SPEED_OF_LIGHT_KM_PER_S;
    const t = matchToleranceAngstrom({
      wavelengthAngstrom: 6000, centreUncertaintyAngstrom: 0, calibrationRmsAngstrom: 0, resolvingPower: 1e12,
      blendSpreadAngstrom: 0.2, velocityUncertaintyKmPerS: 3, toleranceSigmas: 2, blendFraction: 0,
    });
    expect(t.sigmaAngstrom).toBeCloseTo(Math.hypot(0.2, vel), 12);
    expect(t.toleranceAngstrom).toBeCloseTo(2 * Math.hypot(0.2, vel), 12);
  });

  it('states its defaults once', () => {
    expect(IDENTIFY_DEFAULTS.toleranceSigmas).toBe(3);
    expect(IDENTIFY_DEFAULTS.blendFraction).toBe(0.15);
    expect(DEFAULT_EVIDENCE_THRESHOLDS.presentLogLikelihoodRatio).toBeCloseTo(Math.log(20), 15);
  });
});

describe('species names', () => {
  it('splits element and stage', () => {
    expect(elementOfSpecies('Fe II')).toBe('Fe');
    expect(elementOfSpecies('O2 telluric')).toBe('O2');
    expect(isAtomicSpecies('Ca II')).toBe(true);
    expect(isAtomicSpecies('H2O telluric')).toBe(false);
  });

  it('selects by element, spectrum or molecule, keeping the list order', () => {
    const available = ['Ca I', 'Ca II', 'Fe I', 'Fe II', 'H I', 'H2O telluric'];
    expect(selectSpecies(available, ['fe', 'H'])).toEqual(['Fe I', 'Fe II', 'H I']);
    expect(selectSpecies(available, ['Ca_II', 'h2o'])).toEqual(['Ca II', 'H2O telluric']);
  });

  it('names every unknown request', () => {
    let err: unknown;
    try {
      selectSpecies(['Fe I', 'H I'], ['Fe', 'Xx', 'Zz II']);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(UsageError);
    expect((err as UsageError).code).toBe('elements.unknown-species');
    expect((err as UsageError).message).toBe('keyword species: no line list for "Xx", "Zz II" (known: Fe, H)');
  });
});

describe('telluric bands', () => {
  const rows: ReferenceLine[] = [
    { wavelengthAngstrom: 7594, species: 'O2 telluric', relativeIntensity: null, note: 'O2 A band: blue limit of the band as tabulated' },
    { wavelengthAngstrom: 7593.7, species: 'O2 telluric', relativeIntensity: null, note: 'O2 A band (Fraunhofer A); head at the blue edge' },
    { wavelengthAngstrom: 7621, species: 'O2 telluric', relativeIntensity: null, note: 'O2 A band: red limit of the band as tabulated' },
    { wavelengthAngstrom: 5880, species: 'H2O telluric', relativeIntensity: null, note: 'H2O 5900 band (weak): blue limit; from memory' },
    { wavelengthAngstrom: 5990, species: 'H2O telluric', relativeIntensity: null, note: 'H2O 5900 band (weak): red limit; from memory' },
    { wavelengthAngstrom: 8000, species: 'H2O telluric', relativeIntensity: null, note: 'H2O lonely band: blue limit' },
  ];

  it('pairs blue and red limits, marks weak bands, drops unpaired ones', () => {
    const b = telluricBandsFromLines(rows);
    expect(b).toEqual([
      { name: 'H2O 5900 band', species: 'H2O telluric', startAngstrom: 5880, endAngstrom: 5990, strength: 'weak' },
      { name: 'O2 A band', species: 'O2 telluric', startAngstrom: 7594, endAngstrom: 7621, strength: 'strong' },
    ]);
    expect(telluricBandAt(b, 7600)?.name).toBe('O2 A band');
    expect(telluricBandAt(b, 7000)).toBeNull();
  });

  it('flags found absorption lines in a band, not emission lines, and keeps strong-band list lines out of the evidence', () => {
    const bands = telluricBandsFromLines(rows);
    const list = ref('X I', [7600, 7000, 7100, 7200], [100, 100, 100, 100]);
    const obs = [...found([7600.3, 7000, 7100, 7200]), ...found([7610], 'emission')];
    const res = identifyLines(obs, list, { resolvingPower: 5000, coverage: cov(6900, 7700), telluricBands: bands });
    expect(res.lines[0].telluric).toBe(true);
    expect(res.lines[0].candidates.map((c) => c.species)).toContain('O2 telluric');
    expect(res.lines[0].candidates.find((c) => c.telluric)?.band).toBe('O2 A band');
    expect(res.lines[4].telluric).toBe(false);
    const x = res.elements.find((e) => e.species === 'X I');
    expect(x?.linesExpected).toBe(3); // 7600 lies in the O2 A band
  });
});

describe('identifyLines: matching', () => {
  it('recovers a Doppler-shifted species and reports Δλ in the spectrum frame', () => {
    const v = 85; // km/s
    const d = Math.sqrt((1 + v / SPEED_OF_LIGHT_KM_PER_S) / (1 - v / SPEED_OF_LIGHT_KM_PER_S)); // relativistic Doppler factor
    const rest = [4100, 4340, 4861, 6563];
    const obs = [...found(rest.map((w) => w * d + 0.01)), ...filler(15, 4000, 6700, 3)];
    const list = ref('H I', rest);
    const at0 = identifyLines(obs, list, { resolvingPower: 20_000, coverage: cov(4000, 6700) });
    const atV = identifyLines(obs, list, { resolvingPower: 20_000, coverage: cov(4000, 6700), velocityKmPerS: v });
    expect(at0.elements[0].linesMatched).toBe(0); // 85 km/s is 1.2–1.9 Å, far outside the tolerance at R = 20000
    expect(atV.elements[0].linesMatched).toBe(4);
    expect(atV.elements[0].verdict).toBe('present');
    const c = atV.lines[0].candidates[0];
    expect(c.species).toBe('H I');
    expect(c.expectedWavelengthAngstrom).toBeCloseTo(4100 * d, 9);
    expect(c.restWavelengthAngstrom).toBe(4100);
    expect(c.deltaAngstrom).toBeCloseTo(0.01, 9);
  });

  it('converts air lists to a vacuum spectrum (Peck & Reeder 1972)', () => {
    // Na D2: air 5889.9509 Å ↔ vacuum 5891.5833 Å (NIST ASD levels as converted in the shared
    // line lists, note of Na_I.csv; Peck & Reeder 1972 formula)
    const list = ref('Na I', [5889.9509]);
    const res = identifyLines(found([5891.5833], 'absorption', 0.001), list, { resolvingPower: 1e5, medium: 'vacuum', coverage: cov(5800, 6000) });
    expect(res.lines[0].candidates[0].expectedWavelengthAngstrom).toBeCloseTo(5891.5833, 3);
    const inAir = identifyLines(found([5891.5833], 'absorption', 0.001), list, { resolvingPower: 1e5, coverage: cov(5800, 6000) });
    expect(inAir.lines[0].candidates).toHaveLength(0);
  });

  it('merges list lines closer than λ/R into one feature', () => {
    const list = ref('Y I', [5000, 5001, 5010, 5100, 5300], [100, 50, 80, 60, 70]);
    const low = identifyLines(found([5000.4]), list, { resolvingPower: 2000, coverage: cov(4900, 5400) }); // λ/R = 2.5 Å
    const c = low.lines[0].candidates[0];
    expect(c.components).toBe(2);
    expect(c.restWavelengthAngstrom).toBeCloseTo((5000 * 100 + 5001 * 50) / 150, 9); // intensity-weighted mean
    expect(c.relativeIntensity).toBe(150);
    expect(low.elements[0].linesExpected).toBe(4);
    const high = identifyLines(found([5000.4]), list, { resolvingPower: 50_000, coverage: cov(4900, 5400) });
    expect(high.elements[0].linesExpected).toBe(5);
  });

  it('lets forbidden lines match emission lines only, and drops multiplet-centroid rows', () => {
    const list = [
      ...ref('O III', [4958.911, 5006.843], [null, null], '[O III]; forbidden (M1/E2)'),
      ...ref('He I', [5875.6148, 5875.6404, 5875.9663], [500, 250, 120]),
      ...ref('He I', [5875.661], [null], 'He I multiplet centroid 2p 3Po - 3d 3D'),
    ];
    const em = identifyLines(found([5006.85, 5875.62], 'emission'), list, { resolvingPower: 20_000, coverage: cov(4900, 5900) });
    const ab = identifyLines(found([5006.85, 5875.62], 'absorption'), list, { resolvingPower: 20_000, coverage: cov(4900, 5900) });
    expect(em.lines[0].candidates.map((c) => c.species)).toEqual(['O III']);
    expect(ab.lines[0].candidates).toHaveLength(0);
    // 5875.661 (centroid row) is not a candidate; at R = 20000 (λ/R = 0.29 Å) the two strongest
    // components blend into one feature at their intensity-weighted mean, the third stays apart
    const rests = em.lines[1].candidates.map((c) => c.restWavelengthAngstrom);
    expect(rests).not.toContain(5875.661);
    expect(em.lines[1].candidates[0].restWavelengthAngstrom).toBeCloseTo((500 * 5875.6148 + 250 * 5875.6404) / 750, 9);
    expect(em.lines[1].candidates[0].components).toBe(2);
  });

  it('ranks candidates and gives shares that sum to 1', () => {
    const list = [...ref('A I', [5000, 5200, 5400, 5600], [100, 90, 80, 70]), ...ref('B I', [5000.3], [100])];
    const obs = found([5000.05, 5200.02, 5399.97, 5600.01]);
    const res = identifyLines(obs, list, { resolvingPower: 5000, coverage: cov(4900, 5700) });
    const cands = res.lines[0].candidates;
    expect(cands.map((c) => c.species)).toEqual(['A I', 'B I']);
    expect(cands.reduce((s, c) => s + c.score, 0)).toBeCloseTo(1, 12);
    expect(cands[0].score).toBeGreaterThan(cands[1].score);
  });

  it('returns empty candidates, not an error, when nothing matches', () => {
    const res = identifyLines(found([4444]), ref('A I', [5000]), { resolvingPower: 5000, coverage: cov(4000, 6000) });
    expect(res.lines[0].candidates).toEqual([]);
    expect(res.elements[0].verdict).toBe('not detected');
  });
});

describe('identifyLines: evidence', () => {
  // A species with 8 lines of falling intensity, and 60 unrelated lines at random positions.
  const waves = [4200, 4450, 4700, 4950, 5300, 5650, 6000, 6350];
  const inten = [1000, 800, 600, 500, 400, 300, 200, 150];
  const list = ref('S I', waves, inten);
  const bg = filler(60, 4100, 6500, 11);
  const opts = { resolvingPower: 3000, coverage: cov(4100, 6500) };

  it('calls a species present when its strong lines are all there', () => {
    const res = identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], list, opts);
    const e = res.elements[0];
    expect(e.verdict).toBe('present');
    expect(e.linesMatched).toBe(8);
    expect(e.linesExpected).toBe(8);
    expect(e.strongestMatched).toBe(true);
    expect(e.falseAlarmProbability).toBeLessThan(1e-6);
    expect(e.significanceSigma).toBeGreaterThan(4);
    expect(e.missingWavelengthsAngstrom).toEqual([]);
  });

  it('reports how far the lines sit off the velocity given (residual velocity), and warns when it matters', () => {
    // Found 0.1 Å redward of each S I line: c·0.1/λ is 4.7–7.1 km/s over 4200–6350 Å.
    const res = identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], list, opts);
    const rv = res.residualVelocity!;
    expect(rv.lines).toBe(8);
    expect(rv.valueKmPerS).toBeGreaterThan((SPEED_OF_LIGHT_KM_PER_S * 0.1) / 6350);
    expect(rv.valueKmPerS).toBeLessThan((SPEED_OF_LIGHT_KM_PER_S * 0.1) / 4200);
    // Well within 0.2 c/R (20 km/s at R 3000): no warning. 0.5 Å off (24–36 km/s) still
    // matches (tolerance ±0.45 λ/R) and is worth a warning.
    const quiet = collectingLogger();
    identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], list, { ...opts, logger: quiet });
    expect(quiet.warnings.map((w) => w.code)).not.toContain('elements.velocity-offset');
    const loud = collectingLogger();
    const off = identifyLines([...found(waves.map((w) => w + 0.5)), ...bg], list, { ...opts, logger: loud });
    expect(off.residualVelocity!.valueKmPerS).toBeGreaterThan(20);
    expect(loud.warnings.map((w) => w.code)).toContain('elements.velocity-offset');
    // Fewer than 3 lines of present species: no estimate.
    expect(identifyLines(found([4200.1, 4450.1]), list, opts).residualVelocity).toBeNull();
  });

  it('does not call it present when the strongest line is missing, even with the others there', () => {
    const res = identifyLines([...found(waves.slice(1).map((w) => w + 0.1)), ...bg], list, opts);
    const e = res.elements[0];
    expect(e.strongestMatched).toBe(false);
    expect(e.linesMatched).toBe(7);
    expect(e.verdict).not.toBe('present');
    expect(e.missingWavelengthsAngstrom).toEqual([4200]);
  });

  it('lowers the evidence for each missing strong line', () => {
    const lambdas = [0, 1, 2, 3, 4].map((nMissing) => {
      const present = waves.filter((_, i) => i === 0 || i > nMissing);
      return identifyLines([...found(present.map((w) => w + 0.1)), ...bg], list, opts).elements[0].logLikelihoodRatio;
    });
    for (let i = 1; i < lambdas.length; i++) expect(lambdas[i]).toBeLessThan(lambdas[i - 1]);
  });

  it('does not count a list line inside the core of a much broader found line as missing', () => {
    // The strongest S I line (4200 Å) lies 2 Å from the centre of a broad found line (FWHM 6 Å,
    // over 4 resolution elements at R 3000: a Ca II K-like line), beyond its own tolerance: it
    // cannot be seen on its own, so it is neither found nor missing.
    const broadLine: ObservedLine = { wavelengthAngstrom: 4202, wavelengthUncertaintyAngstrom: 0.05, kind: 'absorption', fwhmAngstrom: 6 };
    const others = found(waves.slice(1).map((w) => w + 0.1)).map((o) => ({ ...o, fwhmAngstrom: o.wavelengthAngstrom / 3000 }));
    const res = identifyLines([...others, broadLine, ...bg], list, opts);
    const e = res.elements[0];
    expect(e.linesExpected).toBe(7);
    expect(e.missingWavelengthsAngstrom).toEqual([]);
    expect(e.verdict).toBe('present');
    // A narrow found line at the same place hides nothing: the strongest line is then missing.
    const narrow = identifyLines([...others, { ...broadLine, fwhmAngstrom: 1.4 }, ...bg], list, opts).elements[0];
    expect(narrow.linesExpected).toBe(8);
    expect(narrow.strongestMatched).toBe(false);
    expect(narrow.verdict).not.toBe('present');
  });

  it('does not count lines of a present species as evidence for another (explained away)', () => {
    // T II (invented): its strongest line at 4600 Å, three weaker ones 0.3 Å from S I lines,
    // well within the tolerance at R 3000 (±0.8 Å).
    const other = ref('T II', [4600, 4950.3, 5300.3, 5650.3], [1000, 600, 600, 600]);
    const sLines = found(waves.map((w) => w + 0.1));
    const without = identifyLines([...sLines, ...bg], [...list, ...other], opts);
    const t = without.elements.find((e) => e.species === 'T II')!;
    expect(without.elements.find((e) => e.species === 'S I')!.verdict).toBe('present');
    expect(t.linesMatched).toBe(3);
    expect(t.verdict).toBe('not detected');
    expect(t.reasons).toEqual(['explained-by-present-species']);
    expect(t.explainedBy).toEqual(['S I']);
    expect(t.reason).toBe('its matched lines are lines of S I (present); without them the evidence falls short of possible');
    // With its own strongest line found too, T II keeps its verdict on that line's evidence.
    const withOwn = identifyLines([...sLines, ...found([4600.1]), ...bg], [...list, ...other], opts);
    const t2 = withOwn.elements.find((e) => e.species === 'T II')!;
    expect(t2.verdict).not.toBe('not detected');
    expect(t2.explainedBy).toEqual([]);
  });

  it('does not call weak coincidences present when the strong lines are absent', () => {
    // only the three weakest lines "found"
    const res = identifyLines([...found(waves.slice(5).map((w) => w + 0.1)), ...bg], list, opts);
    expect(res.elements[0].verdict).toBe('not detected');
    expect(res.elements[0].logLikelihoodRatio).toBeLessThan(0);
  });

  it('does not count lines outside the coverage or in gaps as missing', () => {
    const obs = [...found(waves.slice(0, 4).map((w) => w + 0.1)), ...bg];
    const gap = identifyLines(obs, list, { resolvingPower: 3000, coverage: [{ startAngstrom: 4100, endAngstrom: 5100 }] });
    expect(gap.elements[0].linesExpected).toBe(4);
    expect(gap.elements[0].linesMatched).toBe(4);
    expect(gap.elements[0].verdict).toBe('present');
  });

  it('handles emission spectra the same way', () => {
    const res = identifyLines([...found(waves.map((w) => w - 0.1), 'emission'), ...filler(40, 4100, 6500, 5, 'emission')], list, opts);
    expect(res.elements[0].verdict).toBe('present');
  });

  it('counts a list without intensities equally', () => {
    const plain = ref('P I', waves);
    const res = identifyLines([...found(waves.slice(0, 6).map((w) => w + 0.1)), ...bg], plain, opts);
    const e = res.elements[0];
    expect(e.rankedByIntensity).toBe(false);
    expect(e.strongestMatched).toBeNull();
    expect(e.linesExpected).toBe(8);
    expect(e.linesMatched).toBe(6);
    expect(e.verdict).toBe('present');
  });

  it('sorts the most certain species first and adjusts for the number tested', () => {
    const other = ref('Q I', [4300, 4800, 5500], [10, 10, 10]);
    const res = identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], [...list, ...other], opts);
    expect(res.elements.map((e) => e.species)).toEqual(['S I', 'Q I']);
    expect(res.speciesTested).toBe(2);
    const e = res.elements[0];
    expect(e.adjustedFalseAlarmProbability).toBeCloseTo(Math.min(1, 2 * e.falseAlarmProbability), 15);
  });

  it('runs the shift test and reports it', () => {
    const res = identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], list, { ...opts, shiftTrials: 99 });
    expect(res.shiftTrials).toBe(99);
    expect(res.elements[0].shiftFalseAlarmProbability).toBeCloseTo(1 / 100, 12); // no shifted copy does as well
    const none = identifyLines([...found(waves.map((w) => w + 0.1)), ...bg], list, { ...opts, shiftTrials: 0 });
    expect(none.elements[0].shiftFalseAlarmProbability).toBeNull();
  });

  it('false-alarm probability of pure chance: spread of matches under the null hypothesis', () => {
    // 200 random found-line sets with no relation to the list: the fraction with FAP ≤ α must not exceed α
    // by more than the binomial scatter (the FAP is conservative by construction).
    let below05 = 0;
    let below10 = 0;
    for (let t = 0; t < 200; t++) {
      const e = identifyLines(filler(80, 4100, 6500, 1000 + t), list, { ...opts, shiftTrials: 0 }).elements[0];
      if (e.falseAlarmProbability <= 0.05) below05++;
      if (e.falseAlarmProbability <= 0.1) below10++;
    }
    // binomial: 200·0.05 = 10 ± 3.1; 200·0.1 = 20 ± 4.2 — allow +3 sigma
    expect(below05).toBeLessThanOrEqual(10 + 3 * 3.1);
    expect(below10).toBeLessThanOrEqual(20 + 3 * 4.2);
    console.log(`null hypothesis: FAP ≤ 0.05 in ${below05}/200, ≤ 0.10 in ${below10}/200`);
  });
});

describe('identifyLines: options, bad input, immutability', () => {
  const list = ref('A I', [5000, 5200], [10, 10]);

  it('estimates the resolving power from FWHM and warns', () => {
    const log = collectingLogger();
    const obs: ObservedLine[] = [
      { wavelengthAngstrom: 5000, wavelengthUncertaintyAngstrom: 0.1, kind: 'absorption', fwhmAngstrom: 2.5 },
      { wavelengthAngstrom: 6000, wavelengthUncertaintyAngstrom: 0.1, kind: 'absorption', fwhmAngstrom: 2.0 },
      { wavelengthAngstrom: 7000, wavelengthUncertaintyAngstrom: 0.1, kind: 'absorption' },
    ];
    const res = identifyLines(obs, list, { logger: log });
    expect(res.resolvingPower).toBe(2500); // median of 5000/2.5 = 2000 and 6000/2 = 3000
    expect(res.resolvingPowerSource).toBe('line widths');
    expect(log.warnings).toEqual([
      { code: 'elements.resolution-estimated', message: 'resolving power not given; using 2500 (median λ/FWHM of 2 found lines)' },
    ]);
  });

  it('refuses bad calls with a message that says where', () => {
    const good = found([5000]);
    const cases: [() => unknown, string, string][] = [
      [() => identifyLines(good, list), 'elements.no-resolution', 'keyword resolvingPower: give the resolving power: no found line has a FWHM to estimate it from'],
      [() => identifyLines(good, list, { resolvingPower: 0 }), 'elements.bad-option', 'keyword resolvingPower: resolvingPower must be a positive finite number, got 0'],
      [() => identifyLines(good, list, { resolvingPower: 1000, toleranceSigmas: -1 }), 'elements.bad-option', 'keyword toleranceSigmas: toleranceSigmas must be a positive finite number, got -1'],
      [() => identifyLines(good, list, { resolvingPower: 1000, velocityKmPerS: 3e5 }), 'elements.bad-option', 'keyword velocityKmPerS: velocity 300000 km/s is not below the speed of light in size'],
      [() => identifyLines(good, list, { resolvingPower: 1000, coverage: cov(6000, 5000) }), 'elements.bad-option', 'keyword coverage: wavelength coverage 6000–5000 Å is not an interval of positive wavelengths with start < end'],
      [() => identifyLines([...good, { wavelengthAngstrom: NaN, wavelengthUncertaintyAngstrom: 0, kind: 'emission' }], list, { resolvingPower: 1000 }), 'elements.bad-line', 'index 1: found line has wavelength NaN; expected a positive finite number'],
      [() => identifyLines([{ wavelengthAngstrom: 5000, wavelengthUncertaintyAngstrom: -1, kind: 'emission' }], list, { resolvingPower: 1000 }), 'elements.bad-line', 'index 0: found line has wavelength uncertainty -1; expected a positive finite number'],
      [() => identifyLines([{ wavelengthAngstrom: 5000, wavelengthUncertaintyAngstrom: 0, kind: 'peak' as never }], list, { resolvingPower: 1000 }), 'elements.bad-line', 'index 0: found line has kind "peak"; expected "absorption" or "emission"'],
      [() => identifyLines(good, [{ wavelengthAngstrom: -5, species: 'A I', relativeIntensity: null }], { resolvingPower: 1000 }), 'elements.bad-reference', 'index 0: reference line has wavelength -5; expected a positive finite number of Å'],
    ];
    for (const [call, code, message] of cases) {
      let err: unknown;
      try {
        call();
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(UsageError);
      expect((err as UsageError).code).toBe(code);
      expect((err as UsageError).message).toBe(message);
    }
  });

  it('does not modify its inputs', () => {
    const obs = Object.freeze(found([5000.1, 5200.1, 5300]).map((o) => Object.freeze(o)));
    const lst = Object.freeze(list.map((l) => Object.freeze(l)));
    const coverage = Object.freeze(cov(4900, 5400).map((c) => Object.freeze(c)));
    const before = JSON.stringify([obs, lst, coverage]);
    identifyLines(obs, lst, { resolvingPower: 3000, coverage, shiftTrials: 10 });
    expect(JSON.stringify([obs, lst, coverage])).toBe(before);
  });

  it('handles no found lines', () => {
    const res = identifyLines([], list, { resolvingPower: 1000, coverage: cov(4900, 5300) });
    expect(res.lines).toEqual([]);
    expect(res.elements[0]).toMatchObject({ species: 'A I', linesMatched: 0, linesExpected: 2, verdict: 'not detected' });
  });

  it('records its provenance', () => {
    const res = identifyLines(found([5000]), list, { resolvingPower: 1234, coverage: cov(4900, 5300), shiftTrials: 0 });
    expect(res.provenance.step).toBe('identify-lines');
    expect(res.provenance.parameters).toMatchObject({ resolvingPower: 1234, toleranceSigmas: 3, blendFraction: 0.15, medium: 'air' });
  });
});
