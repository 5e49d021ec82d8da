import { describe, expect, it } from 'vitest';
import {
  bernoulliSumUpperTail, createSpectrum, elementOfSpecies, erfc, identifyLines, isAtomicSpecies, matchToleranceAngstrom, normalUpperTail,
  selectSpecies, sigmaFromTailProbability, telluricBandAt, telluricBandsFromLines, usableCoverage,
} from '../../src/index.js';

// Source of 0.00135: the one-sided tail of the standard normal distribution beyond 3σ (normal
// table, from memory); the other values are the docs' own.
// The results written in the @example lines of the elements area's TSDoc, checked so the docs stay true.
describe('elements TSDoc examples', () => {
  it('state the values the functions return', () => {
    expect(erfc(0)).toBe(1);
    expect(normalUpperTail(0)).toBe(0.5);
    expect(sigmaFromTailProbability(0.00135)).toBeCloseTo(3.0, 2);
    expect(bernoulliSumUpperTail([1, 1], [0.5, 0.5], 2)).toBeCloseTo(0.25, 15);
    expect(elementOfSpecies('Ca II')).toBe('Ca');
    expect(isAtomicSpecies('H2O telluric')).toBe(false);
    expect(selectSpecies(['Fe I', 'Fe II', 'Na I'], ['fe'])).toEqual(['Fe I', 'Fe II']);
    const bands = telluricBandsFromLines([
      { species: 'O2 telluric', wavelengthAngstrom: 7594, relativeIntensity: null, note: 'O2 A band: blue limit' },
      { species: 'O2 telluric', wavelengthAngstrom: 7621, relativeIntensity: null, note: 'O2 A band: red limit' },
    ]);
    expect(bands).toEqual([{ name: 'O2 A band', species: 'O2 telluric', startAngstrom: 7594, endAngstrom: 7621, strength: 'strong' }]);
    expect(telluricBandAt([{ name: 'O2 A band', species: 'O2 telluric', startAngstrom: 7594, endAngstrom: 7621, strength: 'strong' }], 7600)?.name).toBe('O2 A band');
    const t = matchToleranceAngstrom({ wavelengthAngstrom: 5000, centreUncertaintyAngstrom: 0, calibrationRmsAngstrom: 0, resolvingPower: 1000 });
    expect(t.sigmaAngstrom).toBeCloseTo(0.75, 12);
    expect(t.toleranceAngstrom).toBeCloseTo(2.25, 12);
    const lines = [6562.8, 4861.33, 4340.47].map((w) => ({ wavelengthAngstrom: w, wavelengthUncertaintyAngstrom: 0.05, kind: 'absorption' as const }));
    const list = [6562.795, 4861.325, 4340.463, 4101.735].map((w) => ({ wavelengthAngstrom: w, species: 'H I', relativeIntensity: null }));
    expect(identifyLines(lines, list, { resolvingPower: 5000, coverage: [{ startAngstrom: 4200, endAngstrom: 6700 }] }).elements[0].verdict).toBe('present');
    expect(usableCoverage(createSpectrum({ wavelength: [5000, 5001, 5002, 5003], flux: [1, NaN, 1, 1] }))).toEqual([
      { startAngstrom: 4999.5, endAngstrom: 5000.5 },
      { startAngstrom: 5001.5, endAngstrom: 5003.5 },
    ]);
  });
});
