/**
 * Writing a spectrum as a FITS file: a 1-D image in the primary HDU with a linear or
 * log-linear spectral WCS, or — when the axis is neither — a binary table of wavelength,
 * flux and uncertainty. Header cards of the source that still apply are kept, provenance
 * becomes HISTORY cards, and every HDU carries DATASUM and CHECKSUM.
 */
import { existsSync, realpathSync, statSync } from 'node:fs';
import { writeFileAtomic } from '../atomic-write.js';
import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { silentLogger, type Logger } from '../../logger.js';
import { isCommentaryKeyword, type HeaderCard } from '../../spectrum/header.js';
import { formatProvenance } from '../../spectrum/provenance.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { unitSymbol } from '../../spectrum/units.js';
import { BLOCK_LENGTH, CARD_LENGTH, CardProblem, MAX_HIERARCH_KEYWORD, formatCard, formatReal, isStandardKeyword } from './cards.js';
import { encodeChecksum, onesComplementSum } from './checksum.js';

/** Options of {@link encodeFitsSpectrum} and {@link writeFitsSpectrum}. */
export interface FitsWriteOptions {
  /** Sample type of flux and uncertainty: `float64` (default, exact) or `float32` (half the size). */
  dataType?: 'float32' | 'float64';
  /**
   * How the spectral axis is written: `auto` (default) picks a linear WCS when the axis is
   * linear within {@link AXIS_TOLERANCE_PIXELS}, else a log-linear one when log-linear
   * within it, else a binary table; `linear` and `log-linear` force that WCS (with a
   * warning when the axis departs from it by more than the tolerance); `table` always
   * writes a binary table.
   */
  layout?: 'auto' | 'linear' | 'log-linear' | 'table';
  /** Receives warnings (cards that cannot be written, a forced WCS that does not fit). */
  logger?: Logger;
}

/**
 * Largest departure, in pixels, of the axis from a linear (or log-linear) WCS for the WCS
 * to be written. 10⁻⁶ pixel is far below any use of a spectrum (the best line centroids
 * reach 10⁻³ pixel) and far above float64 rounding of a computed axis (about 10⁻¹⁰ pixel
 * for λ ≈ 10⁴ Å with steps of 0.01 Å).
 */
export const AXIS_TOLERANCE_PIXELS = 1e-6;

/** Keywords the writer always writes itself or that no longer apply to the written data. */
const DROPPED = new Set([
  'SIMPLE', 'XTENSION', 'BITPIX', 'NAXIS', 'EXTEND', 'PCOUNT', 'GCOUNT', 'GROUPS', 'TFIELDS', 'THEAP',
  'BSCALE', 'BZERO', 'BLANK', 'BUNIT', 'DATAMIN', 'DATAMAX',
  'WCSAXES', 'WCSNAME', 'WCSDIM', 'DC-FLAG', 'AIRORVAC', 'VACUUM',
  'CHECKSUM', 'DATASUM', 'CHECKVER', 'EXTNAME', 'EXTVER', 'EXTLEVEL', 'INHERIT', 'CONTINUE', 'END',
]);
const DROPPED_PATTERNS = [
  /^NAXIS\d+$/,
  /^T(TYPE|FORM|UNIT|SCAL|ZERO|NULL|DIM|DISP|BCOL)\d+$/,
  /^(TCTYP|TCUNI|TCRPX|TCRVL|TCDLT)\d+$/,
  /^(CTYPE|CUNIT|CRVAL|CDELT|CRPIX|CROTA|CRDER|CSYER)\d+[A-Z]?$/,
  /^(CD|PC|PV|PS)\d+_\d+[A-Z]?$/,
  /^WAT\d_\d{3}$/,
  /^LTV\d+$/,
  /^LTM\d+_\d+$/,
];

/** True when the writer drops a card of this keyword (structural, WCS, scaling, checksum). */
export function isRewrittenKeyword(keyword: string): boolean {
  return DROPPED.has(keyword) || DROPPED_PATTERNS.some((p) => p.test(keyword));
}

type Layout =
  | { kind: 'pixel-index' }
  | { kind: 'linear'; crval: number; cdelt: number }
  | { kind: 'log'; crval: number; cdelt: number }
  | { kind: 'log10'; crval: number; cdelt: number }
  | { kind: 'table' };

/** Largest departure in pixels of `axis` from the straight line through its end points. */
function linearDeparture(axis: Float64Array, map: (x: number) => number): number {
  const n = axis.length;
  if (n < 3) return 0;
  const a = map(axis[0]);
  const step = (map(axis[n - 1]) - a) / (n - 1);
  let worst = 0;
  for (let i = 1; i < n - 1; i++) worst = Math.max(worst, Math.abs(map(axis[i]) - (a + step * i)) / Math.abs(step));
  return worst;
}

function chooseLayout(s: Spectrum, requested: NonNullable<FitsWriteOptions['layout']>, logger: Logger): Layout {
  const w = s.wavelength;
  const n = w.length;
  if (requested === 'table') return { kind: 'table' };
  if (s.unit === 'pixel' && requested === 'auto' && w.every((v, i) => v === i)) return { kind: 'pixel-index' };
  const first = w[0];
  const last = w[n - 1];
  const linear = (): Layout => ({ kind: 'linear', crval: first, cdelt: n > 1 ? (last - first) / (n - 1) : 1 });
  const positive = first > 0 && last > 0;
  const log = (): Layout => {
    const cdeltLn = n > 1 ? Math.log(last / first) / (n - 1) : 1e-5;
    // A log-linear axis of unknown medium has no WAVE/AWAV type: the DC-FLAG = 1 (log10) convention is used.
    return s.medium === null || s.unit === 'pixel'
      ? { kind: 'log10', crval: Math.log10(first), cdelt: cdeltLn / Math.LN10 }
      : { kind: 'log', crval: first, cdelt: first * cdeltLn };
  };
  const linDev = linearDeparture(w, (x) => x);
  if (requested === 'linear') {
    if (linDev > AXIS_TOLERANCE_PIXELS) logger.warn({ code: 'fits.forced-linear', message: `the spectral axis departs from a linear WCS by up to ${linDev.toPrecision(3)} pixels; written as linear as asked` });
    return linear();
  }
  if (requested === 'log-linear') {
    if (!positive) throw new UsageError('fits.log-axis', 'a log-linear WCS needs positive wavelengths');
    const logDev = linearDeparture(w, Math.log);
    if (logDev > AXIS_TOLERANCE_PIXELS) logger.warn({ code: 'fits.forced-log', message: `the spectral axis departs from a log-linear WCS by up to ${logDev.toPrecision(3)} pixels; written as log-linear as asked` });
    return log();
  }
  if (linDev <= AXIS_TOLERANCE_PIXELS) return linear();
  if (positive && s.unit !== 'pixel' && linearDeparture(w, Math.log) <= AXIS_TOLERANCE_PIXELS) return log();
  return { kind: 'table' };
}

/** One HDU to write: header cards (without END), and data bytes. */
interface HduPlan {
  cards: HeaderCard[];
  data: Uint8Array;
}

function floatBytes(values: Float64Array, dataType: 'float32' | 'float64'): Uint8Array {
  const size = dataType === 'float32' ? 4 : 8;
  const out = new Uint8Array(values.length * size);
  const view = new DataView(out.buffer);
  if (size === 4) for (let i = 0; i < values.length; i++) view.setFloat32(4 * i, values[i], false);
  else for (let i = 0; i < values.length; i++) view.setFloat64(8 * i, values[i], false);
  return out;
}

/** Cards from the spectrum's header that still apply, made writable (ASCII, finite numbers). */
function keptCards(s: Spectrum, logger: Logger): HeaderCard[] {
  const out: HeaderCard[] = [];
  for (const card of s.header.cards) {
    if (card.value !== undefined ? isRewrittenKeyword(card.keyword) : card.keyword === 'CONTINUE') continue;
    if (card.value === undefined && !isCommentaryKeyword(card.keyword) && !isStandardKeyword(card.keyword)) {
      logger.warn({ code: 'fits.card-not-written', message: `header card ${card.keyword} has no value and a keyword longer than 8 characters, which FITS cannot hold; not written` });
      continue;
    }
    if (card.value !== undefined && !isStandardKeyword(card.keyword) && card.keyword.length > MAX_HIERARCH_KEYWORD) {
      logger.warn({ code: 'fits.card-not-written', message: `header card ${card.keyword.slice(0, 20)}… has a keyword of ${card.keyword.length} characters, too long even for a HIERARCH card; not written` });
      continue;
    }
    if (typeof card.value === 'number' && !Number.isFinite(card.value)) {
      logger.warn({ code: 'fits.card-not-written', message: `header card ${card.keyword} = ${card.value} is not a finite number and was not written` });
      continue;
    }
    const fixed = asciiCard(card);
    if (fixed !== card) logger.warn({ code: 'fits.card-non-ascii', message: `header card ${card.keyword} holds characters outside printable ASCII; written with ? in their place` });
    out.push(fixed);
  }
  return out;
}

const NON_PRINTABLE = /[^\x20-\x7e]/g;

function asciiCard(card: HeaderCard): HeaderCard {
  const bad = (t: string | undefined) => t !== undefined && NON_PRINTABLE.test(t);
  NON_PRINTABLE.lastIndex = 0;
  const anyBad = bad(card.keyword) || bad(card.comment) || bad(card.text) || (typeof card.value === 'string' && bad(card.value));
  NON_PRINTABLE.lastIndex = 0;
  if (!anyBad) return card;
  const fix = (t: string) => t.replace(NON_PRINTABLE, '?');
  const out: { -readonly [K in keyof HeaderCard]: HeaderCard[K] } = { ...card, keyword: fix(card.keyword) };
  if (card.comment !== undefined) out.comment = fix(card.comment);
  if (card.text !== undefined) out.text = fix(card.text);
  if (typeof card.value === 'string') out.value = fix(card.value);
  return out;
}

/** HISTORY cards for the provenance, one entry per group of cards, wrapped at 72 characters. */
function historyCards(s: Spectrum): HeaderCard[] {
  const out: HeaderCard[] = [];
  for (const entry of s.provenance) {
    const text = formatProvenance(entry).replace(NON_PRINTABLE, '?');
    for (const line of wrap(text, 72)) out.push({ keyword: 'HISTORY', text: line });
  }
  return out;
}

/**
 * Wraps text into lines of at most `width` characters without losing any: a line ends
 * after a comma or before a space when one is near the end, otherwise at `width`, so that
 * joining the lines gives the text back.
 */
export function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let rest = text;
  while (rest.length > width) {
    let cut = Math.max(rest.lastIndexOf(' ', width - 1), rest.lastIndexOf(',', width - 1) + 1);
    if (cut <= width / 2) cut = width;
    lines.push(rest.slice(0, cut));
    rest = rest.slice(cut);
  }
  lines.push(rest);
  return lines;
}

/** A real-valued card value, written with a decimal point or exponent. */
function real(x: number): { value: number; rawValue: string } {
  return { value: x, rawValue: formatReal(x) };
}

function wcsCards(s: Spectrum, layout: Layout): HeaderCard[] {
  if (layout.kind === 'pixel-index' || layout.kind === 'table') return [];
  const medium = s.medium;
  const pixel = s.unit === 'pixel';
  let ctype: string;
  let what: string;
  if (layout.kind === 'log10') {
    ctype = 'LINEAR';
    what = 'log10 of wavelength, with DC-FLAG = 1';
  } else if (pixel) {
    ctype = 'PIXEL';
    what = 'pixel coordinate';
  } else if (medium === null) {
    ctype = 'LINEAR';
    what = 'wavelength, medium not stated';
  } else {
    ctype = `${medium === 'air' ? 'AWAV' : 'WAVE'}${layout.kind === 'log' ? '-LOG' : ''}`;
    what = `${medium} wavelength${layout.kind === 'log' ? ', logarithmic' : ''}`;
  }
  const cards: HeaderCard[] = [
    { keyword: 'CTYPE1', value: ctype, comment: what },
    { keyword: 'CUNIT1', value: unitSymbol(s.unit), comment: layout.kind === 'log10' ? 'unit of the wavelength (not of its log)' : 'unit of the spectral axis' },
    { keyword: 'CRPIX1', ...real(1), comment: 'reference pixel (1-based)' },
    { keyword: 'CRVAL1', ...real(layout.crval), comment: layout.kind === 'log10' ? 'log10 of the wavelength at CRPIX1' : 'value at the reference pixel' },
    { keyword: 'CDELT1', ...real(layout.cdelt), comment: layout.kind === 'log10' ? 'log10 step per pixel' : 'step per pixel at the reference pixel' },
  ];
  if (layout.kind === 'log10') cards.push({ keyword: 'DC-FLAG', value: 1, comment: 'log10-linear dispersion' });
  return cards;
}

function imageHdu(primary: boolean, values: Float64Array | Uint8Array, bitpix: number, extra: HeaderCard[]): HduPlan {
  const cards: HeaderCard[] = [
    primary ? { keyword: 'SIMPLE', value: true, comment: 'conforms to FITS Standard 4.0' } : { keyword: 'XTENSION', value: 'IMAGE', comment: 'image extension' },
    { keyword: 'BITPIX', value: bitpix, comment: bitpix === 8 ? '8-bit unsigned integers' : `IEEE ${bitpix === -32 ? '32' : '64'}-bit floating point` },
    { keyword: 'NAXIS', value: 1, comment: 'one axis' },
    { keyword: 'NAXIS1', value: values.length, comment: 'number of pixels' },
  ];
  if (!primary) cards.push({ keyword: 'PCOUNT', value: 0, comment: 'no parameters' }, { keyword: 'GCOUNT', value: 1, comment: 'one group' });
  cards.push(...extra);
  const data = values instanceof Uint8Array ? values : floatBytes(values, bitpix === -32 ? 'float32' : 'float64');
  return { cards, data };
}

/**
 * Encodes a spectrum as the bytes of a FITS file.
 *
 * Method (FITS Standard 4.0): with a linear or log-linear axis, a primary HDU holding a
 * 1-D image (BITPIX −64 or −32, §5.3) with CTYPE1 WAVE/AWAV (vacuum/air; `-LOG` for
 * log-linear, Greisen et al. 2006), LINEAR when the medium is unknown (log-linear then uses
 * DC-FLAG = 1 with log10 values), or PIXEL for an uncalibrated axis that is not the plain
 * 0-based index (which is written with no WCS); CRPIX1 = 1, CRVAL1 = first value, CDELT1
 * from the end points. An uncertainty goes into an IMAGE extension `UNCERT` (1-σ, same
 * BUNIT), a mask into an IMAGE extension `MASK` (BITPIX 8, non-zero = bad). Otherwise an
 * empty primary HDU and a BINTABLE `SPECTRUM` (§7.3) with columns WAVELENGTH (D), FLUX,
 * UNCERTAINTY (E or D) and MASK (B), the header cards in the table's HDU, and AIRORVAC
 * for the medium. The spectrum's header cards follow, without structural, WCS, scaling
 * and checksum cards; then one group of HISTORY cards per provenance entry; then DATASUM
 * and CHECKSUM (checksum convention, §4.4.2.7).
 *
 * @param spectrum the spectrum (not modified).
 * @param options `dataType` (default float64), `layout` (default auto), `logger`.
 * @returns the file's bytes, a multiple of 2880.
 * @throws {UsageError} when a log-linear WCS is forced on non-positive wavelengths, or a
 *   header keyword is too long to write.
 * @example
 * const bytes = encodeFitsSpectrum(createSpectrum({ wavelength: [6560, 6561, 6562], flux: [1, 0.6, 1], medium: 'air' }));
 * bytes.length; // 5760
 */
export function encodeFitsSpectrum(spectrum: Spectrum, options: FitsWriteOptions = {}): Uint8Array {
  const dataType = options.dataType ?? 'float64';
  if (dataType !== 'float32' && dataType !== 'float64') throw new UsageError('fits.data-type', `dataType must be 'float32' or 'float64', not '${String(dataType)}'`);
  const requested = options.layout ?? 'auto';
  if (!['auto', 'linear', 'log-linear', 'table'].includes(requested)) throw new UsageError('fits.layout', `layout must be 'auto', 'linear', 'log-linear' or 'table', not '${String(requested)}'`);
  const logger = options.logger ?? silentLogger;
  const layout = chooseLayout(spectrum, requested, logger);
  const bitpix = dataType === 'float32' ? -32 : -64;
  const kept = keptCards(spectrum, logger);
  const history = historyCards(spectrum);
  const fluxUnit = spectrum.fluxUnit?.replace(NON_PRINTABLE, '?');
  const hdus: HduPlan[] = [];
  if (layout.kind !== 'table') {
    const hasExtensions = spectrum.uncertainty !== undefined || spectrum.mask !== undefined;
    const extra: HeaderCard[] = [];
    if (hasExtensions) extra.push({ keyword: 'EXTEND', value: true, comment: 'extensions follow' });
    extra.push(...wcsCards(spectrum, layout));
    if (fluxUnit) extra.push({ keyword: 'BUNIT', value: fluxUnit, comment: 'flux unit' });
    hdus.push(imageHdu(true, spectrum.flux, bitpix, [...extra, ...kept, ...history]));
    if (spectrum.uncertainty) {
      const ext: HeaderCard[] = [{ keyword: 'EXTNAME', value: 'UNCERT', comment: '1-sigma flux uncertainty' }];
      if (fluxUnit) ext.push({ keyword: 'BUNIT', value: fluxUnit, comment: 'flux unit' });
      hdus.push(imageHdu(false, spectrum.uncertainty, bitpix, ext));
    }
    if (spectrum.mask) hdus.push(imageHdu(false, spectrum.mask, 8, [{ keyword: 'EXTNAME', value: 'MASK', comment: 'pixel mask: 0 good, non-zero bad' }]));
  } else {
    hdus.push({
      cards: [
        { keyword: 'SIMPLE', value: true, comment: 'conforms to FITS Standard 4.0' },
        { keyword: 'BITPIX', value: 8, comment: 'no data in the primary HDU' },
        { keyword: 'NAXIS', value: 0, comment: 'no data in the primary HDU' },
        { keyword: 'EXTEND', value: true, comment: 'the spectrum is in extension 1' },
      ],
      data: new Uint8Array(0),
    });
    hdus.push(tableHdu(spectrum, dataType, fluxUnit, [...kept, ...history]));
  }
  const blocks = hdus.map(encodeHdu);
  const total = blocks.reduce((a, b) => a + b.length, 0);
  const out = new Uint8Array(total);
  let pos = 0;
  for (const b of blocks) {
    out.set(b, pos);
    pos += b.length;
  }
  return out;
}

function tableHdu(s: Spectrum, dataType: 'float32' | 'float64', fluxUnit: string | undefined, rest: HeaderCard[]): HduPlan {
  const n = s.flux.length;
  const fluxCode = dataType === 'float32' ? 'E' : 'D';
  const fluxSize = dataType === 'float32' ? 4 : 8;
  const columns: { name: string; form: string; size: number; unit?: string; write: (view: DataView, pos: number, i: number) => void }[] = [
    { name: 'WAVELENGTH', form: '1D', size: 8, unit: unitSymbol(s.unit), write: (v, p, i) => v.setFloat64(p, s.wavelength[i], false) },
    { name: 'FLUX', form: `1${fluxCode}`, size: fluxSize, ...(fluxUnit ? { unit: fluxUnit } : {}), write: (v, p, i) => (fluxSize === 4 ? v.setFloat32(p, s.flux[i], false) : v.setFloat64(p, s.flux[i], false)) },
  ];
  const unc = s.uncertainty;
  if (unc) columns.push({ name: 'UNCERTAINTY', form: `1${fluxCode}`, size: fluxSize, ...(fluxUnit ? { unit: fluxUnit } : {}), write: (v, p, i) => (fluxSize === 4 ? v.setFloat32(p, unc[i], false) : v.setFloat64(p, unc[i], false)) });
  const mask = s.mask;
  if (mask) columns.push({ name: 'MASK', form: '1B', size: 1, write: (v, p, i) => v.setUint8(p, mask[i]) });
  const rowBytes = columns.reduce((a, c) => a + c.size, 0);
  const data = new Uint8Array(rowBytes * n);
  const view = new DataView(data.buffer);
  for (let i = 0; i < n; i++) {
    let pos = i * rowBytes;
    for (const c of columns) {
      c.write(view, pos, i);
      pos += c.size;
    }
  }
  const cards: HeaderCard[] = [
    { keyword: 'XTENSION', value: 'BINTABLE', comment: 'binary table extension' },
    { keyword: 'BITPIX', value: 8, comment: 'bytes' },
    { keyword: 'NAXIS', value: 2, comment: 'a table' },
    { keyword: 'NAXIS1', value: rowBytes, comment: 'bytes per row' },
    { keyword: 'NAXIS2', value: n, comment: 'one row per pixel' },
    { keyword: 'PCOUNT', value: 0, comment: 'no heap' },
    { keyword: 'GCOUNT', value: 1, comment: 'one group' },
    { keyword: 'TFIELDS', value: columns.length, comment: 'columns' },
  ];
  columns.forEach((c, k) => {
    cards.push({ keyword: `TTYPE${k + 1}`, value: c.name }, { keyword: `TFORM${k + 1}`, value: c.form });
    if (c.unit) cards.push({ keyword: `TUNIT${k + 1}`, value: c.unit });
  });
  cards.push({ keyword: 'EXTNAME', value: 'SPECTRUM', comment: 'the spectrum' });
  if (s.medium !== null) cards.push({ keyword: 'AIRORVAC', value: s.medium === 'air' ? 'air' : 'vac', comment: 'wavelengths in air or vacuum' });
  cards.push(...rest);
  return { cards, data };
}

/** Formats an HDU's header with DATASUM and CHECKSUM, pads header and data to whole blocks. */
function encodeHdu(plan: HduPlan): Uint8Array {
  const dataPadded = Math.ceil(plan.data.length / BLOCK_LENGTH) * BLOCK_LENGTH;
  const dataSum = onesComplementSum(plan.data, 0, dataPadded);
  const placeholder = '0000000000000000';
  const cards: HeaderCard[] = [
    ...plan.cards,
    { keyword: 'DATASUM', value: String(dataSum), comment: 'data unit checksum' },
    { keyword: 'CHECKSUM', value: placeholder, comment: 'HDU checksum' },
  ];
  const images: string[] = [];
  for (const card of cards) {
    try {
      images.push(...formatCard(card));
    } catch (e) {
      if (e instanceof CardProblem) throw new UsageError(e.code, `header keyword ${card.keyword}: ${e.detail}`);
      throw e;
    }
  }
  images.push('END'.padEnd(CARD_LENGTH, ' '));
  const headerBytes = Math.ceil((images.length * CARD_LENGTH) / BLOCK_LENGTH) * BLOCK_LENGTH;
  const out = new Uint8Array(headerBytes + dataPadded);
  out.fill(0x20, 0, headerBytes);
  let checksumAt = -1;
  images.forEach((img, k) => {
    for (let i = 0; i < CARD_LENGTH; i++) out[k * CARD_LENGTH + i] = img.charCodeAt(i);
    if (img.startsWith('CHECKSUM= ')) checksumAt = k * CARD_LENGTH + 11;
  });
  out.set(plan.data, headerBytes);
  const sum = onesComplementSum(out, 0, headerBytes, dataSum);
  const code = encodeChecksum(sum, true);
  for (let i = 0; i < 16; i++) out[checksumAt + i] = code.charCodeAt(i);
  return out;
}

/**
 * Writes a spectrum to a FITS file (see {@link encodeFitsSpectrum} for the layout).
 *
 * The file is written under a temporary name in the same folder and then renamed, so a
 * failure never leaves a partial file; an existing file at `path` is replaced, except the
 * spectrum's own input file, which is never overwritten.
 *
 * @param path output file path.
 * @param spectrum the spectrum (not modified).
 * @param options as for {@link encodeFitsSpectrum}.
 * @throws {UsageError} when `path` is the spectrum's input file (`spectrum.source.file`,
 *   compared by real path) or a folder, or as {@link encodeFitsSpectrum}.
 * @example
 * writeFitsSpectrum('out/lvac7-calibrated.fits', spectrum, { dataType: 'float32' });
 */
export function writeFitsSpectrum(path: string, spectrum: Spectrum, options: FitsWriteOptions = {}): void {
  const target = resolve(path);
  if (existsSync(target) && statSync(target).isDirectory()) {
    throw new UsageError('fits.output-is-folder', 'is a folder; give a file name for the FITS output', { file: path });
  }
  const source = spectrum.source?.file;
  if (source !== undefined && existsSync(source) && existsSync(target) && realpathSync(source) === realpathSync(target)) {
    throw new UsageError('fits.overwrite-input', `is the file this spectrum was read from; lineshift never overwrites its input, so write to another file`, { file: path });
  }
  const bytes = encodeFitsSpectrum(spectrum, options);
  writeFileAtomic(target, bytes);
}
