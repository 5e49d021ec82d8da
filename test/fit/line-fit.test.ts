import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { fitLine, fitLineArrays } from '../../src/fit/line-fit.js';
import { GAUSSIAN_FWHM_PER_SIGMA, lineProfileValue } from '../../src/fit/profiles.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { normal } from '../helpers/random.js';

const gaussLine = (x: number, c: number, f: number, a: number) => a * Math.exp(-4 * Math.LN2 * ((x - c) / f) ** 2);

/** An invented absorption line near Hα: continuum 1 + 0.001(x − 6563), depth 0.4, FWHM 3 Å. */
function absorption(seed = 1, noise = 0.005, step = 0.5): Spectrum {
  const g = normal(seed);
  const wl = Array.from({ length: 120 }, (_, i) => 6533 + step * i);
  const flux = wl.map((w) => 1 + 0.001 * (w - 6563) + gaussLine(w, 6563.2, 3, -0.4) + noise * g());
  return createSpectrum({ wavelength: wl, flux, uncertainty: wl.map(() => noise), medium: 'air' });
}

describe('fitLine', () => {
  it('recovers a line from its approximate centre, with derived quantities and their uncertainties', () => {
    const s = absorption();
    const r = fitLine(s, { centerAngstrom: 6562 });
    expect(r.converged).toBe(true);
    expect(r.sign).toBe('absorption');
    expect(r.unit).toBe('angstrom');
    expect(r.uncertaintySource).toBe('data');
    const c = r.components[0];
    // Truth within 4σ (noise 0.005 per pixel).
    expect(Math.abs(c.center.value - 6563.2)).toBeLessThan(4 * c.center.uncertainty);
    expect(Math.abs(c.fwhm.value - 3)).toBeLessThan(4 * c.fwhm.uncertainty);
    expect(Math.abs(c.amplitude.value + 0.4)).toBeLessThan(4 * c.amplitude.uncertainty);
    const trueEw = 0.4 * (3 / GAUSSIAN_FWHM_PER_SIGMA) * Math.sqrt(2 * Math.PI) / (1 + 0.001 * 0.2);
    expect(Math.abs(c.equivalentWidth.value - trueEw)).toBeLessThan(4 * c.equivalentWidth.uncertainty);
    expect(c.equivalentWidth.value).toBeGreaterThan(0);
    expect(c.integratedFlux.value).toBeLessThan(0);
    expect(c.depth.value).toBeCloseTo(0.4, 1);
    expect(r.parameters.map((p) => p.name)).toEqual(['continuumConstant', 'continuumSlope', 'center1', 'fwhm1', 'amplitude1']);
    expect(r.correlation).toHaveLength(5);
    expect(r.degreesOfFreedom).toBe(r.window.pixelsUsed - 5);
    // Default window: ±3 FWHM, here ±9 Å.
    expect(r.window.end - r.window.start).toBeGreaterThan(16);
    expect(r.window.end - r.window.start).toBeLessThan(22);
    expect(r.signalToNoise).toBeGreaterThan(100);
    expect(r.curve.x).toHaveLength(r.window.pixelsUsed);
  });

  it('gives the same answer for the axis in nm, and for a decreasing axis', () => {
    const s = absorption();
    const a = fitLine(s, { centerAngstrom: 6562, windowAngstrom: 20 });
    const nm = createSpectrum({ wavelength: Array.from(s.wavelength, (w) => w / 10), flux: s.flux, uncertainty: s.uncertainty, unit: 'nm' });
    const b = fitLine(nm, { centerAngstrom: 6562, windowAngstrom: 20 });
    const rev = createSpectrum({ wavelength: Array.from(s.wavelength).reverse(), flux: Array.from(s.flux).reverse(), uncertainty: Array.from(s.uncertainty!).reverse() });
    const c = fitLine(rev, { centerAngstrom: 6562, windowAngstrom: 20 });
    for (const r of [b, c]) {
      expect(r.components[0].center.value).toBeCloseTo(a.components[0].center.value, 8);
      expect(r.components[0].fwhm.uncertainty).toBeCloseTo(a.components[0].fwhm.uncertainty, 8);
    }
  });

  it('skips unusable pixels (NaN flux, masked, bad uncertainty) exactly as if they were absent', () => {
    const s = absorption();
    const flux = Float64Array.from(s.flux);
    const unc = Float64Array.from(s.uncertainty!);
    const mask = new Uint8Array(flux.length);
    flux[60] = NaN; mask[62] = 1; unc[58] = 0;
    const holed = createSpectrum({ wavelength: s.wavelength, flux, uncertainty: unc, mask });
    const keep = Array.from(s.wavelength.keys()).filter((i) => ![58, 60, 62].includes(i));
    const cut = createSpectrum({ wavelength: keep.map((i) => s.wavelength[i]), flux: keep.map((i) => s.flux[i]), uncertainty: keep.map((i) => s.uncertainty![i]) });
    const a = fitLine(holed, { centerAngstrom: 6562, windowAngstrom: 20 });
    const b = fitLine(cut, { centerAngstrom: 6562, windowAngstrom: 20 });
    expect(a.window.pixelsUsed).toBe(b.window.pixelsUsed);
    expect(a.components[0].center.value).toBe(b.components[0].center.value);
    expect(a.chiSquare).toBe(b.chiSquare);
  });

  it('scales the uncertainties by the reduced χ² when the spectrum has none', () => {
    const s = absorption();
    const bare = createSpectrum({ wavelength: s.wavelength, flux: s.flux });
    const r = fitLine(bare, { centerAngstrom: 6562 });
    expect(r.uncertaintySource).toBe('scaled-by-reduced-chi-square');
    const withSigma = fitLine(s, { centerAngstrom: 6562 });
    // Same data, σ = 0.005 known: the scaled uncertainties differ by √(reduced χ² with σ known).
    expect(r.components[0].center.uncertainty / withSigma.components[0].center.uncertainty).toBeCloseTo(Math.sqrt(withSigma.reducedChiSquare), 6);
  });

  it('fits emission lines, with a negative equivalent width, and NaN EW on a zero continuum', () => {
    const wl = Array.from({ length: 60 }, (_, i) => 5850 + 0.5 * i);
    const g = normal(3);
    const flux = wl.map((w) => 2 + gaussLine(w, 5865.3, 2, 30) + 0.2 * g());
    const r = fitLine(createSpectrum({ wavelength: wl, flux }), { centerAngstrom: 5865 });
    expect(r.sign).toBe('emission');
    expect(r.components[0].amplitude.value).toBeCloseTo(30, 0);
    expect(r.components[0].equivalentWidth.value).toBeLessThan(0);
    // A lamp line on no continuum: the equivalent width is undefined.
    const lamp = wl.map((w) => gaussLine(w, 5865.3, 2, 30) + 0.2 * g());
    const q = fitLine(createSpectrum({ wavelength: wl, flux: lamp }), { centerAngstrom: 5865, continuumOrder: 0 });
    expect(q.converged).toBe(true);
    if (q.components[0].continuumAtCenter.value <= 0) expect(q.components[0].equivalentWidth.value).toBeNaN();
    expect(q.components[0].integratedFlux.value).toBeCloseTo(30 * 2 * Math.sqrt(Math.PI / (4 * Math.LN2)), 0);
  });

  it('separates a two-component blend from one approximate centre', () => {
    const g = normal(4);
    const wl = Array.from({ length: 100 }, (_, i) => 5000 + 0.4 * i);
    const flux = wl.map((w) => 1 + gaussLine(w, 5018, 2.0, -0.35) + gaussLine(w, 5021.5, 2.4, -0.25) + 0.004 * g());
    const r = fitLine(createSpectrum({ wavelength: wl, flux, uncertainty: wl.map(() => 0.004) }), { centerAngstrom: 5019.5, components: 2 });
    expect(r.converged).toBe(true);
    const [a, b] = [...r.components].sort((p, q) => p.center.value - q.center.value);
    expect(Math.abs(a.center.value - 5018)).toBeLessThan(4 * a.center.uncertainty);
    expect(Math.abs(b.center.value - 5021.5)).toBeLessThan(4 * b.center.uncertainty);
    expect(Math.abs(a.amplitude.value + 0.35)).toBeLessThan(4 * a.amplitude.uncertainty);
    expect(r.reducedChiSquare).toBeLessThan(1.5);
  });

  it('recovers Voigt and Lorentzian parameters from noiseless data', () => {
    const wl = Array.from({ length: 120 }, (_, i) => 5880 + 0.25 * i);
    const flux = wl.map((w) => 1 - 0.5 * lineProfileValue(w - 5895.9, { profile: 'voigt', fwhmGaussian: 1.2, fwhmLorentzian: 0.8 }));
    const r = fitLine(createSpectrum({ wavelength: wl, flux }), { centerAngstrom: 5895.5, profile: 'voigt', windowAngstrom: 24 });
    expect(r.converged).toBe(true);
    const c = r.components[0];
    expect(c.fwhmGaussian!.value).toBeCloseTo(1.2, 6);
    expect(c.fwhmLorentzian!.value).toBeCloseTo(0.8, 6);
    expect(c.center.value).toBeCloseTo(5895.9, 8);
    const lf = wl.map((w) => 1 - 0.5 * lineProfileValue(w - 5895.9, { profile: 'lorentzian', fwhm: 1.5 }));
    const q = fitLine(createSpectrum({ wavelength: wl, flux: lf }), { centerAngstrom: 5896, profile: 'lorentzian' });
    expect(q.components[0].fwhm.value).toBeCloseTo(1.5, 6);
  });

  it('holds fixed parameters, applies ties and reports bounds', () => {
    const g = normal(5);
    const wl = Array.from({ length: 100 }, (_, i) => 6700 + 0.5 * i);
    // An invented doublet 5.0 Å apart with equal widths.
    const flux = wl.map((w) => 1 + gaussLine(w, 6720, 2.2, -0.3) + gaussLine(w, 6725, 2.2, -0.2) + 0.003 * g());
    const s = createSpectrum({ wavelength: wl, flux, uncertainty: wl.map(() => 0.003) });
    const r = fitLine(s, {
      centerAngstrom: [6720, 6725],
      ties: { fwhm2: { parameter: 'fwhm1' }, center2: { parameter: 'center1', offset: 5.0 } },
      fixed: { continuumSlope: 0 },
    });
    expect(r.converged).toBe(true);
    const byName = new Map(r.parameters.map((p) => [p.name, p]));
    expect(byName.get('fwhm2')!.value).toBe(byName.get('fwhm1')!.value);
    expect(byName.get('fwhm2')!.tiedTo).toBe('fwhm1');
    expect(byName.get('fwhm2')!.uncertainty).toBeCloseTo(byName.get('fwhm1')!.uncertainty, 15);
    expect(byName.get('center2')!.value).toBeCloseTo(byName.get('center1')!.value + 5, 12);
    expect(r.correlation[2][5]).toBeCloseTo(1, 12); // center1 and center2 move together
    expect(byName.get('continuumSlope')).toMatchObject({ value: 0, uncertainty: 0, fixed: true });
    expect(r.degreesOfFreedom).toBe(r.window.pixelsUsed - 5); // 8 parameters, 1 fixed, 2 tied
    // A single line of FWHM 2.2 Å fitted with the FWHM bounded to ≤ 2.0 Å ends on the bound.
    const single = createSpectrum({ wavelength: wl, flux: wl.map((w) => 1 + gaussLine(w, 6720, 2.2, -0.3) + 0.003 * g()), uncertainty: wl.map(() => 0.003) });
    const b = fitLine(single, { centerAngstrom: 6720, bounds: { fwhm1: [0.5, 2.0] } });
    expect(b.parameters.find((p) => p.name === 'fwhm1')).toMatchObject({ value: 2.0, atBound: true });
  });

  it('returns converged: false instead of throwing when there are too few pixels', () => {
    const s = absorption();
    const r = fitLine(s, { centerAngstrom: 6563, windowAngstrom: 1.2 });
    expect(r).toMatchObject({ converged: false, reason: 'too-few-points' });
    expect(r.message).toMatch(/^cannot fit: fewer data points than free parameters/);
  });

  it('appends provenance and does not modify the spectrum', () => {
    const s0 = absorption();
    const s = createSpectrum({ wavelength: s0.wavelength, flux: s0.flux, uncertainty: s0.uncertainty, provenance: [provenanceEntry('read-text', { file: 'lvac7.txt' })] });
    const before = [Array.from(s.wavelength), Array.from(s.flux), Array.from(s.uncertainty!)];
    const r = fitLine(s, { centerAngstrom: 6562, profile: 'gaussian' });
    expect([Array.from(s.wavelength), Array.from(s.flux), Array.from(s.uncertainty!)]).toEqual(before);
    expect(r.provenance.map((p) => p.step)).toEqual(['read-text', 'fit-line']);
    expect(r.provenance[1].parameters).toMatchObject({ centerAngstrom: 6562, profile: 'gaussian', components: 1, continuumOrder: 1, sign: 'absorption' });
    expect(s.provenance).toHaveLength(1);
  });

  it('rejects bad calls with UsageErrors that say what is wrong', () => {
    const s = absorption();
    const pix = createSpectrum({ wavelength: [1, 2, 3, 4, 5], flux: [1, 1, 0, 1, 1], unit: 'pixel' });
    expect(() => fitLine(pix, { centerAngstrom: 3 })).toThrow(/the spectrum has no wavelength scale \(its axis is in pixels\)/);
    expect(() => fitLine(s, { centerAngstrom: 7000 })).toThrow(new UsageError('fit.center-outside', 'line centre 7000 Å is outside the spectrum (6533 to 6592.5 Å)'));
    expect(() => fitLine(s, { centerAngstrom: 6563, fixed: { width1: 2 } })).toThrow(/unknown parameter "width1" in fixed \(parameters: continuumConstant, continuumSlope, center1, fwhm1, amplitude1\)/);
    expect(() => fitLine(s, { centerAngstrom: [6560, 6563], components: 3 })).toThrow(/2 centres given for 3 components/);
    expect(() => fitLine(s, { centerAngstrom: 6563, components: 0 })).toThrow(/components must be a whole number from 1 to 20/);
    expect(() => fitLine(s, { centerAngstrom: 6563, components: 3, ties: { fwhm2: { parameter: 'fwhm1' }, fwhm3: { parameter: 'fwhm2' } } })).toThrow(/tied to fwhm2, which is itself tied/);
    expect(() => fitLine(s, { centerAngstrom: 6563, profile: 'box' as never })).toThrow(/profile must be one of gaussian, lorentzian, voigt/);
    expect(() => fitLineArrays({ x: [1, 2, 2], flux: [1, 2, 3] }, { center: 2 })).toThrow(/x is not strictly monotonic at index 2/);
  });
});

describe('fitWindow', () => {
  it('fits every window found in a lamp spectrum, in pixels, with pulls consistent with the uncertainties', async () => {
    const { findLines } = await import('../../src/lines/find.js');
    const { fitWindow } = await import('../../src/fit/line-fit.js');
    const { lampSpectrum } = await import('../helpers/synthetic.js');
    const lamp = lampSpectrum(8, { withUncertainty: true, pixels: 1200, count: 30 });
    // The same lamp on a pixel axis (0-based index), as before calibration.
    const px = createSpectrum({ wavelength: lamp.spectrum.wavelength.map((_, i) => i), flux: lamp.spectrum.flux, uncertainty: lamp.spectrum.uncertainty, unit: 'pixel' });
    const found = findLines(px);
    const pulls: number[] = [];
    for (const w of found.windows) {
      const r = fitWindow(px, w);
      expect(r.converged, r.message).toBe(true);
      expect(r.unit).toBe('pixel');
      for (const c of r.components) {
        const truth = lamp.lines.reduce((a, b) => (Math.abs((b.center - 4000) / 1.5 - c.center.value) < Math.abs((a.center - 4000) / 1.5 - c.center.value) ? b : a));
        pulls.push((c.center.value - (truth.center - 4000) / 1.5) / c.center.uncertainty);
      }
    }
    expect(pulls.length).toBeGreaterThan(20);
    // Centre pulls of independent lines: |pull| < 4 for all (a 4σ outlier among ~30 has probability ~0.2 %).
    expect(Math.max(...pulls.map(Math.abs))).toBeLessThan(4);
  });
});

describe('robustness', () => {
  it('never throws anything but a UsageError, whatever the flux (property test)', async () => {
    const fc = (await import('fast-check')).default;
    const value = fc.oneof(
      fc.double({ min: -1e6, max: 1e6, noNaN: true }),
      fc.constantFrom(NaN, Infinity, -Infinity, 0, 1e300, -1e300, 5e-324),
    );
    fc.assert(fc.property(
      fc.array(value, { minLength: 3, maxLength: 40 }), fc.constantFrom('gaussian', 'lorentzian', 'voigt'), fc.integer({ min: 1, max: 3 }),
      (flux, profile, components) => {
        const x = flux.map((_, i) => 5000 + i);
        try {
          const r = fitLineArrays({ x, flux }, { center: 5000 + flux.length / 2, profile: profile as 'gaussian', components });
          expect(typeof r.converged).toBe('boolean');
          if (!r.converged) expect(r.message.length).toBeGreaterThan(0);
        } catch (e) {
          expect(e).toBeInstanceOf(UsageError);
        }
      },
    ), { numRuns: 300, seed: 42 });
  });
});
