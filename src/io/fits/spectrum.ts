/**
 * A 1-D spectrum from a FITS file: finds the HDU holding it (a 1-D image, a single-row
 * 2-D image, or a binary table with wavelength and flux columns), reads the flux, the
 * spectral axis from the WCS or the wavelength column, and an uncertainty when the file
 * has one.
 */
import { basename } from 'node:path';
import { InputError, UsageError } from '../../errors.js';
import { Header, type HeaderCard } from '../../spectrum/header.js';
import { provenanceEntry } from '../../spectrum/provenance.js';
import { checkSpectralAxis, createSpectrum, type Medium, type SpectralUnit, type Spectrum } from '../../spectrum/spectrum.js';
import type { ReadSpectrumOptions } from '../read.js';
import { isNumericColumn, readColumn, tableLayout, type TableColumn, type TableLayout } from './bintable.js';
import { fitsContext, fitsError, fitsWarn, type FitsContext } from './context.js';
import { readImagePixels } from './data.js';
import { walkHdus, type FitsHdu } from './structure.js';
import { mediumFromCards, resolveUnitText, spectralAxis } from './wcs.js';

/** Column names (lower case) recognised in spectral binary tables. */
const WAVELENGTH_COLUMNS = ['wavelength', 'wave', 'lambda', 'wavelen', 'loglam'];
const FLUX_COLUMNS = ['flux', 'counts', 'intensity', 'spec', 'fluxdensity', 'flux_density'];
const SIGMA_NAMES = ['error', 'err', 'sigma', 'uncertainty', 'uncert', 'flux_error', 'flux_err', 'fluxerr', 'noise', 'stddev', 'std'];
const IVAR_NAMES = ['ivar', 'invvar', 'inverse_variance'];
const VARIANCE_NAMES = ['var', 'variance'];
const MASK_NAMES = ['mask', 'quality', 'flag', 'flags'];

/** How an uncertainty array is stored. */
type ErrorKind = 'sigma' | 'ivar' | 'variance';

function errorKind(name: string): ErrorKind | undefined {
  const n = name.toLowerCase();
  if (SIGMA_NAMES.includes(n)) return 'sigma';
  if (IVAR_NAMES.includes(n)) return 'ivar';
  if (VARIANCE_NAMES.includes(n)) return 'variance';
  return undefined;
}

/** Converts stored errors to 1-σ: σ = 1/√ivar (ivar = 0 gives ∞, an unusable pixel), σ = √variance. */
function toSigma(values: Float64Array, kind: ErrorKind): Float64Array {
  if (kind === 'sigma') return values;
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    out[i] = kind === 'ivar' ? (v > 0 ? 1 / Math.sqrt(v) : v === 0 ? Infinity : NaN) : v >= 0 ? Math.sqrt(v) : NaN;
  }
  return out;
}

/** What kind of thing an HDU holds, for choosing the spectrum. */
type Candidate =
  | { kind: 'image'; pixels: number }
  | { kind: 'table'; layout: TableLayout; wavelength: TableColumn; flux: TableColumn }
  | { kind: 'image-2d'; axes: readonly number[] }
  | { kind: 'none'; why: string };

function findColumn(layout: TableLayout, names: readonly string[]): TableColumn | undefined {
  for (const name of names) {
    const c = layout.columns.find((col) => col.name.toLowerCase() === name);
    if (c) return c;
  }
  return undefined;
}

function classify(hdu: FitsHdu, ctx: FitsContext): Candidate {
  if (hdu.kind === 'primary' || hdu.kind === 'image') {
    if (hdu.kind === 'image' && (hdu.pcount !== 0 || hdu.gcount !== 1)) {
      throw fitsError(ctx, 'fits.bad-image-extension', `an IMAGE extension must have PCOUNT = 0 and GCOUNT = 1, not ${hdu.pcount} and ${hdu.gcount} (FITS Standard 4.0 §7.1.1)`, { hdu: hdu.index });
    }
    const axes = hdu.axes;
    if (axes.length === 0 || hdu.dataByteLength === 0) return { kind: 'none', why: 'no data' };
    // A 1-D image, or a 2-D (or more) image whose other axes all have length 1.
    if (axes.slice(1).every((a) => a === 1)) return { kind: 'image', pixels: axes[0] };
    return { kind: 'image-2d', axes };
  }
  if (hdu.kind === 'bintable') {
    const layout = tableLayout(hdu, ctx);
    const wavelength = findColumn(layout, WAVELENGTH_COLUMNS);
    const flux = findColumn(layout, FLUX_COLUMNS);
    if (wavelength && flux) return { kind: 'table', layout, wavelength, flux };
    return { kind: 'none', why: `a binary table without ${wavelength ? 'a flux' : 'a wavelength'} column` };
  }
  return { kind: 'none', why: hdu.kind === 'random-groups' ? 'random groups' : `a ${hdu.extension ?? hdu.kind} extension` };
}

/**
 * Parses a 1-D spectrum from the bytes of a FITS file.
 *
 * Method: the HDUs are walked per FITS Standard 4.0 (§3, §4.4.1, §7); the spectrum is the
 * first HDU holding a 1-D image, a 2-D image with a single row (NAXIS2 = 1), or a binary
 * table with a wavelength column (wavelength, wave, lambda, or loglam = log10 Å) and a flux
 * column (flux, counts, intensity), unless `options.hdu` names one. Pixel values are
 * scaled with BSCALE/BZERO, BLANK becomes NaN. The spectral axis comes from the WCS
 * (CRVAL1, CDELT1 or CD1_1, CRPIX1, CTYPE1 WAVE/AWAV/LINEAR with -LOG, DC-FLAG = 1 for
 * log10, CUNIT1; Greisen et al. 2006, A&A 446, 747); without a WCS the axis is the
 * 0-based pixel index 0…N−1 with unit `pixel`. Medium: CTYPE1 WAVE = vacuum, AWAV = air,
 * otherwise AIRORVAC ('air'/'vac') or VACUUM (T/F) cards, otherwise `options.medium`.
 * Uncertainty: an error/ivar/variance column of the table, or an IMAGE extension named
 * ERROR, ERR, SIGMA, UNCERT, UNCERTAINTY, NOISE, STDDEV (σ), IVAR/INVVAR (1/σ²) or
 * VAR/VARIANCE (σ²) with the same number of pixels; a MASK/QUALITY extension or column
 * becomes the mask (non-zero = bad). The header is the HDU's own; when the spectrum is in
 * an extension and the primary HDU holds no data, the primary's value cards that the
 * extension lacks (OBJECT, DATE-OBS, …) are appended after the extension's cards.
 *
 * @param bytes the whole file.
 * @param name file name for messages and `source.file`.
 * @param options `hdu` (0-based) forces an HDU; `unit` and `medium` fill in what the file
 *   does not say; `logger` receives warnings.
 * @returns a validated spectrum; `source.hdu` says which HDU was read.
 * @throws {InputError} for a malformed file (naming the HDU, card and keyword), a file
 *   without a 1-D spectrum (a 2-D image is reported with its size), an `options.hdu` the
 *   file does not have, or a spectral axis that is not finite and strictly monotonic.
 * @throws {UsageError} when `options.hdu` is not an integer 0 or more.
 * @example
 * const s = parseFitsSpectrum(readFileSync('data/samples/lvac7-star.fits'), 'lvac7-star.fits');
 * [s.unit, s.medium, s.source?.hdu]; // ['angstrom', 'air', 0]
 */
export function parseFitsSpectrum(bytes: Uint8Array, name: string, options: ReadSpectrumOptions = {}): Spectrum {
  const ctx = fitsContext(name, options.logger);
  const hdus = walkHdus(bytes, ctx);
  let chosen: FitsHdu | undefined;
  let candidate: Candidate | undefined;
  if (options.hdu !== undefined) {
    const i = options.hdu;
    if (!Number.isInteger(i) || i < 0) throw new UsageError('fits.bad-hdu-option', `the HDU number must be an integer 0 or more, not ${i}`);
    if (i >= hdus.length) {
      throw new InputError('fits.no-such-hdu', `HDU ${i} does not exist: the file has ${hdus.length} HDU${hdus.length === 1 ? '' : 's'} (0 to ${hdus.length - 1})`, { file: name });
    }
    chosen = hdus[i];
    candidate = classify(chosen, ctx);
    if (candidate.kind === 'none') {
      throw fitsError(ctx, 'fits.no-spectrum', `HDU ${i} holds ${candidate.why}, not a 1-D spectrum`);
    }
  } else {
    let firstImage2d: { hdu: FitsHdu; axes: readonly number[] } | undefined;
    const seen: string[] = [];
    for (const hdu of hdus) {
      if (hdu.index > 0 && hdu.name !== null && (errorKind(hdu.name) || MASK_NAMES.includes(hdu.name.toLowerCase()))) {
        seen.push(`HDU ${hdu.index}: the ${hdu.name} extension`);
        continue;
      }
      const c = classify(hdu, ctx);
      if (c.kind === 'image' || c.kind === 'table') {
        chosen = hdu;
        candidate = c;
        break;
      }
      if (c.kind === 'image-2d') firstImage2d ??= { hdu, axes: c.axes };
      seen.push(`HDU ${hdu.index}: ${c.kind === 'none' ? c.why : `a ${c.axes.length}-D image`}`);
    }
    if (chosen === undefined || candidate === undefined) {
      if (firstImage2d) throw image2dError(firstImage2d.hdu, firstImage2d.axes, ctx);
      throw fitsError(ctx, 'fits.no-spectrum', `no HDU holds a 1-D spectrum (${seen.join('; ')})`);
    }
  }
  if (candidate.kind === 'image-2d') throw image2dError(chosen, candidate.axes, ctx);
  if (candidate.kind === 'none') throw new Error('unreachable');
  return candidate.kind === 'image' ? imageSpectrum(bytes, hdus, chosen, candidate.pixels, ctx, options) : tableSpectrum(bytes, hdus, chosen, candidate, ctx, options);
}

function image2dError(hdu: FitsHdu, axes: readonly number[], ctx: FitsContext): InputError {
  // The HDU is named in the text, which reads better than a location prefix here.
  return fitsError(ctx, 'fits.image-not-spectrum', `HDU ${hdu.index} holds a ${axes.length}-D image of ${axes.join('×')} pixels, not a 1-D spectrum; extract the spectrum first`);
}

function imageSpectrum(bytes: Uint8Array, hdus: readonly FitsHdu[], hdu: FitsHdu, pixels: number, ctx: FitsContext, options: ReadSpectrumOptions): Spectrum {
  const flux = readImagePixels(bytes, hdu, ctx);
  const axis = spectralAxis(hdu, pixels, ctx, options);
  const header = spectrumHeader(hdus, hdu);
  const fluxUnit = header.string('BUNIT')?.trim() || null;
  const extras = companionArrays(bytes, hdus, hdu, pixels, ctx);
  return finish({ wavelength: axis.wavelength, flux, unit: axis.unit, medium: axis.medium, fluxUnit, header, ...extras }, hdu, ctx, axis.checked);
}

function tableSpectrum(
  bytes: Uint8Array,
  hdus: readonly FitsHdu[],
  hdu: FitsHdu,
  c: Extract<Candidate, { kind: 'table' }>,
  ctx: FitsContext,
  options: ReadSpectrumOptions,
): Spectrum {
  const { layout, wavelength: wcol, flux: fcol } = c;
  // Either one row per pixel (scalar columns) or one row holding vector columns.
  let perRow: boolean;
  if (wcol.repeat === 1) perRow = true;
  else if (layout.rows === 1) perRow = false;
  else {
    throw fitsError(ctx, 'fits.table-layout', `the table has ${layout.rows} rows with ${wcol.repeat} values of ${wcol.name} each; lineshift reads either one row per pixel or one row holding the whole spectrum`, { hdu: hdu.index, column: wcol.name });
  }
  const pixels = perRow ? layout.rows : wcol.repeat;
  const checkColumn = (col: TableColumn) => {
    const n = perRow ? (col.repeat === 1 ? layout.rows : -1) : col.repeat;
    if (n !== pixels) {
      throw fitsError(ctx, 'fits.column-length', perRow
        ? `column ${col.name} holds ${col.repeat} values per row, but the table has one pixel per row (column ${wcol.name} holds 1)`
        : `column ${col.name} holds ${col.repeat} values but column ${wcol.name} holds ${pixels}; they must be the same length`, { hdu: hdu.index, column: col.name });
    }
  };
  checkColumn(fcol);
  let wavelength = readColumn(bytes, hdu, layout, wcol, ctx);
  const flux = readColumn(bytes, hdu, layout, fcol, ctx);
  const header = spectrumHeader(hdus, hdu);
  // Unit: TUNITn of the wavelength column; loglam is log10 of Å.
  let unit: SpectralUnit;
  const isLog = wcol.name.toLowerCase() === 'loglam';
  if (isLog) {
    const w = new Float64Array(wavelength.length);
    for (let i = 0; i < w.length; i++) w[i] = 10 ** wavelength[i];
    wavelength = w;
    const inner = wcol.unit === undefined ? undefined : /^log\((.*)\)$/i.exec(wcol.unit)?.[1];
    const u = inner === undefined ? undefined : resolveUnitText(inner);
    unit = u?.unit ?? 'angstrom';
    if (u && u.factor !== 1) for (let i = 0; i < wavelength.length; i++) wavelength[i] *= u.factor;
  } else if (wcol.unit !== undefined) {
    const u = resolveUnitText(wcol.unit);
    if (u === undefined) {
      throw fitsError(ctx, 'fits.unknown-unit', `TUNIT${wcol.number} = '${wcol.unit}' of column ${wcol.name} is not a wavelength unit lineshift knows (Angstrom, nm, um, m, cm, mm, pixel)`, { hdu: hdu.index, column: wcol.name, keyword: `TUNIT${wcol.number}` });
    }
    unit = u.unit;
    if (u.factor !== 1) for (let i = 0; i < wavelength.length; i++) wavelength[i] *= u.factor;
  } else if (options.unit !== undefined) {
    unit = options.unit;
  } else {
    unit = 'angstrom';
    fitsWarn(ctx, 'fits.unit-guessed', `column ${wcol.name} has no unit (TUNIT${wcol.number}); Å is assumed (pass a unit to override)`, { hdu: hdu.index, column: wcol.name });
  }
  const medium: Medium = unit === 'pixel' ? null : (mediumFromCards(header) ?? options.medium ?? null);
  const fluxUnit = fcol.unit ?? (header.string('BUNIT')?.trim() || null);
  let uncertainty: Float64Array | undefined;
  let mask: Float64Array | undefined;
  for (const col of layout.columns) {
    if (col === wcol || col === fcol || !isNumericColumn(col)) continue;
    const kind = errorKind(col.name);
    if (kind && uncertainty === undefined) {
      checkColumn(col);
      uncertainty = toSigma(readColumn(bytes, hdu, layout, col, ctx), kind);
    } else if (MASK_NAMES.includes(col.name.toLowerCase()) && mask === undefined) {
      checkColumn(col);
      mask = readColumn(bytes, hdu, layout, col, ctx);
    }
  }
  return finish({ wavelength, flux, unit, medium, fluxUnit, header, uncertainty, mask: mask && maskFrom(mask) }, hdu, ctx);
}

/** Mask from stored values: non-zero (or NaN, an undefined value) is bad. */
function maskFrom(values: Float64Array): Uint8Array {
  const m = new Uint8Array(values.length);
  for (let i = 0; i < values.length; i++) m[i] = values[i] === 0 ? 0 : 1;
  return m;
}

/** Uncertainty and mask from IMAGE extensions named for them, with the same number of pixels. */
function companionArrays(bytes: Uint8Array, hdus: readonly FitsHdu[], hdu: FitsHdu, pixels: number, ctx: FitsContext): { uncertainty?: Float64Array; mask?: Uint8Array } {
  const out: { uncertainty?: Float64Array; mask?: Uint8Array } = {};
  for (const other of hdus) {
    if (other === hdu || other.kind !== 'image' || other.name === null) continue;
    const kind = errorKind(other.name);
    const isMask = MASK_NAMES.includes(other.name.toLowerCase());
    if (!kind && !isMask) continue;
    const n = other.axes.length > 0 && other.axes.slice(1).every((a) => a === 1) ? other.axes[0] : -1;
    if (n !== pixels || other.pcount !== 0 || other.gcount !== 1) {
      fitsWarn(ctx, 'fits.companion-size', `extension ${other.name} has ${other.axes.join('×') || 'no'} pixels, not ${pixels} like the spectrum in HDU ${hdu.index}; ignored`, { hdu: other.index });
      continue;
    }
    if (kind && out.uncertainty === undefined) out.uncertainty = toSigma(readImagePixels(bytes, other, ctx), kind);
    if (isMask && out.mask === undefined) out.mask = maskFrom(readImagePixels(bytes, other, ctx));
  }
  return out;
}

/**
 * The spectrum's header: the HDU's own cards; for an extension after a primary HDU without
 * data, the primary's value cards that the extension lacks are appended (the primary is
 * then a container of observation keywords such as OBJECT and DATE-OBS).
 */
function spectrumHeader(hdus: readonly FitsHdu[], hdu: FitsHdu): Header {
  if (hdu.index === 0) return hdu.header;
  const primary = hdus[0];
  if (primary.dataByteLength !== 0) return hdu.header;
  const extra: HeaderCard[] = [];
  for (const card of primary.header.cards) {
    if (card.value === undefined || STRUCTURAL_PRIMARY.has(card.keyword) || /^NAXIS\d+$/.test(card.keyword)) continue;
    if (hdu.header.has(card.keyword)) continue;
    extra.push(card);
  }
  return extra.length === 0 ? hdu.header : Header.from([...hdu.header.cards, ...extra]);
}

const STRUCTURAL_PRIMARY = new Set(['SIMPLE', 'BITPIX', 'NAXIS', 'EXTEND', 'CHECKSUM', 'DATASUM', 'BSCALE', 'BZERO', 'BLANK', 'BUNIT', 'EXTNAME', 'EXTVER', 'PCOUNT', 'GCOUNT', 'GROUPS']);

/**
 * Builds the frozen Spectrum. Same checks and shape as createSpectrum, without its copies:
 * the arrays here are fresh and owned by the result, and copying them again would double
 * the reader's cost on large files (see bench/fits-read.ts).
 */
function finish(
  init: { wavelength: Float64Array; flux: Float64Array; unit: SpectralUnit; medium: Medium; fluxUnit: string | null; header: Header; uncertainty?: Float64Array; mask?: Uint8Array },
  hdu: FitsHdu,
  ctx: FitsContext,
  axisChecked = false,
): Spectrum {
  const where = { file: ctx.file, hdu: hdu.index };
  const n = init.wavelength.length;
  if (n === 0 || init.flux.length !== n || (init.uncertainty !== undefined && init.uncertainty.length !== n) || (init.mask !== undefined && init.mask.length !== n)) {
    // Let createSpectrum word the message for an empty or inconsistent spectrum.
    return createSpectrum({ ...init, source: { file: ctx.file, hdu: hdu.index, format: 'fits' } }, where);
  }
  if (!axisChecked) checkSpectralAxis(init.wavelength, where);
  return Object.freeze({
    wavelength: init.wavelength,
    flux: init.flux,
    uncertainty: init.uncertainty,
    mask: init.mask,
    unit: init.unit,
    medium: init.unit === 'pixel' ? null : init.medium,
    fluxUnit: init.fluxUnit,
    header: init.header,
    provenance: Object.freeze([provenanceEntry('read-fits', { file: basename(ctx.file), hdu: hdu.index })]),
    source: { file: ctx.file, hdu: hdu.index, format: 'fits' as const },
  });
}
