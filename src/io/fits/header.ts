/**
 * Reading one FITS header: 2880-byte blocks of 80-character cards up to the END card
 * (FITS Standard 4.0 §3.1, §4.1), CONTINUE long strings joined (§4.2.1.2), commentary
 * kept in order (§4.4.2.4), HIERARCH cards tolerated.
 */
import { Header, type HeaderCard } from '../../spectrum/header.js';
import { BLOCK_LENGTH, CARD_LENGTH, CardProblem, isStandardKeyword, parseCard, type RawCard } from './cards.js';
import { fitsError, fitsWarn, type FitsContext } from './context.js';

/** One parsed header with the map from its (joined) cards back to physical card numbers. */
export interface ParsedHeader {
  readonly header: Header;
  /** For each card of `header`, its 1-based card number in the file's header (first physical card). */
  readonly cardNumbers: readonly number[];
  /** Bytes the header occupies, a multiple of 2880. */
  readonly byteLength: number;
}

/**
 * Reads the header that starts at `offset`.
 *
 * @throws {InputError} when a card holds a byte outside printable ASCII (§4.1.1), a string
 *   has no closing quote, there is no END card, or the last block is cut short.
 */
export function readHeader(bytes: Uint8Array, offset: number, hdu: number, ctx: FitsContext): ParsedHeader {
  const raw: { card: RawCard; number: number }[] = [];
  let pos = offset;
  let number = 0;
  let nonStandard: string | undefined;
  let hierarchs = 0;
  for (;;) {
    if (pos + CARD_LENGTH > bytes.length) {
      throw fitsError(ctx, 'fits.missing-end', `no END card: the header runs to the end of the file (byte ${bytes.length}) after ${number} cards; the file is truncated or not FITS`, { hdu });
    }
    number++;
    const bad = firstNonPrintable(bytes, pos);
    if (bad >= 0) {
      const keyword = printableKeyword(bytes, pos);
      const what = `holds byte 0x${bytes[pos + bad].toString(16).padStart(2, '0')} at column ${bad + 1}; header cards are ASCII text, characters 32 to 126 (FITS Standard 4.0 §4.1.1)`;
      const hint = number > 36 && raw.length > 0 ? '. The header may lack its END card, or be damaged' : '';
      throw fitsError(ctx, 'fits.non-printable', `${what}${hint}`, { hdu, card: number, ...(keyword ? { keyword } : {}), byteOffset: pos + bad });
    }
    const text = latin1(bytes, pos, CARD_LENGTH);
    let card: RawCard;
    try {
      card = parseCard(text);
    } catch (e) {
      if (e instanceof CardProblem) {
        const keyword = text.slice(0, 8).trim();
        throw fitsError(ctx, e.code, e.detail, { hdu, card: number, ...(keyword ? { keyword } : {}) });
      }
      throw e;
    }
    pos += CARD_LENGTH;
    if (card.kind === 'end') break;
    if (card.kind === 'value') {
      if (card.hierarch) hierarchs++;
      else if (nonStandard === undefined && !isStandardKeyword(text.slice(0, 8).trimEnd())) nonStandard = `card ${number} (${text.slice(0, 8).trimEnd()})`;
      if (card.malformed !== undefined) {
        fitsWarn(ctx, 'fits.malformed-value', `the value "${card.malformed}" is not a FITS string, logical, integer, real or complex number (FITS Standard 4.0 §4.2); kept as text`, { hdu, card: number, keyword: card.card.keyword });
      }
    }
    raw.push({ card, number });
  }
  const used = pos - offset;
  const byteLength = Math.ceil(used / BLOCK_LENGTH) * BLOCK_LENGTH;
  if (offset + byteLength > bytes.length) {
    throw fitsError(
      ctx,
      'fits.partial-block',
      `the header ends with its END card at byte ${pos}, but its last block is cut short: the file ends at byte ${bytes.length}, and a header fills whole 2880-byte blocks (FITS Standard 4.0 §3.1)`,
      { hdu },
    );
  }
  if (nonStandard !== undefined) {
    fitsWarn(ctx, 'fits.nonstandard-keyword', `${nonStandard}: keywords are up to 8 of A-Z, 0-9, hyphen and underscore (FITS Standard 4.0 §4.1.2.1); read as written, in upper case`, { hdu });
  }
  if (hierarchs > 0) {
    fitsWarn(ctx, 'fits.hierarch', `${hierarchs} HIERARCH card${hierarchs === 1 ? '' : 's'} (a registered convention, not part of the FITS Standard) read with the full name as keyword`, { hdu });
  }
  const { cards, numbers } = joinContinue(raw);
  return { header: Header.from(cards), cardNumbers: numbers, byteLength };
}

/** Joins long strings continued with `&` over CONTINUE cards (§4.2.1.2); keeps stray CONTINUE cards as text. */
function joinContinue(raw: readonly { card: RawCard; number: number }[]): { cards: HeaderCard[]; numbers: number[] } {
  const cards: HeaderCard[] = [];
  const numbers: number[] = [];
  for (let i = 0; i < raw.length; i++) {
    const { card, number } = raw[i];
    if (card.kind === 'continue') {
      cards.push({ keyword: 'CONTINUE', text: card.rawField.trimEnd() });
      numbers.push(number);
      continue;
    }
    if (card.kind !== 'value' && card.kind !== 'commentary') continue;
    if (card.kind === 'value' && card.rawString !== undefined && continues(card.rawString) && isStringContinue(raw[i + 1]?.card)) {
      let text = card.rawString.trimEnd().slice(0, -1);
      const comments = card.card.comment !== undefined ? [card.card.comment] : [];
      let j = i + 1;
      while (j < raw.length) {
        const next = raw[j].card;
        if (next.kind !== 'continue' || next.text === undefined) break;
        if (next.comment !== undefined && next.comment !== '') comments.push(next.comment);
        j++;
        if (continues(next.text) && isStringContinue(raw[j]?.card)) {
          text += next.text.trimEnd().slice(0, -1);
        } else {
          text += next.text;
          break;
        }
      }
      const trimmed = text.replace(/ +$/, '');
      const joined: HeaderCard = { keyword: card.card.keyword, value: trimmed === '' && text.length > 0 ? ' ' : trimmed };
      cards.push(comments.length > 0 ? { ...joined, comment: comments.join(' ') } : joined);
      numbers.push(number);
      i = j - 1;
      continue;
    }
    cards.push(card.card);
    numbers.push(number);
  }
  return { cards, numbers };
}

function isStringContinue(card: RawCard | undefined): boolean {
  return card?.kind === 'continue' && card.text !== undefined;
}

function continues(s: string): boolean {
  return s.trimEnd().endsWith('&');
}

function firstNonPrintable(bytes: Uint8Array, pos: number): number {
  for (let i = 0; i < CARD_LENGTH; i++) {
    const b = bytes[pos + i];
    if (b < 0x20 || b > 0x7e) return i;
  }
  return -1;
}

/** The keyword field of a card when it is printable, for messages about a damaged card. */
function printableKeyword(bytes: Uint8Array, pos: number): string | undefined {
  let s = '';
  for (let i = 0; i < 8; i++) {
    const b = bytes[pos + i];
    if (b < 0x20 || b > 0x7e) return undefined;
    s += String.fromCharCode(b);
  }
  s = s.trim();
  return s === '' ? undefined : s;
}

function latin1(bytes: Uint8Array, pos: number, length: number): string {
  return String.fromCharCode.apply(null, bytes.subarray(pos, pos + length) as unknown as number[]);
}
