import { readFileSync, statSync } from 'node:fs';
import { InputError } from '../errors.js';
import type { Logger } from '../logger.js';
import type { Medium, SpectralUnit, Spectrum } from '../spectrum/spectrum.js';
import { parseFitsSpectrum } from './fits/spectrum.js';
import { parseTextSpectrum } from './text/read.js';

/** Options shared by the spectrum readers. */
export interface ReadSpectrumOptions {
  /** FITS only: read this HDU (0-based) instead of finding the spectrum. */
  hdu?: number;
  /** Spectral unit to assume when the file does not say (text files; FITS without CUNIT1). */
  unit?: SpectralUnit;
  /** Medium to assume when the file does not say. */
  medium?: Medium;
  /** Receives warnings (a guessed unit, a HIERARCH card, ...). */
  logger?: Logger;
}

/** Bytes that start every FITS file: `SIMPLE  =`. */
const FITS_MAGIC = 'SIMPLE  =';

/** True when the bytes start like a FITS file. */
export function looksLikeFits(bytes: Uint8Array): boolean {
  if (bytes.length < FITS_MAGIC.length) return false;
  for (let i = 0; i < FITS_MAGIC.length; i++) if (bytes[i] !== FITS_MAGIC.charCodeAt(i)) return false;
  return true;
}

/**
 * Parses a spectrum from the bytes of a FITS or text file; the format is told by the
 * content (a FITS file starts with `SIMPLE  =`), not by the file name.
 *
 * @param bytes the whole file.
 * @param name file name used in messages and in `source`.
 * @throws {InputError} when the file is empty or malformed, naming the file and where.
 */
export function parseSpectrum(bytes: Uint8Array, name: string, options: ReadSpectrumOptions = {}): Spectrum {
  if (bytes.length === 0) throw new InputError('io.empty-file', 'the file is empty', { file: name });
  return looksLikeFits(bytes) ? parseFitsSpectrum(bytes, name, options) : parseTextSpectrum(bytes, name, options);
}

/**
 * Reads a spectrum from a FITS or text file.
 *
 * @param path file path.
 * @throws {InputError} when the file is missing, empty, a directory, or malformed.
 * @example
 * const s = readSpectrum('data/samples/lamp-neon.fits');
 * s.source?.hdu; // 0
 */
export function readSpectrum(path: string, options: ReadSpectrumOptions = {}): Spectrum {
  let size: number;
  try {
    const st = statSync(path);
    if (st.isDirectory()) throw new InputError('io.is-directory', 'is a directory, not a file', { file: path });
    size = st.size;
  } catch (e) {
    if (e instanceof InputError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('io.cannot-open', code === 'ENOENT' ? 'no such file' : `cannot open (${code ?? String(e)})`, { file: path });
  }
  if (size === 0) throw new InputError('io.empty-file', 'the file is empty', { file: path });
  return parseSpectrum(readFileSync(path), path, options);
}
