import { InputError, UsageError } from '../errors.js';
import { SPEED_OF_LIGHT_KM_PER_S } from './constants.js';
import type { SpectralUnit } from './spectrum.js';
import { unitSymbol } from './units.js';

/** Largest grid the builders make (pixels); a larger one is almost surely a mistake in `step`. */
export const MAX_GRID_PIXELS = 10_000_000;

/** An output grid for {@link resampleSpectrum}: pixel centres and the edges of their bins. */
export interface WavelengthGrid {
  /** Pixel centres, strictly increasing, in `unit`. */
  readonly wavelength: Float64Array;
  /** Bin edges (one more than the centres), strictly increasing: bin i is [edges[i], edges[i+1]]. */
  readonly edges: Float64Array;
  /** Unit of `wavelength` and `edges`. */
  readonly unit: Exclude<SpectralUnit, 'pixel'>;
  /** `linear` (constant step), `log-linear` (constant step in ln λ) or `irregular`. */
  readonly spacing: 'linear' | 'log-linear' | 'irregular';
  /** Step between centres in `unit` (linear grids). */
  readonly step?: number;
  /** Step in ln λ between centres (log-linear grids). */
  readonly logStep?: number;
  /** c · Δln λ in km/s (log-linear grids); see {@link logGridVelocityStepKmPerS}. */
  readonly velocityStepKmPerS?: number;
}

/** Options of {@link linearGrid}: give exactly one of `step` and `count`. */
export interface LinearGridOptions {
  /** First pixel centre, in `unit`. */
  start: number;
  /** Last pixel centre (with `count`) or upper limit for the centres (with `step`), in `unit`; above `start`. */
  end: number;
  /** Step between centres, in `unit` (> 0). The last centre is the largest start + k·step ≤ end. */
  step?: number;
  /** Number of pixels (≥ 2): centres from `start` to `end` inclusive. */
  count?: number;
  /** Unit of `start`, `end` and `step`; default Å. */
  unit?: Exclude<SpectralUnit, 'pixel'>;
}

/** Options of {@link logLinearGrid}: give exactly one of `velocityStepKmPerS` and `count`. */
export interface LogLinearGridOptions {
  /** First pixel centre, in `unit` (> 0). */
  start: number;
  /** Last pixel centre (with `count`) or upper limit for the centres, in `unit`; above `start`. */
  end: number;
  /** Step per pixel as a velocity, c · Δln λ, in km/s (> 0). */
  velocityStepKmPerS?: number;
  /** Number of pixels (≥ 2): centres from `start` to `end` inclusive. */
  count?: number;
  /** Unit of `start` and `end`; default Å. */
  unit?: Exclude<SpectralUnit, 'pixel'>;
}

/** Default unit of the grid builders. */
const DEFAULT_GRID_UNIT = 'angstrom';

/** Relative slack when deciding whether the last step still fits below `end`. */
const STEP_SLACK = 1e-9;

function checkRange(start: number, end: number, unit: string): void {
  if (!Number.isFinite(start) || !Number.isFinite(end)) throw new UsageError('grid.bad-range', `the grid needs finite start and end (got ${start} and ${end})`);
  if (!(end > start)) throw new UsageError('grid.bad-range', `the grid's end (${end} ${unit}) must be above its start (${start} ${unit})`);
}

function checkCount(count: number): void {
  if (!Number.isInteger(count) || count < 2) throw new UsageError('grid.bad-count', `the grid needs an integer count of at least 2 pixels (got ${count})`);
  if (count > MAX_GRID_PIXELS) throw new UsageError('grid.too-large', `a grid of ${count} pixels is larger than the limit of ${MAX_GRID_PIXELS}`);
}

function exactlyOne(a: number | undefined, b: number | undefined, names: string): void {
  if ((a === undefined) === (b === undefined)) throw new UsageError('grid.step-or-count', `give exactly one of ${names}`);
}

/**
 * A grid with a constant step in wavelength.
 *
 * Centre i is `start + i·step` (computed directly, not by accumulation); the bin of each
 * centre reaches half a step to either side.
 *
 * @param options `start`, `end` (in `unit`, default Å) and either `step` or `count`.
 * @returns a {@link WavelengthGrid} with `spacing: 'linear'`.
 * @throws {UsageError} for a non-finite or empty range, a step ≤ 0, a count < 2, both or
 *   neither of step and count, or more than {@link MAX_GRID_PIXELS} pixels.
 * @example
 * const g = linearGrid({ start: 6500, end: 6600, step: 0.5 });
 * g.wavelength.length; // 201
 * g.edges[0]; // 6499.75
 */
export function linearGrid(options: LinearGridOptions): WavelengthGrid {
  const unit = options.unit ?? DEFAULT_GRID_UNIT;
  const { start, end } = options;
  checkRange(start, end, unitSymbol(unit));
  exactlyOne(options.step, options.count, 'step and count');
  let count: number;
  let step: number;
  if (options.step !== undefined) {
    step = options.step;
    if (!(step > 0) || !Number.isFinite(step)) throw new UsageError('grid.bad-step', `the grid step must be a positive number (got ${step})`);
    const k = Math.floor(((end - start) / step) * (1 + STEP_SLACK));
    checkCount(Math.min(k + 1, MAX_GRID_PIXELS + 1));
    count = k + 1;
  } else {
    count = options.count!;
    checkCount(count);
    step = (end - start) / (count - 1);
  }
  const wavelength = new Float64Array(count);
  const edges = new Float64Array(count + 1);
  for (let i = 0; i < count; i++) wavelength[i] = start + i * step;
  if (options.count !== undefined) wavelength[count - 1] = end;
  for (let i = 0; i <= count; i++) edges[i] = start + (i - 0.5) * step;
  return Object.freeze({ wavelength, edges, unit, spacing: 'linear' as const, step });
}

/**
 * A grid with a constant step in ln λ (constant velocity per pixel), as used for
 * cross-correlation: a Doppler shift is then the same number of pixels everywhere.
 *
 * The step is Δln λ = v/c with c = 299 792.458 km/s (exact, SI). Convention (common
 * practice): c·Δln λ is the pixel's velocity step; a relativistic Doppler shift of
 * velocity v moves a line by artanh(v/c)/Δln λ pixels, which differs from v/(c·Δln λ) by
 * a relative (v/c)²/3 (4·10⁻⁹ at 30 km/s). Centre i is
 * `start·exp(i·Δ)`; bin edges are the geometric midpoints `start·exp((i ± ½)·Δ)`.
 *
 * @param options `start` > 0, `end` (in `unit`, default Å) and either
 *   `velocityStepKmPerS` (> 0) or `count` (≥ 2).
 * @returns a {@link WavelengthGrid} with `spacing: 'log-linear'`, its `logStep` and `velocityStepKmPerS`.
 * @throws {UsageError} for a start ≤ 0, an empty range, a step ≤ 0, a count < 2, both or
 *   neither of step and count, or more than {@link MAX_GRID_PIXELS} pixels.
 * @example
 * const g = logLinearGrid({ start: 4000, end: 7000, velocityStepKmPerS: 10 });
 * g.wavelength.length; // 16777
 * g.wavelength[1] / g.wavelength[0]; // ≈ 1 + 10/299792.458
 */
export function logLinearGrid(options: LogLinearGridOptions): WavelengthGrid {
  const unit = options.unit ?? DEFAULT_GRID_UNIT;
  const { start, end } = options;
  checkRange(start, end, unitSymbol(unit));
  if (!(start > 0)) throw new UsageError('grid.bad-range', `a log-linear grid needs a positive start (got ${start})`);
  exactlyOne(options.velocityStepKmPerS, options.count, 'velocityStepKmPerS and count');
  const span = Math.log(end / start);
  let count: number;
  let logStep: number;
  if (options.velocityStepKmPerS !== undefined) {
    const v = options.velocityStepKmPerS;
    if (!(v > 0) || !Number.isFinite(v)) throw new UsageError('grid.bad-step', `the velocity step must be a positive number of km/s (got ${v})`);
    logStep = v / SPEED_OF_LIGHT_KM_PER_S;
    const k = Math.floor((span / logStep) * (1 + STEP_SLACK));
    checkCount(Math.min(k + 1, MAX_GRID_PIXELS + 1));
    count = k + 1;
  } else {
    count = options.count!;
    checkCount(count);
    logStep = span / (count - 1);
  }
  const wavelength = new Float64Array(count);
  const edges = new Float64Array(count + 1);
  for (let i = 0; i < count; i++) wavelength[i] = start * Math.exp(i * logStep);
  wavelength[0] = start;
  if (options.count !== undefined) wavelength[count - 1] = end;
  for (let i = 0; i <= count; i++) edges[i] = start * Math.exp((i - 0.5) * logStep);
  return Object.freeze({
    wavelength,
    edges,
    unit,
    spacing: 'log-linear' as const,
    logStep,
    velocityStepKmPerS: logStep * SPEED_OF_LIGHT_KM_PER_S,
  });
}

/**
 * Bin edges for pixel centres: midpoints between neighbours, and half the neighbouring
 * step beyond the first and last centre. For a log-linear axis the arithmetic midpoint
 * differs from the geometric one by about λ·(Δln λ)²/8 (2·10⁻⁸ Å for 10 km/s pixels at
 * 6000 Å), which no flux-conserving result can notice.
 *
 * @param centres at least 2 values, strictly monotonic (increasing or decreasing).
 * @returns n + 1 edges in the same order as the centres.
 * @throws {UsageError} for fewer than 2 centres.
 * @example Array.from(binEdges([1, 2, 4])); // [0.5, 1.5, 3, 5]
 */
export function binEdges(centres: ArrayLike<number>): Float64Array {
  const n = centres.length;
  if (n < 2) throw new UsageError('grid.too-few-pixels', `bin edges need at least 2 pixel centres (got ${n})`);
  const e = new Float64Array(n + 1);
  for (let i = 1; i < n; i++) e[i] = 0.5 * (centres[i - 1] + centres[i]);
  e[0] = centres[0] - 0.5 * (centres[1] - centres[0]);
  e[n] = centres[n - 1] + 0.5 * (centres[n - 1] - centres[n - 2]);
  return e;
}

/**
 * The velocity step of a log-linear axis: c · Δln λ in km/s, with c = 299 792.458 km/s
 * (exact, SI), taken as c · ln(λ_last/λ_first)/(n − 1).
 *
 * @param wavelength pixel centres (any wavelength unit, increasing or decreasing, > 0), at least 2.
 * @returns the step in km/s (positive for either direction).
 * @throws {InputError} `grid.not-log-linear` when some step in ln λ differs from the mean by
 *   more than 1 part in 10⁶ (the axis is not log-linear), or a value is ≤ 0.
 * @throws {UsageError} for fewer than 2 values.
 * @example
 * logGridVelocityStepKmPerS(logLinearGrid({ start: 4000, end: 7000, velocityStepKmPerS: 10 }).wavelength); // ≈ 10
 */
export function logGridVelocityStepKmPerS(wavelength: ArrayLike<number>): number {
  const n = wavelength.length;
  if (n < 2) throw new UsageError('grid.too-few-pixels', `a velocity step needs at least 2 pixels (got ${n})`);
  for (let i = 0; i < n; i++) {
    if (!(wavelength[i] > 0)) throw new InputError('grid.not-log-linear', `wavelength ${wavelength[i]} at pixel ${i} is not positive`, { index: i });
  }
  const mean = Math.log(wavelength[n - 1] / wavelength[0]) / (n - 1);
  for (let i = 1; i < n; i++) {
    const d = Math.log(wavelength[i] / wavelength[i - 1]);
    // 1 part in 10⁶, plus 10⁻¹² for the rounding of ln of two nearly equal doubles.
    if (Math.abs(d - mean) > 1e-6 * Math.abs(mean) + 1e-12) {
      throw new InputError('grid.not-log-linear', `the axis is not log-linear: the step in ln λ at pixel ${i} is ${d.toPrecision(8)}, the mean is ${mean.toPrecision(8)}`, { index: i });
    }
  }
  return Math.abs(mean) * SPEED_OF_LIGHT_KM_PER_S;
}
