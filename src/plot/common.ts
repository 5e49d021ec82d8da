/**
 * Helpers shared by the plot builders: input checks, axis titles, sampling of model
 * functions, number formatting. Internal to the plot area.
 */
import { InputError, UsageError } from '../errors.js';
import type { Medium } from '../spectrum/spectrum.js';
import { VEGA_LITE_SCHEMA_URL, type VegaLiteSpec } from './spec.js';
import { vegaLiteConfig } from './theme.js';

/** Options every builder takes. */
export interface PlotOptions {
  /** Title above the plot; each builder has its own default. */
  title?: string;
  /** Second line under the title; each builder has its own default (often a summary such as the RMS). */
  subtitle?: string;
  /** Width of the plotting area in px (default from the theme, 640). */
  width?: number;
  /** Height of the main panel in px (default from the theme, 260). */
  height?: number;
}

/**
 * Checks that every given column has the length of the first one and that it is not empty.
 * @throws {InputError} `plot.length-mismatch` or `plot.empty`.
 */
export function checkColumns(what: string, columns: Record<string, ArrayLike<number> | undefined>): number {
  let n = -1;
  let first = '';
  for (const [name, col] of Object.entries(columns)) {
    if (col === undefined) continue;
    if (n < 0) {
      n = col.length;
      first = name;
      if (n === 0) throw new InputError('plot.empty', `${what}: ${name} is empty, nothing to plot`, { keyword: name });
    } else if (col.length !== n) {
      throw new InputError('plot.length-mismatch', `${what}: ${name} has ${col.length} values but ${first} has ${n}`, { keyword: name });
    }
  }
  return Math.max(n, 0);
}

/** Checks a size option (px), which must be a finite number from 20 to 10 000. */
export function checkSize(name: string, value: number | undefined, fallback: number): number {
  if (value === undefined) return fallback;
  if (!Number.isFinite(value) || value < 20 || value > 10_000) {
    throw new UsageError('plot.bad-size', `${name} must be a number of pixels from 20 to 10000, got ${value}`, { keyword: name });
  }
  return value;
}

/** True for a finite number. */
export function isFiniteNumber(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/** The wavelength axis title with unit and medium, e.g. `Wavelength (Å, air)`. */
export function wavelengthTitle(medium: Medium | undefined): string {
  if (medium === 'air') return 'Wavelength (Å, air)';
  if (medium === 'vacuum') return 'Wavelength (Å, vacuum)';
  return 'Wavelength (Å, medium not stated)';
}

/** The flux axis title: `Flux (ADU)` or `Flux (arbitrary units)` when the unit is unknown. */
export function fluxTitle(fluxUnit: string | null | undefined, normalised = false): string {
  if (normalised) return 'Normalised flux (continuum = 1)';
  const unit = fluxUnit?.trim();
  return unit ? `Flux (${unit})` : 'Flux (arbitrary units)';
}

/**
 * Formats a number for titles and labels with `digits` decimals (trailing zeros kept so
 * that columns line up); non-finite values print as `n/a`.
 */
export function formatFixed(value: number, digits: number): string {
  return Number.isFinite(value) ? value.toFixed(digits) : 'n/a';
}

/** Formats `value ± sigma` with `digits` decimals, or just the value when sigma is absent. */
export function formatWithError(value: number, sigma: number | undefined, digits: number): string {
  return isFiniteNumber(sigma) ? `${formatFixed(value, digits)} ± ${formatFixed(sigma, digits)}` : formatFixed(value, digits);
}

/**
 * Samples `f` at `n` evenly spaced points from `from` to `to`, dropping points where `f`
 * is not finite (a model undefined there leaves a gap rather than a wrong value).
 */
export function sampleFunction(f: (x: number) => number, from: number, to: number, n: number): { x: number[]; y: number[] } {
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const xi = n === 1 ? from : from + ((to - from) * i) / (n - 1);
    const yi = f(xi);
    if (Number.isFinite(yi)) {
      x.push(xi);
      y.push(yi);
    }
  }
  return { x, y };
}

/** Smallest and largest finite value of a column; [NaN, NaN] when none is finite. */
export function finiteRange(values: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v)) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : [NaN, NaN];
}

/** The title object of a spec: text plus optional subtitle. */
export function titleBlock(text: string, subtitle: string | undefined): Record<string, unknown> {
  return subtitle ? { text, subtitle } : { text };
}

/** The top-level fields every spec shares: schema, title, config, named datasets. */
export function topLevel(title: string, subtitle: string | undefined, datasets: Record<string, unknown[]>, description: string): VegaLiteSpec {
  return {
    $schema: VEGA_LITE_SCHEMA_URL,
    description,
    title: titleBlock(title, subtitle),
    config: vegaLiteConfig(),
    datasets,
  };
}

/**
 * A whole-number offset below every BJD, so that the time axis shows small numbers
 * (`BJD_TDB − 2460000`): the smallest value rounded down to a multiple of 10, or 0 when
 * the values are already small (under 100 000, e.g. already offset by the caller).
 */
export function bjdOffset(minBjd: number): number {
  if (!Number.isFinite(minBjd) || Math.abs(minBjd) < 100_000) return 0;
  return Math.floor(minBjd / 10) * 10;
}

/** Axis title for a BJD_TDB axis with offset, e.g. `BJD_TDB − 2460000 (days)`. */
export function bjdTitle(offset: number): string {
  return offset === 0 ? 'BJD_TDB (days)' : `BJD_TDB − ${offset} (days)`;
}

/** Speed of light in km/s (exact, SI definition of the metre). */
export const SPEED_OF_LIGHT_KM_PER_S = 299_792.458;
