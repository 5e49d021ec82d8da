/**
 * FITS-style header cards kept in order, with comments. Lookups go through a
 * `Map`, never a plain object, so that keywords such as `__proto__` or
 * `constructor` are ordinary keys and cannot pollute anything.
 */

/** A header card's value. `null` is the FITS "undefined" value; `bigint` holds integers beyond 2^53. */
export type CardValue = string | number | bigint | boolean | null;

/** One header card. Commentary cards (COMMENT, HISTORY, blank keyword) have `value` undefined and `text` set. */
export interface HeaderCard {
  /** Keyword, upper case as written (HIERARCH keywords keep their full dotted/space name). */
  readonly keyword: string;
  /** Value for value cards; undefined for commentary cards. */
  readonly value?: CardValue;
  /** Comment after the slash, without the slash, trimmed; undefined when none. */
  readonly comment?: string;
  /** Text of a commentary card (COMMENT, HISTORY, blank keyword). */
  readonly text?: string;
  /**
   * For real-valued cards: the value as written in the file (e.g. `1.5D3`), so that a
   * writer can reproduce it exactly. Optional.
   */
  readonly rawValue?: string;
}

const COMMENTARY = new Set(['COMMENT', 'HISTORY', '']);

/** True for keywords whose cards hold free text rather than a value. */
export function isCommentaryKeyword(keyword: string): boolean {
  return COMMENTARY.has(keyword);
}

/**
 * An immutable, ordered list of header cards with keyword lookup.
 * Methods that change something return a new Header.
 *
 * @example
 * const h = Header.from([{ keyword: 'OBJECT', value: 'LVAC-7' }]);
 * h.get('object'); // 'LVAC-7'
 */
export class Header {
  readonly #cards: readonly HeaderCard[];
  readonly #index: Map<string, number>;

  private constructor(cards: readonly HeaderCard[]) {
    this.#cards = Object.freeze(cards.map((c) => Object.freeze({ ...c })));
    this.#index = new Map();
    this.#cards.forEach((c, i) => {
      // First occurrence wins for lookups, as FITS readers conventionally do.
      if (!isCommentaryKeyword(c.keyword) && !this.#index.has(c.keyword)) this.#index.set(c.keyword, i);
    });
  }

  /** An empty header. */
  static empty(): Header {
    return new Header([]);
  }

  /** A header holding `cards` in the given order (copied). */
  static from(cards: readonly HeaderCard[]): Header {
    return new Header(cards);
  }

  /** All cards, in order. */
  get cards(): readonly HeaderCard[] {
    return this.#cards;
  }

  /** Number of cards. */
  get size(): number {
    return this.#cards.length;
  }

  /** True when a value card with this keyword exists (case-insensitive). */
  has(keyword: string): boolean {
    return this.#index.has(keyword.toUpperCase());
  }

  /** The value of the first card with this keyword (case-insensitive), or undefined. */
  get(keyword: string): CardValue | undefined {
    return this.card(keyword)?.value;
  }

  /** The first value card with this keyword (case-insensitive), or undefined. */
  card(keyword: string): HeaderCard | undefined {
    const i = this.#index.get(keyword.toUpperCase());
    return i === undefined ? undefined : this.#cards[i];
  }

  /** 1-based position of the first card with this keyword, or undefined. */
  position(keyword: string): number | undefined {
    const i = this.#index.get(keyword.toUpperCase());
    return i === undefined ? undefined : i + 1;
  }

  /** The value as a finite number, or undefined when absent or not numeric. */
  number(keyword: string): number | undefined {
    const v = this.get(keyword);
    if (typeof v === 'number' && Number.isFinite(v)) return v;
    if (typeof v === 'bigint') return Number(v);
    return undefined;
  }

  /** The value as a string (trailing spaces removed), or undefined when absent or not a string. */
  string(keyword: string): string | undefined {
    const v = this.get(keyword);
    return typeof v === 'string' ? v.replace(/\s+$/, '') : undefined;
  }

  /** Texts of all commentary cards with this keyword (COMMENT or HISTORY), in order. */
  commentary(keyword: 'COMMENT' | 'HISTORY' | ''): string[] {
    return this.#cards.filter((c) => c.keyword === keyword).map((c) => c.text ?? '');
  }

  /**
   * A header with `keyword` set to `value`: the first existing card is replaced in place
   * (keeping its comment unless one is given), otherwise a card is appended.
   */
  with(keyword: string, value: CardValue, comment?: string): Header {
    const kw = keyword.toUpperCase();
    const i = this.#index.get(kw);
    const cards = this.#cards.slice();
    if (i === undefined) {
      cards.push(comment === undefined ? { keyword: kw, value } : { keyword: kw, value, comment });
    } else {
      const old = cards[i];
      cards[i] = { keyword: kw, value, comment: comment ?? old.comment };
    }
    return new Header(cards);
  }

  /** A header without any value card named `keyword`. */
  without(...keywords: string[]): Header {
    const drop = new Set(keywords.map((k) => k.toUpperCase()));
    return new Header(this.#cards.filter((c) => isCommentaryKeyword(c.keyword) || !drop.has(c.keyword)));
  }

  /** A header with a commentary card appended. */
  withCommentary(keyword: 'COMMENT' | 'HISTORY', text: string): Header {
    return new Header([...this.#cards, { keyword, text }]);
  }

  /** A header keeping only the cards for which `keep` is true. */
  filter(keep: (card: HeaderCard, index: number) => boolean): Header {
    return new Header(this.#cards.filter(keep));
  }

  /** Plain JSON form: the list of cards. */
  toJSON(): HeaderCard[] {
    return this.#cards.map((c) => ({ ...c, value: typeof c.value === 'bigint' ? (c.value.toString() as unknown as CardValue) : c.value }));
  }
}
