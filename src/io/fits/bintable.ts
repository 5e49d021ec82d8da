/**
 * Binary tables (FITS Standard 4.0 §7.3): column formats (TFORMn), names (TTYPEn), units
 * (TUNITn), scaling (TSCALn, TZEROn) and null values (TNULLn) of numeric columns.
 */
import { fitsError, fitsWarn, type FitsContext } from './context.js';
import { MAX_AXES, keywordLocation, type FitsHdu } from './structure.js';

/** One binary-table column. */
export interface TableColumn {
  /** 1-based column number. */
  readonly number: number;
  /** TTYPEn, trimmed ('' when absent). */
  readonly name: string;
  /** Type letter of TFORMn: L X B I J K A E D C M P Q. */
  readonly type: string;
  /** Repeat count r of rTa. */
  readonly repeat: number;
  /** Bytes per row. */
  readonly width: number;
  /** Byte offset within a row. */
  readonly offset: number;
  /** TUNITn, trimmed, or undefined. */
  readonly unit?: string;
  readonly scale: number;
  readonly zero: number;
  /** TNULLn for integer columns. */
  readonly nullValue?: bigint;
}

/** Layout of a binary table. */
export interface TableLayout {
  readonly rowBytes: number;
  readonly rows: number;
  readonly columns: readonly TableColumn[];
}

/** Bytes per element of each TFORM type letter (§7.3.1, Table 18); X is bits, handled apart. */
const ELEMENT_BYTES: Readonly<Record<string, number>> = { L: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, C: 8, M: 16, P: 8, Q: 16 };

/** Numeric types that {@link readColumn} decodes. */
const NUMERIC = new Set(['B', 'I', 'J', 'K', 'E', 'D']);

/**
 * Reads the column layout of a BINTABLE HDU.
 *
 * @throws {InputError} when BITPIX is not 8 or NAXIS not 2 (§7.3.1), TFIELDS is missing or
 *   out of 0…999, a TFORMn is missing or malformed, or the columns need more bytes than a
 *   row has (NAXIS1).
 */
export function tableLayout(hdu: FitsHdu, ctx: FitsContext): TableLayout {
  if (hdu.bitpix !== 8 || hdu.axes.length !== 2) {
    throw fitsError(ctx, 'fits.bad-bintable', `a binary table must have BITPIX = 8 and NAXIS = 2, not ${hdu.bitpix} and ${hdu.axes.length} (FITS Standard 4.0 §7.3.1)`, keywordLocation(hdu, 'BITPIX'));
  }
  const [rowBytes, rows] = hdu.axes;
  const tfields = hdu.header.get('TFIELDS');
  if (typeof tfields !== 'number' || !Number.isInteger(tfields) || tfields < 0 || tfields > MAX_AXES) {
    throw fitsError(ctx, 'fits.bad-keyword-value', tfields === undefined ? 'the mandatory keyword TFIELDS is missing (FITS Standard 4.0 §7.3.1)' : `TFIELDS = ${String(tfields)} is not an integer from 0 to 999 (FITS Standard 4.0 §7.3.1)`, keywordLocation(hdu, 'TFIELDS'));
  }
  const columns: TableColumn[] = [];
  let offset = 0;
  for (let n = 1; n <= tfields; n++) {
    const kw = `TFORM${n}`;
    const tform = hdu.header.get(kw);
    if (typeof tform !== 'string') {
      throw fitsError(ctx, 'fits.bad-tform', tform === undefined ? `${kw} is missing; every column needs a format (FITS Standard 4.0 §7.3.1)` : `${kw} must be a string such as '1E', not ${String(tform)}`, keywordLocation(hdu, kw));
    }
    const m = /^\s*(\d*)([LXBIJKAEDCMPQ])(.*)$/.exec(tform);
    if (!m) {
      throw fitsError(ctx, 'fits.bad-tform', `${kw} = '${tform.trim()}' is not a binary-table format rT (r a repeat count, T one of L X B I J K A E D C M P Q; FITS Standard 4.0 §7.3.1, Table 18)`, keywordLocation(hdu, kw));
    }
    const repeat = m[1] === '' ? 1 : Number(m[1]);
    if (!Number.isSafeInteger(repeat)) {
      throw fitsError(ctx, 'fits.bad-tform', `${kw} = '${tform.trim()}' has an impossible repeat count`, keywordLocation(hdu, kw));
    }
    const type = m[2];
    const width = type === 'X' ? Math.ceil(repeat / 8) : type === 'P' || type === 'Q' ? (repeat > 0 ? ELEMENT_BYTES[type] : 0) : repeat * ELEMENT_BYTES[type];
    const name = hdu.header.string(`TTYPE${n}`)?.trim() ?? '';
    const unitText = hdu.header.string(`TUNIT${n}`)?.trim();
    const scale = numberOr(hdu, `TSCAL${n}`, 1, ctx);
    const zero = numberOr(hdu, `TZERO${n}`, 0, ctx);
    const tnull = hdu.header.get(`TNULL${n}`);
    const column: TableColumn = {
      number: n,
      name,
      type,
      repeat,
      width,
      offset,
      ...(unitText ? { unit: unitText } : {}),
      scale,
      zero,
      ...(typeof tnull === 'number' && Number.isInteger(tnull) ? { nullValue: BigInt(tnull) } : typeof tnull === 'bigint' ? { nullValue: tnull } : {}),
    };
    columns.push(column);
    offset += width;
    if (offset > rowBytes) {
      throw fitsError(ctx, 'fits.columns-exceed-row', `the columns up to ${kw} = '${tform.trim()}' need ${offset} bytes per row but NAXIS1 = ${rowBytes} (FITS Standard 4.0 §7.3.1: NAXIS1 is the sum of the column widths)`, keywordLocation(hdu, kw));
    }
  }
  if (offset < rowBytes) {
    fitsWarn(ctx, 'fits.row-padding', `the columns fill ${offset} of the ${rowBytes} bytes of a row (NAXIS1); the rest is ignored`, keywordLocation(hdu, 'NAXIS1'));
  }
  return { rowBytes, rows, columns };
}

function numberOr(hdu: FitsHdu, keyword: string, fallback: number, ctx: FitsContext): number {
  const v = hdu.header.get(keyword);
  if (v === undefined || v === null) return fallback;
  if (typeof v === 'number' && Number.isFinite(v)) return v;
  if (typeof v === 'bigint') return Number(v);
  throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} must be a number, not ${typeof v === 'string' ? `'${v}'` : String(v)}`, keywordLocation(hdu, keyword));
}

/** True when {@link readColumn} can decode the column. */
export function isNumericColumn(c: TableColumn): boolean {
  return NUMERIC.has(c.type);
}

/**
 * Reads `count` elements of a numeric column starting at row `firstRow`: all repeat
 * elements of each row, row after row. Physical value = TZEROn + TSCALn × stored value
 * (§7.3.2); stored integers equal to TNULLn become NaN (§7.3.2, TNULLn); floating-point
 * NaN stays NaN.
 */
export function readColumn(bytes: Uint8Array, hdu: FitsHdu, layout: TableLayout, column: TableColumn, hduCtx: FitsContext, rows = layout.rows): Float64Array {
  if (!isNumericColumn(column)) {
    throw fitsError(hduCtx, 'fits.column-type', `column ${column.number} (${column.name || 'unnamed'}) has format ${column.repeat}${column.type}, which is not a numeric format lineshift reads (B, I, J, K, E, D)`, keywordLocation(hdu, `TFORM${column.number}`));
  }
  const size = ELEMENT_BYTES[column.type];
  const count = rows * column.repeat;
  const out = new Float64Array(count);
  const view = new DataView(bytes.buffer, bytes.byteOffset + hdu.dataOffset, hdu.dataByteLength);
  const { scale, zero, nullValue } = column;
  const identity = scale === 1 && zero === 0;
  const nul = nullValue === undefined ? undefined : Number(nullValue);
  let k = 0;
  for (let r = 0; r < rows; r++) {
    let pos = r * layout.rowBytes + column.offset;
    for (let e = 0; e < column.repeat; e++, pos += size) {
      let v: number;
      switch (column.type) {
        case 'B': v = view.getUint8(pos); break;
        case 'I': v = view.getInt16(pos, false); break;
        case 'J': v = view.getInt32(pos, false); break;
        case 'K': {
          const b = view.getBigInt64(pos, false);
          if (nullValue !== undefined && b === nullValue) { out[k++] = NaN; continue; }
          // TZERO = 2^63 with TSCAL = 1 marks unsigned 64-bit integers (§7.3.2, Table 19): add exactly.
          out[k++] = scale === 1 && zero === 2 ** 63 ? Number(b + (1n << 63n)) : identity ? Number(b) : Number(b) * scale + zero;
          continue;
        }
        case 'E': v = view.getFloat32(pos, false); break;
        default: v = view.getFloat64(pos, false); break;
      }
      if (nul !== undefined && column.type !== 'E' && column.type !== 'D' && v === nul) out[k++] = NaN;
      else out[k++] = identity ? v : v * scale + zero;
    }
  }
  return out;
}
