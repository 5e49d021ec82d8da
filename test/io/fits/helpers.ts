import { readFileSync } from 'node:fs';
import type { CardValue, HeaderCard } from '../../../src/spectrum/header.js';
import { repoPath } from '../../helpers/paths.js';

/** Folder of the astropy-made fixtures (test/reference/make_fits_fixtures.py). */
export const FIXTURES = repoPath('test', 'fixtures', 'fits');

/** Path of one fixture. */
export function fixture(name: string): string {
  return repoPath('test', 'fixtures', 'fits', name);
}

/** The bytes of one fixture. */
export function fixtureBytes(name: string): Uint8Array {
  return new Uint8Array(readFileSync(fixture(name)));
}

/** Big-endian float64 hex of each value, NaN as the canonical 7ff8000000000000 (as the Python script writes). */
export function hex64(values: ArrayLike<number>): string[] {
  const view = new DataView(new ArrayBuffer(8));
  const out: string[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v)) { out.push('7ff8000000000000'); continue; }
    view.setFloat64(0, v, false);
    let s = '';
    for (let b = 0; b < 8; b++) s += view.getUint8(b).toString(16).padStart(2, '0');
    out.push(s);
  }
  return out;
}

/** A card value as the Python script writes it into JSON. */
export type PyValue = null | boolean | number | string | { real: string } | { complex: [string, string] };

/** Our card in the script's JSON form, for comparison with astropy's. */
export function asPyCard(card: HeaderCard): [string, PyValue, string] {
  if (card.value === undefined) return [card.keyword, card.text ?? '', ''];
  return [card.keyword, asPyValue(card.value, card.rawValue), card.comment ?? ''];
}

function asPyValue(v: CardValue, raw: string | undefined): PyValue {
  if (v === null || typeof v === 'boolean') return v;
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'number') return raw !== undefined ? { real: String(v) } : v;
  const m = raw !== undefined ? /^\(\s*([^,]+?)\s*,\s*([^)]+?)\s*\)$/.exec(raw) : null;
  if (m) return { complex: [m[1], m[2]] };
  return v;
}

/** Normalises the script's value for comparison: reals to numbers written by JS. */
export function normalisePy(card: [string, PyValue, string]): [string, PyValue, string] {
  const [k, v, c] = card;
  let value: PyValue = v;
  if (v !== null && typeof v === 'object' && 'real' in v) value = { real: String(Number(v.real)) };
  if (v !== null && typeof v === 'object' && 'complex' in v) value = { complex: [String(Number(v.complex[0])), String(Number(v.complex[1]))] };
  return [k.toUpperCase(), value, c];
}

/** One HDU for {@link buildFits}: card texts (END is added unless `end` is false) and data bytes. */
export interface HduSpec {
  cards: string[];
  data?: Uint8Array;
  end?: boolean;
}

/** Assembles FITS bytes from card texts, padding cards to 80 and header and data to 2880 bytes. */
export function buildFits(hdus: HduSpec[]): Uint8Array {
  const parts: number[] = [];
  for (const h of hdus) {
    const cards = h.end === false ? h.cards : [...h.cards, 'END'];
    let text = cards.map((c) => c.padEnd(80, ' ').slice(0, 80)).join('');
    text = text.padEnd(Math.ceil(text.length / 2880) * 2880, ' ');
    for (let i = 0; i < text.length; i++) parts.push(text.charCodeAt(i) & 0xff);
    if (h.data) {
      for (const b of h.data) parts.push(b);
      const pad = (2880 - (h.data.length % 2880)) % 2880;
      for (let i = 0; i < pad; i++) parts.push(0);
    }
  }
  return Uint8Array.from(parts);
}

/** Big-endian float32 bytes. */
export function float32Bytes(values: number[]): Uint8Array {
  const out = new Uint8Array(values.length * 4);
  const view = new DataView(out.buffer);
  values.forEach((v, i) => view.setFloat32(4 * i, v, false));
  return out;
}

/** Big-endian float64 bytes. */
export function float64Bytes(values: number[]): Uint8Array {
  const out = new Uint8Array(values.length * 8);
  const view = new DataView(out.buffer);
  values.forEach((v, i) => view.setFloat64(8 * i, v, false));
  return out;
}

/** A card with a value right-justified to byte 30, as the fixed format writes it. */
export function card(keyword: string, value: string, comment?: string): string {
  const v = value.startsWith("'") ? value.padEnd(20, ' ') : value.padStart(20, ' ');
  return `${keyword.padEnd(8, ' ')}= ${v}${comment ? ` / ${comment}` : ''}`;
}

/** Primary-HDU cards of a 1-D float32 image of n pixels. */
export function primary1d(n: number, extra: string[] = []): string[] {
  return [card('SIMPLE', 'T'), card('BITPIX', '-32'), card('NAXIS', '1'), card('NAXIS1', String(n)), ...extra];
}
