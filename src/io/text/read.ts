import { UsageError } from '../../errors.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { ReadSpectrumOptions } from '../read.js';

/** Placeholder until the text reader lands (issue 2). */
export function parseTextSpectrum(_bytes: Uint8Array, name: string, _options: ReadSpectrumOptions = {}): Spectrum {
  throw new UsageError('text.not-implemented', 'the text reader is not written yet', { file: name });
}
