import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { findLines, runningMedian, type DetectedLine } from '../../src/lines/find.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { normal } from '../helpers/random.js';
import { lampSpectrum, noiseSpectrum, starSpectrum, type TrueLine } from '../helpers/synthetic.js';

/** Recall of lines expected above `minSignificance`, and detections with no true line within 2 FWHM. */
function score(found: readonly DetectedLine[], truth: TrueLine[], minSignificance: number) {
  const strong = truth.filter((t) => t.expectedSignificance >= minSignificance);
  const recovered = strong.filter((t) => found.some((d) => Math.abs(d.center - t.center) < 0.5 * t.fwhm));
  const spurious = found.filter((d) => !truth.some((t) => Math.abs(d.center - t.center) < 2 * t.fwhm));
  return { strong: strong.length, recovered: recovered.length, spurious: spurious.length };
}

describe('runningMedian', () => {
  it('equals the median of each (truncated) window', () => {
    const g = normal(9);
    const v = Array.from({ length: 57 }, () => g());
    const m = runningMedian(v, 9);
    v.forEach((_, i) => {
      const w = v.slice(Math.max(0, i - 4), Math.min(v.length, i + 5)).sort((a, b) => a - b);
      const k = w.length;
      expect(m[i]).toBe(k % 2 ? w[(k - 1) / 2] : (w[k / 2 - 1] + w[k / 2]) / 2);
    });
  });
});

// Simulated spectra (test/helpers/synthetic.ts, invented data). Criteria: every line whose
// expected matched-filter significance is ≥ 8 (well above the threshold 5, so that noise
// rarely pushes it under) is recovered within half a FWHM.
describe('findLines on seeded synthetic spectra', () => {
  const figures: string[] = [];

  it.each([[1, true], [2, true], [3, false], [4, false]] as const)('lamp spectrum %i (uncertainty given: %s): every strong line, no spurious ones', (seed, withUncertainty) => {
    const lamp = lampSpectrum(seed, { withUncertainty });
    const r = findLines(lamp.spectrum);
    const s = score(r.lines, lamp.lines, 8);
    figures.push(`lamp ${seed}: ${s.recovered}/${s.strong} strong lines, ${r.lines.length} detections, ${s.spurious} spurious`);
    expect(r.noiseSource).toBe(withUncertainty ? 'uncertainty' : 'der-snr');
    expect(s.recovered).toBe(s.strong);
    expect(s.spurious).toBe(0);
    expect(r.lines.every((l) => l.sign === 'emission')).toBe(true);
    // Lines are ≥ 5 FWHM apart: each window holds one line.
    expect(r.windows.every((w) => w.components === 1)).toBe(true);
    // Centres good to a fraction of a pixel for strong lines.
    for (const t of lamp.lines.filter((l) => l.expectedSignificance > 50)) {
      const d = r.lines.reduce((a, b) => (Math.abs(b.center - t.center) < Math.abs(a.center - t.center) ? b : a));
      expect(Math.abs(d.center - t.center)).toBeLessThan(0.3 * 1.5); // 0.3 pixel of 1.5 Å
    }
  });

  it.each([[30, 1], [100, 2], [300, 3]] as const)('star spectrum at S/N %i: Balmer lines and metal lines', (snr, seed) => {
    const st = starSpectrum(seed, snr);
    const r = findLines(st.spectrum);
    const s = score(r.lines, [...st.lines, ...st.balmer.map((c) => ({ center: c, fwhm: 20, amplitude: -0.5, expectedSignificance: Infinity }))], 8);
    figures.push(`star S/N ${snr}: ${s.recovered}/${s.strong} strong lines (4 Balmer), ${r.lines.length} detections, ${s.spurious} spurious`);
    expect(s.recovered).toBe(s.strong);
    // At high S/N the continuum under strong Balmer wings can leave broad continuum
    // artefacts (≤ 1 % deep): at most two per spectrum here (measured 0; 2 at S/N 300 with
    // the plain running median), and never a narrow one.
    expect(s.spurious).toBeLessThanOrEqual(2);
    const truth = [...st.lines.map((l) => l.center), ...st.balmer];
    const spurious = r.lines.filter((d) => !truth.some((c) => Math.abs(d.center - c) < 6));
    expect(spurious.every((d) => d.fwhm > 10 && Math.abs(d.amplitude) < 0.01)).toBe(true);
    for (const b of st.balmer) {
      const win = r.windows.filter((w) => w.start < b && w.end > b);
      expect(win).toHaveLength(1);
      const broad = win[0].lines.filter((l) => l.fwhm > 10);
      expect(broad).toHaveLength(1);
      expect(broad[0].sign).toBe('absorption');
      expect(Math.abs(broad[0].center - b)).toBeLessThan(1.5); // one pixel
    }
  });

  it('keeps a blend together in one window', () => {
    const g = normal(21);
    const wl = Array.from({ length: 300 }, (_, i) => 5000 + i);
    const line = (w: number, c: number, a: number) => a * Math.exp(-4 * Math.LN2 * ((w - c) / 3) ** 2);
    const flux = wl.map((w) => 10 + line(w, 5100, 80) + line(w, 5105, 50) + line(w, 5200, 60) + g());
    const r = findLines(createSpectrum({ wavelength: wl, flux }));
    expect(r.windows).toHaveLength(2);
    expect(r.windows[0]).toMatchObject({ components: 2, sign: 'emission' });
    expect(r.windows[0].centers[0]).toBeCloseTo(5100, 0);
    expect(r.windows[0].centers[1]).toBeCloseTo(5105, 0);
    // ±3 estimated FWHM around the outer lines (estimates within ~20 % of the true 3 Å).
    expect(r.windows[0].start).toBeLessThan(5093);
    expect(r.windows[0].end).toBeGreaterThan(5112);
    expect(r.windows[1].components).toBe(1);
  });

  it('finds nothing in 100 spectra of pure white noise at the default threshold', () => {
    let atDefault = 0, atFour = 0;
    for (let k = 0; k < 100; k++) {
      const s = noiseSpectrum(5000 + k);
      atDefault += findLines(s).lines.length;
      if (k < 50) atFour += findLines(s, { significance: 4 }).lines.length;
    }
    figures.push(`pure noise (2000 px): ${atDefault} detections in 100 spectra at 5σ; ${atFour} in 50 at 4σ`);
    expect(atDefault).toBe(0);
    // At 4σ false alarms appear, as the Gaussian tail predicts (2Φ(−4) = 6.3e-5 per independent trial).
    expect(atFour).toBeGreaterThan(0);
  });

  it('works on an uncalibrated (pixel) axis and skips unusable pixels', () => {
    const lamp = lampSpectrum(5, { withUncertainty: true, pixels: 600, count: 12 });
    const px = createSpectrum({ wavelength: lamp.spectrum.wavelength.map((_, i) => i), flux: lamp.spectrum.flux, uncertainty: lamp.spectrum.uncertainty, unit: 'pixel' });
    const r = findLines(px);
    expect(r.unit).toBe('pixel');
    const strongest = [...lamp.lines].sort((a, b) => b.amplitude - a.amplitude)[0];
    const pixel = (strongest.center - 4000) / 1.5;
    expect(r.lines.some((l) => Math.abs(l.center - pixel) < 0.3 && Math.abs(l.pixel - pixel) < 0.3)).toBe(true);
    // NaN in the middle of a line does not stop it being found; the pixel index stays that of the input.
    const flux = Float64Array.from(px.flux);
    flux[Math.round(pixel)] = NaN;
    const r2 = findLines(createSpectrum({ wavelength: px.wavelength, flux, uncertainty: px.uncertainty, unit: 'pixel' }));
    expect(r2.lines.some((l) => Math.abs(l.pixel - pixel) < 0.5)).toBe(true);
  });

  it('rejects bad options and does not modify the spectrum', () => {
    const s = noiseSpectrum(1, 100);
    const before = Array.from(s.flux);
    expect(() => findLines(s, { significance: 0 })).toThrow(new UsageError('find.bad-significance', 'significance must be a number > 0, got 0'));
    expect(() => findLines(s, { continuumWindowPixels: 2 })).toThrow(/continuumWindowPixels must be ≥ 5/);
    expect(() => findLines(s, { minFwhmPixels: 5, maxFwhmPixels: 2 })).toThrow(/0 < minFwhmPixels ≤ maxFwhmPixels/);
    const r = findLines(s, { kind: 'absorption' });
    expect(Array.from(s.flux)).toEqual(before);
    expect(r.provenance.at(-1)!.step).toBe('find-lines');
  });

  it('never throws on odd flux values (property test)', async () => {
    const fc = (await import('fast-check')).default;
    const value = fc.oneof(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.constantFrom(NaN, Infinity, -Infinity, 0, 1e300));
    fc.assert(fc.property(fc.array(value, { minLength: 1, maxLength: 300 }), (flux) => {
      const r = findLines(createSpectrum({ wavelength: flux.map((_, i) => 4000 + i), flux }));
      expect(Array.isArray(r.windows)).toBe(true);
      for (const w of r.windows) expect(w.start).toBeLessThanOrEqual(w.end);
    }), { numRuns: 200, seed: 3 });
  });

  it('prints the figures', () => {
    console.log(figures.join('\n'));
    expect(figures.length).toBeGreaterThan(0);
  });
});
