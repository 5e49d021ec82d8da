/**
 * Makes the INVENTED sample spectra in data/samples/ (for `lineshift info` in the README
 * quick start until the full demo data lands). Seeded: the same files every run.
 *
 *     npx tsx data/samples/make-samples.ts            # writes data/samples/*.fits
 *     npx tsx data/samples/make-samples.ts OUT_DIR    # writes them elsewhere
 *
 * The spectra are simple: Gaussian lines on a smooth continuum with Gaussian noise. Line
 * positions are air wavelengths of real Ne I, Ar I and H I lines (NIST Atomic Spectra
 * Database, as compiled in the project's shared reference line lists); everything else —
 * the club, the star LVAC-7, the instrument, the dates — is invented.
 */
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { writeFitsSpectrum } from '../../src/io/fits/write.js';
import { Header, type HeaderCard } from '../../src/spectrum/header.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { uniformGenerator } from '../../src/math/random.js';

/** Air wavelengths (Å) and relative strengths of lamp lines, NIST ASD (shared reference line lists Ne_I.csv, Ar_I.csv). */
const LAMP_LINES: readonly [number, number][] = [
  [5852.4879, 2.0], [5881.8952, 1.0], [5944.8342, 0.6], [5975.534, 0.5], [6029.9969, 1.0], [6032.127, 0.15], [6043.223, 0.1],
  [6074.3377, 1.0], [6096.1631, 0.4], [6143.0626, 1.0], [6163.5939, 1.0], [6217.2812, 1.0], [6266.495, 1.0], [6334.4278, 1.0],
  [6382.9917, 1.0], [6384.717, 0.1], [6402.248, 2.0], [6416.307, 0.15], [6506.5281, 1.5],
];

/** Hα air wavelength (Å), NIST ASD (shared reference line list H_I.csv). */
const H_ALPHA = 6562.795;

/** Small seeded generator (mulberry32) and Gaussian deviates (Box–Muller). */
function random(seed: number): { uniform(): number; normal(): number } {
  const uniform = uniformGenerator(seed);
  return { uniform, normal: () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform()) };
}

function gaussian(x: number, centre: number, sigma: number): number {
  return Math.exp(-0.5 * ((x - centre) / sigma) ** 2);
}

const INVENTED: HeaderCard[] = [
  { keyword: 'COMMENT', text: 'INVENTED sample data for lineshift: not an observation. The Larkspur' },
  { keyword: 'COMMENT', text: 'Valley Astronomy Club, its observers and the star LVAC-7 are fictional.' },
];

/** Writes the samples into `dir` and returns their paths. */
export function makeSamples(dir: string): string[] {
  mkdirSync(dir, { recursive: true });
  const paths: string[] = [];
  const pixels = 2048;

  // 1. Neon-argon lamp, not yet calibrated: pixel axis, no WCS. An invented dispersion
  //    λ(p) = 5800 + 0.3 p + 1.5e-5 p² Å (p the 0-based pixel) places the lines.
  {
    const rng = random(7001);
    const lambda = (p: number) => 5800 + 0.3 * p + 1.5e-5 * p * p;
    const flux = new Float64Array(pixels);
    for (let p = 0; p < pixels; p++) {
      let f = 120 + 10 * Math.sin(p / 400);
      for (const [l, s] of LAMP_LINES) f += 18000 * s * gaussian(lambda(p), l, 0.75);
      flux[p] = Math.round(f + Math.sqrt(f) * rng.normal());
    }
    const s = createSpectrum({
      wavelength: Array.from({ length: pixels }, (_, i) => i),
      flux,
      unit: 'pixel',
      fluxUnit: 'adu',
      header: Header.from([
        { keyword: 'OBJECT', value: 'Ne-Ar lamp', comment: 'calibration lamp (invented sample)' },
        { keyword: 'IMAGETYP', value: 'lamp', comment: 'exposure type' },
        { keyword: 'DATE-OBS', value: '2026-05-14T03:01:10', comment: 'UTC start (invented)' },
        { keyword: 'EXPTIME', value: 20, comment: '[s] exposure time' },
        { keyword: 'OBSERVER', value: 'R. Okafor (invented)' },
        { keyword: 'TELESCOP', value: 'LVAC 28 cm (invented)' },
        ...INVENTED,
      ]),
      provenance: [provenanceEntry('make-samples', { sample: 'lamp', seed: 7001 })],
    });
    const path = join(dir, 'lamp-ne-ar.fits');
    writeFitsSpectrum(path, s, { dataType: 'float32' });
    paths.push(path);
  }

  // 2. LVAC-7, an A-type-like star, calibrated: linear air-wavelength WCS, broad Hα.
  {
    const rng = random(7002);
    const start = 6300;
    const step = 0.25;
    const wavelength = Array.from({ length: pixels }, (_, i) => start + step * i);
    const flux = new Float64Array(pixels);
    const sigma = new Float64Array(pixels);
    const shift = 6562.795 * (-23.4 / 299792.458); // an invented radial velocity of −23.4 km/s
    for (let i = 0; i < pixels; i++) {
      const l = wavelength[i];
      const continuum = 2500 * (1 - 0.00025 * (l - start));
      const line = 1 - 0.55 * (1 / (1 + ((l - H_ALPHA - shift) / 9) ** 2)) - 0.08 * gaussian(l, 6347.1 + shift * 0.967, 0.8) - 0.06 * gaussian(l, 6371.4 + shift * 0.971, 0.8);
      const f = continuum * line;
      sigma[i] = Math.sqrt(f + 36);
      flux[i] = f + sigma[i] * rng.normal();
    }
    const s = createSpectrum({
      wavelength,
      flux,
      uncertainty: sigma,
      medium: 'air',
      fluxUnit: 'adu',
      header: Header.from([
        { keyword: 'OBJECT', value: 'LVAC-7', comment: 'invented star' },
        { keyword: 'IMAGETYP', value: 'object', comment: 'exposure type' },
        { keyword: 'DATE-OBS', value: '2026-05-14T03:12:45', comment: 'UTC start (invented)' },
        { keyword: 'EXPTIME', value: 900, comment: '[s] exposure time' },
        { keyword: 'RA', value: 275.4175, comment: '[deg] (invented)' },
        { keyword: 'DEC', value: 31.2022, comment: '[deg] (invented)' },
        { keyword: 'OBSERVER', value: 'M. Lindqvist (invented)' },
        { keyword: 'TELESCOP', value: 'LVAC 28 cm (invented)' },
        ...INVENTED,
      ]),
      provenance: [provenanceEntry('make-samples', { sample: 'star', seed: 7002, radialVelocityKmPerS: -23.4 })],
    });
    const path = join(dir, 'lvac7-star.fits');
    writeFitsSpectrum(path, s, { dataType: 'float32' });
    paths.push(path);
  }

  // 3. A low-resolution spectrum of the same star across the visible, log-linear vacuum axis.
  {
    const rng = random(7003);
    const n = 1500;
    const wavelength = Array.from({ length: n }, (_, i) => 3900 * Math.exp(i * 3.9e-4));
    // Balmer lines in vacuum from the Rydberg formula, R_H = R∞/(1 + mₑ/mₚ) with CODATA
    // R∞ = 10 973 731.568 m⁻¹ and mₚ/mₑ = 1836.152 67 (from memory); fine structure ignored.
    const rydbergHydrogenPerAngstrom = 10973731.568e-10 / (1 + 1 / 1836.15267);
    const balmerVacuum = [6, 5, 4, 3].map((n) => 1 / (rydbergHydrogenPerAngstrom * (1 / 4 - 1 / (n * n))));
    const flux = wavelength.map((l) => {
      const planck = 1 / (l ** 5 * (Math.exp(1.4388e8 / (l * 9200)) - 1)); // 9200 K, λ in Å
      let f = planck;
      for (const b of balmerVacuum) f *= 1 - 0.5 * (1 / (1 + ((l - b) / 12) ** 2));
      return f;
    });
    const peak = Math.max(...flux);
    const scaled = flux.map((f) => (1000 * f) / peak);
    const s = createSpectrum({
      wavelength,
      flux: scaled.map((f) => f + Math.sqrt(f + 25) * rng.normal()),
      medium: 'vacuum',
      fluxUnit: 'adu',
      header: Header.from([
        { keyword: 'OBJECT', value: 'LVAC-7', comment: 'invented star' },
        { keyword: 'IMAGETYP', value: 'object', comment: 'exposure type' },
        { keyword: 'DATE-OBS', value: '2026-06-02T04:40:00', comment: 'UTC start (invented)' },
        { keyword: 'EXPTIME', value: 120, comment: '[s] exposure time' },
        { keyword: 'OBSERVER', value: 'J. Ruiz-Baptiste (invented)' },
        ...INVENTED,
      ]),
      provenance: [provenanceEntry('make-samples', { sample: 'low-resolution', seed: 7003 })],
    });
    const path = join(dir, 'lvac7-lowres.fits');
    writeFitsSpectrum(path, s, { dataType: 'float32' });
    paths.push(path);
  }
  return paths;
}

if (process.argv[1] && pathToFileURL(resolve(process.argv[1])).href === import.meta.url) {
  const dir = process.argv[2] ?? fileURLToPath(new URL('.', import.meta.url));
  for (const p of makeSamples(dir)) console.log(`wrote ${p}`);
}
