/**
 * Where the demo's velocity errors come from: each LVAC-7 night's error against the INVENTED
 * truth split into its parts with the truth's help (test/demo/velocity-budget.test.ts and
 * bench/demo-velocity-budget.ts use it).
 *
 * - Calibration: the wavelengths the pipeline gave the star (lamps before and after,
 *   interpolated to mid-exposure) against the star frame's true dispersion (truth.json's
 *   set-up through the grating equation), as c·Δλ/λ at the star's line positions.
 * - Measurement: the raw star frame put on its TRUE wavelengths and measured as the batch
 *   measures (lines with Voigt profiles, or cross-correlation with a line-list template):
 *   what remains is the measurement's own error.
 * - Noise: the realised noise (frame − noise-free model) projected on the model's velocity
 *   derivative, δv = Σ rᵢ Mᵢ′/σᵢ² / Σ Mᵢ′²/σᵢ² (the error of the optimal linear estimator;
 *   its expectation is 0 and its spread the photon-noise limit). A measurement error that
 *   tracks δv night by night is noise, not a bias.
 * - Generator: the noise-free model on the true grid, measured: any error there is a bias of
 *   the measurement (or a generator that does not put the lines where the truth says).
 */
import { gratingPixelToWavelength, type SlitSpectrographSetup } from '../../src/calibrate/grating.js';
import { lineListTemplate } from '../../src/lines/synthetic.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/spectrum/constants.js';
import { createSpectrum, type Spectrum } from '../../src/spectrum/spectrum.js';
import { crossCorrelationVelocity } from '../../src/velocity/ccf.js';
import { shiftWavelength } from '../../src/velocity/doppler.js';
import { velocityFromLines, type LineVelocityRow } from '../../src/velocity/lines.js';
import { lvac12StarModel, lvac7Lines, lvac7StarModel, type Scenario, type TrueExposure } from '../../data/demo/generate.js';

/** The species the demo measures LVAC-7 with (`--species 'H,Si II,Fe II'`). */
export const LVAC7_VELOCITY_SPECIES: readonly string[] = ['H I', 'Si II', 'Fe II'];

/** λ (Å, air) of every pixel of a frame's true set-up. */
export function trueWavelengths(setup: SlitSpectrographSetup): Float64Array {
  return Float64Array.from({ length: setup.pixels! }, (_, p) => gratingPixelToWavelength(setup, p));
}

/** A raw (pixel-axis) frame's flux and uncertainty on the given true air wavelengths. */
export function onTrueGrid(raw: Pick<Spectrum, 'flux' | 'uncertainty'>, wavelengthAngstrom: Float64Array): Spectrum {
  return createSpectrum({
    wavelength: wavelengthAngstrom, flux: raw.flux, uncertainty: raw.uncertainty ?? undefined, unit: 'angstrom', medium: 'air', provenance: [],
  });
}

/** One measurement: velocity (km/s, observer's frame) and its uncertainty, plus the per-line table of the line method. */
export interface BudgetMeasurement {
  readonly velocityKmPerS: number;
  readonly uncertaintyKmPerS: number;
  readonly lines: readonly LineVelocityRow[];
}

/** Measures a calibrated LVAC-7 spectrum as `lineshift batch` does in the demo (lines: Voigt profiles; ccf: line-list template at λ/(2.5 pixels)). */
export function measureLvac7(spectrum: Spectrum, method: 'lines' | 'ccf'): BudgetMeasurement {
  if (method === 'lines') {
    const r = velocityFromLines(spectrum, { species: LVAC7_VELOCITY_SPECIES, profile: 'voigt' });
    return { velocityKmPerS: r.velocity.value, uncertaintyKmPerS: r.velocity.uncertainty, lines: r.lines };
  }
  const w = spectrum.wavelength;
  const lo = w[0];
  const hi = w[w.length - 1];
  const R = (0.5 * (lo + hi)) / (2.5 * ((hi - lo) / (w.length - 1)));
  const template = lineListTemplate({ species: LVAC7_VELOCITY_SPECIES, startAngstrom: lo, endAngstrom: hi, medium: 'air', resolvingPower: R });
  const r = crossCorrelationVelocity(spectrum, template, {});
  return { velocityKmPerS: r.velocity.value, uncertaintyKmPerS: r.velocity.uncertainty, lines: [] };
}

/** The noise-free star frame (ADU) of an exposure, from the generator's own model and the truth's values. */
export function noiseFreeStar(scenario: Scenario, e: TrueExposure, velocityKmPerS = e.topocentricVelocityKmPerS): Float64Array {
  return lvac7StarModel(scenario, e.dispersion.star.setup, velocityKmPerS, e.airmass, e.peakSignalToNoise);
}

/**
 * The realised noise of a star frame projected on the model's velocity derivative (km/s):
 * δv = Σ (Fᵢ − Mᵢ) Mᵢ′/σᵢ² / Σ Mᵢ′²/σᵢ², σᵢ from the model's photon and read noise, M′ by
 * central differences at ±0.5 km/s. Also returns the photon-noise limit 1/√Σ Mᵢ′²/σᵢ².
 */
export function noiseProjectionKmPerS(scenario: Scenario, e: TrueExposure, flux: ArrayLike<number>): { deltaKmPerS: number; limitKmPerS: number } {
  const v = e.topocentricVelocityKmPerS;
  const m = noiseFreeStar(scenario, e);
  const up = noiseFreeStar(scenario, e, v + 0.5);
  const down = noiseFreeStar(scenario, e, v - 0.5);
  const g = scenario.instrument.gainElectronsPerAdu;
  const rn = scenario.instrument.readNoiseElectrons;
  let num = 0;
  let den = 0;
  for (let i = 0; i < m.length; i++) {
    const variance = (m[i] * g + rn * rn) / (g * g);
    const d = up[i] - down[i];
    num += ((flux[i] - m[i]) * d) / variance;
    den += (d * d) / variance;
  }
  return { deltaKmPerS: num / den, limitKmPerS: 1 / Math.sqrt(den) };
}

/**
 * The calibration's error at the star's lines: c·(λ_calibrated − λ_true)/λ_true at the
 * observed position of each of LVAC-7's lines (km/s; positive = wavelengths too long,
 * which reads as a velocity too high). `calibrated` holds the pipeline's wavelength of
 * every pixel of the star frame.
 */
export function calibrationOffsetsKmPerS(scenario: Scenario, e: TrueExposure, calibrated: ArrayLike<number>): { species: string; restAngstrom: number; offsetKmPerS: number }[] {
  const truth = trueWavelengths(e.dispersion.star.setup);
  return lvac7Lines(scenario.binary.projectedRotationKmPerS).map((l) => ({
    species: l.species!, restAngstrom: l.wavelengthAngstrom, offsetKmPerS: calibrationOffsetAtKmPerS(truth, calibrated, l.wavelengthAngstrom, e.topocentricVelocityKmPerS),
  }));
}

/**
 * c·(λ_calibrated − λ_true)/λ_true where a line of rest wavelength `restAngstrom` falls on a
 * frame moving at `velocityKmPerS`: the pixel comes from the true grid `truth`, the calibrated
 * wavelength from `calibrated` at that pixel (linear between pixels). Air wavelengths scale with
 * the Doppler factor to within 10⁻⁸ here (the refractive index barely changes over 1 Å).
 */
function calibrationOffsetAtKmPerS(truth: Float64Array, calibrated: ArrayLike<number>, restAngstrom: number, velocityKmPerS: number): number {
  const observed = shiftWavelength(restAngstrom, velocityKmPerS);
  let p = 0;
  while (p < truth.length - 2 && truth[p + 1] < observed) p++;
  const f = (observed - truth[p]) / (truth[p + 1] - truth[p]);
  const at = calibrated[p] + f * (calibrated[p + 1] - calibrated[p]);
  return (SPEED_OF_LIGHT_KM_PER_S * (at - observed)) / observed;
}

/** One Balmer line of LVAC-12's velocity in {@link lvac12Budget}. */
export interface Lvac12BudgetLine {
  /** Rest wavelength, Å, air. */
  readonly restAngstrom: number;
  /** The measurement's weight of the line (1/σ², km/s⁻²). */
  readonly weight: number;
  /** Calibration error at the line, km/s (c·Δλ/λ; positive reads as a velocity too high). */
  readonly calibrationKmPerS: number;
  /** The same line measured on the noise-free frame on its true wavelengths, minus the truth, km/s. */
  readonly noiseFreeKmPerS: number;
}

/** Where LVAC-12's velocity error comes from, each part weighted as the measurement weighted its lines. */
export interface Lvac12Budget {
  readonly lines: readonly Lvac12BudgetLine[];
  /** Measured − true (observer's frame), km/s. */
  readonly totalKmPerS: number;
  /** The calibration's part, km/s. */
  readonly calibrationKmPerS: number;
  /** The measurement's own bias (the metal lines inside the Balmer profiles at R ≈ 900), from the noise-free frame, km/s. */
  readonly blendKmPerS: number;
  /** What is left (the realised noise), km/s, and the statistical uncertainty to compare it with. */
  readonly remainderKmPerS: number;
  readonly statisticalKmPerS: number;
}

/**
 * Splits LVAC-12's measured velocity error (the demo's step 9: Balmer lines, Voigt profiles)
 * with the truth's help: the calibration's error at each line used (the pipeline's
 * wavelengths against the frame's true set-up), and the bias of the measurement itself (the
 * generator's noise-free frame on its true wavelengths, measured the same way); the rest is
 * noise. `calibrated` is the pipeline's wavelength of every pixel; `lines` and the
 * velocities are the step's output.
 */
export function lvac12Budget(scenario: Scenario, truth: { topocentricVelocityKmPerS: number; airmass: number; dispersion: { star: { setup: SlitSpectrographSetup } } },
  calibrated: ArrayLike<number>, measured: { measuredKmPerS: number; statisticalKmPerS: number; lines: readonly LineVelocityRow[] }): Lvac12Budget {
  const v = truth.topocentricVelocityKmPerS;
  const grid = trueWavelengths(truth.dispersion.star.setup);
  const model = lvac12StarModel(scenario, v, truth.airmass);
  const g = scenario.instrument.gainElectronsPerAdu;
  const rn = scenario.instrument.readNoiseElectrons;
  const clean = createSpectrum({ wavelength: grid, flux: model, uncertainty: model.map((m) => Math.sqrt(m * g + rn * rn) / g), unit: 'angstrom', medium: 'air', provenance: [] });
  const noiseFree = velocityFromLines(clean, { species: ['H I'], profile: 'voigt' }).lines;
  const lines = measured.lines.filter((l) => l.reason === null && l.velocityKmPerS).map((l): Lvac12BudgetLine => {
    const clean = noiseFree.find((r) => Math.abs(r.restWavelengthAngstrom - l.restWavelengthAngstrom) < 1e-6)?.velocityKmPerS;
    return {
      restAngstrom: l.restWavelengthAngstrom,
      weight: 1 / l.velocityKmPerS!.uncertainty ** 2,
      calibrationKmPerS: calibrationOffsetAtKmPerS(grid, calibrated, l.restWavelengthAngstrom, v),
      noiseFreeKmPerS: clean ? clean.value - v : NaN,
    };
  });
  const w = lines.reduce((s, l) => s + l.weight, 0);
  const weighted = (k: 'calibrationKmPerS' | 'noiseFreeKmPerS') => lines.reduce((s, l) => s + l.weight * l[k], 0) / w;
  const totalKmPerS = measured.measuredKmPerS - v;
  const calibrationKmPerS = weighted('calibrationKmPerS');
  const blendKmPerS = weighted('noiseFreeKmPerS');
  return { lines, totalKmPerS, calibrationKmPerS, blendKmPerS, remainderKmPerS: totalKmPerS - calibrationKmPerS - blendKmPerS, statisticalKmPerS: measured.statisticalKmPerS };
}
