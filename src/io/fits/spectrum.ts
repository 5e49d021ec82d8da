import { UsageError } from '../../errors.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { ReadSpectrumOptions } from '../read.js';

/** Placeholder until the FITS reader lands (issue 2). */
export function parseFitsSpectrum(_bytes: Uint8Array, name: string, _options: ReadSpectrumOptions = {}): Spectrum {
  throw new UsageError('fits.not-implemented', 'the FITS reader is not written yet', { file: name });
}
