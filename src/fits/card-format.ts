/**
 * Serialisation of header cards (FITS Standard 4.0, section 4): fixed-format values (right-justified
 * in columns 11-30), quoted strings with doubled quotes, long strings with CONTINUE, HIERARCH for
 * keywords that are not 1-8 characters of A-Z 0-9 - _ (common practice).
 */
import { InputError } from '../errors.js';
import type { Card, CardValue } from './header.js';
import { BLOCK_BYTES, CARD_BYTES } from './card-parse.js';

const STANDARD_KEY = /^[A-Z0-9_-]{1,8}$/;
const COMMENTARY = new Set(['COMMENT', 'HISTORY', '']);
/** Characters of an escaped string chunk per card: 80 - "KEYWORD = '" (11) - "&'" (2). */
const CHUNK = 67;

/** Printable ASCII only: anything else becomes '?'. */
function ascii(text: string): string {
  return text.replace(/[^\x20-\x7e]/g, '?');
}

function formatNumber(v: number, key: string): string {
  if (!Number.isFinite(v)) {
    throw new InputError('fits.write-invalid', 'a header value must be a finite number', { key }, { expected: 'a finite number', actual: String(v) });
  }
  if (Number.isSafeInteger(v)) return String(v);
  // Shortest round-trip form; a real needs a decimal point or an upper-case exponent (section 4.2.4),
  // so integral values beyond 2^53 stay reals rather than becoming integers on reading.
  const s = String(v).toUpperCase();
  return /[.E]/.test(s) ? s : `${s}.0`;
}

/** The value as it appears on the card (strings quoted, not padded). */
export function formatValue(v: CardValue, key: string): string {
  // Only XTENSION must be padded to 8 characters (section 4.2.1.1); other strings are written as they are.
  if (typeof v === 'string') return `'${ascii(v).replace(/'/g, "''").padEnd(key === 'XTENSION' ? 8 : 0)}'`;
  if (typeof v === 'boolean') return v ? 'T' : 'F';
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'number') return formatNumber(v, key);
  return `(${formatNumber(v.re, key)}, ${formatNumber(v.im, key)})`;
}

function withComment(line: string, comment: string | undefined): string {
  if (comment === undefined || comment === '') return line;
  const full = `${line} / ${ascii(comment)}`;
  return full.length <= CARD_BYTES ? full : full.slice(0, CARD_BYTES);
}

/** Split a long string into escaped chunks of at most CHUNK characters, never splitting a doubled quote. */
function chunks(value: string): string[] {
  const out: string[] = [];
  let cur = '';
  for (const ch of ascii(value)) {
    const piece = ch === "'" ? "''" : ch;
    if (cur.length + piece.length > CHUNK) {
      out.push(cur);
      cur = '';
    }
    cur += piece;
  }
  out.push(cur);
  return out;
}

function longString(prefix: string, value: string, comment: string | undefined): string[] {
  const parts = chunks(value);
  const lines: string[] = [];
  parts.forEach((p, i) => {
    const last = i === parts.length - 1;
    const head = i === 0 ? prefix : 'CONTINUE  ';
    lines.push(last ? withComment(`${head}'${p}'`, comment) : `${head}'${p}&'`);
  });
  return lines;
}

/** The 80-character lines (unpadded) of one card; several for long strings and commentary. */
export function formatCard(card: Card): string[] {
  const key = card.key.toUpperCase();
  if (COMMENTARY.has(key) || (card.value === undefined && STANDARD_KEY.test(key))) {
    const text = ascii(card.comment ?? '');
    const lines: string[] = [];
    for (let i = 0; i < Math.max(1, text.length); i += 72) lines.push(`${key.padEnd(8)}${text.slice(i, i + 72)}`);
    return lines;
  }
  const hierarch = !STANDARD_KEY.test(key);
  const prefix = hierarch ? `HIERARCH ${ascii(key)} = ` : `${key.padEnd(8)}= `;
  if (prefix.length > CARD_BYTES - 4) {
    throw new InputError('fits.write-invalid', 'keyword too long for a header card', { key }, { expected: 'at most 66 characters' });
  }
  if (card.value === undefined) return [withComment(prefix.trimEnd(), card.comment)];
  const text = formatValue(card.value, key);
  if (typeof card.value === 'string') {
    if (prefix.length + text.length > CARD_BYTES) {
      if (hierarch) {
        throw new InputError('fits.write-invalid', 'string too long for a HIERARCH card', { key }, { expected: `at most ${CARD_BYTES - prefix.length - 2} characters` });
      }
      return longString(prefix, card.value, card.comment);
    }
    return [withComment(prefix + text, card.comment)];
  }
  // Fixed format: right-justified so the value ends in column 30 (section 4.2).
  const field = hierarch ? text : text.padStart(20);
  if (prefix.length + field.length > CARD_BYTES) {
    throw new InputError('fits.write-invalid', 'value too long for a header card', { key }, { actual: text });
  }
  return [withComment(prefix + field, card.comment)];
}

/**
 * All cards plus END, padded with spaces to whole 2880-byte blocks, as one ASCII string. A header
 * with CONTINUE cards gets LONGSTRN = 'OGIP 1.0', which fitsverify asks for (HEASARC convention).
 */
export function formatHeader(cards: readonly Card[]): string {
  const lines: string[] = [];
  for (const c of cards) for (const l of formatCard(c)) lines.push(l.padEnd(CARD_BYTES));
  if (lines.some((l) => l.startsWith('CONTINUE  ')) && !cards.some((c) => c.key === 'LONGSTRN')) {
    lines.push(formatCard({ key: 'LONGSTRN', value: 'OGIP 1.0', comment: 'long strings use CONTINUE cards' })[0]!.padEnd(CARD_BYTES));
  }
  lines.push('END'.padEnd(CARD_BYTES));
  const text = lines.join('');
  return text.padEnd(Math.ceil(text.length / BLOCK_BYTES) * BLOCK_BYTES);
}
