import { UsageError } from '../errors.js';
import { provenanceEntry } from './provenance.js';
import { deriveSpectrum, type SpectralUnit, type Spectrum } from './spectrum.js';
import { angstromPerUnit, unitSymbol } from './units.js';

/**
 * The same spectrum with its spectral axis in another wavelength unit (Å, nm, µm). The
 * factor between units is an exact power of ten applied in one correctly rounded
 * multiplication or division, so Å → nm → Å returns the original values to within one
 * rounding (1 part in 10¹⁶). Flux values are not changed: when the flux is a density per
 * unit wavelength, its `fluxUnit` text still names the old unit.
 *
 * @param s the spectrum (not modified).
 * @param unit target unit: `angstrom`, `nm` or `um`.
 * @returns a new Spectrum (or `s` itself when it is already in `unit`), with a
 *   `convert-unit` provenance entry.
 * @throws {UsageError} `units.pixel` when the spectrum or the target is `pixel`: a pixel
 *   axis has no length and needs a dispersion solution instead.
 * @example
 * const s = createSpectrum({ wavelength: [6562.8, 6563.0], flux: [1, 1] });
 * convertSpectrumUnit(s, 'nm').wavelength[0]; // 656.28
 */
export function convertSpectrumUnit(s: Spectrum, unit: SpectralUnit): Spectrum {
  if (s.unit === 'pixel' || unit === 'pixel') {
    throw new UsageError('units.pixel', `cannot convert a spectral axis from ${unitSymbol(s.unit)} to ${unitSymbol(unit)}: a pixel axis has no wavelength unit; calibrate the spectrum first`);
  }
  if (s.unit === unit) return s;
  const from = angstromPerUnit(s.unit);
  const to = angstromPerUnit(unit);
  const w = s.wavelength;
  const out = new Float64Array(w.length);
  if (from >= to) {
    const k = from / to;
    for (let i = 0; i < w.length; i++) out[i] = w[i] * k;
  } else {
    const k = to / from;
    for (let i = 0; i < w.length; i++) out[i] = w[i] / k;
  }
  return deriveSpectrum(s, { wavelength: out, unit }, provenanceEntry('convert-unit', { from: s.unit, to: unit }));
}
