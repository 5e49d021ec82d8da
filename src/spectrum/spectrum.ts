import { InputError, type ErrorLocation } from '../errors.js';
import { Header } from './header.js';
import type { ProvenanceEntry } from './provenance.js';

/** Unit of the spectral axis. `pixel` means not yet wavelength-calibrated (0-based pixel index or a physical pixel coordinate). */
export type SpectralUnit = 'angstrom' | 'nm' | 'um' | 'pixel';

/** Medium in which wavelengths are measured; `null` when unknown or not applicable (pixels). */
export type Medium = 'air' | 'vacuum' | null;

/** Where a spectrum was read from. */
export interface SpectrumSource {
  /** File path as given. */
  readonly file: string;
  /** 0-based HDU index for FITS files. */
  readonly hdu?: number;
  /** `fits` or `text`. */
  readonly format: 'fits' | 'text';
}

/**
 * A 1-D spectrum. Treat it as immutable: every function in this library returns a new
 * Spectrum and never writes into the arrays of its input.
 *
 * Missing-data policy (the same everywhere): a pixel is unusable when its flux is NaN,
 * its uncertainty is NaN, zero-or-negative or infinite, or its mask is non-zero. Fits and
 * statistics skip unusable pixels; they never treat NaN as zero.
 */
export interface Spectrum {
  /** Spectral axis, strictly increasing or strictly decreasing, finite, in `unit`. */
  readonly wavelength: Float64Array;
  /** Flux in arbitrary or physical units (see `fluxUnit`); NaN marks missing values. */
  readonly flux: Float64Array;
  /** 1-σ flux uncertainty per pixel, same length as `flux`; absent when unknown. */
  readonly uncertainty?: Float64Array;
  /** Per-pixel mask: 0 = good, non-zero = bad; absent means all good. */
  readonly mask?: Uint8Array;
  /** Unit of `wavelength`. */
  readonly unit: SpectralUnit;
  /** Air or vacuum wavelengths; null when unknown or `unit` is pixel. */
  readonly medium: Medium;
  /** Flux unit as text (e.g. from BUNIT), or null when unknown. */
  readonly fluxUnit: string | null;
  /** Header cards from the source file, in order. */
  readonly header: Header;
  /** How this spectrum was made, oldest step first. */
  readonly provenance: readonly ProvenanceEntry[];
  /** Where it was read from, when it came from a file. */
  readonly source?: SpectrumSource;
}

/** What {@link createSpectrum} takes. Arrays may be plain number arrays; they are copied. */
export interface SpectrumInit {
  wavelength: ArrayLike<number>;
  flux: ArrayLike<number>;
  uncertainty?: ArrayLike<number>;
  mask?: ArrayLike<number>;
  unit?: SpectralUnit;
  medium?: Medium;
  fluxUnit?: string | null;
  header?: Header;
  provenance?: readonly ProvenanceEntry[];
  source?: SpectrumSource;
}

/**
 * Builds a validated Spectrum, copying the arrays.
 *
 * @param init arrays and metadata; `unit` defaults to `angstrom`, `medium` to null.
 * @param where location used in error messages (file, HDU, line).
 * @throws {InputError} when the lengths differ, the spectrum is empty, a wavelength is
 *   not finite, or the axis is not strictly monotonic (duplicated values included).
 * @example
 * const s = createSpectrum({ wavelength: [6560, 6561, 6562], flux: [1, 0.6, 1], medium: 'air' });
 * s.unit; // 'angstrom'
 */
export function createSpectrum(init: SpectrumInit, where: ErrorLocation = {}): Spectrum {
  const n = init.wavelength.length;
  if (n === 0) throw new InputError('spectrum.empty', 'the spectrum has no pixels', where);
  if (init.flux.length !== n) {
    throw new InputError('spectrum.length-mismatch', `flux has ${init.flux.length} values but the spectral axis has ${n}`, where);
  }
  if (init.uncertainty && init.uncertainty.length !== n) {
    throw new InputError('spectrum.length-mismatch', `uncertainty has ${init.uncertainty.length} values but the spectral axis has ${n}`, where);
  }
  if (init.mask && init.mask.length !== n) {
    throw new InputError('spectrum.length-mismatch', `mask has ${init.mask.length} values but the spectral axis has ${n}`, where);
  }
  const wavelength = Float64Array.from(init.wavelength);
  checkSpectralAxis(wavelength, where);
  const unit = init.unit ?? 'angstrom';
  return Object.freeze({
    wavelength,
    flux: Float64Array.from(init.flux),
    uncertainty: init.uncertainty ? Float64Array.from(init.uncertainty) : undefined,
    mask: init.mask ? Uint8Array.from(init.mask, (m) => (m ? 1 : 0)) : undefined,
    unit,
    medium: unit === 'pixel' ? null : (init.medium ?? null),
    fluxUnit: init.fluxUnit ?? null,
    header: init.header ?? Header.empty(),
    provenance: Object.freeze([...(init.provenance ?? [])]),
    source: init.source,
  });
}

/**
 * Checks that a spectral axis is finite and strictly monotonic.
 * @throws {InputError} naming the first offending index.
 */
export function checkSpectralAxis(axis: ArrayLike<number>, where: ErrorLocation = {}): void {
  const n = axis.length;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(axis[i])) {
      throw new InputError('spectrum.bad-wavelength', `wavelength at pixel ${i} is ${axis[i]}, not a finite number`, { ...where, index: i });
    }
  }
  if (n < 2) return;
  const increasing = axis[1] > axis[0];
  for (let i = 1; i < n; i++) {
    const d = axis[i] - axis[i - 1];
    if (d === 0) {
      throw new InputError('spectrum.duplicate-wavelength', `wavelength ${axis[i]} is repeated at pixels ${i - 1} and ${i}`, { ...where, index: i });
    }
    if (d > 0 !== increasing) {
      throw new InputError('spectrum.not-monotonic', `the spectral axis is not monotonic: it turns at pixel ${i} (${axis[i - 1]} then ${axis[i]})`, { ...where, index: i });
    }
  }
}

/** A copy of `s` with some fields replaced and one provenance entry appended. Arrays passed in are used as given (not copied). */
export function deriveSpectrum(s: Spectrum, changes: Partial<Omit<Spectrum, 'provenance'>>, entry?: ProvenanceEntry): Spectrum {
  return Object.freeze({
    ...s,
    ...changes,
    provenance: Object.freeze(entry ? [...s.provenance, entry] : [...s.provenance]),
  });
}

/** True when pixel `i` is usable (finite flux, valid uncertainty if any, not masked). */
export function isUsablePixel(s: Spectrum, i: number): boolean {
  if (!Number.isFinite(s.flux[i])) return false;
  if (s.mask && s.mask[i] !== 0) return false;
  if (s.uncertainty) {
    const e = s.uncertainty[i];
    if (!(e > 0) || !Number.isFinite(e)) return false;
  }
  return true;
}
