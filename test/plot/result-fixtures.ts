/**
 * Real library results for the result-plot and display tests and the result gallery
 * (scripts/render-result-gallery.ts): the invented sample files in data/samples/ read and
 * analysed, and seeded synthetic lamps, stars and binaries from the test helpers. Every
 * object, date and number here is invented.
 */
import { calibrateLamp } from '../../src/calibrate/lamp.js';
import type { DispersionSolution } from '../../src/calibrate/solution.js';
import { identifySpectrum, type SpectrumIdentification } from '../../src/elements/spectrum.js';
import { fitLine, fitWindow, type LineFitResult } from '../../src/fit/line-fit.js';
import { readSpectrum } from '../../src/io/read.js';
import { fitContinuum } from '../../src/lines/continuum.js';
import { findLines, type FindLinesResult } from '../../src/lines/find.js';
import { radialVelocityKmPerS, type KeplerianOrbit } from '../../src/orbit/keplerian.js';
import { fitOrbit, type OrbitFit } from '../../src/orbit/orbit-fit.js';
import { velocityPeriodogram, type Periodogram } from '../../src/orbit/periodogram.js';
import { createVelocityTable, type VelocityTable } from '../../src/orbit/table.js';
import { plotCalibration } from '../../src/plot/results/calibration.js';
import { plotLineFit } from '../../src/plot/results/line-fit.js';
import { plotPeriodogram, plotPhaseFolded, plotVelocityCurve } from '../../src/plot/results/orbit.js';
import { plotFoundLines, plotSpectrum } from '../../src/plot/results/spectrum.js';
import type { VegaLiteSpec } from '../../src/plot/spec.js';
import { Header } from '../../src/spectrum/header.js';
import { deriveSpectrum } from '../../src/spectrum/spectrum.js';
import { provenanceEntry } from '../../src/spectrum/provenance.js';
import type { Spectrum } from '../../src/spectrum/spectrum.js';
import { makeLampSpectrum, STANDARD_CASES } from '../calibrate/synthetic-lamp.js';
import { makeStar } from '../helpers/star.js';
import { crossCorrelationVelocity, type CrossCorrelationResult } from '../../src/velocity/ccf.js';
import { velocityFromLines, type LineVelocityResult } from '../../src/velocity/lines.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { plotCrossCorrelation, plotLineVelocities } from '../../src/plot/results/velocity.js';
import { syntheticSpectrum } from '../elements/synthetic-spectrum.js';
import { SCENARIOS } from '../elements/simulate.js';
import { starSpectrum } from '../helpers/synthetic.js';
import { gaussian, mulberry32 } from '../helpers/random.js';
import { repoPath } from '../helpers/paths.js';

/** The results the gallery draws, computed once. */
export interface GalleryResults {
  readonly star: Spectrum;
  readonly found: FindLinesResult;
  readonly halpha: LineFitResult;
  readonly starIdentification: SpectrumIdentification;
  readonly blendSpectrum: Spectrum;
  readonly blend: LineFitResult;
  readonly coolStar: Spectrum;
  readonly coolIdentification: SpectrumIdentification;
  readonly sampleSolution: DispersionSolution;
  readonly syntheticSolution: DispersionSolution;
  readonly lvac7Table: VelocityTable;
  readonly lvac7Orbit: OrbitFit;
  readonly lvac7Periodogram: Periodogram;
  readonly longTable: VelocityTable;
  readonly longOrbit: OrbitFit;
  readonly velocityStar: Spectrum;
  readonly ccf: CrossCorrelationResult;
  readonly lineVelocities: LineVelocityResult;
}

/**
 * LVAC-7's invented orbit (the same elements as the orbit area's examples) observed on 24
 * nights of one season with 1.0–2.0 km/s uncertainties (seeded).
 */
export function lvac7Velocities(seed = 7): VelocityTable {
  const orbit: KeplerianOrbit = { periodDays: 12.37, periastronTimeBjdTdb: 2461140.63, eccentricity: 0.28, omegaDeg: 112, semiAmplitudeKmPerS: 41.3, systemicVelocityKmPerS: -17.8 };
  const rand = mulberry32(seed);
  const nights = new Set<number>();
  while (nights.size < 24) nights.add(Math.floor(rand() * 140));
  const t = [...nights].sort((a, b) => a - b).map((n) => 2461120.3 + n + 0.1 * (rand() - 0.5));
  const sigma = t.map(() => 1 + rand());
  const v = Array.from(radialVelocityKmPerS(orbit, t), (x, i) => x + sigma[i] * gaussian(rand));
  return createVelocityTable({ bjdTdb: t, velocityKmPerS: v, uncertaintyKmPerS: sigma, label: t.map((_, i) => `LVAC-7 night ${i + 1}`) });
}

/** A short-period binary observed over three seasons (seeded): many cycles, shown folded. */
export function longBaselineVelocities(seed = 11): VelocityTable {
  const orbit: KeplerianOrbit = { periodDays: 3.716, periastronTimeBjdTdb: 2460401.2, eccentricity: 0.05, omegaDeg: 40, semiAmplitudeKmPerS: 27, systemicVelocityKmPerS: 8 };
  const rand = mulberry32(seed);
  const t: number[] = [];
  for (let season = 0; season < 3; season++) for (let k = 0; k < 14; k++) t.push(2460400 + 365 * season + Math.floor(rand() * 150) + 0.3 + 0.1 * rand());
  t.sort((a, b) => a - b);
  const sigma = t.map(() => 0.8 + 0.6 * rand());
  const v = Array.from(radialVelocityKmPerS(orbit, t), (x, i) => x + sigma[i] * gaussian(rand));
  return createVelocityTable({ bjdTdb: t, velocityKmPerS: v, uncertaintyKmPerS: sigma });
}

let cached: GalleryResults | undefined;

/** Runs the library on the sample files and the synthetic data (once per process; the results are treated as read-only). */
export function galleryResults(): GalleryResults {
  if (cached) return cached;
  const star = readSpectrum(repoPath('data', 'samples', 'lvac7-star.fits'));
  const found = findLines(star);
  const halpha = fitLine(star, { centerAngstrom: 6563 });
  const starIdentification = identifySpectrum(star);

  // A blend: the synthetic star's two closest metal lines fitted together, with uncertainties from the scatter.
  const synthetic = starSpectrum(5, 80, 40);
  const blendSpectrum = deriveSpectrum(synthetic.spectrum, {
    header: Header.from([{ keyword: 'OBJECT', value: 'Synthetic star (invented)' }, { keyword: 'DATE-OBS', value: '2026-06-02T22:41:05' }]),
  }, provenanceEntry('gallery-header', {}));
  const windows = findLines(blendSpectrum).windows.filter((w) => w.components === 2 && w.sign === 'absorption');
  const blend = fitWindow(blendSpectrum, windows[0] ?? findLines(blendSpectrum).windows[0]);

  const cool = syntheticSpectrum(SCENARIOS[0], 2000, 100, 3);
  const coolStar = deriveSpectrum(cool.spectrum, {
    header: Header.from([{ keyword: 'OBJECT', value: 'LVAC-12 (invented)' }, { keyword: 'DATE-OBS', value: '2026-06-11T01:15:00' }]),
  }, provenanceEntry('gallery-header', {}));
  const coolIdentification = identifySpectrum(coolStar);

  const sampleSolution = calibrateLamp(readSpectrum(repoPath('data', 'samples', 'lamp-ne-ar.fits')), { lamp: 'neon,argon' });
  const c = STANDARD_CASES.neArRed;
  const lamp = makeLampSpectrum({ lamp: c.lamp, pixels: c.pixels, curve: c.curve, fwhmPixels: c.fwhmPixels, peakCounts: 60000, seed: 4, saturationCounts: 30000 });
  const syntheticSolution = calibrateLamp(lamp.spectrum, { lamp: 'neon,argon' });

  const lvac7Table = lvac7Velocities();
  const lvac7Orbit = fitOrbit(lvac7Table);
  const lvac7Periodogram = velocityPeriodogram(lvac7Table, { minPeriodDays: 1 });
  const longTable = longBaselineVelocities();
  const longOrbit = fitOrbit(longTable);

  // LVAC-7 at +37.9 km/s near Hβ and Mg b (R = 5000, S/N ≈ 100), against a noise-free copy at rest.
  const starOptions = {
    lo: 4800, hi: 5900, n: 2000, resolvingPower: 5000, velocityKmPerS: 37.9, peakCounts: 10000, species: ['H I', 'Fe I', 'Mg I'], perSpecies: 8,
    header: Header.from([{ keyword: 'OBJECT', value: 'LVAC-7' }, { keyword: 'DATE-OBS', value: '2026-05-20T02:10:00' }]),
  };
  const velocityStar = makeStar(starOptions).synthetic.spectrum;
  const rest = makeStar({ ...starOptions, velocityKmPerS: 0, seed: 2 }).synthetic;
  const template = createSpectrum({ wavelength: rest.spectrum.wavelength, flux: rest.model, uncertainty: rest.sigma!, medium: rest.spectrum.medium });
  const ccf = crossCorrelationVelocity(velocityStar, template);
  const lineVelocities = velocityFromLines(velocityStar, { species: ['H I', 'Fe I', 'Mg I'], resolvingPower: 5000 });
  cached = {
    star, found, halpha, starIdentification, blendSpectrum, blend, coolStar, coolIdentification,
    sampleSolution, syntheticSolution, lvac7Table, lvac7Orbit, lvac7Periodogram, longTable, longOrbit,
    velocityStar, ccf, lineVelocities,
  };
  return cached;
}

/** Every result plot of the gallery, by file name. */
export function resultGalleryPlots(r: GalleryResults = galleryResults()): Record<string, VegaLiteSpec> {
  return {
    'result-spectrum-identified': plotSpectrum(r.star, { identification: r.starIdentification, verdicts: ['present', 'possible', 'telluric'] }),
    'result-spectrum-continuum': plotSpectrum(r.star, { continuum: fitContinuum(r.star, { exclude: [{ min: 6520, max: 6610 }] }) }),
    'result-cool-star-identified': plotSpectrum(r.coolStar, { identification: r.coolIdentification }),
    'result-found-lines': plotFoundLines(r.star, r.found),
    'result-found-lines-numbered': plotFoundLines(r.coolStar, findLines(r.coolStar), { label: 'number' }),
    'result-line-fit-halpha': plotLineFit(r.halpha, { spectrum: r.star, labels: ['Hα'] }),
    'result-line-fit-halpha-no-spectrum': plotLineFit(r.halpha),
    'result-line-fit-blend': plotLineFit(r.blend, { spectrum: r.blendSpectrum }),
    'result-calibration-sample': plotCalibration(r.sampleSolution),
    'result-calibration-synthetic-kms': plotCalibration(r.syntheticSolution, { residualUnit: 'kmPerS' }),
    'result-velocity-table': plotVelocityCurve(r.lvac7Table),
    'result-velocity-orbit': plotVelocityCurve(r.lvac7Table, r.lvac7Orbit),
    'result-phase-folded': plotPhaseFolded(r.lvac7Table, r.lvac7Orbit),
    'result-phase-folded-long': plotPhaseFolded(r.longTable, r.longOrbit),
    'result-periodogram': plotPeriodogram(r.lvac7Periodogram, { table: r.lvac7Table }),
    'result-cross-correlation': plotCrossCorrelation(r.ccf, { spectrum: r.velocityStar }),
    'result-line-velocities': plotLineVelocities(r.lineVelocities, { spectrum: r.velocityStar }),
  };
}
