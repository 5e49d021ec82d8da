/**
 * Image data: big-endian integers and IEEE floats (FITS Standard 4.0 §5), scaled with
 * BSCALE and BZERO (§4.4.2.5), with BLANK marking undefined integer pixels (§4.4.2.5),
 * returned as physical values in a Float64Array (NaN for undefined pixels).
 */
import { fitsError, fitsWarn, type FitsContext } from './context.js';
import { keywordLocation, type FitsHdu } from './structure.js';

/** Physical value = BZERO + BSCALE × stored value (§4.4.2.5, eq. 5). */
export interface Scaling {
  readonly scale: number;
  readonly zero: number;
  /** Stored integer value that marks an undefined pixel, or undefined. */
  readonly blank?: bigint;
  /** True when BZERO = 2^63 exactly with BSCALE = 1 (unsigned 64-bit integers, §5.3 Table 11). */
  readonly unsigned64: boolean;
}

/** Reads BSCALE, BZERO and BLANK of an image HDU. */
export function imageScaling(hdu: FitsHdu, ctx: FitsContext): Scaling {
  const scale = numberKeyword(hdu, 'BSCALE', 1, ctx);
  const zero = numberKeyword(hdu, 'BZERO', 0, ctx);
  const blankCard = hdu.header.card('BLANK');
  let blank: bigint | undefined;
  if (blankCard !== undefined) {
    const v = blankCard.value;
    if (hdu.bitpix < 0) {
      fitsWarn(ctx, 'fits.blank-float', 'BLANK is ignored for floating-point data, where NaN marks undefined pixels (FITS Standard 4.0 §4.4.2.5)', keywordLocation(hdu, 'BLANK'));
    } else if (typeof v === 'number' && Number.isInteger(v)) blank = BigInt(v);
    else if (typeof v === 'bigint') blank = v;
    else throw fitsError(ctx, 'fits.bad-keyword-value', `BLANK must be an integer, not ${JSON.stringify(v)} (FITS Standard 4.0 §4.4.2.5)`, keywordLocation(hdu, 'BLANK'));
  }
  const zeroValue = hdu.header.get('BZERO');
  const unsigned64 = hdu.bitpix === 64 && scale === 1 && typeof zeroValue === 'bigint' && zeroValue === 1n << 63n;
  return { scale, zero, ...(blank !== undefined ? { blank } : {}), unsigned64 };
}

/** A numeric keyword with a default; present but not a number is an error. */
export function numberKeyword(hdu: FitsHdu, keyword: string, fallback: number, ctx: FitsContext): number {
  const v = hdu.header.get(keyword);
  if (v === undefined || v === null) return fallback;
  if (typeof v === 'number' && Number.isFinite(v)) return v;
  if (typeof v === 'bigint') return Number(v);
  throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} must be a number, not ${JSON.stringify(typeof v === 'number' ? String(v) : v)}`, keywordLocation(hdu, keyword));
}

/**
 * Decodes `count` stored values of type `bitpix` starting at byte `offset` into physical
 * values. The caller has checked that the bytes exist.
 */
export function decodeValues(bytes: Uint8Array, offset: number, count: number, bitpix: number, scaling: Scaling): Float64Array {
  const out = new Float64Array(count);
  const view = new DataView(bytes.buffer, bytes.byteOffset + offset, count * (Math.abs(bitpix) / 8));
  const { scale, zero } = scaling;
  const identity = scale === 1 && zero === 0;
  const blank = scaling.blank;
  switch (bitpix) {
    case -32:
      for (let i = 0; i < count; i++) out[i] = view.getFloat32(4 * i, false);
      break;
    case -64:
      for (let i = 0; i < count; i++) out[i] = view.getFloat64(8 * i, false);
      break;
    case 8: {
      const b = blank === undefined ? -1 : Number(blank);
      const base = bytes.byteOffset + offset;
      const u8 = new Uint8Array(bytes.buffer, base, count);
      for (let i = 0; i < count; i++) {
        const v = u8[i];
        out[i] = v === b ? NaN : identity ? v : v * scale + zero;
      }
      return out;
    }
    case 16: {
      const b = blank === undefined ? 0x10000 : Number(blank);
      for (let i = 0; i < count; i++) {
        const v = view.getInt16(2 * i, false);
        out[i] = v === b ? NaN : identity ? v : v * scale + zero;
      }
      return out;
    }
    case 32: {
      const b = blank === undefined ? 2 ** 40 : Number(blank);
      for (let i = 0; i < count; i++) {
        const v = view.getInt32(4 * i, false);
        out[i] = v === b ? NaN : identity ? v : v * scale + zero;
      }
      return out;
    }
    case 64: {
      for (let i = 0; i < count; i++) {
        const v = view.getBigInt64(8 * i, false);
        if (blank !== undefined && v === blank) out[i] = NaN;
        else if (scaling.unsigned64) out[i] = Number(v + (1n << 63n));
        else out[i] = identity ? Number(v) : Number(v) * scale + zero;
      }
      return out;
    }
    default:
      throw new RangeError(`BITPIX ${bitpix}`);
  }
  if (!identity) for (let i = 0; i < count; i++) out[i] = out[i] * scale + zero;
  return out;
}

/** Reads the pixels of an image HDU (all of them, in file order). */
export function readImagePixels(bytes: Uint8Array, hdu: FitsHdu, ctx: FitsContext): Float64Array {
  const count = hdu.dataByteLength / (Math.abs(hdu.bitpix) / 8);
  return decodeValues(bytes, hdu.dataOffset, count, hdu.bitpix, imageScaling(hdu, ctx));
}
