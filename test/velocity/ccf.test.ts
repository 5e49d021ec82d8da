import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { lineListTemplate } from '../../src/lines/synthetic.js';
import { convertSpectrumUnit } from '../../src/spectrum/convert.js';
import { createSpectrum, deriveSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { crossCorrelationVelocity } from '../../src/velocity/ccf.js';
import { redshiftFromVelocity } from '../../src/velocity/doppler.js';
import { makeStar, type StarOptions } from '../helpers/star.js';

const C = 299792.458; // km/s, exact (SI)
/** R = 5000, 4800–5900 Å, Hβ and metal lines; S/N 50 at the continuum peak. */
const BASE: StarOptions = { lo: 4800, hi: 5900, n: 2000, resolvingPower: 5000, velocityKmPerS: 0, peakCounts: 2500, species: ['H I', 'Fe I', 'Mg I'], perSpecies: 8 };

function noiseFree(o: StarOptions): Spectrum {
  const s = makeStar(o).synthetic;
  return createSpectrum({ wavelength: s.spectrum.wavelength, flux: s.model, uncertainty: s.sigma!, medium: s.spectrum.medium });
}

describe('crossCorrelationVelocity', () => {
  const template = noiseFree(BASE);

  it('recovers the velocity of a noise-free star against its own rest-frame spectrum', () => {
    for (const v of [-180.4, -12.2, 0.7, 37.9, 251.3]) {
      const r = crossCorrelationVelocity(noiseFree({ ...BASE, velocityKmPerS: v }), template);
      expect(r.converged).toBe(true);
      expect(r.reason).toBe('ok');
      // 20 m/s: 0.02 of the uncertainty at S/N 50 (0.92 km/s); measured ≤ 10 m/s (the continuum
      // fits differ as the lines move against the spline's knots).
      expect(Math.abs(r.velocity.value - v), `v = ${v}`).toBeLessThan(0.02);
      expect(r.velocity.uncertainty).toBeCloseTo(r.uncertainties.propagated, 12);
    }
  });

  it('handles a template in the other medium, another unit, a different range and a line-list template', () => {
    const v = 63.2;
    const star = noiseFree({ ...BASE, velocityKmPerS: v });
    // Template in vacuum wavelengths and nm, covering a wider range.
    const vacuumTemplate = convertSpectrumUnit(noiseFree({ ...BASE, lo: 4700, hi: 6100, n: 2600, medium: 'vacuum' }), 'nm');
    const a = crossCorrelationVelocity(star, vacuumTemplate);
    expect(Math.abs(a.velocity.value - v)).toBeLessThan(0.02);
    // Only part of the spectrum covered by the template: the overlap is used.
    const part = crossCorrelationVelocity(star, noiseFree({ ...BASE, lo: 5100, hi: 5600, n: 900 }));
    expect(part.grid.startAngstrom).toBeGreaterThan(5100);
    expect(part.grid.endAngstrom).toBeLessThan(5602);
    expect(Math.abs(part.velocity.value - v)).toBeLessThan(0.05);
    // A template of equal-depth Gaussians from the shipped lists: another line shape, same positions.
    const mask = lineListTemplate({ species: ['H I', 'Fe I', 'Mg I'], maxLinesPerSpecies: 8, startAngstrom: 4700, endAngstrom: 6000, medium: 'air', resolvingPower: 5000 });
    const b = crossCorrelationVelocity(star, mask);
    expect(Math.abs(b.velocity.value - v)).toBeLessThan(0.2);
  });

  it('combines the template\'s own velocity relativistically and offers the classical formula', () => {
    const tv = -21.5;
    const star = noiseFree({ ...BASE, velocityKmPerS: 40 });
    const shifted = noiseFree({ ...BASE, velocityKmPerS: tv });
    const r = crossCorrelationVelocity(star, shifted, { templateVelocityKmPerS: tv });
    expect(Math.abs(r.velocity.value - 40)).toBeLessThan(0.02);
    const classical = crossCorrelationVelocity(star, template, { formula: 'classical' });
    // Classical "velocity" c·z of the same z (relativistic Doppler factor, from memory).
    expect(Math.abs(classical.velocity.value - C * redshiftFromVelocity(40))).toBeLessThan(0.02);
    expect(classical.formula).toBe('classical');
  });

  it('returns the CCF and the peak for plotting', () => {
    const r = crossCorrelationVelocity(noiseFree({ ...BASE, velocityKmPerS: 25 }), template, { velocityRangeKmPerS: { min: -200, max: 300 } });
    const { velocityKmPerS: vs, correlation: cs } = r.ccf;
    expect(vs.length).toBe(cs.length);
    expect(vs[0]).toBeGreaterThanOrEqual(-200);
    expect(vs[vs.length - 1]).toBeLessThanOrEqual(300);
    for (let i = 1; i < vs.length; i++) expect(vs[i]).toBeGreaterThan(vs[i - 1]);
    const top = cs.indexOf(Math.max(...cs));
    expect(Math.abs(vs[top] - 25)).toBeLessThan(r.grid.velocityStepKmPerS);
    expect(r.peak.height).toBeGreaterThan(0.99);
    expect(r.peak.height).toBeLessThanOrEqual(1 + 1e-9);
    expect(r.peak.model!.centerKmPerS).toBeCloseTo(25, 0);
    expect(r.peak.fwhmKmPerS).toBeGreaterThan(0);
    expect(r.grid.medium).toBe('vacuum');
    expect(r.grid.velocityStepKmPerS).toBeCloseTo(((C * 0.55) / 5350) / 4, 0);
    expect(r.provenance.at(-1)?.step).toBe('cross-correlation');
  });

  it('says so when the peak lies at the edge of the range', () => {
    const r = crossCorrelationVelocity(noiseFree({ ...BASE, velocityKmPerS: 150 }), template, { velocityRangeKmPerS: { min: -100, max: 100 } });
    expect(r.converged).toBe(false);
    expect(r.reason).toBe('peak-at-range-edge');
    expect(r.message).toMatch(/^the highest correlation lies at the edge of the velocity range \(\d+\.\d km\/s\); widen the range$/);
    expect(r.velocity.uncertainty).toBeNaN();
  });

  it('adds the calibration error at the information-weighted wavelength', () => {
    const star = noiseFree({ ...BASE, velocityKmPerS: 10 });
    const calibration = { rmsAngstrom: 0.04, lineCount: 25, coefficients: 4 };
    const r = crossCorrelationVelocity(star, template, { calibration });
    const atEnds = [4800, 5900].map((w) => (C * 0.04 * Math.sqrt(4 / 25)) / w);
    expect(r.uncertainties.calibration).toBeGreaterThan(atEnds[1]);
    expect(r.uncertainties.calibration).toBeLessThan(atEnds[0]);
    expect(r.velocity.uncertainty).toBeCloseTo(Math.hypot(r.uncertainties.propagated, r.uncertainties.calibration), 12);
  });

  it('estimates the noise from the data when the spectrum has no uncertainties', () => {
    const s = makeStar({ ...BASE, velocityKmPerS: 5, peakCounts: 400 }).synthetic;
    const withSigma = crossCorrelationVelocity(s.spectrum, template);
    const without = crossCorrelationVelocity(deriveSpectrum(s.spectrum, { uncertainty: undefined }), template);
    expect(without.velocity.value).toBeCloseTo(withSigma.velocity.value, 1);
    // DER_SNR gives one σ for all pixels where photon noise varies: within 25 %.
    expect(Math.abs(without.uncertainties.propagated / withSigma.uncertainties.propagated - 1)).toBeLessThan(0.25);
  });

  it('leaves its inputs unchanged', () => {
    const star = makeStar({ ...BASE, velocityKmPerS: 5 }).synthetic.spectrum;
    const copies = [star.wavelength.slice(), star.flux.slice(), template.wavelength.slice(), template.flux.slice()];
    crossCorrelationVelocity(star, template);
    expect([star.wavelength, star.flux, template.wavelength, template.flux]).toEqual(copies);
  });

  it('refuses what it cannot use', () => {
    const star = noiseFree(BASE);
    const unknown = deriveSpectrum(star, { medium: null });
    expect(() => crossCorrelationVelocity(unknown, template)).toThrow(InputError);
    expect(() => crossCorrelationVelocity(unknown, template)).toThrow('the spectrum does not say whether its wavelengths are in air or vacuum (at 6000 Å the two differ by 1.66 Å, 83 km/s); state it with --medium air|vacuum (options.spectrumMedium)');
    expect(crossCorrelationVelocity(unknown, template, { spectrumMedium: 'air' }).converged).toBe(true);
    expect(() => crossCorrelationVelocity(star, template, { spectrumMedium: 'vacuum' })).toThrow('the spectrum says its wavelengths are in air, but vacuum was stated');
    const pixels = createSpectrum({ wavelength: Array.from({ length: 100 }, (_, i) => i), flux: new Array(100).fill(1), unit: 'pixel' });
    expect(() => crossCorrelationVelocity(pixels, template)).toThrow('the spectrum has no wavelength scale (its axis is in pixels); calibrate it first');
    const far = noiseFree({ ...BASE, lo: 6000, hi: 6500, n: 500 });
    expect(() => crossCorrelationVelocity(far, template)).toThrow(/do not overlap|share fewer than 32 usable pixels/);
    expect(() => crossCorrelationVelocity(star, template, { velocityRangeKmPerS: { min: 10, max: -10 } })).toThrow(UsageError);
    expect(() => crossCorrelationVelocity(star, template, { apodizationFraction: 0.7 })).toThrow('apodizationFraction must lie between 0 and 0.5 (got 0.7)');
    expect(() => crossCorrelationVelocity(star, template, { uncertaintyMethod: 'guess' as never })).toThrow('uncertaintyMethod must be propagated, zucker-2003 or tonry-davis-1979 (got guess)');
  });
});
