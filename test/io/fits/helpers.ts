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
