/**
 * Makes data/samples/lvac7-sample.csv: a small INVENTED text spectrum of the fictional star
 * LVAC-7 (Larkspur Valley Astronomy Club demo scenario, data/demo/scenario.json). It is not
 * an observation: a Planck continuum at the scenario's effective temperature, Balmer
 * absorption lines at the laboratory air wavelengths of data/linelists/H_I.csv (Hα–H10),
 * shifted by the scenario's systemic velocity, with seeded Gaussian noise.
 *
 * Usage: npx tsx data/samples/make-text-sample.ts [OUTPUT]   (default: data/samples/lvac7-sample.csv)
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeTextSpectrum } from '../../src/io/text/write.js';
import { filterLineList, loadLineList } from '../../src/lines/linelist.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/spectrum/constants.js';
import { Header } from '../../src/spectrum/header.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { uniformGenerator } from '../../src/math/random.js';

const here = dirname(fileURLToPath(import.meta.url));
const scenario = JSON.parse(readFileSync(join(here, '..', 'demo', 'scenario.json'), 'utf8')) as {
  binary: { name: string; effectiveTemperatureK: number; orbit: { systemicVelocityKmPerS: number } };
};

/** Seed of the noise; change it and the file changes. */
const SEED = 7;
/** Invented set-up: 3900–7000 Å at 5 Å per pixel, peak S/N 80. */
const START_ANGSTROM = 3900;
const END_ANGSTROM = 7000;
const STEP_ANGSTROM = 5;
const PEAK_SNR = 80;
/** Invented line shapes: depth and Lorentzian half width (Å) of each Balmer line. */
const LINE_DEPTH = 0.55;
const LINE_HALF_WIDTH_ANGSTROM = 12;

/** mulberry32, a small public-domain generator: uniform numbers in [0, 1). */
function mulberry32(seed: number): () => number {
  return uniformGenerator(seed);
}

function gaussian(rand: () => number): number {
  let u = 0;
  while (u === 0) u = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** Planck B_λ up to a constant: λ⁻⁵ / (exp(hc/λkT) − 1), λ in Å; hc/k = 1.438776877e8 Å·K (CODATA 2018, second radiation constant). */
function planck(wavelengthAngstrom: number, temperatureK: number): number {
  const x = 1.438776877e8 / (wavelengthAngstrom * temperatureK);
  return Math.pow(wavelengthAngstrom / 5000, -5) / Math.expm1(x);
}

export function makeSample() {
  const star = scenario.binary;
  const v = star.orbit.systemicVelocityKmPerS;
  const doppler = Math.sqrt((1 + v / SPEED_OF_LIGHT_KM_PER_S) / (1 - v / SPEED_OF_LIGHT_KM_PER_S));
  const balmer = filterLineList(loadLineList('H I'), { maxWavelengthAngstrom: 7000 }).entries.map((e) => e.wavelengthAngstrom * doppler);
  const rand = mulberry32(SEED);
  const n = Math.round((END_ANGSTROM - START_ANGSTROM) / STEP_ANGSTROM) + 1;
  const wavelength: number[] = [];
  const model: number[] = [];
  for (let i = 0; i < n; i++) {
    const w = START_ANGSTROM + i * STEP_ANGSTROM;
    let f = planck(w, star.effectiveTemperatureK);
    for (const c of balmer) f *= 1 - LINE_DEPTH / (1 + ((w - c) / LINE_HALF_WIDTH_ANGSTROM) ** 2);
    wavelength.push(w);
    model.push(f);
  }
  const peak = Math.max(...model);
  const scale = (PEAK_SNR * PEAK_SNR) / peak; // counts such that the peak has S/N = PEAK_SNR (photon noise)
  const flux: number[] = [];
  const uncertainty: number[] = [];
  for (const m of model) {
    const counts = m * scale;
    const sigma = Math.sqrt(counts);
    flux.push(Math.round((counts + sigma * gaussian(rand)) * 100) / 100);
    uncertainty.push(Math.round(sigma * 1000) / 1000);
  }
  return createSpectrum({
    wavelength,
    flux,
    uncertainty,
    unit: 'angstrom',
    medium: 'air',
    fluxUnit: 'adu',
    header: Header.from([
      { keyword: 'OBJECT', value: star.name, comment: 'INVENTED star of the demo scenario' },
      { keyword: 'COMMENT', text: 'INVENTED sample spectrum, not an observation' },
    ]),
    provenance: [
      provenanceEntry('simulate', {
        script: 'data/samples/make-text-sample.ts',
        seed: SEED,
        temperatureK: star.effectiveTemperatureK,
        velocityKmPerS: v,
        peakSnr: PEAK_SNR,
      }),
    ],
  });
}

const isMain = process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1];
if (isMain) {
  const out = process.argv[2] ?? join(here, 'lvac7-sample.csv');
  writeTextSpectrum(out, makeSample(), {
    comments: [
      'INVENTED sample spectrum of the fictional star LVAC-7 (Larkspur Valley Astronomy Club demo scenario).',
      'Not an observation: Planck continuum, Balmer lines at laboratory air wavelengths, seeded noise.',
      'Made by data/samples/make-text-sample.ts.',
    ],
  });
  console.log(`wrote ${out}`);
}
