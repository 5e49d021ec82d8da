/**
 * The FITS checksum convention (Seaman, Pence & Rots; FITS Standard 4.0 §4.4.2.7 and
 * Appendix J): DATASUM is the 32-bit ones'-complement sum of the data unit, as an unsigned
 * decimal string; CHECKSUM is a 16-character ASCII encoding chosen so that the ones'-
 * complement sum of the whole HDU (header and data) is −0 (all bits set).
 */
import type { Logger } from '../../logger.js';
import { BLOCK_LENGTH } from './cards.js';
import { fitsContext } from './context.js';
import { walkHdus } from './structure.js';

/**
 * 32-bit ones'-complement sum of `bytes[start, end)` read as big-endian 32-bit words, added
 * to `initial` (Appendix J: 16-bit halves with end-around carries). Bytes past the end of
 * the array count as zero (a last block without its padding). `end − start` must be a
 * multiple of 4.
 */
export function onesComplementSum(bytes: Uint8Array, start: number, end: number, initial = 0): number {
  let hi = Math.floor(initial / 0x10000);
  let lo = initial % 0x10000;
  const stop = Math.min(end, bytes.length);
  let i = start;
  // Accumulate 16-bit halves in doubles; fold every 2^20 words so nothing nears 2^53.
  while (i + 4 <= stop) {
    const chunkEnd = Math.min(stop - ((stop - i) % 4), i + 4 * (1 << 20));
    for (; i < chunkEnd; i += 4) {
      hi += (bytes[i] << 8) | bytes[i + 1];
      lo += (bytes[i + 2] << 8) | bytes[i + 3];
    }
    [hi, lo] = fold(hi, lo);
  }
  if (i < stop) {
    // A final partial word (only when the file lacks its padding): pad with zeros.
    const w = [0, 0, 0, 0];
    for (let k = 0; i + k < stop; k++) w[k] = bytes[i + k];
    hi += (w[0] << 8) | w[1];
    lo += (w[2] << 8) | w[3];
    [hi, lo] = fold(hi, lo);
  }
  return hi * 0x10000 + lo;
}

function fold(hi: number, lo: number): [number, number] {
  while (hi > 0xffff || lo > 0xffff) {
    const hiCarry = Math.floor(hi / 0x10000);
    const loCarry = Math.floor(lo / 0x10000);
    hi = (hi % 0x10000) + loCarry;
    lo = (lo % 0x10000) + hiCarry;
  }
  return [hi, lo];
}

/** Ones'-complement sum of two 32-bit values. */
export function addOnesComplement(a: number, b: number): number {
  const [hi, lo] = fold(Math.floor(a / 0x10000) + Math.floor(b / 0x10000), (a % 0x10000) + (b % 0x10000));
  return hi * 0x10000 + lo;
}

/** Characters the encoding avoids (ASCII punctuation between digits and letters), Appendix J. */
const EXCLUDED = [0x3a, 0x3b, 0x3c, 0x3d, 0x3e, 0x3f, 0x40, 0x5b, 0x5c, 0x5d, 0x5e, 0x5f, 0x60];

/**
 * Encodes a 32-bit value as 16 ASCII characters (Appendix J): each byte is split into four
 * parts offset by 0x30, punctuation avoided by shifting pairs, the result rotated right by
 * one character. With `complement` the value is complemented first, which is how CHECKSUM
 * is made from the HDU's sum.
 */
export function encodeChecksum(value: number, complement = true): string {
  const v = complement ? (~value >>> 0) : value >>> 0;
  const asc = new Array<number>(16);
  for (let i = 0; i < 4; i++) {
    const byte = (v >>> (24 - 8 * i)) & 0xff;
    const quotient = Math.floor(byte / 4) + 0x30;
    const remainder = byte % 4;
    const ch = [quotient + remainder, quotient, quotient, quotient];
    for (let check = true; check;) {
      check = false;
      for (const k of EXCLUDED) {
        for (let j = 0; j < 4; j += 2) {
          if (ch[j] === k || ch[j + 1] === k) {
            ch[j]++;
            ch[j + 1]--;
            check = true;
          }
        }
      }
    }
    for (let j = 0; j < 4; j++) asc[4 * j + i] = ch[j];
  }
  let out = '';
  for (let i = 0; i < 16; i++) out += String.fromCharCode(asc[(i + 15) % 16]);
  return out;
}

/** Outcome of one check: matches, does not match, or the keyword is absent. */
export type ChecksumStatus = 'ok' | 'bad' | 'absent';

/** Checksum verification of one HDU. */
export interface FitsChecksumReport {
  /** 0-based HDU index. */
  readonly hdu: number;
  /** CHECKSUM: the whole HDU sums to −0. */
  readonly checksum: ChecksumStatus;
  /** DATASUM: the data unit's sum equals the value. */
  readonly datasum: ChecksumStatus;
}

/**
 * Verifies the CHECKSUM and DATASUM keywords of every HDU of a FITS file.
 *
 * Method: FITS checksum convention (FITS Standard 4.0 §4.4.2.7, Appendix J): the
 * ones'-complement sum of the data unit (with its padding) must equal DATASUM, and the
 * sum of the header and data units must be −0 (0xFFFFFFFF).
 *
 * @param bytes the whole file.
 * @param name file name for messages.
 * @returns one report per HDU, in file order.
 * @throws {InputError} when the file's structure cannot be read.
 * @example
 * verifyFitsChecksums(encodeFitsSpectrum(spectrum), 'x.fits')[0]; // { hdu: 0, checksum: 'ok', datasum: 'ok' }
 */
export function verifyFitsChecksums(bytes: Uint8Array, name: string, options: { logger?: Logger } = {}): FitsChecksumReport[] {
  const hdus = walkHdus(bytes, fitsContext(name, options.logger));
  return hdus.map((hdu) => {
    const dataEnd = hdu.dataOffset + Math.ceil(hdu.dataByteLength / BLOCK_LENGTH) * BLOCK_LENGTH;
    const dataSum = onesComplementSum(bytes, hdu.dataOffset, dataEnd);
    const datasumValue = hdu.header.get('DATASUM');
    let datasum: ChecksumStatus = 'absent';
    if (datasumValue !== undefined) {
      const text = typeof datasumValue === 'string' ? datasumValue.trim() : String(datasumValue);
      datasum = /^\d+$/.test(text) && Number(text) === dataSum ? 'ok' : 'bad';
    }
    let checksum: ChecksumStatus = 'absent';
    if (hdu.header.has('CHECKSUM')) {
      const total = onesComplementSum(bytes, hdu.headerOffset, hdu.dataOffset, dataSum);
      checksum = total === 0xffffffff ? 'ok' : 'bad';
    }
    return { hdu: hdu.index, checksum, datasum };
  });
}
