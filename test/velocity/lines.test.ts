import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { loadLineList, type LineList } from '../../src/lines/linelist.js';
import { syntheticSpectrum } from '../../src/lines/synthetic.js';
import { airToVacuum, vacuumToAir } from '../../src/spectrum/air-vacuum.js';
import { createSpectrum, deriveSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { shiftWavelength } from '../../src/velocity/doppler.js';
import { velocityFromLines } from '../../src/velocity/lines.js';
import { makeStar, type StarOptions } from '../helpers/star.js';

const C = 299792.458; // km/s, exact (SI)
/** R = 20 000 around Hα: Hα, Fe I, Ca I and Si II lines, S/N 200. */
const BASE: StarOptions = { lo: 6330, hi: 6600, n: 2000, resolvingPower: 20000, velocityKmPerS: 0, peakCounts: 40000, species: ['H I', 'Fe I', 'Ca I', 'Si II'], perSpecies: 6 };
const SPECIES = BASE.species;

function noiseFree(o: StarOptions): Spectrum {
  const s = makeStar(o).synthetic;
  return createSpectrum({ wavelength: s.spectrum.wavelength, flux: s.model, uncertainty: s.sigma!, medium: s.spectrum.medium });
}

function withEntries(list: LineList, extra: { wavelengthAngstrom: number; species: string }[]): LineList {
  const entries = [...list.entries, ...extra.map((e) => Object.freeze({ ...e, medium: 'air' as const, relativeIntensity: 1e9, source: 'test', note: '', blend: false }))];
  entries.sort((a, b) => a.wavelengthAngstrom - b.wavelengthAngstrom);
  return Object.freeze({ species: list.species, medium: 'air', entries: Object.freeze(entries) });
}

describe('velocityFromLines', () => {
  it('measures every line of a noise-free star and combines them', () => {
    const v = 47.3;
    const star = makeStar({ ...BASE, velocityKmPerS: v });
    const s = createSpectrum({ wavelength: star.wavelength, flux: star.synthetic.model, uncertainty: star.synthetic.sigma!, medium: 'air' });
    const r = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    expect(r.converged).toBe(true);
    expect(r.linesUsed).toBe(star.list.entries.length);
    // 3 m/s: 0.1 of the combined uncertainty (~30 m/s); measured below 1 m/s.
    expect(Math.abs(r.velocity.value - v)).toBeLessThan(0.003);
    expect(r.approximateVelocitySource).toBe('cross-correlation');
    expect(Math.abs(r.approximateVelocityKmPerS - v)).toBeLessThan(1);
    expect(r.medium).toBe('air');
    for (const row of r.lines) {
      expect(row.status).toBe('used');
      // Rest wavelengths are the list's (air, NIST), to the air-vacuum round trip.
      expect(star.list.entries.some((e) => Math.abs(e.wavelengthAngstrom - row.restWavelengthAngstrom) < 1e-9)).toBe(true);
      const expected = vacuumToAir(shiftWavelength(airToVacuum(row.restWavelengthAngstrom), v));
      expect(Math.abs(row.observedWavelengthAngstrom!.value - expected), `${row.species} ${row.restWavelengthAngstrom}`).toBeLessThan(3 * row.observedWavelengthAngstrom!.uncertainty);
      expect(row.velocityKmPerS!.uncertainty).toBeCloseTo((C * row.observedWavelengthAngstrom!.uncertainty) / row.restWavelengthAngstrom, 2);
    }
    expect(r.chiSquare).toBeLessThan(0.1);
    expect(r.uncertaintyScale).toBe(1);
    expect(r.velocity.uncertainty).toBeCloseTo(r.statisticalUncertaintyKmPerS, 12);
    expect(r.provenance.at(-1)?.step).toBe('line-velocities');
  });

  it('works in vacuum wavelengths and with a vacuum line list', () => {
    const v = -88.1;
    const s = noiseFree({ ...BASE, velocityKmPerS: v, medium: 'vacuum' });
    const r = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    expect(Math.abs(r.velocity.value - v)).toBeLessThan(0.003);
    expect(r.medium).toBe('vacuum');
    // Hα in vacuum: 6564.608 Å (data/linelists/H_I.csv note, NIST ASD).
    expect(r.lines.find((l) => l.species === 'H I')!.restWavelengthAngstrom).toBeCloseTo(6564.608, 3);
  });

  it('finds the approximate velocity from the strongest line, or takes it as given', () => {
    const v = 212.6;
    const s = noiseFree({ ...BASE, velocityKmPerS: v });
    const a = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000, approximateVelocity: 'strongest-line' });
    expect(a.approximateVelocitySource).toBe('strongest-line');
    expect(Math.abs(a.approximateVelocityKmPerS - v)).toBeLessThan(10);
    expect(Math.abs(a.velocity.value - v)).toBeLessThan(0.003);
    const b = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000, approximateVelocity: 205 });
    expect(b.approximateVelocitySource).toBe('given');
    expect(Math.abs(b.velocity.value - v)).toBeLessThan(0.003);
  });

  it('rejects blends, lines that are not there and lines that disagree, and says why', () => {
    const v = 12;
    const star = makeStar({ ...BASE, velocityKmPerS: v });
    const s = star.synthetic.spectrum;
    const list = withEntries(star.list, [
      { wavelengthAngstrom: 6380.0, species: 'Xx I' }, // no line there
      { wavelengthAngstrom: 6449.83, species: 'Yy I' }, // 0.02 Å from Ca I 6449.808: a blend
    ]);
    // Rest wavelengths wrong by 0.6 Å (28 km/s: beyond the ±15 km/s, c/R, allowed around the
    // expected position), by 0.4 Å (19 km/s: inside it, but 19 km/s from the other lines) and
    // by 0.05 Å (2.3 km/s, many σ). The approximate velocity is given 10 km/s high.
    const shiftedEntries = list.entries.map((e) => {
      if (Math.abs(e.wavelengthAngstrom - 6400.0) < 0.01) return Object.freeze({ ...e, wavelengthAngstrom: e.wavelengthAngstrom - 0.6 });
      if (Math.abs(e.wavelengthAngstrom - 6421.349) < 0.01) return Object.freeze({ ...e, wavelengthAngstrom: e.wavelengthAngstrom - 0.4 });
      if (Math.abs(e.wavelengthAngstrom - 6439.075) < 0.01) return Object.freeze({ ...e, wavelengthAngstrom: e.wavelengthAngstrom - 0.05 });
      return e;
    });
    const r = velocityFromLines(s, { lines: { ...list, entries: shiftedEntries }, resolvingPower: 20000, approximateVelocity: v + 10 });
    const row = (w: number) => r.lines.find((l) => Math.abs(l.restWavelengthAngstrom - w) < 0.02)!;
    expect(row(6380.0).reason).toBe('not-detected');
    expect(row(6380.0).note).toMatch(/^not detected: amplitude \d+\.\d σ \(below 3 σ\)$/);
    expect(row(6449.83).reason).toBe('blended');
    expect(row(6449.808).note).toMatch(/^blended with Yy I 6449\.830 Å \(closer than 2 FWHM\)$/);
    expect(row(6399.4).reason).toBe('at-window-edge');
    expect(row(6399.4).note).toBe('the fitted centre is at the edge of its allowed range (±15.0 km/s around the expected position)');
    expect(row(6420.949).reason).toBe('far-from-others');
    expect(row(6420.949).note).toMatch(/^velocity 3\d\.\d\d km\/s is more than 15\.0 km\/s from the median of the fitted lines \(1\d\.\d\d km\/s\)$/);
    expect(row(6439.025).reason).toBe('outlier');
    expect(row(6439.025).note).toMatch(/^outlier: normalised residual \d+\.\d\d against the other lines \(limit \d\.\d\d\)$/);
    expect(r.linesRejected).toBe(6);
    expect(Math.abs(r.velocity.value - v)).toBeLessThan(4 * r.velocity.uncertainty);
  });

  it('rejects a line whose pixels are all unusable (NaN over its core) instead of failing', () => {
    // Before: the fit was handed a stretch whose usable pixels all lay beside the line, and
    // threw "line centre … is outside the spectrum". Invented: a bad column over one line.
    const v = 5;
    const star = makeStar({ ...BASE, velocityKmPerS: v });
    const s0 = noiseFree({ ...BASE, velocityKmPerS: v });
    const target = star.list.entries.find((e) => e.wavelengthAngstrom > 6400 && e.wavelengthAngstrom < 6550)!;
    const centre = shiftWavelength(target.wavelengthAngstrom, v);
    const flux = s0.flux.map((f, i) => (Math.abs(s0.wavelength[i] - centre) < 1.5 ? NaN : f));
    const s = deriveSpectrum(s0, { flux });
    const r = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    const row = r.lines.find((l) => Math.abs(l.restWavelengthAngstrom - target.wavelengthAngstrom) < 0.01)!;
    expect(row.reason).toBe('no-usable-pixels');
    expect(row.note).toMatch(/^only 0 usable pixels within \d+\.\d\d Å of the expected centre/);
    expect(r.linesUsed).toBe(star.list.entries.length - 1);
    expect(Math.abs(r.velocity.value - v)).toBeLessThan(0.01); // noise-free: as in the first test
    // Unusable from 40 Å blueward up to just past the line: the usable pixels all lie on its red side.
    const oneSided = deriveSpectrum(s0, { flux: s0.flux.map((f, i) => (s0.wavelength[i] > centre - 40 && s0.wavelength[i] < centre + 1.5 ? NaN : f)) });
    const r2 = velocityFromLines(oneSided, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    expect(r2.lines.find((l) => Math.abs(l.restWavelengthAngstrom - target.wavelengthAngstrom) < 0.01)!.reason).toBe('no-usable-pixels');
  });

  it('scales the error when the lines disagree beyond their errors, and adds the calibration error', () => {
    const s = makeStar({ ...BASE, velocityKmPerS: 5, seed: 9 }).synthetic.spectrum;
    const honest = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    // Uncertainties understated fourfold: χ²/ν ≈ 16, the error is scaled up by about 4.
    const optimistic = deriveSpectrum(s, { uncertainty: s.uncertainty!.map((u) => u / 4) });
    const r = velocityFromLines(optimistic, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000 });
    expect(r.reducedChiSquare).toBeGreaterThan(5);
    expect(r.uncertaintyScale).toBeCloseTo(Math.sqrt(r.reducedChiSquare), 12);
    expect(r.velocity.uncertainty / honest.velocity.uncertainty).toBeGreaterThan(0.5);
    expect(r.velocity.uncertainty / honest.velocity.uncertainty).toBeLessThan(2);
    const calibration = { rmsAngstrom: 0.01, lineCount: 30, coefficients: 3 };
    const c = velocityFromLines(s, { species: SPECIES, maxLinesPerSpecies: 6, resolvingPower: 20000, calibration });
    const perLine = (w: number) => (C * 0.01 * Math.sqrt(3 / 30)) / w;
    expect(c.calibrationUncertaintyKmPerS).toBeGreaterThan(perLine(6600));
    expect(c.calibrationUncertaintyKmPerS).toBeLessThan(perLine(6330));
    expect(c.velocity.uncertainty).toBeCloseTo(Math.hypot(honest.velocity.uncertainty, c.calibrationUncertaintyKmPerS), 9);
    expect(c.chiSquare).toBeCloseTo(honest.chiSquare, 9);
  });

  it('places a Voigt Hα with broad Lorentzian wings on a steep continuum (Planck × a falling response) without bias, because it normalises first', () => {
    // The physics of an A-type star through a real spectrograph that the recovery tests lack:
    // Stark-like wings (Lorentzian FWHM 9.5 Å) and a continuum falling by 6.6·10⁻⁴ per Å at
    // Hα (9200 K Planck times a Gaussian response of σ 1800 Å centred at 5600 Å, as in the
    // invented demo).
    const halpha = loadLineList('H I').entries.find((e) => Math.abs(e.wavelengthAngstrom - 6562.8) < 0.1)!;
    const wl = Float64Array.from({ length: 2048 }, (_, i) => 6198 + 0.2155 * i);
    const v = -40;
    const model = syntheticSpectrum({
      wavelengthAngstrom: wl, medium: 'air', velocityKmPerS: v, resolvingPower: 11500, continuum: { shape: 'planck', temperatureK: 9200 },
      lines: [{ wavelengthAngstrom: halpha.wavelengthAngstrom, medium: 'air', depth: 0.56, fwhmAngstrom: 3.2, fwhmLorentzianAngstrom: 9.5, profile: 'voigt' }],
    }).model;
    const flux = model.map((m, i) => 30000 * m * Math.exp(-0.5 * ((wl[i] - 5600) / 1800) ** 2));
    const s = createSpectrum({ wavelength: wl, flux, uncertainty: flux.map(Math.sqrt), medium: 'air' });
    const r = velocityFromLines(s, { species: ['H I'], profile: 'voigt' });
    // Measured −0.003 km/s; 0.01 km/s is 2 % of this line's own error at S/N 170 (0.52 km/s).
    expect(Math.abs(r.velocity.value - v)).toBeLessThan(0.01);
    // The same fit without dividing by the continuum (an additive line on the slope) is off by
    // C′/C·σ² with the wings' large σ²: measured −0.65 km/s. This is what the normalisation prevents.
    const raw = velocityFromLines(s, { species: ['H I'], profile: 'voigt', continuum: 'none' });
    expect(raw.velocity.value - v).toBeLessThan(-0.3);
  });

  it('leaves its inputs unchanged', () => {
    const s = makeStar({ ...BASE, velocityKmPerS: 5 }).synthetic.spectrum;
    const copies = [s.wavelength.slice(), s.flux.slice(), s.uncertainty!.slice()];
    velocityFromLines(s, { species: SPECIES, resolvingPower: 20000 });
    expect([s.wavelength, s.flux, s.uncertainty]).toEqual(copies);
  });

  it('refuses what it cannot use', () => {
    const s = noiseFree(BASE);
    expect(() => velocityFromLines(s, { species: SPECIES, lines: loadLineList('H I') })).toThrow('give exactly one of lines (a line list) and species');
    expect(() => velocityFromLines(s, { species: ['Xx I'] })).toThrow(UsageError);
    expect(() => velocityFromLines(s, { species: ['Ne III'] })).toThrow(/^no line of Ne III falls inside the spectrum \(6331\.\d–6601\.\d Å, vacuum\)$/);
    const unknown = deriveSpectrum(s, { medium: null });
    expect(() => velocityFromLines(unknown, { species: SPECIES })).toThrow(InputError);
    expect(() => velocityFromLines(unknown, { species: SPECIES })).toThrow('the spectrum does not say whether its wavelengths are in air or vacuum');
    expect(() => velocityFromLines(s, { species: SPECIES, approximateVelocity: 'guess' as never })).toThrow('approximateVelocity must be a number of km/s, "cross-correlation" or "strongest-line" (got guess)');
  });
});
