import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { fitLineArrays } from '../../src/fit/line-fit.js';
import { lineProfileValue } from '../../src/fit/profiles.js';
import { loadLineList } from '../../src/lines/linelist.js';
import {
  drawSyntheticNoise, lineListTemplate, selectStrongestLines, syntheticSpectrum, type SyntheticLine,
} from '../../src/lines/synthetic.js';
import { airToVacuum, vacuumToAir } from '../../src/spectrum/air-vacuum.js';
import { repoPath } from '../helpers/paths.js';
import { meanStd } from '../helpers/random.js';

/** test/fixtures/velocity-references.json, written by test/reference/make_velocity_refs.py (astropy 5.2.1, scipy 1.10.1). */
const refs = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'velocity-references.json'), 'utf8')) as {
  planck: { wavelengths_vacuum_angstrom: number[]; curves: { temperature_k: number; b_lambda_erg_per_s_cm2_angstrom_sr: number[] }[] };
  wien_b_m_k: { value: number };
};

const C = 299792.458; // km/s, exact (SI)
const grid = (start: number, step: number, n: number) => Array.from({ length: n }, (_, i) => start + i * step);
/** Hα in standard air, NIST ASD (data/linelists/H_I.csv). */
const H_ALPHA_AIR = 6562.795;

function ewAndCentroid(wl: ArrayLike<number>, model: ArrayLike<number>, cont: ArrayLike<number>) {
  let ew = 0, c1 = 0;
  for (let i = 0; i < wl.length; i++) {
    const d = 1 - model[i] / cont[i];
    const step = i + 1 < wl.length ? wl[i + 1] - wl[i] : wl[i] - wl[i - 1];
    ew += d * step;
    c1 += d * step * wl[i];
  }
  return { ew, centroid: c1 / ew };
}

describe('syntheticSpectrum: lines', () => {
  it('keeps an isolated line\'s equivalent width through blurring and puts it at the relativistic Doppler position', () => {
    const wl = grid(6500, 0.1, 1500);
    for (const v of [-250, 0, 31.7, 180]) {
      const s = syntheticSpectrum({
        wavelengthAngstrom: wl, medium: 'air', velocityKmPerS: v, resolvingPower: 8000,
        lines: [{ wavelengthAngstrom: H_ALPHA_AIR, medium: 'air', equivalentWidthAngstrom: 1.2, fwhmAngstrom: 2 }],
      });
      const { ew, centroid } = ewAndCentroid(wl, s.model, s.continuum);
      // Special-relativistic Doppler factor √((1+β)/(1−β)) (from memory), applied to the vacuum
      // wavelength, back to air with Peck & Reeder 1972.
      const beta = v / C;
      const expected = vacuumToAir(airToVacuum(H_ALPHA_AIR) * Math.sqrt((1 + beta) / (1 - beta)));
      // The EW scales with 1 + z; 10⁻⁶: the window (±75 Å) holds all but 10⁻²⁰ of a 2 Å Gaussian.
      expect(Math.abs(ew / (1.2 * Math.sqrt((1 + beta) / (1 - beta))) - 1)).toBeLessThan(1e-6);
      // 5·10⁻⁵ Å (2 m/s): the instrumental Gaussian is symmetric in ln λ (constant in velocity),
      // which moves a centroid in λ by about λ·σ²_lnλ/2 = 3·10⁻⁵ Å at R = 8000.
      expect(Math.abs(centroid - expected)).toBeLessThan(5e-5);
    }
  });

  it('blurs a Gaussian line to the quadrature sum of its width, λ/R and the pixel', () => {
    const wl = grid(5000, 0.05, 800);
    const R = 12000;
    const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'vacuum', resolvingPower: R, lines: [{ wavelengthAngstrom: 5020, medium: 'vacuum', depth: 0.8, fwhmAngstrom: 0.3 }] });
    const fit = fitLineArrays({ x: wl, flux: s.model }, { center: 5020, window: 4 });
    // Gaussian ⊗ Gaussian is Gaussian with FWHMs added in quadrature (from memory); the pixel
    // (a box of width Δ, variance Δ²/12) adds 8 ln2·Δ²/12 to the FWHM² to first order.
    const expected = Math.sqrt(0.3 ** 2 + (5020 / R) ** 2 + (8 * Math.LN2 * 0.05 ** 2) / 12);
    expect(Math.abs(fit.components[0].fwhm.value / expected - 1)).toBeLessThan(2e-3);
    // 10⁻⁵ Å: the instrumental Gaussian is symmetric in ln λ (see above).
    expect(Math.abs(fit.components[0].center.value - 5020)).toBeLessThan(1e-5);
  });

  it('draws Lorentzian and Voigt lines with the line fitter\'s profiles', () => {
    const wl = grid(4990, 0.01, 2001);
    for (const line of [
      { profile: 'lorentzian' as const, fwhmAngstrom: 0.8 },
      { profile: 'voigt' as const, fwhmAngstrom: 0.6, fwhmLorentzianAngstrom: 0.4 },
    ]) {
      const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'vacuum', lines: [{ wavelengthAngstrom: 5000, medium: 'vacuum', depth: 0.5, ...line }] });
      let worst = 0;
      for (let i = 0; i < wl.length; i += 7) {
        const widths = line.profile === 'voigt'
          ? { profile: 'voigt' as const, fwhmGaussian: line.fwhmAngstrom, fwhmLorentzian: line.fwhmLorentzianAngstrom! }
          : { profile: 'lorentzian' as const, fwhm: line.fwhmAngstrom };
        worst = Math.max(worst, Math.abs(s.model[i] - (1 - 0.5 * lineProfileValue(wl[i] - 5000, widths))));
      }
      // 4·10⁻⁵: averaging over a pixel of Δ = 0.01 Å changes the profile by f″Δ²/24, 2.6·10⁻⁵
      // at the core of the 0.8 Å Lorentzian (f″ = 8·depth/F²).
      expect(worst, line.profile).toBeLessThan(4e-5);
    }
  });

  it('keeps overlapping absorption lines above zero and adds emission lines', () => {
    const wl = grid(6000, 0.1, 200);
    const lines: SyntheticLine[] = [
      { wavelengthAngstrom: 6008, medium: 'air', depth: 1, fwhmAngstrom: 1 },
      { wavelengthAngstrom: 6008.2, medium: 'air', depth: 1, fwhmAngstrom: 1 },
      { wavelengthAngstrom: 6015, medium: 'air', depth: 0.7, fwhmAngstrom: 0.5, kind: 'emission' },
    ];
    const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines });
    expect(Math.min(...s.model)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...s.model)).toBeGreaterThan(1.5);
  });
});

describe('syntheticSpectrum: continuum', () => {
  it('follows the Planck law per unit vacuum wavelength (astropy 5.2.1 BlackBody) and peaks at Wien\'s b/T', () => {
    const ref = refs.planck;
    for (const medium of ['vacuum', 'air'] as const) {
      for (const curve of ref.curves) {
        const T = curve.temperature_k;
        // Pixel centres at the reference wavelengths (in the grid's medium), 0.5 Å apart around each.
        const centres = ref.wavelengths_vacuum_angstrom.map((w) => (medium === 'vacuum' ? w : vacuumToAir(w)));
        const wl = centres.flatMap((c) => [c - 0.5, c, c + 0.5]);
        const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium, lines: [], continuum: { shape: 'planck', temperatureK: T, level: 2 } });
        const ours = centres.map((_, k) => s.continuum[3 * k + 1]);
        const theirs = curve.b_lambda_erg_per_s_cm2_angstrom_sr;
        for (let k = 0; k < ours.length; k++) {
          // Ratios to the 5000 Å value; 1e-7: a 1 Å bin average of a smooth curve, and the air-to-vacuum round trip.
          expect(Math.abs(ours[k] / ours[2] / (theirs[k] / theirs[2]) - 1), `${medium} ${T} K ${ref.wavelengths_vacuum_angstrom[k]} Å`).toBeLessThan(1e-7);
        }
        expect(Math.max(...s.continuum)).toBeCloseTo(2, 12);
      }
    }
    const T = 5800;
    const wl = grid(4000, 1, 2001);
    const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'vacuum', lines: [], continuum: { shape: 'planck', temperatureK: T } });
    const peak = wl[s.continuum.indexOf(Math.max(...s.continuum))];
    // Wien's displacement law λ_max = b/T, b from CODATA 2018 (astropy.constants.b_wien); ±1 pixel.
    expect(Math.abs(peak - (refs.wien_b_m_k.value / T) * 1e10)).toBeLessThanOrEqual(1);
  });

  it('evaluates flat and polynomial continua', () => {
    const wl = grid(5000, 1, 11);
    expect(Array.from(syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines: [], continuum: { shape: 'flat', level: 3 } }).model)).toEqual(new Array(11).fill(3));
    const p = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines: [], continuum: { shape: 'polynomial', coefficients: [2, 0.1], referenceAngstrom: 5000 } });
    // The mean of a straight line over a bin is its value at the centre.
    p.model.forEach((m, i) => expect(m).toBeCloseTo(2 + 0.1 * i, 10));
  });
});

describe('syntheticSpectrum: noise', () => {
  const wl = grid(5000, 0.2, 5000);
  const base = { wavelengthAngstrom: wl, medium: 'air' as const, lines: [{ wavelengthAngstrom: 5300, medium: 'air' as const, depth: 0.6, fwhmAngstrom: 5 }], resolvingPower: 4000 };

  it('gives photon plus read noise of the right size, the same for the same seed', () => {
    const s = syntheticSpectrum({ ...base, noise: { peakCounts: 900, readNoiseElectrons: 8, seed: 42 } });
    const again = syntheticSpectrum({ ...base, noise: { peakCounts: 900, readNoiseElectrons: 8, seed: 42 } });
    expect(again.spectrum.flux).toEqual(s.spectrum.flux);
    const g = s.electronsPerFluxUnit!;
    expect(g).toBeCloseTo(900, 9);
    s.model.forEach((m, i) => expect(s.sigma![i]).toBeCloseTo(Math.sqrt(m * g + 64) / g, 12));
    expect(s.peakSignalToNoise).toBeCloseTo(900 / Math.sqrt(900 + 64), 12);
    const pulls = Array.from(s.spectrum.flux, (f, i) => (f - s.model[i]) / s.sigma![i]);
    const { mean, std } = meanStd(pulls);
    // 5000 pixels: standard errors 0.014 (mean) and 0.010 (std); bands of 4 of them.
    expect(Math.abs(mean)).toBeLessThan(0.06);
    expect(Math.abs(std - 1)).toBeLessThan(0.04);
    expect(Array.from(s.spectrum.uncertainty!)).toEqual(Array.from(s.sigma!));
  });

  it('draws new noise on the same model', () => {
    const s = syntheticSpectrum({ ...base, noise: { peakCounts: 900, seed: 1 } });
    const t = drawSyntheticNoise(s, 2);
    expect(t.flux).not.toEqual(s.spectrum.flux);
    const d = Array.from(t.flux, (f, i) => (f - s.spectrum.flux[i]) / s.sigma![i]);
    expect(Math.abs(meanStd(d).std - Math.SQRT2)).toBeLessThan(0.06);
    expect(t.provenance.at(-1)?.step).toBe('redraw-noise');
    expect(() => drawSyntheticNoise(syntheticSpectrum(base), 1)).toThrow('this synthetic spectrum was made without noise');
  });
});

describe('syntheticSpectrum: inputs', () => {
  it('leaves its inputs unchanged', () => {
    const wl = Object.freeze(grid(6000, 0.5, 50));
    const lines = Object.freeze([Object.freeze({ wavelengthAngstrom: 6010, medium: 'air' as const, depth: 0.5, fwhmAngstrom: 1 })]);
    const s = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines, noise: { peakCounts: 100, seed: 3 } });
    expect(s.spectrum.medium).toBe('air');
    expect(s.spectrum.provenance[0].step).toBe('synthetic-spectrum');
  });

  it.each([
    [{ wavelengthAngstrom: [5000] }, 'the wavelength grid needs at least 2 pixels (got 1)'],
    [{ wavelengthAngstrom: [5000, 4999] }, 'the wavelength grid must hold positive, finite, strictly increasing values in Å (pixel 1: 4999)'],
    [{ lines: [{ wavelengthAngstrom: 5000, medium: 'air', depth: 1.5, fwhmAngstrom: 1 }] }, "line 0 (5000 Å): an absorption line's depth must lie in (0, 1] (got 1.500)"],
    [{ lines: [{ wavelengthAngstrom: 5000, medium: 'air', fwhmAngstrom: 1 }] }, 'line 0 (5000 Å): give exactly one of depth and equivalentWidthAngstrom'],
    [{ lines: [{ wavelengthAngstrom: 5000, medium: 'air', equivalentWidthAngstrom: 5, fwhmAngstrom: 1 }] }, "line 0 (5000 Å): an absorption line's depth must lie in (0, 1] (got 4.697 from its equivalent width)"],
    [{ lines: [{ wavelengthAngstrom: 5000, medium: 'air', depth: 0.5, fwhmAngstrom: 0 }] }, "line 0 (5000 Å): the FWHM must be a positive number of Å (a Voigt's Lorentzian FWHM may be 0)"],
    [{ velocityKmPerS: 3e5 }, 'the velocity must be a finite number of km/s below the speed of light in size (got 300000)'],
    [{ resolvingPower: -5 }, 'the resolving power must be a positive number (got -5)'],
    [{ continuum: { shape: 'planck', temperatureK: 0 } }, 'the Planck continuum needs a positive temperature in K (got 0)'],
    [{ noise: { peakCounts: 0, seed: 1 } }, 'peakCounts must be a positive number of electrons (got 0)'],
    [{ continuum: { shape: 'polynomial', coefficients: [-1] }, noise: { peakCounts: 10, seed: 1 } }, 'photon noise needs a continuum that is positive somewhere'],
    [{ lines: [{ wavelengthAngstrom: 5000, medium: 'air', depth: 0.5, fwhmAngstrom: 1e-6 }] }, 'the model would need'],
  ])('refuses %j', (change, message) => {
    const options = { wavelengthAngstrom: grid(4990, 0.1, 200), medium: 'air' as const, lines: [], ...change } as Parameters<typeof syntheticSpectrum>[0];
    expect(() => syntheticSpectrum(options)).toThrow(UsageError);
    expect(() => syntheticSpectrum(options)).toThrow(message);
  });
});

describe('lineListTemplate and selectStrongestLines', () => {
  it('keeps the strongest lines of each species by the list\'s intensity', () => {
    const fe = loadLineList('Fe I');
    const top = selectStrongestLines(fe, { minWavelengthAngstrom: 4000, maxWavelengthAngstrom: 5000, maxLinesPerSpecies: 5 });
    expect(top.entries).toHaveLength(5);
    const inRange = fe.entries.filter((e) => e.wavelengthAngstrom >= 4000 && e.wavelengthAngstrom <= 5000);
    const fifth = [...inRange].sort((a, b) => (b.relativeIntensity ?? 0) - (a.relativeIntensity ?? 0))[4].relativeIntensity!;
    expect(top.entries.every((e) => e.relativeIntensity! >= fifth)).toBe(true);
    expect([...top.entries].map((e) => e.wavelengthAngstrom)).toEqual([...top.entries].map((e) => e.wavelengthAngstrom).sort((a, b) => a - b));
    // H I has no intensities: all its lines in range are kept.
    expect(selectStrongestLines(loadLineList('H I'), { minWavelengthAngstrom: 4000, maxWavelengthAngstrom: 7000 }).entries).toHaveLength(4);
    expect(() => selectStrongestLines(fe, { maxLinesPerSpecies: 0 })).toThrow('maxLinesPerSpecies must be a whole number ≥ 1 (got 0)');
  });

  it('makes a normalised template with a line at each Balmer wavelength', () => {
    const t = lineListTemplate({ species: ['H I'], startAngstrom: 4000, endAngstrom: 7000, medium: 'air', resolvingPower: 5000 });
    // 3 pixels per λ/R: ln(7000/4000)·15000 + 1 pixels.
    expect(t.flux.length).toBe(Math.floor(Math.log(7000 / 4000) * 15000 * (1 + 1e-9)) + 1);
    expect(t.medium).toBe('air');
    expect(Math.max(...t.flux)).toBeCloseTo(1, 6);
    // Balmer air wavelengths, NIST ASD (data/linelists/H_I.csv).
    for (const line of [4101.735, 4340.463, 4861.325, 6562.795]) {
      let best = 0;
      for (let i = 1; i < t.flux.length; i++) if (Math.abs(t.wavelength[i] - line) < Math.abs(t.wavelength[best] - line)) best = i;
      expect(t.flux[best], String(line)).toBeLessThan(0.6);
    }
    expect(t.provenance.map((p) => p.step)).toEqual(['synthetic-spectrum', 'line-list-template']);
    expect(() => lineListTemplate({ species: ['H I'], startAngstrom: 7100, endAngstrom: 8000, medium: 'air', resolvingPower: 5000 })).toThrow('no line of H I falls between 7100.0 and 8000.0 Å');
    expect(() => lineListTemplate({ species: ['Xx I'], startAngstrom: 4000, endAngstrom: 5000, medium: 'air', resolvingPower: 5000 })).toThrow(/no line list for "Xx I"/);
  });
});
