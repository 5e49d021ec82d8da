/**
 * How close the demo comes to the truth it was generated from. This checks the whole chain
 * (lamp calibration, interpolation, velocities, barycentric correction, orbit) against our
 * own INVENTED truth in data/demo/truth.json — not against the outside world.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { DemoTruth, Scenario, TrueDispersion } from '../../data/demo/generate.js';
import { gratingPixelToWavelength } from '../../src/calibrate/grating.js';
import type { BatchReport } from '../../src/cli/commands/batch.js';
import type { ElementsReport } from '../../src/cli/commands/elements.js';
import type { VelocityReport } from '../../src/cli/commands/velocity.js';
import { readSpectrum } from '../../src/io/read.js';
import { lnGamma } from '../../src/orbit/special.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/spectrum/constants.js';
import { REPO } from './paths.js';
import { lvac12Budget, type Lvac12Budget } from './velocity-budget.js';

/** A value with its 1-σ uncertainty. */
export interface Measured {
  readonly value: number;
  readonly uncertainty: number;
}

/** What `lineshift orbit --json` prints (the parts the demo uses). */
export interface OrbitJson {
  converged: boolean;
  message: string;
  period: Measured;
  periastronTime: Measured;
  eccentricity: Measured;
  omega: Measured;
  semiAmplitude: Measured;
  systemicVelocity: Measured;
  massFunction: Measured;
  projectedSemiMajorAxis: Measured;
  chiSquare: number;
  degreesOfFreedom: number;
  reducedChiSquare: number;
  rms: number;
  residuals: number[];
  lucySweeney: { probability: number; circularPreferred: boolean };
  alternatives: { period: number; chiSquare: number }[];
  provenance: unknown[];
}

/** What `lineshift periodogram --json` prints (the parts the demo uses). */
export interface PeriodogramJson {
  pointCount: number;
  timeSpan: number;
  minPeriod: number;
  maxPeriod: number;
  bestPeriod: number;
  bestFrequency: number;
  bestPower: number;
  falseAlarmProbability: number;
  peaks: { period: number; frequency: number; power: number }[];
  aliases: { period: number; power: number; windowCycle: string | null; sign: number }[];
  frequency: number[];
  power: number[];
}

/** One night: measured against true. */
export interface NightComparison {
  readonly night: string;
  readonly label: string;
  readonly bjdTdb: number;
  /** Barycentric radial velocity measured, km/s. */
  readonly measured: Measured;
  /** The true barycentric radial velocity (the orbit at BJD_TDB), km/s. */
  readonly trueKmPerS: number;
  /** (measured − true)/σ. */
  readonly pull: number;
  /** Measured BJD_TDB − true, s. */
  readonly bjdDifferenceSeconds: number;
  /** Measured barycentric correction − true, m/s. */
  readonly correctionDifferenceMPerS: number;
  /** Largest |λ − λ_true| over the calibrated star spectrum's pixels, converted to km/s at each pixel. */
  readonly wavelengthErrorMaxKmPerS: number;
  /** (λ − λ_true)/λ_true · c at the middle pixel of the calibrated star spectrum, km/s: the calibration's error of the velocity zero point. */
  readonly wavelengthErrorMiddleKmPerS: number;
  /** The calibration error the pipeline stated for this star, km/s. */
  readonly statedCalibrationKmPerS: number;
}

/** Statistics of pulls (measured − true)/σ. */
export interface PullStatistics {
  readonly count: number;
  readonly chiSquare: number;
  /** P(χ² ≥ observed) for `count` degrees of freedom (the truth has no fitted parameter). */
  readonly chiSquareProbability: number;
  readonly meanPull: number;
  /** Standard deviation of the pulls about zero: √(χ²/N). */
  readonly rmsPull: number;
  readonly maxAbsPull: number;
}

/** One orbital element: fitted against true. */
export interface ElementComparison {
  readonly name: string;
  readonly unit: string;
  readonly fitted: Measured;
  readonly trueValue: number;
  /** (fitted − true)/σ. */
  readonly pull: number;
}

/** The species of LVAC-12: what was put in, what was found. */
export interface SpeciesComparison {
  readonly species: string;
  readonly verdict: string;
  readonly inComposition: boolean;
  readonly linesPutIn: number;
  readonly linesMatched: number;
  readonly linesExpected: number;
}

/** Everything compared. */
export interface DemoComparison {
  readonly nights: readonly NightComparison[];
  readonly pulls: PullStatistics;
  readonly orbit: readonly ElementComparison[];
  readonly calibration: {
    readonly night: string;
    readonly file: string;
    /** RMS and largest |λ_solution − λ_true| over the lamp's pixels, Å. */
    readonly rmsErrorAngstrom: number;
    readonly maxErrorAngstrom: number;
    /** The solution's own 1-σ error, largest over the pixels, Å. */
    readonly statedMaxAngstrom: number;
  };
  readonly lvac12: {
    readonly measured: Measured;
    readonly trueKmPerS: number;
    readonly pull: number;
    /** The velocity error split into calibration, the measurement's bias and noise (observer's frame). */
    readonly budget: Lvac12Budget;
    readonly species: readonly SpeciesComparison[];
    /** Species called present that the star does not have (should be empty). */
    readonly falsePresent: readonly string[];
    /** Species of the composition called present or possible. */
    readonly found: readonly string[];
  };
}

/**
 * Upper tail of the χ² distribution with k degrees of freedom: Q(k/2, x/2), the regularized
 * upper incomplete gamma function, by its series (x < a + 1) or continued fraction
 * (Numerical Recipes 3rd ed., Press et al. 2007, §6.2; from memory).
 */
export function chiSquareUpperTail(x: number, k: number): number {
  const a = k / 2;
  const y = x / 2;
  if (!(y > 0)) return 1;
  const lnPrefix = -y + a * Math.log(y) - lnGamma(a);
  if (y < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 500; n++) {
      term *= y / (a + n);
      sum += term;
      if (term < sum * 1e-16) break;
    }
    return Math.max(0, 1 - sum * Math.exp(lnPrefix));
  }
  // Lentz's continued fraction for Q.
  const tiny = 1e-300;
  let b = y + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 500; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(lnPrefix) * h;
}

/** Statistics of a list of pulls. */
export function pullStatistics(pulls: readonly number[]): PullStatistics {
  const n = pulls.length;
  const chi2 = pulls.reduce((s, p) => s + p * p, 0);
  return {
    count: n,
    chiSquare: chi2,
    chiSquareProbability: chiSquareUpperTail(chi2, n),
    meanPull: pulls.reduce((s, p) => s + p, 0) / n,
    rmsPull: Math.sqrt(chi2 / n),
    maxAbsPull: Math.max(...pulls.map(Math.abs)),
  };
}

/** Largest and RMS |λ(p) − λ_true(p)| over the pixels, Å, and the largest in km/s. */
function wavelengthErrors(wavelengthAngstrom: ArrayLike<number>, truthDispersion: TrueDispersion): { rms: number; max: number; maxKmPerS: number; middleKmPerS: number } {
  let s = 0;
  let max = 0;
  let maxV = 0;
  for (let p = 0; p < wavelengthAngstrom.length; p++) {
    const t = gratingPixelToWavelength(truthDispersion.setup, p);
    const d = wavelengthAngstrom[p] - t;
    s += d * d;
    max = Math.max(max, Math.abs(d));
    maxV = Math.max(maxV, (Math.abs(d) / t) * SPEED_OF_LIGHT_KM_PER_S);
  }
  const mid = wavelengthAngstrom.length >> 1;
  const tMid = gratingPixelToWavelength(truthDispersion.setup, mid);
  return { rms: Math.sqrt(s / wavelengthAngstrom.length), max, maxKmPerS: maxV, middleKmPerS: ((wavelengthAngstrom[mid] - tMid) / tMid) * SPEED_OF_LIGHT_KM_PER_S };
}

/** The orbit's periastron time of the truth moved by whole true periods to the passage nearest the fitted one. */
function nearestPeriastron(truth: DemoTruth, fittedT: number): number {
  const { periodDays: P, periastronTimeBjdTdb: T } = truth.orbit;
  return T + Math.round((fittedT - T) / P) * P;
}

/** Inputs of {@link compareWithTruth}: the outputs of the demo's steps. */
export interface ComparisonInputs {
  readonly scenario: Scenario;
  readonly truth: DemoTruth;
  readonly batch: BatchReport;
  readonly orbit: OrbitJson;
  /** The calibrated night: its name, the lamp file, and λ of each lamp pixel under the solution. */
  readonly calibration: { readonly night: string; readonly file: string; readonly wavelengthAngstrom: ArrayLike<number>; readonly statedMaxAngstrom: number };
  readonly lvac12Velocity: VelocityReport;
  /** λ of every pixel of LVAC-12's calibrated spectrum, Å. */
  readonly lvac12Wavelengths: ArrayLike<number>;
  readonly elements: ElementsReport;
}

/**
 * Compares the demo's outputs with the truth: per-night velocities, BJD_TDB and corrections,
 * the calibrated wavelengths of every star, the orbital elements, one lamp's solution, and
 * LVAC-12's velocity and species.
 */
export function compareWithTruth(inputs: ComparisonInputs): DemoComparison {
  const { truth, batch, orbit } = inputs;
  const nights = batch.results.map((r): NightComparison => {
    const t = truth.exposures.find((e) => e.files.star.endsWith(r.label));
    if (!t) throw new Error(`no truth for ${r.label}`);
    const calibrated = readSpectrum(join(REPO, r.calibratedFile));
    const err = wavelengthErrors(calibrated.wavelength, t.dispersion.star);
    return {
      night: t.night,
      label: r.label,
      bjdTdb: r.bjdTdb,
      measured: r.radialVelocity,
      trueKmPerS: t.barycentricVelocityKmPerS,
      pull: (r.radialVelocity.value - t.barycentricVelocityKmPerS) / r.radialVelocity.uncertainty,
      bjdDifferenceSeconds: (r.bjdTdb - t.bjdTdb) * 86400,
      correctionDifferenceMPerS: (r.barycentricCorrectionKmPerS - t.barycentricCorrectionKmPerS) * 1000,
      wavelengthErrorMaxKmPerS: err.maxKmPerS,
      wavelengthErrorMiddleKmPerS: err.middleKmPerS,
      statedCalibrationKmPerS: r.calibrationUncertaintyKmPerS,
    };
  });
  const o = truth.orbit;
  const element = (name: string, unit: string, fitted: Measured, trueValue: number): ElementComparison => ({ name, unit, fitted, trueValue, pull: (fitted.value - trueValue) / fitted.uncertainty });
  const calib = inputs.calibration;
  const lampTruth = truth.exposures.find((e) => e.night === calib.night)!.dispersion.lampBefore;
  const calErr = wavelengthErrors(calib.wavelengthAngstrom, lampTruth);

  const v = inputs.lvac12Velocity.radialVelocity!;
  const composition = new Map(truth.lvac12.composition.map((c) => [c.species, c.lines]));
  const species = inputs.elements.elements
    .filter((e) => e.linesExpected > 0)
    .map((e): SpeciesComparison => ({
      species: e.species, verdict: e.verdict, inComposition: composition.has(e.species), linesPutIn: composition.get(e.species) ?? 0,
      linesMatched: e.linesMatched, linesExpected: e.linesExpected,
    }));
  return {
    nights,
    pulls: pullStatistics(nights.map((n) => n.pull)),
    orbit: [
      element('Period P', 'd', orbit.period, o.periodDays),
      element('Periastron time T', 'BJD_TDB', orbit.periastronTime, nearestPeriastron(truth, orbit.periastronTime.value)),
      element('Eccentricity e', '', orbit.eccentricity, o.eccentricity),
      element('Argument of periastron ω', '°', orbit.omega, o.omegaDeg),
      element('Semi-amplitude K', 'km/s', orbit.semiAmplitude, o.semiAmplitudeKmPerS),
      element('Systemic velocity γ', 'km/s', orbit.systemicVelocity, o.systemicVelocityKmPerS),
    ],
    calibration: { night: calib.night, file: calib.file, rmsErrorAngstrom: calErr.rms, maxErrorAngstrom: calErr.max, statedMaxAngstrom: calib.statedMaxAngstrom },
    lvac12: {
      measured: v,
      trueKmPerS: truth.lvac12.barycentricVelocityKmPerS,
      pull: (v.value - truth.lvac12.barycentricVelocityKmPerS) / v.uncertainty,
      budget: lvac12Budget(inputs.scenario, truth.lvac12, inputs.lvac12Wavelengths, {
        measuredKmPerS: inputs.lvac12Velocity.measuredVelocity.value,
        statisticalKmPerS: inputs.lvac12Velocity.combination?.statisticalUncertaintyKmPerS ?? NaN,
        lines: inputs.lvac12Velocity.lines ?? [],
      }),
      species,
      falsePresent: species.filter((s) => s.verdict === 'present' && !s.inComposition).map((s) => s.species),
      found: species.filter((s) => s.inComposition && s.verdict !== 'not detected').map((s) => s.species),
    },
  };
}

/** Reads a JSON file of the repository. */
export function readJson<T>(relativePath: string): T {
  return JSON.parse(readFileSync(join(REPO, relativePath), 'utf8')) as T;
}
