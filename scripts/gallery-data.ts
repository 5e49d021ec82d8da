/**
 * Invented sample data for the plot gallery (scripts/render-plot-gallery.ts): synthetic
 * spectra, fits and velocities from a fixed random seed. Nothing here is a measurement.
 */
import type { VegaLiteSpec } from '../src/plot/spec.js';
import { spectrumPlot } from '../src/plot/spectrum.js';
import { lineFitPlot } from '../src/plot/lineFit.js';
import { calibrationResidualPlot } from '../src/plot/calibration.js';
import { crossCorrelationPlot } from '../src/plot/crossCorrelation.js';
import { uniformGenerator } from '../src/math/random.js';
import { periodogramPlot } from '../src/plot/periodogram.js';
import { phaseFoldedVelocityPlot, velocityCurvePlot } from '../src/plot/velocity.js';

/** Small seeded generator (mulberry32) so the gallery is the same on every run. */
export function seededRandom(seed: number): () => number {
  return uniformGenerator(seed);
}

/** Standard normal deviates from a uniform generator (Box–Muller). */
export function gaussianNoise(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

const gauss = (x: number, centre: number, sigma: number) => Math.exp(-0.5 * ((x - centre) / sigma) ** 2);

/** An invented red-region star spectrum with a Balmer line and a few weak lines. */
export function sampleSpectrum() {
  const noise = gaussianNoise(seededRandom(7));
  const wavelengthAngstrom: number[] = [];
  const flux: number[] = [];
  const uncertainty: number[] = [];
  const continuum: number[] = [];
  const mask: number[] = [];
  const lines = [
    { centre: 6562.8 + 0.9, depth: 0.55, sigma: 4.5 },
    { centre: 6546.24 + 0.9, depth: 0.12, sigma: 0.9 },
    { centre: 6592.91 + 0.9, depth: 0.1, sigma: 0.9 },
    { centre: 6678.15 + 0.9, depth: 0.18, sigma: 1.2 },
    { centre: 6494.98 + 0.9, depth: 0.15, sigma: 0.9 },
    { centre: 6496.9 + 0.9, depth: 0.08, sigma: 0.9 },
  ];
  for (let i = 0; i < 1000; i++) {
    const w = 6450 + 0.25 * i;
    const c = 1200 * (1 + 0.0009 * (w - 6450));
    let f = c;
    for (const l of lines) f -= c * l.depth * gauss(w, l.centre, l.sigma);
    const sigma = Math.sqrt(f + 25);
    wavelengthAngstrom.push(w);
    flux.push(f + sigma * noise());
    uncertainty.push(sigma);
    continuum.push(c);
    mask.push(i >= 700 && i < 712 ? 1 : 0);
  }
  return {
    wavelengthAngstrom, flux, uncertainty, continuum, mask, medium: 'air' as const, fluxUnit: 'ADU',
    lines: [
      { wavelengthAngstrom: 6563.7, label: 'Hα' },
      { wavelengthAngstrom: 6547.1, label: 'Fe I 6546.2' },
      { wavelengthAngstrom: 6593.8, label: 'Fe I 6592.9' },
      { wavelengthAngstrom: 6679.1, label: 'He I 6678.2' },
      { wavelengthAngstrom: 6495.9, label: 'Fe I 6495.0' },
      { wavelengthAngstrom: 6497.8, label: 'Ba II?' },
    ],
  };
}

/** An invented blend of two absorption lines on a sloping continuum, with its (known) model. */
export function sampleLineFit() {
  const noise = gaussianNoise(seededRandom(11));
  const continuum = (w: number) => 1000 + 4 * (w - 6580);
  const a = (w: number) => -420 * gauss(w, 6578.2, 0.55);
  const b = (w: number) => -260 * gauss(w, 6579.6, 0.7);
  const model = (w: number) => continuum(w) + a(w) + b(w);
  const wavelengthAngstrom: number[] = [];
  const flux: number[] = [];
  const uncertainty: number[] = [];
  for (let i = 0; i < 60; i++) {
    const w = 6575 + 0.15 * i;
    const sigma = Math.sqrt(model(w)) * 0.8;
    wavelengthAngstrom.push(w);
    flux.push(model(w) + sigma * noise());
    uncertainty.push(sigma);
  }
  return {
    wavelengthAngstrom, flux, uncertainty, model, continuum, medium: 'air' as const, fluxUnit: 'ADU',
    components: [{ label: 'Line A', flux: a }, { label: 'Line B', flux: b }],
    centres: [{ wavelengthAngstrom: 6578.21, uncertaintyAngstrom: 0.03 }, { wavelengthAngstrom: 6579.58, uncertaintyAngstrom: 0.05 }],
  };
}

/** Invented calibration: neon-like line list (approximate air wavelengths, for the picture only) on a quadratic solution. */
export function sampleCalibration() {
  const noise = gaussianNoise(seededRandom(3));
  const wavelengthAtPixel = (p: number) => 5800 + 1.02 * p - 1.5e-5 * p * p;
  const reference = [5852.49, 5881.9, 5944.83, 5975.53, 6030.0, 6074.34, 6096.16, 6143.06, 6163.59, 6217.28, 6266.5, 6304.79,
    6334.43, 6382.99, 6402.25, 6506.53, 6532.88, 6598.95, 6678.28, 6717.04];
  const lines = reference.map((w, i) => {
    // Invert the solution by Newton's method for the pixel of each line.
    let p = (w - 5800) / 1.02;
    for (let k = 0; k < 5; k++) p -= (wavelengthAtPixel(p) - w) / (1.02 - 3e-5 * p);
    const rejected = i === 6 || i === 15;
    return {
      wavelengthAngstrom: w,
      residualAngstrom: rejected ? (i === 6 ? 0.42 : -0.37) : 0.045 * noise(),
      uncertaintyAngstrom: 0.02 + 0.01 * (i % 3),
      used: !rejected,
      pixel: p,
      label: `Ne I ${w.toFixed(2)}`,
    };
  });
  return { lines, medium: 'air' as const, dispersion: { wavelengthAtPixel, pixelRange: [0, 1023] as const } };
}

/** Invented cross-correlation: Gaussian peak at +17.3 km/s on a wavy baseline, with a fitted Gaussian. */
export function sampleCrossCorrelation() {
  const noise = gaussianNoise(seededRandom(5));
  const velocityKmPerS: number[] = [];
  const correlation: number[] = [];
  const peak = (v: number) => 0.12 + 0.74 * gauss(v, 17.3, 21);
  for (let v = -300; v <= 300; v += 5) {
    velocityKmPerS.push(v);
    correlation.push(peak(v) + 0.04 * Math.sin(v / 37) + 0.01 * noise());
  }
  return { velocityKmPerS, correlation, peak: { velocityKmPerS: 17.3, uncertaintyKmPerS: 1.4, model: peak, fitRangeKmPerS: [-25, 60] as const } };
}

/** An invented eccentric orbit (P = 4.237 d, e = 0.3) and velocities from it. */
export function sampleOrbit() {
  const period = 4.237;
  const e = 0.3;
  const omega = (70 * Math.PI) / 180;
  const k = 38;
  const gamma = -12;
  const tPeri = 2460401.812;
  const velocity = (t: number) => {
    const m = (2 * Math.PI * (t - tPeri)) / period;
    let E = m;
    for (let i = 0; i < 30; i++) E -= (E - e * Math.sin(E) - m) / (1 - e * Math.cos(E));
    const nu = 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
    return gamma + k * (Math.cos(nu + omega) + e * Math.cos(omega));
  };
  const random = seededRandom(9);
  const noise = gaussianNoise(random);
  const bjdTdb: number[] = [];
  const velocityKmPerS: number[] = [];
  const uncertaintyKmPerS: number[] = [];
  let t = 2460403.3;
  for (let i = 0; i < 26; i++) {
    t += 1 + 4 * random();
    const sigma = 1.5 + 2 * random();
    bjdTdb.push(t);
    velocityKmPerS.push(velocity(t) + sigma * noise());
    uncertaintyKmPerS.push(sigma);
  }
  return { bjdTdb, velocityKmPerS, uncertaintyKmPerS, orbitVelocityKmPerS: velocity, systemicVelocityKmPerS: gamma, periodDays: period, epochBjdTdb: tPeri };
}

/** A classical Lomb–Scargle periodogram of the sample orbit (for the picture; not the library's method). */
export function samplePeriodogram() {
  const { bjdTdb, velocityKmPerS } = sampleOrbit();
  const mean = velocityKmPerS.reduce((a, b) => a + b, 0) / velocityKmPerS.length;
  const y = velocityKmPerS.map((v) => v - mean);
  const variance = y.reduce((a, b) => a + b * b, 0) / (y.length - 1);
  const frequencyPerDay: number[] = [];
  const power: number[] = [];
  for (let f = 0.01; f <= 1.2; f += 0.0005) {
    const w = 2 * Math.PI * f;
    let s2 = 0;
    let c2 = 0;
    for (const t of bjdTdb) { s2 += Math.sin(2 * w * t); c2 += Math.cos(2 * w * t); }
    const tau = Math.atan2(s2, c2) / (2 * w);
    let yc = 0; let ys = 0; let cc = 0; let ss = 0;
    bjdTdb.forEach((t, i) => {
      const c = Math.cos(w * (t - tau));
      const s = Math.sin(w * (t - tau));
      yc += y[i] * c; ys += y[i] * s; cc += c * c; ss += s * s;
    });
    frequencyPerDay.push(f);
    power.push((yc * yc / cc + ys * ys / ss) / (2 * variance) / (y.length / 2));
  }
  return { frequencyPerDay, power, falseAlarmLevels: [{ probability: 0.01, power: 0.52 }, { probability: 0.001, power: 0.61 }] };
}

/** Every gallery plot by file name. */
export function galleryPlots(): Record<string, VegaLiteSpec> {
  return {
    spectrum: spectrumPlot(sampleSpectrum(), { title: 'LVAC-7 (invented), 2025-03-14' }),
    'line-fit': lineFitPlot(sampleLineFit(), { title: 'Blend near 6579 Å (invented)' }),
    calibration: calibrationResidualPlot(sampleCalibration(), { title: 'Neon lamp calibration (invented)' }),
    'calibration-km-s': calibrationResidualPlot({ ...sampleCalibration(), dispersion: undefined }, { residualUnit: 'kmPerS' }),
    'cross-correlation': crossCorrelationPlot(sampleCrossCorrelation(), { title: 'Cross-correlation with an A-star template (invented)' }),
    'velocity-curve': velocityCurvePlot(sampleOrbit(), { title: 'LVAC-7 radial velocities (invented)' }),
    periodogram: periodogramPlot(samplePeriodogram(), { title: 'LVAC-7 periodogram (invented)' }),
    'periodogram-frequency': periodogramPlot(samplePeriodogram(), { xAxis: 'frequency' }),
    'phase-folded': phaseFoldedVelocityPlot(sampleOrbit(), { title: 'LVAC-7 folded on P = 4.237 d (invented)' }),
  };
}
