/**
 * A FITS header as an ordered list of cards (FITS Standard 4.0, section 4).
 * Parsing and serialisation of 80-character cards live in cards.ts; this class only holds values.
 * Keys are stored upper-case; HIERARCH keys keep their words joined by single spaces.
 */

export interface Complex {
  re: number;
  im: number;
}

/** A card value: string, integer (number, or bigint beyond 2^53), float, logical, complex, or undefined (no value). */
export type CardValue = string | number | bigint | boolean | Complex;

export interface Card {
  key: string;
  /** Absent for commentary cards (COMMENT, HISTORY, blank) and for keys with an undefined value. */
  value?: CardValue;
  /** The comment after `/`, or the text of a commentary card. */
  comment?: string;
}

const COMMENTARY = new Set(['COMMENT', 'HISTORY', '']);

export class Header {
  readonly cards: Card[];

  constructor(cards: Card[] = []) {
    this.cards = cards;
  }

  /** Value of the first card with this key (case-insensitive), or undefined. */
  get(key: string): CardValue | undefined {
    const k = key.toUpperCase();
    for (const c of this.cards) if (c.key === k) return c.value;
    return undefined;
  }

  has(key: string): boolean {
    const k = key.toUpperCase();
    return this.cards.some((c) => c.key === k);
  }

  /** Numeric value (integers and floats; bigint converted), or undefined if absent or not numeric. */
  getNumber(key: string): number | undefined {
    const v = this.get(key);
    if (typeof v === 'number') return v;
    if (typeof v === 'bigint') return Number(v);
    return undefined;
  }

  getString(key: string): string | undefined {
    const v = this.get(key);
    return typeof v === 'string' ? v : undefined;
  }

  getBoolean(key: string): boolean | undefined {
    const v = this.get(key);
    return typeof v === 'boolean' ? v : undefined;
  }

  /** Set the first card with this key, or append one. Commentary keys always append. */
  set(key: string, value: CardValue, comment?: string): this {
    const k = key.toUpperCase();
    if (!COMMENTARY.has(k)) {
      const existing = this.cards.find((c) => c.key === k);
      if (existing) {
        existing.value = value;
        if (comment !== undefined) existing.comment = comment;
        return this;
      }
    }
    const card: Card = { key: k, value };
    if (comment !== undefined) card.comment = comment;
    this.cards.push(card);
    return this;
  }

  delete(key: string): this {
    const k = key.toUpperCase();
    for (let i = this.cards.length - 1; i >= 0; i--) if (this.cards[i]!.key === k) this.cards.splice(i, 1);
    return this;
  }

  history(text: string): this {
    this.cards.push({ key: 'HISTORY', comment: text });
    return this;
  }

  comment(text: string): this {
    this.cards.push({ key: 'COMMENT', comment: text });
    return this;
  }

  /** All HISTORY (or COMMENT) texts, in order. */
  commentary(key: 'HISTORY' | 'COMMENT'): string[] {
    return this.cards.filter((c) => c.key === key).map((c) => c.comment ?? '');
  }

  clone(): Header {
    return new Header(this.cards.map((c) => ({ ...c })));
  }
}
