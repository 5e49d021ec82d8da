/**
 * The invented demo data in data/demo/: regenerating it gives the same bytes, it is small,
 * labelled as invented, and its truth is consistent with the library's own conventions.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { generateDemo, topocentricVelocityKmPerS, type DemoTruth } from '../../data/demo/generate.js';
import { gratingPixelToWavelength } from '../../src/calibrate/grating.js';
import { InputError } from '../../src/errors.js';
import { verifyFitsChecksums } from '../../src/io/fits/checksum.js';
import { readSpectrum } from '../../src/io/read.js';
import { radialVelocityKmPerS } from '../../src/orbit/keplerian.js';
import { applyVelocityCorrection } from '../../src/velocity/doppler.js';
import { barycentricCorrectionFromHeader } from '../../src/velocity/observation.js';
import { repoPath } from '../helpers/paths.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-demo-data-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function filesUnder(root: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.push(relative(root, p));
    }
  };
  walk(root);
  return out.sort();
}

const committed = repoPath('data', 'demo');
const truth = JSON.parse(readFileSync(join(committed, 'truth.json'), 'utf8')) as DemoTruth;

describe('data/demo (invented)', () => {
  const written = generateDemo(dir);

  it('regenerates byte for byte: npx tsx data/demo/generate.ts reproduces every committed file', () => {
    const generated = filesUnder(dir);
    expect(generated).toEqual([...written].sort());
    const inRepo = filesUnder(committed).filter((f) => !['generate.ts', 'scenario.json', 'README.md'].includes(f));
    expect(inRepo).toEqual(generated);
    const differing = generated.filter((f) => !readFileSync(join(dir, f)).equals(readFileSync(join(committed, f))));
    // If this fails after a deliberate change to the generator, the scenario or the library's physics, regenerate and commit.
    expect(differing).toEqual([]);
  });

  it('is small, and every spectrum says it is invented, carries the header a newcomer expects and a valid checksum', () => {
    const total = filesUnder(committed).reduce((s, f) => s + statSync(join(committed, f)).size, 0);
    expect(total).toBeLessThan(3_000_000);
    const fits = filesUnder(committed).filter((f) => f.endsWith('.fits') && f !== truth.damagedFile.file);
    expect(fits).toHaveLength(3 * 24 + 2 + 2);
    for (const f of fits) {
      const bytes = new Uint8Array(readFileSync(join(committed, f)));
      expect(verifyFitsChecksums(bytes, f).every((r) => r.checksum === 'ok' && r.datasum === 'ok')).toBe(true);
      const s = readSpectrum(join(committed, f));
      expect(s.unit).toBe('pixel');
      expect(s.flux.length).toBe(2048);
      expect(s.uncertainty).not.toBeNull();
      expect(s.header.commentary('COMMENT').join(' ')).toMatch(/^INVENTED demo data for lineshift: not an observation/);
      for (const k of ['OBJECT', 'IMAGETYP', 'DATE-OBS', 'EXPTIME', 'OBSERVER', 'INSTRUME', 'SITELAT', 'SITELONG', 'SITEELEV']) expect(s.header.has(k)).toBe(true);
      if (s.header.string('IMAGETYP') === 'object') expect(s.header.has('RA') && s.header.has('DEC')).toBe(true);
      expect(s.header.string('OBSERVER')).toMatch(/\(invented\)$/);
    }
  });

  it('holds one deliberately truncated file that the reader refuses with a clear message', () => {
    const path = join(committed, truth.damagedFile.file);
    expect(statSync(path).size).toBe(truth.damagedFile.bytesKept);
    expect(() => readSpectrum(path)).toThrow(InputError);
    expect(() => readSpectrum(path)).toThrow(/the file is truncated/);
  });

  it('keeps a truth that follows the library’s conventions: orbit, barycentric correction and BJD_TDB from the headers', () => {
    const good = truth.exposures.filter((e) => !e.damaged);
    expect(good).toHaveLength(24);
    for (const e of good.slice(0, 6)) {
      const star = readSpectrum(join(committed, e.files.star));
      const c = barycentricCorrectionFromHeader(star.header);
      // The same header keys give the same correction and time stamp (truth.json keeps 6 and 8 decimals).
      expect(c.barycentricCorrectionKmPerS).toBeCloseTo(e.barycentricCorrectionKmPerS, 5);
      expect(Math.abs(c.bjdTdb - e.bjdTdb)).toBeLessThan(1e-8);
      expect(radialVelocityKmPerS(truth.orbit, [e.bjdTdb])[0]).toBeCloseTo(e.barycentricVelocityKmPerS, 5);
      // Topocentric → barycentric with the pipeline's relativistic combination gives back the truth.
      expect(applyVelocityCorrection(e.topocentricVelocityKmPerS, e.barycentricCorrectionKmPerS)).toBeCloseTo(e.barycentricVelocityKmPerS, 5);
      // The sampled true dispersion is the set-up's grating equation.
      for (const s of e.dispersion.star.sampleWavelengthsAngstrom) expect(gratingPixelToWavelength(e.dispersion.star.setup, s.pixel)).toBeCloseTo(s.wavelengthAngstrom, 5);
      // Hα lands on the sensor with room for its wings.
      expect(e.dispersion.star.sampleWavelengthsAngstrom.at(-1)!.wavelengthAngstrom).toBeGreaterThan(6562.8 + 40);
    }
  });

  it('inverts the relativistic combination exactly: topocentricVelocityKmPerS then applyVelocityCorrection', () => {
    for (const [v, bc] of [[41.3, -29.8], [-250, 30], [0, 0.4]] as const) expect(applyVelocityCorrection(topocentricVelocityKmPerS(v, bc), bc)).toBeCloseTo(v, 9);
  });
});
