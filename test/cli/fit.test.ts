/**
 * `lineshift fit` and `lineshift find` on small text spectra written to a temporary
 * folder (invented data), through runCli with a capturing CommandIO.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { FindReport } from '../../src/cli/commands/find.js';
import type { FitReport } from '../../src/cli/commands/fit.js';
import { formatMeasured } from '../../src/cli/commands/fit.js';
import { runCli } from '../../src/cli/run.js';
import { fitLine } from '../../src/fit/line-fit.js';
import { readSpectrum } from '../../src/io/read.js';
import { normal } from '../helpers/random.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

const dir = mkdtempSync(join(tmpdir(), 'lineshift-fit-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Invented spectrum of the fictional LVAC-7: an absorption line at 6562.80 Å (FWHM 4 Å, depth 0.45), a weaker one at 6578.0 Å, continuum 1000 counts, σ 8. */
function writeStar(name: string, withError = true): string {
  const g = normal(77);
  const rows = ['# invented data (Larkspur Valley Astronomy Club demo): not an observation', '# medium: air',
    withError ? 'wavelength [Angstrom],flux,error' : 'wavelength [Angstrom],flux'];
  for (let i = 0; i < 240; i++) {
    const w = 6530 + 0.25 * i;
    const f = 1000 * (1 - 0.45 * Math.exp(-4 * Math.LN2 * ((w - 6562.8) / 4) ** 2) - 0.2 * Math.exp(-4 * Math.LN2 * ((w - 6578) / 2) ** 2)) + 8 * g();
    rows.push(withError ? `${w.toFixed(2)},${f.toFixed(3)},8` : `${w.toFixed(2)},${f.toFixed(3)}`);
  }
  const path = join(dir, name);
  writeFileSync(path, rows.join('\n') + '\n');
  return path;
}

describe('lineshift fit', () => {
  const star = writeStar('lvac7.csv');

  it('prints the fit as JSON with value/uncertainty pairs, equal to the library result', async () => {
    const io = capture();
    expect(await runCli(['fit', star, '--center', '6562', '--json'], io)).toBe(0);
    expect(io.err).toBe('');
    const r = JSON.parse(io.out) as FitReport;
    expect(r).toMatchObject({ file: star, profile: 'gaussian', converged: true, unit: 'angstrom', uncertaintySource: 'data' });
    const c = r.components[0];
    for (const key of ['center', 'fwhm', 'amplitude', 'equivalentWidth'] as const) {
      expect(Object.keys(c[key]).sort()).toEqual(['uncertainty', 'value']);
    }
    // Truth within 4σ: centre 6562.8 Å, FWHM 4 Å, amplitude −450 counts, EW = 0.45·4·√(π/(4 ln 2)) Å.
    expect(Math.abs(c.center.value - 6562.8)).toBeLessThan(4 * c.center.uncertainty);
    expect(Math.abs(c.fwhm.value - 4)).toBeLessThan(4 * c.fwhm.uncertainty);
    expect(Math.abs(c.amplitude.value + 450)).toBeLessThan(4 * c.amplitude.uncertainty);
    expect(Math.abs(c.equivalentWidth.value - 0.45 * 4 * Math.sqrt(Math.PI / (4 * Math.LN2)))).toBeLessThan(4 * c.equivalentWidth.uncertainty);
    expect(r.reducedChiSquare).toBeGreaterThan(0.6);
    expect(r.reducedChiSquare).toBeLessThan(1.5);
    const lib = fitLine(readSpectrum(star), { centerAngstrom: [6562], profile: 'gaussian' });
    expect(c.center.value).toBe(lib.components[0].center.value);
    expect(r.provenance.map((p) => p.step)).toEqual(['read-text', 'fit-line']);
    expect('curve' in r).toBe(false);
  });

  it('prints a readable table', async () => {
    const io = capture();
    expect(await runCli(['fit', star, '--center', '6562'], io)).toBe(0);
    const lib = fitLine(readSpectrum(star), { centerAngstrom: [6562] });
    const lines = io.out.split('\n');
    expect(lines[0]).toBe(`${star}: Gaussian fit of 1 absorption line over ${lib.window.start.toFixed(2)}–${lib.window.end.toFixed(2)} Å (${lib.window.pixelsUsed} pixels)`);
    expect(lines[1]).toMatch(/^  converged: /);
    expect(lines[2]).toMatch(/^  χ² [\d.]+ for \d+ degrees of freedom \(reduced [\d.]+\); uncertainties from the data; S\/N \(DER_SNR\) \d+$/);
    expect(lines[4]).toMatch(/^  line  centre \(Å\) +FWHM \(Å\) +amplitude +depth +equiv\. width \(Å\) +flux × Å$/);
    expect(lines[5]).toContain(formatMeasured(lib.components[0].center));
  });

  it('fits a blend with one centre per component, and Voigt profiles', async () => {
    const io = capture();
    expect(await runCli(['fit', star, '--center', '6562,6578', '--window', '50', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as FitReport;
    expect(r.components).toHaveLength(2);
    expect(Math.abs(r.components[1].center.value - 6578)).toBeLessThan(4 * r.components[1].center.uncertainty);
    const v = capture();
    expect(await runCli(['fit', star, '--center', '6562', '--profile', 'voigt', '--continuum-order', '2'], v)).toBe(0);
    expect(v.out).toMatch(/Voigt fit of 1 absorption line/);
    expect(v.out).toMatch(/line 1: Gaussian FWHM [\d.]+ ± [\d.]+ Å, Lorentzian FWHM [\d.]+ ± [\d.]+ Å/);
  });

  it('scales the uncertainties when the file has none', async () => {
    const io = capture();
    expect(await runCli(['fit', writeStar('bare.csv', false), '--center', '6562', '--json'], io)).toBe(0);
    expect((JSON.parse(io.out) as FitReport).uncertaintySource).toBe('scaled-by-reduced-chi-square');
  });

  it('exits 1 with the reason when the fit cannot be done', async () => {
    const io = capture();
    expect(await runCli(['fit', star, '--center', '6562', '--window', '0.6'], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${star}: the fit did not converge: cannot fit: fewer data points than free parameters (3 residuals for 5 free parameters)\n`);
  });

  it.each([
    [['fit', 'x.csv'], 'lineshift: "lineshift fit" needs --center Å\n'],
    [['fit', 'x.csv', '--center', 'abc'], 'lineshift: option --center needs numbers, got "abc"\n'],
    [['fit', 'x.csv', '--center', '6562', '--profile', 'box'], 'lineshift: option --profile must be one of gaussian, lorentzian, voigt, got "box"\n'],
    [['fit', 'x.csv', '--center', '6562', '--components', '0'], 'lineshift: option --components must be a whole number from 1 to 20, got 0\n'],
    [['fit', 'x.csv', '--center', '6562', '--continuum-order', '3'], 'lineshift: option --continuum-order must be 0, 1 or 2, got 3\n'],
  ])('exits 2 on a usage error: %j', async (argv, message) => {
    const io = capture();
    expect(await runCli(argv, io)).toBe(2);
    expect(io.err).toBe(message);
  });

  it('exits 2 for a centre outside the spectrum and 1 for a missing file', async () => {
    let io = capture();
    expect(await runCli(['fit', star, '--center', '7000'], io)).toBe(2);
    expect(io.err).toBe('lineshift: line centre 7000 Å is outside the spectrum (6530 to 6589.75 Å)\n');
    io = capture();
    expect(await runCli(['fit', join(dir, 'none.csv'), '--center', '7000'], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${join(dir, 'none.csv')}: no such file\n`);
  });
});

describe('lineshift find', () => {
  const star = writeStar('lvac7-find.csv');

  it('lists the windows as JSON and as a table', async () => {
    const io = capture();
    expect(await runCli(['find', star, '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as FindReport;
    expect(r).toMatchObject({ file: star, unit: 'angstrom', significance: 5, noiseSource: 'uncertainty' });
    expect(r.windows.map((w) => w.sign)).toEqual(['absorption', 'absorption']);
    expect(r.windows[0].centers[0]).toBeCloseTo(6562.8, 0);
    expect(r.windows[1].centers[0]).toBeCloseTo(6578, 0);
    const t = capture();
    expect(await runCli(['find', star, '--kind', 'emission'], t)).toBe(0);
    expect(t.out).toBe(`${star}: 0 lines in 0 windows at ≥ 5 σ (noise from the uncertainties)\n`);
    const h = capture();
    expect(await runCli(['find', star], h)).toBe(0);
    expect(h.out.split('\n')[2]).toMatch(/^  window \(Å\) +lines +sign +centres \(Å\) +σ$/);
    expect(h.out.split('\n')[3]).toMatch(/^  65\d\d\.\d\d–65\d\d\.\d\d +1 +absorption +6562\.\d\d +\d+\.\d$/);
  });

  it('exits 2 on a bad --kind', async () => {
    const io = capture();
    expect(await runCli(['find', star, '--kind', 'lines'], io)).toBe(2);
    expect(io.err).toBe('lineshift: option --kind must be absorption, emission or both, got "lines"\n');
  });
});
