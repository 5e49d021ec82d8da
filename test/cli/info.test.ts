/**
 * `lineshift info` on FITS files: in-process through runCli with a capturing CommandIO,
 * and once as a real process (node dist/cli/main.js) for exit codes and stderr.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import type { SpectrumInfo } from '../../src/cli/commands/info.js';
import { runCli } from '../../src/cli/run.js';
import { collectingLogger } from '../../src/logger.js';
import { repoPath } from '../helpers/paths.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

const fits = (name: string) => repoPath('test', 'fixtures', 'fits', name);
const sample = (name: string) => repoPath('data', 'samples', name);
const expected = JSON.parse(readFileSync(fits('expected.json'), 'utf8')).files as Record<string, { hdu: number; pixels: number; nanCount: number; wavelengthAngstrom: number[] }>;

describe('lineshift info on FITS files (in process)', () => {
  it('describes an uncalibrated lamp with the 0-based pixel convention and a calibrated star', async () => {
    const io = capture();
    expect(await runCli(['info', sample('lamp-ne-ar.fits'), sample('lvac7-star.fits')], io)).toBe(0);
    expect(io.err).toBe('');
    expect(io.out).toContain(`${sample('lamp-ne-ar.fits')} [HDU 0]\n  object:      Ne-Ar lamp\n  date-obs:    2026-05-14T03:01:10\n  pixels:      2048\n  axis:        pixels 0 to 2047 (0-based pixel index; not wavelength-calibrated)\n`);
    expect(io.out).toContain(`${sample('lvac7-star.fits')} [HDU 0]\n  object:      LVAC-7\n  date-obs:    2026-05-14T03:12:45\n  pixels:      2048\n  axis:        6300.000 to 6811.750 Å (air)\n`);
    expect(io.out).toContain('  uncertainty: yes\n');
  });

  it('prints one JSON object per file; values agree with astropy (expected.json)', async () => {
    const io = capture();
    const names = ['multi_hdu.fits', 'bitpix16_scaled_nm.fits', 'table_vector.fits', 'bitpix32_pixel_axis.fits'];
    expect(await runCli(['info', ...names.map(fits), '--json'], io)).toBe(0);
    const lines = io.out.trim().split('\n').map((l) => JSON.parse(l) as SpectrumInfo);
    expect(lines.map((l) => l.hdu)).toEqual(names.map((n) => expected[n].hdu));
    expect(lines.map((l) => l.pixels)).toEqual(names.map((n) => expected[n].pixels));
    expect(lines.map((l) => l.nanCount)).toEqual(names.map((n) => expected[n].nanCount));
    // Wavelengths in Å from astropy.wcs / astropy tables (test/fixtures/fits/expected.json), 1e-9 relative.
    for (const [k, n] of names.slice(0, 3).entries()) {
      expect(Math.abs(lines[k].wavelengthFirst / expected[n].wavelengthAngstrom[0] - 1)).toBeLessThan(1e-9);
      expect(Math.abs(lines[k].wavelengthLast / expected[n].wavelengthAngstrom[2] - 1)).toBeLessThan(1e-9);
    }
    expect(lines[1].unit).toBe('angstrom');
    expect(lines[1].medium).toBe('vacuum');
    expect(lines[3]).toMatchObject({ unit: 'pixel', pixelConvention: '0-based index', wavelengthFirst: 0, wavelengthLast: 99, medium: null });
    expect(lines[0]).toMatchObject({ object: 'LVAC-7', dateObs: '2026-05-14T03:12:45.5', format: 'fits' });
  });

  it('reports a bad file in one line, describes the others, and exits 1', async () => {
    const io = capture();
    expect(await runCli(['info', fits('image_2d.fits'), fits('uint16_blank_ctype.fits')], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${fits('image_2d.fits')}: HDU 0 holds a 2-D image of 40×30 pixels, not a 1-D spectrum; extract the spectrum first\n`);
    expect(io.out).toContain(`${fits('uint16_blank_ctype.fits')} [HDU 0]`);
  });

  it('passes reader warnings to the logger', async () => {
    const io = capture();
    expect(await runCli(['info', fits('header_cards.fits')], io)).toBe(0);
    expect((io.logger as ReturnType<typeof collectingLogger>).warnings.map((w) => w.code)).toEqual(['fits.hierarch']);
  });
});

describe('lineshift info as a process (node dist/cli/main.js)', () => {
  beforeAll(() => {
    // The CLI runs from dist/: build it (about 10 s) so this test never runs stale code.
    const build = spawnSync(process.execPath, [repoPath('node_modules', 'typescript', 'bin', 'tsc'), '-p', repoPath('tsconfig.build.json')], { encoding: 'utf8' });
    if (build.status !== 0) throw new Error(`build failed: ${build.stdout}${build.stderr}`);
  }, 120_000);

  it('exits 0 on good files, 1 with one lineshift: line on a bad file, 2 on a usage error', () => {
    const main = repoPath('dist', 'cli', 'main.js');
    const ok = spawnSync(process.execPath, [main, 'info', sample('lvac7-star.fits')], { encoding: 'utf8' });
    expect([ok.status, ok.stderr]).toEqual([0, '']);
    expect(ok.stdout).toContain('6300.000 to 6811.750 Å (air)');

    const bad = spawnSync(process.execPath, [main, 'info', fits('image_2d.fits')], { encoding: 'utf8' });
    expect(bad.status).toBe(1);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toBe(`lineshift: ${fits('image_2d.fits')}: HDU 0 holds a 2-D image of 40×30 pixels, not a 1-D spectrum; extract the spectrum first\n`);

    const truncated = spawnSync(process.execPath, [main, 'info', fits('dcflag_log10.fits'), '--json', '--nope'], { encoding: 'utf8' });
    expect(truncated.status).toBe(2);
    expect(truncated.stderr).toMatch(/^lineshift: unknown option --nope/);

    const warn = spawnSync(process.execPath, [main, 'info', fits('header_cards.fits')], { encoding: 'utf8' });
    expect(warn.status).toBe(0);
    expect(warn.stderr).toBe(`lineshift: warning: ${fits('header_cards.fits')}: HDU 0: 3 HIERARCH cards (a registered convention, not part of the FITS Standard) read with the full name as keyword\n`);
  });
});
