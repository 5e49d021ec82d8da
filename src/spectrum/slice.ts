import { InputError, UsageError } from '../errors.js';
import { provenanceEntry } from './provenance.js';
import { deriveSpectrum, type SpectralUnit, type Spectrum } from './spectrum.js';
import { convertWavelength, unitSymbol } from './units.js';

/** A wavelength range for {@link sliceSpectrum}; both ends are included. */
export interface SliceOptions {
  /** Lower end of the range, in `unit`. */
  min: number;
  /** Upper end of the range, in `unit`. */
  max: number;
  /** Unit of `min` and `max`; the spectrum's own unit when omitted. */
  unit?: SpectralUnit;
}

/**
 * The pixels of a spectrum whose wavelength lies in a range, both ends included. Works for
 * increasing and decreasing axes (the order is kept). Uncertainty and mask are cut the same
 * way; header, medium, unit and source are kept, and a `slice` provenance entry is added.
 *
 * @param s the spectrum (not modified).
 * @param range `min` ≤ `max`, in `range.unit` (default: the spectrum's unit; Å, nm and µm
 *   convert into each other, a pixel range needs a pixel spectrum).
 * @returns a new Spectrum holding copies of the selected pixels.
 * @throws {UsageError} when `min` or `max` is not a finite number, `min` > `max`, or the
 *   units cannot be converted (pixel against a wavelength unit).
 * @throws {InputError} `spectrum.empty-range` when no pixel lies in the range.
 * @example
 * const s = createSpectrum({ wavelength: [6560, 6561, 6562, 6563], flux: [1, 2, 3, 4] });
 * Array.from(sliceSpectrum(s, { min: 656.1, max: 656.2, unit: 'nm' }).flux); // [2, 3]
 */
export function sliceSpectrum(s: Spectrum, range: SliceOptions): Spectrum {
  const { min, max } = range;
  if (!Number.isFinite(min) || !Number.isFinite(max)) {
    throw new UsageError('spectrum.bad-range', `the slice range needs finite min and max (got ${min} and ${max})`);
  }
  if (min > max) throw new UsageError('spectrum.bad-range', `the slice range has min ${min} above max ${max}`);
  const unit = range.unit ?? s.unit;
  // A bound converted from another unit may land one rounding off a pixel it names exactly
  // (656.1 nm → 6561.000000000001 Å): widen it by 10⁻¹² relative so the end stays included.
  const slack = unit === s.unit ? 0 : 1e-12;
  const lo = convertWavelength(min, unit, s.unit);
  const hi = convertWavelength(max, unit, s.unit);
  const loW = lo - Math.abs(lo) * slack;
  const hiW = hi + Math.abs(hi) * slack;
  const w = s.wavelength;
  const n = w.length;
  let first = -1;
  let last = -1;
  for (let i = 0; i < n; i++) {
    if (w[i] >= loW && w[i] <= hiW) {
      if (first < 0) first = i;
      last = i;
    }
  }
  if (first < 0) {
    const a = Math.min(w[0], w[n - 1]);
    const b = Math.max(w[0], w[n - 1]);
    throw new InputError(
      'spectrum.empty-range',
      `no pixel lies between ${min} and ${max} ${unitSymbol(unit)} (the spectrum covers ${a} to ${b} ${unitSymbol(s.unit)})`,
      s.source ? { file: s.source.file } : {},
    );
  }
  const end = last + 1;
  return deriveSpectrum(
    s,
    {
      wavelength: w.slice(first, end),
      flux: s.flux.slice(first, end),
      uncertainty: s.uncertainty?.slice(first, end),
      mask: s.mask?.slice(first, end),
    },
    provenanceEntry('slice', { min, max, unit, pixels: end - first }),
  );
}
