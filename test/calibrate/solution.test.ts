/**
 * Dispersion solutions: JSON round trip and bad files (with the JSON path), applying to a
 * spectrum, interpolation in time between two lamps, and calibration on a star's own
 * Balmer lines. Synthetic, seeded, invented data.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { applySolution, interpolateSolutions } from '../../src/calibrate/apply.js';
import { calibrateLamp } from '../../src/calibrate/lamp.js';
import { parseSolutionJson, readSolution, solutionToJson, writeSolution } from '../../src/calibrate/solution-json.js';
import { solutionPixel, solutionWavelength, type DispersionSolution } from '../../src/calibrate/solution.js';
import { calibrateOnStarLines } from '../../src/calibrate/star-lines.js';
import { InputError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { STANDARD_CASES, cubicCurve, makeLampSpectrum } from './synthetic-lamp.js';

const c = STANDARD_CASES.neArRed;
const lampA = makeLampSpectrum({ ...c, peakCounts: 30_000, seed: 31 });
const solA = calibrateLamp(lampA.spectrum, { lamp: c.lamp, observation: { midpointUtc: '2026-05-14T03:01:20.000', mjdUtc: 61174.12593 } });
// The second lamp: the whole spectrum shifted by 0.8 pixel (flexure), an hour later.
const shifted = cubicCurve([6400 - 0.8 * 0.55, 0.55, -1.2e-5, -2.0e-9], 1024);
const lampB = makeLampSpectrum({ ...c, curve: shifted, peakCounts: 30_000, seed: 32 });
const solB = calibrateLamp(lampB.spectrum, { lamp: c.lamp, observation: { midpointUtc: '2026-05-14T04:01:20.000', mjdUtc: 61174.16759 } });

describe('solution JSON', () => {
  it('round-trips exactly (write, read, same numbers)', () => {
    expect(solA.ok, solA.message).toBe(true);
    const dir = mkdtempSync(join(tmpdir(), 'lineshift-solution-'));
    const path = join(dir, 'lamp.json');
    writeSolution(path, solA);
    const back = readSolution(path);
    expect(back).toEqual(JSON.parse(JSON.stringify(solA)));
    for (const p of [0, 777.25, 2047]) expect(solutionWavelength(back, p)).toBe(solutionWavelength(solA, p));
    const raw = JSON.parse(solutionToJson(solA));
    expect(raw.format).toBe('lineshift-dispersion-solution');
    expect(raw.formatVersion).toBe(1);
  });

  it('names the JSON path of a bad field', () => {
    const good = JSON.parse(solutionToJson(solA));
    const bad = (mutate: (o: any) => void) => {
      const o = JSON.parse(JSON.stringify(good));
      mutate(o);
      return () => parseSolutionJson(JSON.stringify(o), 'bad.json');
    };
    expect(bad((o) => { o.coefficients[2] = 'x'; })).toThrow('bad.json: $.coefficients[2] should be a finite number, got "x"');
    expect(bad((o) => { o.coefficients.pop(); })).toThrow('bad.json: $.coefficients should hold order + 1 = 4 numbers, got 3');
    expect(bad((o) => { delete o.domain.max; })).toThrow('bad.json: $.domain.max should be a finite number, got nothing (the field is missing)');
    expect(bad((o) => { o.lines[3].used = 'yes'; })).toThrow('bad.json: $.lines[3].used should be true or false, got "yes"');
    expect(bad((o) => { o.formatVersion = 2; })).toThrow('bad.json: $.formatVersion is 2, newer than this version of lineshift reads (1); update lineshift');
    expect(bad((o) => { o.format = 'something'; })).toThrow('bad.json: $.format should be "lineshift-dispersion-solution", got "something"; this is not a lineshift dispersion solution');
    expect(bad((o) => { o.method = 'magic'; })).toThrow('$.method should be one of "lamp", "grating-equation", "star-lines", "interpolated", got "magic"');
    expect(() => parseSolutionJson('{"format": ', 'cut.json')).toThrow(InputError);
    expect(() => parseSolutionJson('{"format": ', 'cut.json')).toThrow(/^cut\.json: is not valid JSON/);
  });

  it('inverse: solutionPixel(solutionWavelength(p)) = p', () => {
    for (const p of [0, 13.7, 1024, 2047]) expect(Math.abs(solutionPixel(solA, solutionWavelength(solA, p)) - p)).toBeLessThan(1e-8);
    expect(solutionPixel(solA, 9000)).toBeNaN();
  });
});

describe('applying a solution', () => {
  const star = createSpectrum({
    wavelength: Array.from({ length: 2048 }, (_, i) => i), unit: 'pixel',
    flux: Array.from({ length: 2048 }, (_, i) => 1000 + i), source: { file: 'star.fits', format: 'fits' },
  });

  it('gives Å in air with the solution summary in the provenance, leaving the input untouched', () => {
    const before = Float64Array.from(star.wavelength);
    const out = applySolution(star, solA, { solutionFile: 'lamp.json' });
    expect(out.unit).toBe('angstrom');
    expect(out.medium).toBe('air');
    expect(out.wavelength[1000]).toBe(solutionWavelength(solA, 1000));
    expect(Math.abs(out.wavelength[1000] - c.curve(1000))).toBeLessThan(0.05 * 0.55); // within 0.05 pixel of the truth
    expect(out.flux).toEqual(star.flux);
    expect(star.wavelength).toEqual(before);
    const entry = out.provenance.at(-1)!;
    expect(entry.step).toBe('apply-dispersion-solution');
    expect(entry.parameters).toMatchObject({ file: 'lamp.json', method: 'lamp', calibratedByLamp: true, order: 3, linesUsed: solA.linesUsed });
  });

  it('refuses a calibrated spectrum, another pixel count, and a failed solution', () => {
    const calibrated = applySolution(star, solA);
    expect(() => applySolution(calibrated, solA)).toThrow('star.fits: the spectrum already has a wavelength axis (angstrom); a dispersion solution applies to a spectrum on a pixel axis');
    const short = createSpectrum({ wavelength: [0, 1, 2], flux: [1, 2, 3], unit: 'pixel' });
    expect(() => applySolution(short, solA)).toThrow('the spectrum has 3 pixels but the solution is for a frame of 2048; it must come from the same detector rows and binning');
    const failed: DispersionSolution = { ...solA, ok: false, reason: 'no-pattern' };
    expect(() => applySolution(star, failed, { solutionFile: 'f.json' })).toThrow('f.json: the dispersion solution was not accepted (no-pattern); it cannot be applied');
  });

  it('a star between two lamps gets the solution interpolated to its mid-exposure time', () => {
    expect(solB.ok, solB.message).toBe(true);
    const mid = (61174.12593 + 61174.16759) / 2;
    const s = interpolateSolutions(solA, solB, mid);
    expect(s.method).toBe('interpolated');
    // The truth half-way: the curve shifted by 0.4 pixel. Within 0.05 pixel over the detector.
    const halfway = cubicCurve([6400 - 0.4 * 0.55, 0.55, -1.2e-5, -2.0e-9], 1024);
    for (const p of [100, 1024, 1900]) expect(Math.abs(solutionWavelength(s, p) - halfway(p)) / 0.55).toBeLessThan(0.05);
    // At the lamp times, each lamp's own solution; equal to interpolating the wavelength arrays.
    expect(solutionWavelength(interpolateSolutions(solA, solB, 61174.12593), 500)).toBeCloseTo(solutionWavelength(solA, 500), 9);
    const w = 0.3, t = 61174.12593 + w * (61174.16759 - 61174.12593);
    expect(solutionWavelength(interpolateSolutions(solA, solB, t), 1500)).toBeCloseTo((1 - w) * solutionWavelength(solA, 1500) + w * solutionWavelength(solB, 1500), 9);
    const log = collectingLogger();
    interpolateSolutions(solA, solB, 61174.2, log);
    expect(log.warnings.map((x) => x.code)).toEqual(['calibrate.extrapolated-time']);
    expect(() => interpolateSolutions(solA, { ...solB, observation: null }, mid)).toThrow('the second solution has no lamp exposure time');
  });
});

describe('calibration on a star\'s own Balmer lines', () => {
  it('finds Hα…H10 in an A-type-like spectrum, fits a solution, and says that velocities are not meaningful', () => {
    // Invented star: broad Balmer absorption (FWHM 15 Å) at the NIST air wavelengths (H_I.csv),
    // shifted by +30 km/s, on a sloping continuum; 1.9 Å/pixel from 3750 Å.
    const balmer = [6562.795, 4861.325, 4340.463, 4101.735, 3970.072, 3889.049, 3835.384, 3797.897];
    const z = 30 / 299_792.458;
    const curve = (p: number) => 3750 + 1.9 * p + 2e-5 * p * p;
    const rand = mulberry32(5150);
    const flux = Array.from({ length: 1600 }, (_, p) => {
      const w = curve(p);
      let f = 1000 * (1 + 0.0001 * (w - 5000));
      for (const b of balmer) f *= 1 - 0.6 * Math.exp(-4 * Math.LN2 * ((w - b * (1 + z)) / 15) ** 2);
      return f + 3 * gaussian(rand);
    });
    const star = createSpectrum({ wavelength: Array.from({ length: 1600 }, (_, i) => i), flux, unit: 'pixel' });
    const s = calibrateOnStarLines(star, { hint: { kind: 'range', minWavelengthAngstrom: 3700, maxWavelengthAngstrom: 6900 } });
    expect(s.ok, s.message).toBe(true);
    expect(s).toMatchObject({ method: 'star-lines', velocityZeroPointMeaningful: false, calibratedByLamp: false });
    expect(s.warnings).toEqual(["calibrated on the star's own lines: the star's radial velocity is absorbed into the zero point, so velocities measured with this solution are not meaningful"]);
    expect(s.linesUsed).toBeGreaterThanOrEqual(5);
    // The zero point carries the star's +30 km/s: the solution reads rest wavelengths where the shifted lines are.
    const p = solutionPixel(s, 4861.325);
    expect(Math.abs(curve(p) - 4861.325 * (1 + z))).toBeLessThan(0.3); // Å: a quarter pixel
  });
});
