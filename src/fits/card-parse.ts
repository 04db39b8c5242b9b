/**
 * Parsing of 80-character header cards (FITS Standard 4.0, sections 4.1-4.2), the CONTINUE
 * long-string convention (section 4.2.1.2) and HIERARCH keywords (common practice: the keyword is
 * the words between HIERARCH and the first `=`).
 */
import { InputError, type ErrorPlace } from '../errors.js';
import { Header, type Card, type CardValue } from './header.js';

export const CARD_BYTES = 80;
export const BLOCK_BYTES = 2880;

const INTEGER = /^[+-]?\d+$/;
const REAL = /^[+-]?(\d+\.?\d*|\.\d+)([EeDd][+-]?\d+)?$/;
const COMPLEX = /^\(\s*([^,\s]+)\s*,\s*([^)\s]+)\s*\)$/;

/** A parsed card before CONTINUE cards are joined to the string they continue. */
interface RawCard extends Card {
  /** True for a CONTINUE card carrying a string. */
  continuation?: boolean;
}

/** Parse the value field (text after `= `): returns the value, comment and whether it was readable. */
function parseValueField(text: string): { value?: CardValue; comment?: string; ok: boolean } {
  let i = 0;
  while (i < text.length && text[i] === ' ') i++;
  if (text[i] === "'") {
    let s = '';
    let j = i + 1;
    for (;;) {
      const q = text.indexOf("'", j);
      if (q < 0) return { ok: false };
      s += text.slice(j, q);
      if (text[q + 1] === "'") {
        s += "'";
        j = q + 2;
        continue;
      }
      j = q + 1;
      break;
    }
    const rest = text.slice(j);
    const slash = rest.indexOf('/');
    const out: { value?: CardValue; comment?: string; ok: boolean } = { value: s.trimEnd(), ok: rest.slice(0, slash < 0 ? undefined : slash).trim() === '' };
    if (slash >= 0) out.comment = rest.slice(slash + 1).trim();
    return out;
  }
  const slash = text.indexOf('/');
  const token = (slash < 0 ? text : text.slice(0, slash)).trim();
  const out: { value?: CardValue; comment?: string; ok: boolean } = { ok: true };
  if (slash >= 0) out.comment = text.slice(slash + 1).trim();
  if (token === '') return out;
  const v = parseToken(token);
  if (v === undefined) return { ok: false };
  out.value = v;
  return out;
}

function parseNumber(token: string): number | bigint | undefined {
  if (INTEGER.test(token)) {
    const n = Number(token);
    return Number.isSafeInteger(n) ? n : BigInt(token);
  }
  if (REAL.test(token)) return Number(token.replace(/[Dd]/, 'E'));
  return undefined;
}

function parseToken(token: string): CardValue | undefined {
  if (token === 'T') return true;
  if (token === 'F') return false;
  const n = parseNumber(token);
  if (n !== undefined) return n;
  const m = COMPLEX.exec(token);
  if (m) {
    const re = parseNumber(m[1]!);
    const im = parseNumber(m[2]!);
    if (re !== undefined && im !== undefined) return { re: Number(re), im: Number(im) };
  }
  return undefined;
}

/**
 * One card from its 80 characters. Unreadable values are kept as value-less cards and reported
 * through `warn`, so one odd card does not make a whole raw frame unreadable.
 */
export function parseCard(text: string, warn: (message: string) => void): RawCard | 'END' {
  const written = text.slice(0, 8).trimEnd();
  const name = written.toUpperCase();
  if (name === 'END') return 'END';
  // FITS 4.0 section 4.1.2.1: keywords are upper case; read folded, as other readers do, with a warning.
  if (written !== name) warn(`keyword '${written}' is not upper case (FITS 4.0 section 4.1.2.1); read as ${name}`);
  let key = name;
  let valueText: string | undefined;
  if (name === 'HIERARCH') {
    const eq = text.indexOf('=', 8);
    if (eq >= 0) {
      key = text.slice(8, eq).trim().split(/\s+/).join(' ').toUpperCase();
      valueText = text.slice(eq + 1);
    }
  } else if (text.slice(8, 10) === '= ') {
    valueText = text.slice(10);
  } else if (name === 'CONTINUE') {
    const parsed = parseValueField(text.slice(8));
    if (parsed.ok && typeof parsed.value === 'string') {
      const card: RawCard = { key, value: parsed.value, continuation: true };
      if (parsed.comment !== undefined) card.comment = parsed.comment;
      return card;
    }
  }
  if (valueText === undefined) return { key, comment: text.slice(8).trimEnd() };
  const parsed = parseValueField(valueText);
  if (!parsed.ok) {
    warn(`keyword ${key}: unreadable value ${JSON.stringify(valueText.trim())}, ignored`);
    return { key, comment: valueText.trim() };
  }
  const card: RawCard = { key };
  if (parsed.value !== undefined) card.value = parsed.value;
  if (parsed.comment !== undefined) card.comment = parsed.comment;
  return card;
}

export interface ParsedHeader {
  header: Header;
  /** Byte offset just past the header's last 2880-byte block. */
  end: number;
}

/**
 * Read the header starting at `offset` (a block boundary): cards up to END, CONTINUE strings joined.
 * Throws InputError for bytes outside ASCII 32-126 and for a header without END.
 */
export function parseHeader(bytes: Uint8Array, offset: number, place: ErrorPlace, warn: (message: string) => void): ParsedHeader {
  const cards: Card[] = [];
  let pos = offset;
  let open: Card | undefined; // last string card ending in '&', waiting for CONTINUE
  while (pos + CARD_BYTES <= bytes.length) {
    for (let i = pos; i < pos + CARD_BYTES; i++) {
      const b = bytes[i]!;
      if (b < 0x20 || b > 0x7e) {
        // A block after the first whose first card holds binary bytes is the data unit: the header lacked END.
        if (pos > offset && (pos - offset) % BLOCK_BYTES === 0) {
          throw new InputError('fits.no-end', 'header has no END card', { ...place, offset }, {
            expected: `an END card in the ${(pos - offset) / BLOCK_BYTES} header block(s) before byte ${pos}`,
            actual: `${cards.length} cards, then bytes that are not ASCII text (data?) at byte ${pos}`,
          });
        }
        throw new InputError('fits.non-ascii-header', 'header contains a byte that is not printable ASCII', { ...place, offset: i }, {
          expected: 'ASCII characters 32-126 in header cards',
          actual: `byte 0x${b.toString(16).padStart(2, '0')}`,
        });
      }
    }
    const text = String.fromCharCode.apply(null, bytes.subarray(pos, pos + CARD_BYTES) as unknown as number[]);
    pos += CARD_BYTES;
    const card = parseCard(text, warn);
    if (card === 'END') {
      const end = offset + Math.ceil((pos - offset) / BLOCK_BYTES) * BLOCK_BYTES;
      return { header: new Header(cards), end };
    }
    if (card.continuation && open && typeof open.value === 'string') {
      open.value = open.value.slice(0, -1) + (card.value as string);
      if (card.comment) open.comment = open.comment ? `${open.comment} ${card.comment}` : card.comment;
    } else if (card.continuation) {
      cards.push({ key: 'CONTINUE', comment: text.slice(8).trimEnd() });
    } else {
      delete card.continuation;
      cards.push(card);
      open = undefined;
    }
    const last = cards[cards.length - 1];
    open = last && typeof last.value === 'string' && last.value.endsWith('&') ? last : undefined;
  }
  throw new InputError('fits.no-end', 'header has no END card', { ...place, offset }, {
    expected: 'an END card before the end of the file',
    actual: `${cards.length} cards and then the end of the file`,
  });
}
