/**
 * `lineshift calibrate` and `lineshift apply` through runCli with a capturing CommandIO, on
 * seeded synthetic (invented) lamp and star spectra written to os.tmpdir().
 */
import { existsSync, mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ApplyReport } from '../../src/cli/commands/apply.js';
import type { CalibrateReport } from '../../src/cli/commands/calibrate.js';
import { runCli } from '../../src/cli/run.js';
import { writeFitsSpectrum } from '../../src/io/fits/write.js';
import { readSpectrum } from '../../src/io/read.js';
import { Header } from '../../src/spectrum/header.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { STANDARD_CASES, cubicCurve, makeLampSpectrum } from '../calibrate/synthetic-lamp.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { captureIO } from '../helpers/cli.js';

const capture = (cwd: string) => captureIO({ cwd });

const c = STANDARD_CASES.neArRed;
let dir = '';

function writeLamp(name: string, curve: (p: number) => number, seed: number, dateObs: string) {
  const lamp = makeLampSpectrum({ ...c, curve, peakCounts: 30_000, seed });
  const s = createSpectrum({
    wavelength: lamp.spectrum.wavelength, flux: lamp.spectrum.flux, uncertainty: lamp.spectrum.uncertainty, unit: 'pixel',
    header: Header.from([{ keyword: 'OBJECT', value: 'Ne-Ar lamp (invented)' }, { keyword: 'DATE-OBS', value: dateObs }, { keyword: 'EXPTIME', value: 20 }]),
  });
  writeFitsSpectrum(join(dir, name), s);
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'lineshift-cli-calibrate-'));
  writeLamp('lamp1.fits', c.curve, 41, '2026-05-14T03:01:10');
  writeLamp('lamp2.fits', cubicCurve([6400 - 0.8 * 0.55, 0.55, -1.2e-5, -2.0e-9], 1024), 42, '2026-05-14T04:01:10');
  const rand = mulberry32(43);
  const star = createSpectrum({
    wavelength: Array.from({ length: 2048 }, (_, i) => i), unit: 'pixel', flux: Array.from({ length: 2048 }, () => 500 + 5 * gaussian(rand)),
    header: Header.from([{ keyword: 'OBJECT', value: 'LVAC-7 (invented)' }, { keyword: 'DATE-OBS', value: '2026-05-14T03:26:00' }, { keyword: 'EXPTIME', value: 600 }]),
  });
  writeFitsSpectrum(join(dir, 'star.fits'), star);
  const noise = createSpectrum({ wavelength: Array.from({ length: 2048 }, (_, i) => i), unit: 'pixel', flux: Array.from({ length: 2048 }, () => 100 + 10 * gaussian(rand)) });
  writeFitsSpectrum(join(dir, 'noise.fits'), noise);
});

describe('lineshift calibrate', () => {
  it('blind: prints the JSON report with rms (Å), pixels, km/s, lines used/rejected, order, resolving power and the line table; writes the solution', async () => {
    const io = capture(dir);
    expect(await runCli(['calibrate', 'lamp1.fits', '--lamp', 'neon,argon', '--out', 'sol1.json', '--json'], io)).toBe(0);
    expect(io.err).toBe('');
    const r = JSON.parse(io.out) as CalibrateReport;
    expect(r).toMatchObject({ ok: true, reason: null, order: 3, method: 'lamp', calibratedByLamp: true, out: 'sol1.json' });
    expect(r.rms).toBe(r.rmsAngstrom);
    expect(r.rmsPixels!).toBeLessThan(0.1);
    expect(r.rmsKmPerS!).toBeCloseTo((r.rmsAngstrom! / 6400) * 299_792.458, 0);
    expect(r.linesUsed).toBeGreaterThanOrEqual(20);
    // Every identified line is either used or rejected; clipped lines are among the rejected.
    expect(r.linesUsed + r.linesRejected).toBe(r.linesIdentified);
    expect(r.linesClipped).toBeLessThanOrEqual(r.linesRejected);
    expect(r.lines.filter((l) => l.wavelengthAngstrom !== null && !l.used).length).toBe(r.linesRejected);
    expect(r.resolvingPower!).toBeGreaterThan(3000);
    expect(r.resolvingPowerSpread!).toBeGreaterThan(0);
    expect(r.lines.length).toBe(r.linesMeasured);
    expect(r.lines.filter((l) => l.used).length).toBe(r.linesUsed);
    const saved = JSON.parse(readFileSync(join(dir, 'sol1.json'), 'utf8'));
    expect(saved.observation).toEqual({ midpointUtc: '2026-05-14T03:01:20.000', mjdUtc: saved.observation.mjdUtc });
    expect(saved.observation.mjdUtc).toBeCloseTo(61174 + (3 * 3600 + 80) / 86400, 9);
  });

  it('with a hint, human output', async () => {
    const io = capture(dir);
    expect(await runCli(['calibrate', 'lamp2.fits', '--lamp', 'neon,argon', '--range', '5800,6950', '--out', 'sol2.json'], io)).toBe(0);
    expect(io.out).toMatch(/^lamp2\.fits\n  accepted: dispersion solution of order 3 from \d+ lines: RMS [\d.]+ Å \([\d.]+ pixel\)\n/);
    expect(io.out).toMatch(/\n  RMS: {14}[\d.]+ Å = [\d.]+ pixel = [\d.]+ km\/s\n/);
    expect(io.out).toContain('  pixel        ±σ      FWHM    λ list (Å)    residual Å   pixel    km/s   used\n');
    expect(io.out).toContain('  written: sol2.json\n');
  });

  it('a lamp spectrum of pure noise: NOT accepted, exit 1, the reason on stderr', async () => {
    const io = capture(dir);
    expect(await runCli(['calibrate', 'noise.fits', '--lamp', 'neon'], io)).toBe(1);
    expect(io.err).toBe('lineshift: noise.fits: no lamp line reached the detection threshold of 8 σ; check that the spectrum is a lamp exposure with light in it\n');
    expect(io.out).toContain('NOT accepted (no-lines-found)');
  });

  it('usage errors: no lamp, conflicting hints, incomplete grating set-up, overwriting the input', async () => {
    const cases: [string[], string][] = [
      [['calibrate', 'lamp1.fits'], 'lineshift: "lineshift calibrate" needs --lamp NAME (or --star-lines, or --grating-only)\n'],
      [['calibrate', 'lamp1.fits', '--lamp', 'neon', '--range', '5800,6900', '--center', '6400', '--dispersion', '0.5'], 'lineshift: give one hint: --range, or --center with --dispersion, or the grating set-up\n'],
      [['calibrate', 'lamp1.fits', '--lamp', 'neon', '--lines-per-mm', '600'], 'lineshift: a grating set-up needs --pixel-size-um\n'],
      [['calibrate', 'lamp1.fits', '--lamp', 'neon', '--range', '5800'], 'lineshift: --range needs two wavelengths in Å, MIN,MAX, got "5800"\n'],
      [['calibrate', 'lamp1.fits', '--lamp', 'sodium'], 'lineshift: unknown lamp "sodium" (known: neon, argon, mercury, helium, krypton, xenon, hydrogen; combine them as "neon,argon")\n'],
      [['calibrate', 'lamp1.fits', '--lamp', 'neon', '--out', 'lamp1.fits'], `lineshift: ${join(dir, 'lamp1.fits')}: is an input file; lineshift never overwrites its input, so write to another file\n`],
    ];
    for (const [argv, message] of cases) {
      const io = capture(dir);
      expect(await runCli(argv, io)).toBe(2);
      expect(io.err).toBe(message);
    }
  });

  it('--grating-only: the approximate solution of a transmission grating, flagged as not calibrated by a lamp', async () => {
    const io = capture(dir);
    expect(await runCli(['calibrate', 'star.fits', '--grating-only', '--lines-per-mm', '100', '--distance-mm', '50', '--pixel-size-um', '5.4', '--zero-order-pixel', '-400', '--geometry-uncertainty', 'distanceMm=0.5', '--out', 'grating.json', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as CalibrateReport;
    expect(r).toMatchObject({ ok: true, method: 'grating-equation', calibratedByLamp: false });
    // λ = d sin β with tan β = x/L at the first pixel; the order-5 series stands for it to 0.01 Å (0.001 pixel).
    expect(Math.abs(r.wavelengthRangeAngstrom![0] - 1e5 * Math.sin(Math.atan((400 * 5.4e-3) / 50)))).toBeLessThan(0.01);
    expect(r.warnings[0]).toMatch(/^approximate solution from the grating equation/);
  });
});

describe('lineshift apply', () => {
  it('applies one solution and writes FITS that reads back with the same wavelengths', async () => {
    const io = capture(dir);
    expect(await runCli(['apply', 'star.fits', '--solution', 'sol1.json', '--out', 'star-cal.fits', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as ApplyReport;
    expect(r).toMatchObject({ method: 'lamp', medium: 'air', after: null, weightAfter: null });
    const back = readSpectrum(join(dir, 'star-cal.fits'));
    expect(back.unit).toBe('angstrom');
    expect(back.medium).toBe('air');
    expect(Math.abs(back.wavelength[1000] - c.curve(1000)) / 0.55).toBeLessThan(0.05);
    expect(back.wavelength[0]).toBe(r.wavelengthFirstAngstrom);
    // No temporary files left behind.
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('interpolates between lamps before and after the star to its mid-exposure (DATE-OBS + EXPTIME/2)', async () => {
    const io = capture(dir);
    expect(await runCli(['apply', 'star.fits', '--solution', 'sol1.json', '--after', 'sol2.json', '--out', 'star-cal2.csv', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as ApplyReport;
    // No outside source: the weight is arithmetic on the header times below.
    // Lamps at 03:01:20 and 04:01:20 (mid-exposures), star mid-exposure 03:31:00: weight 29:40 of 60:00 = 0.4944.
    expect(r.midpointUtc).toBe('2026-05-14T03:31:00.000');
    expect(r.weightAfter!).toBeCloseTo(1780 / 3600, 6);
    expect(r.method).toBe('interpolated');
    const back = readSpectrum(join(dir, 'star-cal2.csv'));
    const truth = cubicCurve([6400 - (1780 / 3600) * 0.8 * 0.55, 0.55, -1.2e-5, -2.0e-9], 1024);
    expect(Math.abs(back.wavelength[1500] - truth(1500)) / 0.55).toBeLessThan(0.05);
  });

  it('refuses to overwrite an input and reports a malformed solution file with its JSON path', async () => {
    let io = capture(dir);
    expect(await runCli(['apply', 'star.fits', '--solution', 'sol1.json', '--out', 'star.fits'], io)).toBe(2);
    expect(io.err).toBe('lineshift: --out star.fits is one of the inputs; lineshift never overwrites its input, so write to another file\n');
    io = capture(dir);
    expect(await runCli(['apply', 'star.fits', '--solution', 'lamp1.fits', '--out', 'x.fits'], io)).toBe(1);
    expect(io.err).toMatch(/^lineshift: .*lamp1\.fits: is not valid JSON/);
    expect(existsSync(join(dir, 'x.fits'))).toBe(false);
  });
});
