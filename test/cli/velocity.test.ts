import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { VelocityReport } from '../../src/cli/commands/velocity.js';
import { runCli } from '../../src/cli/run.js';
import { writeFitsSpectrum } from '../../src/io/fits/write.js';
import { writeTextSpectrum } from '../../src/io/text/write.js';
import { Header, type HeaderCard } from '../../src/spectrum/header.js';
import { createSpectrum, deriveSpectrum } from '../../src/spectrum/spectrum.js';
import { applyVelocityCorrection } from '../../src/velocity/doppler.js';
import { makeStar, type StarOptions } from '../helpers/star.js';
import { astropy } from '../velocity/astropy-fixture.js';
import { captureIO } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-velocity-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const capture = () => captureIO({ cwd: dir });

/** Time, target and site of astropy case 2 (test/fixtures/barycentric-astropy.json, astropy 5.2.1), as header cards. */
const ref = astropy.cases[2];
const OBSERVATION: HeaderCard[] = [
  { keyword: 'OBJECT', value: 'LVAC-7 (invented)' },
  { keyword: 'DATE-AVG', value: ref.time_utc, comment: 'mid-exposure, UTC' },
  { keyword: 'RA', value: ref.ra_deg, comment: '[deg]' },
  { keyword: 'DEC', value: ref.dec_deg, comment: '[deg]' },
  { keyword: 'SITELAT', value: ref.lat_deg },
  { keyword: 'SITELONG', value: ref.lon_deg, comment: 'east positive' },
  { keyword: 'SITEELEV', value: ref.height_m },
];
const STAR: StarOptions = { lo: 4800, hi: 5900, n: 2000, resolvingPower: 5000, velocityKmPerS: 31.4, peakCounts: 10000, species: ['H I', 'Fe I', 'Mg I'], perSpecies: 8, resolvedOnly: 3, seed: 5 };
const star = makeStar({ ...STAR, header: Header.from(OBSERVATION) });
const starText = join(dir, 'star.csv');
writeTextSpectrum(starText, star.synthetic.spectrum);
const starFits = join(dir, 'star.fits');
writeFitsSpectrum(starFits, star.synthetic.spectrum);
const rest = makeStar({ ...STAR, velocityKmPerS: 0, seed: 6, peakCounts: 1e6 });
const templateFits = join(dir, 'template.fits');
writeFitsSpectrum(templateFits, createSpectrum({ wavelength: rest.wavelength, flux: rest.synthetic.model, medium: 'air' }));
const bare = join(dir, 'bare.csv');
writeTextSpectrum(bare, deriveSpectrum(star.synthetic.spectrum, { header: Header.empty() }));
const noMedium = join(dir, 'no-medium.csv');
writeTextSpectrum(noMedium, deriveSpectrum(star.synthetic.spectrum, { medium: null }));
const listFile = join(dir, 'my-lines.csv');
writeFileSync(listFile, 'wavelength_air_angstrom,species\n' + star.list.entries.map((e) => `${e.wavelengthAngstrom},${e.species}`).join('\n') + '\n');

async function run(args: string[]): Promise<{ code: number; io: ReturnType<typeof capture>; report: VelocityReport | null }> {
  const io = capture();
  const code = await runCli(['velocity', ...args], io);
  let report: VelocityReport | null = null;
  if (args.includes('--json') && io.out) report = JSON.parse(io.out) as VelocityReport;
  return { code, io, report };
}

describe('lineshift velocity', () => {
  it('measures a text spectrum from its lines and corrects it with the header\'s time, target and site (astropy 5.2.1)', async () => {
    const { code, io, report: r } = await run(['star.csv', '--species', 'H,Fe,Mg', '--resolving-power', '5000', '--json']);
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(r!.method).toBe('lines');
    expect(r!.frame).toBe('barycentric');
    // The injected (topocentric) velocity, within 4σ.
    expect(Math.abs(r!.measuredVelocity.value - STAR.velocityKmPerS)).toBeLessThan(4 * r!.measuredVelocity.uncertainty);
    // Budget of test/velocity/barycentric.test.ts: 3 m/s and 20 ms against astropy 5.2.1.
    expect(Math.abs(r!.barycentricCorrection! * 1000 - ref.barycentric_correction_m_s)).toBeLessThan(3);
    expect(Math.abs(r!.bjdTdb! - 2400000 - ref.bjd_tdb_minus_2400000) * 86400).toBeLessThan(0.02);
    // The combination is applyVelocityCorrection's (tested against its worked example in test/velocity/doppler.test.ts).
    expect(r!.radialVelocity!.value).toBeCloseTo(applyVelocityCorrection(r!.measuredVelocity.value, r!.barycentricCorrection!), 9);
    expect(Math.abs(r!.radialVelocity!.uncertainty / r!.measuredVelocity.uncertainty - 1)).toBeLessThan(2e-4);
    expect(r!.keysUsed).toEqual(['DATE-AVG', 'RA', 'DEC', 'SITELAT', 'SITELONG', 'SITEELEV']);
    expect(r!.midpoint).toBe(ref.time_utc.replace(/(\.\d{3})\d*$/, '$1'));
    expect(r!.medium).toBe('air');
    // The shipped lists hold more lines than the star (and close pairs, rejected as blends).
    expect(r!.combination!.linesUsed).toBeGreaterThanOrEqual(4);
    const used = r!.lines!.filter((l) => l.status === 'used');
    expect(used.every((l) => l.velocityKmPerS !== null && l.observedWavelengthAngstrom !== null && l.reason === null)).toBe(true);
    expect(r!.lines!.filter((l) => l.status === 'rejected').every((l) => l.reason !== null && l.note.length > 0)).toBe(true);
  });

  it('cross-correlates a FITS spectrum with a FITS template', async () => {
    const { code, io, report: r } = await run(['star.fits', '--method', 'ccf', '--template', 'template.fits', '--json']);
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(r!.method).toBe('ccf');
    expect(Math.abs(r!.measuredVelocity.value - STAR.velocityKmPerS)).toBeLessThan(4 * r!.measuredVelocity.uncertainty);
    expect(Math.abs(r!.barycentricCorrection! * 1000 - ref.barycentric_correction_m_s)).toBeLessThan(3);
    expect(r!.ccf!.template).toBe('template.fits');
    expect(r!.ccf!.uncertaintyMethod).toBe('propagated');
    expect(r!.measuredVelocity.uncertainty).toBeCloseTo(r!.ccf!.uncertainties.propagated, 12);
    expect(r!.ccf!.peakHeight).toBeGreaterThan(0.5);
    // The curve for plots: the peak of the first pass (template at its own velocity, 0) sits near the measured velocity.
    const { velocityKmPerS: v, correlation: c } = r!.ccf!.curve;
    expect(v.length).toBe(c.length);
    expect(v[c.indexOf(Math.max(...c))]).toBeCloseTo(r!.measuredVelocity.value, -1);
    expect(r!.ccf!.peakModel!.centerKmPerS).toBeCloseTo(r!.measuredVelocity.value, -1);
    expect(r!.lines).toBeUndefined();
  });

  it('cross-correlates with a template made from a line list, and reads a line list file', async () => {
    const a = await run(['star.csv', '--method', 'ccf', '--lines', 'my-lines.csv', '--resolving-power', '5000', '--json']);
    expect(a.code).toBe(0);
    expect(Math.abs(a.report!.measuredVelocity.value - STAR.velocityKmPerS)).toBeLessThan(4 * a.report!.measuredVelocity.uncertainty + 0.3);
    expect(a.report!.ccf!.template).toBe('a template of my-lines.csv lines at R 5000');
    const b = await run(['star.csv', '--lines', 'my-lines.csv', '--resolving-power', '5000', '--approximate', '30', '--json']);
    expect(b.code).toBe(0);
    expect(b.report!.combination!.approximateVelocitySource).toBe('given');
    expect(b.report!.lines!.length).toBe(star.list.entries.length);
  });

  it('gives a topocentric velocity without a site, and says what is missing otherwise', async () => {
    const t = await run(['bare.csv', '--species', 'H,Fe,Mg', '--resolving-power', '5000', '--topocentric', '--json']);
    expect(t.code).toBe(0);
    expect(t.report!.frame).toBe('topocentric');
    expect(t.report!.radialVelocity).toBeNull();
    expect(t.report!.barycentricCorrection).toBeNull();
    expect(t.report!.bjdTdb).toBeNull();
    const m = await run(['bare.csv', '--species', 'H', '--time', '2025-06-01T22:00:00', '--exptime', '600', '--json']);
    expect(m.code).toBe(1);
    expect(m.io.out).toBe('');
    expect(m.io.err.trim().split('\n')).toHaveLength(1);
    expect(m.io.err).toContain('lineshift: bare.csv: cannot compute the correction; missing: the target\'s RA/Dec (looked for RA_OBJ/DEC_OBJ, OBJCTRA/OBJCTDEC, OBJRA/OBJDEC, RA/DEC; give --ra and --dec, options.target); the site (looked for');
    expect(m.io.err).toMatch(/; or give --topocentric for the velocity in the observer's frame\n$/);
    // The options supply what the header lacks, and override it.
    const o = await run(['bare.csv', '--species', 'H,Fe,Mg', '--resolving-power', '5000', '--midpoint', ref.time_utc, '--ra', String(ref.ra_deg), '--dec', String(ref.dec_deg),
      '--lat', String(ref.lat_deg), '--lon', String(ref.lon_deg), '--height', String(ref.height_m), '--json']);
    expect(o.code).toBe(0);
    expect(Math.abs(o.report!.barycentricCorrection! * 1000 - ref.barycentric_correction_m_s)).toBeLessThan(3);
    expect(o.report!.keysUsed).toEqual([]);
  });

  it('prints a readable summary', async () => {
    const { code, io } = await run(['star.csv', '--species', 'H,Fe,Mg', '--resolving-power', '5000']);
    expect(code).toBe(0);
    expect(io.out).toMatch(/^ {2}radial velocity: -?\d+\.\d{3} ± \d+\.\d{3} km\/s \(barycentric, relativistic Doppler formula\)$/m);
    expect(io.out).toMatch(/^ {2}measured: {8}-?\d+\.\d{3} ± \d+\.\d{3} km\/s \(observer's frame\)$/m);
    expect(io.out).toMatch(/^ {2}barycentric correction: -?\d+\.\d{4} km\/s; BJD_TDB \d+\.\d{6}; mid-point \S+ UTC$/m);
    expect(io.out).toMatch(/^ {2}H I +4861\.325 +\d+\.\d{4} ± \d\.\d{4} +-?\d+\.\d\d ± \d+\.\d\d {2}used$/m);
    const c = await run(['star.fits', '--method', 'ccf', '--template', 'template.fits']);
    expect(c.io.out).toMatch(/^ {2}method: cross-correlation with template\.fits; peak height \d\.\d{3}, FWHM \d+\.\d km\/s$/m);
    expect(c.io.out).toMatch(/^ {2}uncertainty \(propagated\): propagated \d+\.\d{3}, Zucker 2003 \d+\.\d{3}, Tonry & Davis 1979 \d+\.\d{3} km\/s$/m);
  });

  it('needs the medium of a spectrum that does not state it', async () => {
    const a = await run(['no-medium.csv', '--species', 'H', '--topocentric']);
    expect(a.code).toBe(1);
    expect(a.io.err).toBe('lineshift: no-medium.csv: the spectrum does not say whether its wavelengths are in air or vacuum (at 6000 Å the two differ by 1.66 Å, 83 km/s); state it with --medium air|vacuum (options.spectrumMedium)\n');
    const b = await run(['no-medium.csv', '--species', 'H,Fe,Mg', '--resolving-power', '5000', '--medium', 'air', '--topocentric', '--json']);
    expect(b.code).toBe(0);
    expect(b.report!.medium).toBe('air');
  });

  it('says so when no line can be measured', async () => {
    // He I lines lie in the range (5015.7, 5875.6 Å) but the star has none.
    const { code, io, report } = await run(['star.csv', '--species', 'He I', '--approximate', '30', '--resolving-power', '5000', '--json']);
    expect(code).toBe(1);
    expect(io.err).toBe('lineshift: star.csv: no velocity: no line could be used (7 blended, 2 not-detected, 1 at-window-edge)\n');
    expect(report!.radialVelocity).toBeNull();
    expect(report!.lines!.every((l) => l.status === 'rejected')).toBe(true);
  });

  it.each([
    [['star.csv', '--template', 'template.fits'], 2, 'lineshift: --template goes with --method ccf'],
    [['star.csv', '--lines', 'my-lines.csv', '--species', 'H'], 2, 'lineshift: give --lines or --species, not both'],
    [['star.csv', '--species', 'Qq'], 2, 'lineshift: no line list for "Qq" (elements: '],
    [['star.csv', '--method', 'fourier'], 2, 'lineshift: --method must be lines, ccf; got "fourier"'],
    [['star.csv', '--velocity-range', '100,-100'], 2, 'lineshift: --velocity-range needs MIN,MAX in km/s with MIN < MAX, got "100,-100"'],
    [['star.csv', '--calibration-rms', '0.05'], 2, 'lineshift: --calibration-rms, --calibration-lines and --calibration-terms go together'],
    [['missing.csv'], 1, 'missing.csv: no such file'],
    [[], 2, 'lineshift: "lineshift velocity" needs a SPECTRUM argument'],
  ])('fails cleanly on %j', async (args, exit, message) => {
    const { code, io } = await run(args);
    expect(code).toBe(exit);
    expect(io.out).toBe('');
    expect(io.err.trim().split('\n')).toHaveLength(1);
    expect(io.err).toContain(message);
  });

  it('has --help', async () => {
    const io = capture();
    expect(await runCli(['velocity', '--help'], io)).toBe(0);
    expect(io.out).toMatch(/^Usage: lineshift velocity SPECTRUM \[--method lines\|ccf\]/);
    for (const option of ['--template FILE', '--species H,Fe,...', '--ra DEG|HH:MM:SS', '--topocentric', '--calibration-rms Å']) expect(io.out).toContain(option);
  });
});
