/**
 * Internal: brings a spectrum into the form the velocity measurements work in — Å,
 * vacuum wavelengths, increasing order — refusing spectra whose medium is unknown.
 */
import { InputError, UsageError, type ErrorLocation } from '../errors.js';
import { convertSpectrumMedium } from '../spectrum/air-vacuum.js';
import { convertSpectrumUnit } from '../spectrum/convert.js';
import { deriveSpectrum, type Spectrum } from '../spectrum/spectrum.js';

/** A spectrum in vacuum Å, increasing, and the medium it was stated in. */
export interface PreparedSpectrum {
  readonly spectrum: Spectrum;
  /** The medium of the input's wavelengths (stated by the spectrum or the caller). */
  readonly medium: 'air' | 'vacuum';
}

function where(s: Spectrum): ErrorLocation {
  const w: ErrorLocation = {};
  if (s.source?.file !== undefined) w.file = s.source.file;
  if (s.source?.hdu !== undefined) w.hdu = s.source.hdu;
  return w;
}

/**
 * The medium of a spectrum's wavelengths: its own, or the one the caller states.
 * @throws {InputError} `velocity.medium-unknown`; {@link UsageError} `velocity.medium-conflict`.
 */
export function resolveMedium(s: Spectrum, stated: 'air' | 'vacuum' | undefined, role: string, option: string): 'air' | 'vacuum' {
  if (stated !== undefined && stated !== 'air' && stated !== 'vacuum') {
    throw new UsageError('velocity.bad-medium', `the stated medium of the ${role} must be air or vacuum (got ${String(stated)})`);
  }
  if (s.medium !== null && stated !== undefined && stated !== s.medium) {
    throw new UsageError('velocity.medium-conflict', `the ${role} says its wavelengths are in ${s.medium}, but ${stated} was stated`);
  }
  const medium = s.medium ?? stated;
  if (medium === undefined) {
    throw new InputError(
      'velocity.medium-unknown',
      `the ${role} does not say whether its wavelengths are in air or vacuum (at 6000 Å the two differ by 1.66 Å, 83 km/s); state it with ${option}`,
      where(s),
    );
  }
  return medium;
}

/**
 * The spectrum in Å, vacuum wavelengths (Peck & Reeder 1972 from air), increasing order.
 * @throws {InputError} `velocity.uncalibrated` for a pixel axis, `velocity.medium-unknown`.
 */
export function prepareSpectrum(s: Spectrum, stated: 'air' | 'vacuum' | undefined, role: string, option: string): PreparedSpectrum {
  if (s.unit === 'pixel') {
    throw new InputError('velocity.uncalibrated', `the ${role} has no wavelength scale (its axis is in pixels); calibrate it first`, where(s));
  }
  const medium = resolveMedium(s, stated, role, option);
  let v = convertSpectrumMedium(convertSpectrumUnit(s, 'angstrom'), 'vacuum', { from: medium });
  const n = v.wavelength.length;
  if (n > 1 && v.wavelength[n - 1] < v.wavelength[0]) {
    const rev = <T extends Float64Array | Uint8Array>(a: T | undefined): T | undefined => (a ? (a.slice().reverse() as T) : undefined);
    v = deriveSpectrum(v, { wavelength: rev(v.wavelength)!, flux: rev(v.flux)!, uncertainty: rev(v.uncertainty), mask: rev(v.mask) });
  }
  return { spectrum: v, medium };
}
