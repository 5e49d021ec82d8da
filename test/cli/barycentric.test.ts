import { describe, expect, it } from 'vitest';
import type { BarycentricReport } from '../../src/cli/commands/barycentric.js';
import { runCli } from '../../src/cli/run.js';
import { astropy } from '../velocity/astropy-fixture.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

describe('lineshift barycentric', () => {
  it('prints the corrections, BJD_TDB, HJD and the inputs as understood (--json), matching astropy 5.2.1', async () => {
    // Reference: test/fixtures/barycentric-astropy.json (astropy 5.2.1), case 1; --midpoint gives its time.
    const c = astropy.cases[1];
    const io = capture();
    const code = await runCli(['barycentric', '--midpoint', c.time_utc, '--ra', String(c.ra_deg), '--dec', String(c.dec_deg),
      '--lat', String(c.lat_deg), '--lon', String(c.lon_deg), '--height', String(c.height_m), '--json'], io);
    expect(io.err).toBe('');
    expect(code).toBe(0);
    const r = JSON.parse(io.out) as BarycentricReport;
    // Budget of test/velocity/barycentric.test.ts: 3 m/s, 20 ms.
    expect(Math.abs(r.barycentricCorrection * 1000 - c.barycentric_correction_m_s)).toBeLessThan(3);
    expect(Math.abs(r.heliocentricCorrection * 1000 - c.heliocentric_correction_m_s)).toBeLessThan(3);
    expect(Math.abs(r.bjdTdb - 2400000 - c.bjd_tdb_minus_2400000) * 86400).toBeLessThan(0.02);
    expect(Math.abs(r.hjd - 2400000 - c.hjd_utc_minus_2400000) * 86400).toBeLessThan(0.02);
    expect(r.hjdTimeScale).toBe('UTC');
    expect(r.target.raDeg).toBe(c.ra_deg);
    expect(r.site.latitudeDeg).toBe(c.lat_deg);
    expect(Math.abs(r.time.jdUtc - c.jd_utc) * 86400).toBeLessThan(1e-4);
    expect(Math.abs(r.time.jdTdb - 2400000.5 - c.mjd_tdb) * 86400).toBeLessThan(2e-5);
    expect(r.midpointGiven).toBe(true);
    expect(r.file).toBeNull();
    expect(r.keysUsed).toEqual([]);
  });

  it('takes sexagesimal RA/Dec and the exposure start plus --exptime', async () => {
    const io = capture();
    const code = await runCli(['barycentric', '--time', '2024-03-05T21:14:07', '--exptime', '600', '--ra', '06:45:09', '--dec', '-16:42:58',
      '--lat', '38.87', '--lon', '-121.06', '--height', '312', '--json'], io);
    expect(code).toBe(0);
    const r = JSON.parse(io.out) as BarycentricReport;
    expect(r.midpoint).toBe('2024-03-05T21:19:07.000');
    expect(r.midpointMethod).toBe('start-exposure');
    expect(r.target.raHms).toBe('06:45:09.000');
    expect(r.target.decDms).toBe('-16:42:58.00');
    expect(r.target.raDeg).toBeCloseTo(101.2875, 10);
  });

  it('prints a readable summary without --json', async () => {
    const io = capture();
    expect(await runCli(['barycentric', '--midpoint', '2024-03-05T21:19:07', '--ra', '06:45:09', '--dec', '-16:42:58', '--lat', '38.87', '--lon', '-121.06', '--height', '312'], io)).toBe(0);
    expect(io.out).toMatch(/^ {2}barycentric correction: -?\d+\.\d{4} km\/s \(add to a measured velocity\)$/m);
    expect(io.out).toMatch(/^ {2}BJD_TDB: {3}2460375\.\d{6}$/m);
    expect(io.out).toMatch(/^ {2}mid-point: 2024-03-05T21:19:07\.000 UTC \(given\)$/m);
  });

  it.each([
    [['--ra', '1', '--dec', '2', '--lat', '0', '--lon', '0'], 1, 'lineshift: cannot compute the correction; missing: the exposure time'],
    [['--time', '2024-03-05T21:14:07', '--ra', '06:45:09', '--dec', '-96:00:00', '--lat', '0', '--lon', '0'], 1, 'lineshift: keyword --dec: declination "-96:00:00" is outside -90..+90 degrees'],
    [['--time', '2024-03-05T21:14:07', '--ra', '06:45:09', '--lat', '0', '--lon', '0'], 2, 'lineshift: --ra and --dec go together'],
    [['--time', 'soon', '--ra', '1', '--dec', '2', '--lat', '0', '--lon', '0'], 1, 'lineshift: keyword --time: "soon" is not a UTC date/time'],
    [['no-such-file.fits'], 1, 'no such file'],
    [['--header-longitude', 'north', '--ra', '1', '--dec', '2'], 2, 'lineshift: --header-longitude must be east or west, got "north"'],
  ])('fails cleanly on %j', async (args, exit, message) => {
    const io = capture();
    expect(await runCli(['barycentric', ...args], io)).toBe(exit);
    expect(io.out).toBe('');
    expect(io.err.trim().split('\n')).toHaveLength(1);
    expect(io.err).toContain(message);
  });

  it('has --help', async () => {
    const io = capture();
    expect(await runCli(['barycentric', '--help'], io)).toBe(0);
    expect(io.out).toMatch(/^Usage: lineshift barycentric \[FILE\]/);
    expect(io.out).toContain('--lon DEG');
  });
});
