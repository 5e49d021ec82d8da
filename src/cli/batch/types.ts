/**
 * The values that travel between the batch command, its planner and its workers. Every one
 * is plain data (structured-clonable), so that it can be posted to a worker thread.
 */
import type { WavelengthHint } from '../../calibrate/identify.js';
import type { LineProfile } from '../../fit/profiles.js';
import type { CcfUncertaintyMethod } from '../../velocity/ccf.js';
import type { DopplerFormula } from '../../velocity/doppler.js';

/** How each star exposure is reduced (the options of `lineshift batch`, parsed). */
export interface BatchSettings {
  /** Lamp gases, as for `lineshift calibrate --lamp`. */
  readonly lamp: string;
  /** Order of the dispersion solutions (default: calibrateLamp's). */
  readonly order?: number;
  /** Wavelength hint for the lamps; a grating hint's set-up gets each lamp's pixel count. */
  readonly hint?: WavelengthHint;
  /** Line detection threshold for the lamps, σ. */
  readonly significance?: number;
  /** Saturation level of the camera, ADU; default: each lamp's SATURATE card, if any. */
  readonly saturationAdu?: number;
  /** How the velocity is measured. */
  readonly velocity: {
    readonly method: 'lines' | 'ccf';
    /** Shipped line lists (spectra such as `H I`, `Fe II`). */
    readonly species: readonly string[];
    readonly maxLinesPerSpecies?: number;
    readonly profile?: LineProfile;
    readonly resolvingPower?: number;
    readonly velocityRangeKmPerS?: { readonly min: number; readonly max: number };
    readonly formula?: DopplerFormula;
    readonly uncertaintyMethod?: CcfUncertaintyMethod;
  };
  /** Output folder (absolute). */
  readonly outDir: string;
  /** Folder the inputs' relative names are taken from (absolute): outputs mirror the layout below it. */
  readonly root: string;
  /** Working directory (absolute), for the names shown in messages. */
  readonly cwd: string;
}

/** One star exposure with the lamp frames chosen for it. Paths are absolute. */
export interface StarJob {
  /** Position in the plan (0-based). */
  readonly index: number;
  readonly star: string;
  /** The lamp taken before the star (the latest one in the same folder), or null. */
  readonly lampBefore: string | null;
  /** The lamp taken after the star (the earliest one in the same folder), or null. */
  readonly lampAfter: string | null;
  /** The star's path relative to the root, used as its label and for its outputs. */
  readonly label: string;
}

/** At which stage a file failed. */
export type BatchStage = 'read' | 'classify' | 'pair' | 'calibrate' | 'velocity' | 'write' | 'internal';

/** One failure: the file, the stage, a stable code and the message. */
export interface BatchFailure {
  /** The file as shown to the user (relative to the working directory). */
  readonly file: string;
  readonly stage: BatchStage;
  readonly code: string;
  readonly message: string;
}

/** A value with its 1-σ uncertainty. */
export interface Measured {
  readonly value: number;
  readonly uncertainty: number;
}

/** What became of one lamp frame. */
export interface LampOutcome {
  /** The lamp file as shown (relative to the working directory). */
  readonly file: string;
  readonly role: 'before' | 'after';
  readonly ok: boolean;
  readonly reason: string | null;
  readonly message: string;
  readonly order: number;
  readonly rmsAngstrom: number | null;
  readonly rmsKmPerS: number | null;
  readonly linesMeasured: number;
  readonly linesUsed: number;
  readonly midpointUtc: string | null;
  /** The solution file written (relative to the working directory), or null. */
  readonly solutionFile: string | null;
}

/** The reduction of one star exposure. */
export interface StarResult {
  readonly index: number;
  /** The star file as shown. */
  readonly file: string;
  readonly label: string;
  readonly object: string | null;
  readonly lamps: readonly LampOutcome[];
  /** `interpolated` (two lamps), `before` or `after` (one lamp). */
  readonly calibration: 'interpolated' | 'before' | 'after';
  /** Weight of the lamp after the star in the interpolation (null with one lamp). */
  readonly weightAfter: number | null;
  /** Wavelength error of the solution applied, converted to velocity at the middle of the spectrum, km/s (enters the velocity's uncertainty). */
  readonly calibrationUncertaintyKmPerS: number;
  /** The calibrated spectrum written (relative to the working directory). */
  readonly calibratedFile: string;
  readonly midpointUtc: string;
  readonly bjdTdb: number;
  readonly barycentricCorrectionKmPerS: number;
  readonly method: 'lines' | 'ccf';
  /** Velocity in the observer's frame, km/s. */
  readonly measuredVelocity: Measured;
  /** Barycentric radial velocity, km/s (1 + z = (1 + z_meas)(1 + z_B)). */
  readonly radialVelocity: Measured;
  /** Lines method: lines used and rejected and χ²/ν; CCF: the peak height and FWHM. */
  readonly detail: Readonly<Record<string, number | string | null>>;
  readonly warnings: readonly string[];
  /** Time spent on this star in its worker, ms. */
  readonly milliseconds: number;
}

/** What a worker sends back for a job: a result, or a failure (with any outputs already written). */
export type JobOutcome =
  | { readonly kind: 'result'; readonly result: StarResult }
  | { readonly kind: 'failure'; readonly failure: BatchFailure; readonly milliseconds: number };
