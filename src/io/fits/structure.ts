/**
 * The layout of a FITS file: every HDU's header, its mandatory keywords and where its data
 * lies (FITS Standard 4.0 §3, §4.4.1, §7). Sizes are computed with BigInt and checked
 * against the file before anything is allocated.
 */
import type { ErrorLocation } from '../../errors.js';
import type { Logger } from '../../logger.js';
import type { Header } from '../../spectrum/header.js';
import { BLOCK_LENGTH } from './cards.js';
import { fitsContext, fitsError, fitsWarn, type FitsContext } from './context.js';
import { readHeader } from './header.js';

/** What an HDU holds, from its first keyword (SIMPLE, or XTENSION's value). */
export type FitsHduKind = 'primary' | 'image' | 'bintable' | 'table' | 'random-groups' | 'other';

/** One header-data unit of a FITS file, with its data located but not read. */
export interface FitsHdu {
  /** 0-based position in the file (0 is the primary HDU). */
  readonly index: number;
  /** What it holds. */
  readonly kind: FitsHduKind;
  /** XTENSION value (trailing blanks removed), or null for the primary HDU. */
  readonly extension: string | null;
  /** EXTNAME, or null. */
  readonly name: string | null;
  /** The header cards, in order (CONTINUE strings joined). */
  readonly header: Header;
  /** 1-based card number in the file of each card of `header` (for messages). */
  readonly cardNumbers: readonly number[];
  /** BITPIX: 8, 16, 32, 64, -32 or -64. */
  readonly bitpix: number;
  /** NAXIS1, NAXIS2, … (empty when NAXIS = 0). */
  readonly axes: readonly number[];
  /** PCOUNT (0 for the primary HDU). */
  readonly pcount: number;
  /** GCOUNT (1 for the primary HDU). */
  readonly gcount: number;
  /** Byte offset of the header. */
  readonly headerOffset: number;
  /** Byte offset of the data. */
  readonly dataOffset: number;
  /** Bytes of data declared by the header (without block padding), all present in the file. */
  readonly dataByteLength: number;
}

/** Options of {@link parseFitsStructure}. */
export interface FitsStructureOptions {
  /** Receives warnings (HIERARCH cards, non-standard keywords, missing padding). */
  logger?: Logger;
}

const BITPIX_VALUES = [8, 16, 32, 64, -32, -64];

/** Greatest NAXIS and TFIELDS the Standard allows (§4.4.1.1, §7.3.1). */
export const MAX_AXES = 999;

/**
 * Reads the headers of every HDU of a FITS file and locates each data unit, without
 * reading data.
 *
 * Method: FITS Standard 4.0 §3.3 and §4.4.1: the data of an HDU holds
 * |BITPIX| × GCOUNT × (PCOUNT + NAXIS1 × … × NAXISn) bits (for random groups NAXIS1 = 0
 * is left out of the product), padded to whole 2880-byte blocks; the next HDU starts with
 * `XTENSION=`. Bytes after the last HDU that are not an extension are ignored with a
 * warning.
 *
 * @param bytes the whole file.
 * @param name file name for messages.
 * @returns the HDUs in file order.
 * @throws {InputError} for a file that does not start with SIMPLE, a missing or invalid
 *   mandatory keyword (BITPIX, NAXIS, NAXISn, PCOUNT, GCOUNT), a header without END, or
 *   data declared beyond the end of the file.
 * @example
 * const hdus = parseFitsStructure(readFileSync('data/samples/lvac7-star.fits'), 'lvac7-star.fits');
 * hdus[0].axes; // [2048]
 */
export function parseFitsStructure(bytes: Uint8Array, name: string, options: FitsStructureOptions = {}): FitsHdu[] {
  return walkHdus(bytes, fitsContext(name, options.logger));
}

/** {@link parseFitsStructure} with a reader context. */
export function walkHdus(bytes: Uint8Array, ctx: FitsContext): FitsHdu[] {
  if (bytes.length === 0) throw fitsError(ctx, 'io.empty-file', 'the file is empty');
  const hdus: FitsHdu[] = [];
  let offset = 0;
  while (offset < bytes.length) {
    const index = hdus.length;
    if (index > 0 && !startsWith(bytes, offset, 'XTENSION=')) {
      if (!allPadding(bytes, offset)) {
        fitsWarn(ctx, 'fits.trailing-bytes', `${bytes.length - offset} bytes after the last HDU do not start an extension (XTENSION) and were ignored`, { byteOffset: offset });
      }
      break;
    }
    if (index === 0 && !startsWith(bytes, 0, 'SIMPLE  =')) {
      throw fitsError(ctx, 'fits.not-fits', 'the file does not start with SIMPLE = T, so it is not a FITS file (FITS Standard 4.0 §4.4.1.1)', { hdu: 0, card: 1 });
    }
    const parsed = readHeader(bytes, offset, index, ctx);
    const hdu = describeHdu(bytes, offset, parsed.header, parsed.cardNumbers, parsed.byteLength, index, ctx);
    hdus.push(hdu);
    const padded = Math.ceil(hdu.dataByteLength / BLOCK_LENGTH) * BLOCK_LENGTH;
    const next = hdu.dataOffset + padded;
    if (next > bytes.length) {
      // All declared data is present (checked in describeHdu); only the block padding is missing.
      fitsWarn(ctx, 'fits.missing-padding', `the data ends at byte ${hdu.dataOffset + hdu.dataByteLength} without the padding to a whole 2880-byte block (FITS Standard 4.0 §3.3.2); read anyway`, { hdu: index });
      break;
    }
    offset = next;
  }
  return hdus;
}

/** Locates a keyword's card for messages. */
export function keywordLocation(hdu: Pick<FitsHdu, 'index' | 'header' | 'cardNumbers'>, keyword: string): Omit<ErrorLocation, 'file'> {
  const p = hdu.header.position(keyword);
  return p === undefined ? { hdu: hdu.index, keyword } : { hdu: hdu.index, card: hdu.cardNumbers[p - 1], keyword };
}

function describeHdu(
  bytes: Uint8Array,
  headerOffset: number,
  header: Header,
  cardNumbers: readonly number[],
  headerBytes: number,
  index: number,
  ctx: FitsContext,
): FitsHdu {
  const where = { index, header, cardNumbers };
  const first = header.cards[0];
  let kind: FitsHduKind;
  let extension: string | null = null;
  if (index === 0) {
    if (first?.keyword !== 'SIMPLE' || typeof first.value !== 'boolean') {
      throw fitsError(ctx, 'fits.bad-simple', 'the first card must be SIMPLE = T (FITS Standard 4.0 §4.4.1.1)', { hdu: 0, card: 1, keyword: 'SIMPLE' });
    }
    if (first.value === false) fitsWarn(ctx, 'fits.simple-false', 'SIMPLE = F: the file says it does not conform to the FITS Standard; reading it anyway', { hdu: 0, card: 1, keyword: 'SIMPLE' });
    kind = 'primary';
  } else {
    if (first?.keyword !== 'XTENSION' || typeof first.value !== 'string') {
      throw fitsError(ctx, 'fits.bad-xtension', 'an extension must start with XTENSION = \'type\' (FITS Standard 4.0 §7)', { hdu: index, card: 1, keyword: 'XTENSION' });
    }
    extension = first.value.trim();
    kind = extension === 'IMAGE' ? 'image' : extension === 'BINTABLE' ? 'bintable' : extension === 'TABLE' ? 'table' : 'other';
  }
  const bitpix = requiredInteger(where, 'BITPIX', ctx);
  if (!BITPIX_VALUES.includes(bitpix)) {
    throw fitsError(ctx, 'fits.bad-bitpix', `BITPIX = ${bitpix} is not one of 8, 16, 32, 64, -32, -64 (FITS Standard 4.0 §4.4.1.1, Table 8)`, keywordLocation(where, 'BITPIX'));
  }
  const naxis = requiredInteger(where, 'NAXIS', ctx);
  if (naxis < 0 || naxis > MAX_AXES) {
    throw fitsError(ctx, 'fits.bad-naxis', `NAXIS = ${naxis} is outside 0 to ${MAX_AXES} (FITS Standard 4.0 §4.4.1.1)`, keywordLocation(where, 'NAXIS'));
  }
  const axes: number[] = [];
  for (let n = 1; n <= naxis; n++) {
    const kw = `NAXIS${n}`;
    const v = requiredInteger(where, kw, ctx, true);
    if (v < 0) throw fitsError(ctx, 'fits.bad-naxis', `${kw} = ${v} is negative; axis lengths are 0 or more (FITS Standard 4.0 §4.4.1.1)`, keywordLocation(where, kw));
    axes.push(v);
  }
  let pcount = 0;
  let gcount = 1;
  if (index > 0) {
    pcount = requiredInteger(where, 'PCOUNT', ctx, true);
    gcount = requiredInteger(where, 'GCOUNT', ctx, true);
    if (pcount < 0) throw fitsError(ctx, 'fits.bad-pcount', `PCOUNT = ${pcount} is negative (FITS Standard 4.0 §4.4.1.2)`, keywordLocation(where, 'PCOUNT'));
    if (gcount < 0) throw fitsError(ctx, 'fits.bad-gcount', `GCOUNT = ${gcount} is negative (FITS Standard 4.0 §4.4.1.2)`, keywordLocation(where, 'GCOUNT'));
  } else if (naxis > 0 && axes[0] === 0 && header.get('GROUPS') === true) {
    // Random groups (§6): never a spectrum for us, but its size must be right to find what follows.
    kind = 'random-groups';
    pcount = optionalInteger(where, 'PCOUNT', 0, ctx);
    gcount = optionalInteger(where, 'GCOUNT', 1, ctx);
  }
  // Size in bits, exactly (§4.4.1.1 eq. 2, §4.4.1.2 eq. 3, §6 eq. 4).
  let product = 1n;
  const from = kind === 'random-groups' ? 1 : 0;
  if (naxis === 0) product = 0n;
  for (let n = from; n < axes.length; n++) product *= BigInt(axes[n]);
  const bits = BigInt(Math.abs(bitpix)) * BigInt(gcount) * (BigInt(pcount) + product);
  const dataBytes = bits / 8n;
  const dataOffset = headerOffset + headerBytes;
  const available = BigInt(bytes.length - dataOffset);
  if (dataBytes > available) {
    const formula = naxis === 0 ? 'PCOUNT' : axes.map((_, n) => `NAXIS${n + 1}`).join(' × ') + (bitpix === 8 ? '' : ` × ${Math.abs(bitpix) / 8}`) + (pcount ? ' + PCOUNT' : '');
    throw fitsError(
      ctx,
      'fits.data-beyond-end',
      `the header declares ${dataBytes} bytes of data (${formula}) but the file has only ${available} bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)`,
      { hdu: index, byteOffset: dataOffset },
    );
  }
  const extname = header.string('EXTNAME');
  return Object.freeze({
    index,
    kind,
    extension,
    name: extname === undefined ? null : extname.trim(),
    header,
    cardNumbers,
    bitpix,
    axes: Object.freeze(axes),
    pcount,
    gcount,
    headerOffset,
    dataOffset,
    dataByteLength: Number(dataBytes),
  });
}

type Where = Pick<FitsHdu, 'index' | 'header' | 'cardNumbers'>;

/**
 * A mandatory integer keyword. Values beyond 2^53 (bigint) are returned as Infinity when
 * `allowHuge`, so that the size check reports them; otherwise they are an error.
 */
function requiredInteger(where: Where, keyword: string, ctx: FitsContext, allowHuge = false): number {
  const card = where.header.card(keyword);
  if (card === undefined) {
    throw fitsError(ctx, 'fits.missing-keyword', `the mandatory keyword ${keyword} is missing (FITS Standard 4.0 §4.4.1)`, { hdu: where.index, keyword });
  }
  if (card.rawValue !== undefined) {
    throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} must be an integer, not ${card.rawValue} (FITS Standard 4.0 §4.4.1)`, keywordLocation(where, keyword));
  }
  return integerValue(where, keyword, card.value, ctx, allowHuge);
}

function optionalInteger(where: Where, keyword: string, fallback: number, ctx: FitsContext): number {
  const card = where.header.card(keyword);
  return card === undefined ? fallback : integerValue(where, keyword, card.value, ctx, false);
}

function integerValue(where: Where, keyword: string, value: unknown, ctx: FitsContext, allowHuge: boolean): number {
  if (typeof value === 'number' && Number.isInteger(value)) return value;
  if (typeof value === 'bigint') {
    if (allowHuge && value > 0n) return Number.MAX_SAFE_INTEGER;
    throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} = ${value} is out of range`, keywordLocation(where, keyword));
  }
  const shown = typeof value === 'string' ? `'${value}'` : String(value);
  throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} must be an integer, not ${shown} (FITS Standard 4.0 §4.4.1)`, keywordLocation(where, keyword));
}

function startsWith(bytes: Uint8Array, offset: number, text: string): boolean {
  if (offset + text.length > bytes.length) return false;
  for (let i = 0; i < text.length; i++) if (bytes[offset + i] !== text.charCodeAt(i)) return false;
  return true;
}

function allPadding(bytes: Uint8Array, offset: number): boolean {
  for (let i = offset; i < bytes.length; i++) if (bytes[i] !== 0 && bytes[i] !== 0x20) return false;
  return true;
}
