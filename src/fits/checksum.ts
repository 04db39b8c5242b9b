/**
 * The FITS checksum convention (FITS Standard 4.0, appendix J; Seaman, Pence & Rots): the 32-bit
 * ones'-complement sum of big-endian words, DATASUM as its decimal string, CHECKSUM as the
 * 16-character ASCII encoding of the complement that makes the whole HDU sum to -0.
 */
import { LITTLE_ENDIAN } from './endian.js';

/** Ones'-complement sum of bytes[start..end) as big-endian 32-bit words, added to `initial`. A partial last word is zero-padded. */
export function onesComplementSum(bytes: Uint8Array, start: number, end: number, initial = 0): number {
  // Sum the 16-bit halves separately (exact in doubles up to 2^37 words), fold carries at the end.
  let hi = Math.floor(initial / 65536);
  let lo = initial % 65536;
  const whole = start + ((end - start) & ~3);
  let i = start;
  if (LITTLE_ENDIAN && whole > start && (bytes.byteOffset + start) % 4 === 0) {
    // Whole words at once: with w = b0 | b1 << 8 | b2 << 16 | b3 << 24 read natively, the masks
    // put b0 and b2 (b1 and b3) in separate 16-bit lanes. 128 words cannot overflow a lane, and
    // keep each sum below 2^31, so the loop stays in int32 arithmetic (faster than 256 in V8).
    const words = new Int32Array(bytes.buffer, bytes.byteOffset + start, (whole - start) >> 2);
    for (let w0 = 0; w0 < words.length; w0 += 128) {
      const w1 = Math.min(words.length, w0 + 128);
      let evenBytes = 0;
      let oddBytes = 0;
      for (let k = w0; k < w1; k++) {
        const w = words[k]!;
        evenBytes += w & 0x00ff00ff;
        oddBytes += (w >> 8) & 0x00ff00ff; // the mask drops the sign bits >> brings in
      }
      hi += (evenBytes & 0xffff) * 256 + (oddBytes & 0xffff);
      lo += (evenBytes >>> 16) * 256 + (oddBytes >>> 16);
    }
    i = whole;
  }
  for (; i < whole; i += 4) {
    hi += (bytes[i]! << 8) | bytes[i + 1]!;
    lo += (bytes[i + 2]! << 8) | bytes[i + 3]!;
  }
  if (whole < end) {
    const tail = [0, 0, 0, 0];
    for (let i = whole; i < end; i++) tail[i - whole] = bytes[i]!;
    hi += (tail[0]! << 8) | tail[1]!;
    lo += (tail[2]! << 8) | tail[3]!;
  }
  let hiCarry = Math.floor(hi / 65536);
  let loCarry = Math.floor(lo / 65536);
  while (hiCarry !== 0 || loCarry !== 0) {
    hi = (hi % 65536) + loCarry;
    lo = (lo % 65536) + hiCarry;
    hiCarry = Math.floor(hi / 65536);
    loCarry = Math.floor(lo / 65536);
  }
  return hi * 65536 + lo;
}

/** Ones'-complement addition of two 32-bit sums. */
export function addSums(a: number, b: number): number {
  const s = a + b;
  return s > 0xffffffff ? s - 0xffffffff : s;
}

/** ASCII punctuation between the digits and the letters, which the encoding avoids. */
const EXCLUDED = [0x3a, 0x3b, 0x3c, 0x3d, 0x3e, 0x3f, 0x40, 0x5b, 0x5c, 0x5d, 0x5e, 0x5f, 0x60];

/**
 * The 16-character encoding of a 32-bit value (the convention's char_encode): each byte split into
 * four characters from '0', punctuation avoided in pairs that keep the sum, rotated by one place.
 * CHECKSUM is encodeChecksum(~sum) computed with the card holding '0000000000000000'.
 */
export function encodeChecksum(value: number): string {
  const asc = new Array<number>(16);
  for (let i = 0; i < 4; i++) {
    const byte = (value >>> (24 - 8 * i)) & 0xff;
    const quotient = (byte >> 2) + 0x30;
    const ch = [quotient + (byte & 3), quotient, quotient, quotient];
    for (let changed = true; changed; ) {
      changed = false;
      for (const x of EXCLUDED) {
        for (let j = 0; j < 4; j += 2) {
          if (ch[j] === x || ch[j + 1] === x) {
            ch[j]!++;
            ch[j + 1]!--;
            changed = true;
          }
        }
      }
    }
    for (let j = 0; j < 4; j++) asc[4 * j + i] = ch[j]!;
  }
  let out = '';
  for (let i = 0; i < 16; i++) out += String.fromCharCode(asc[(i + 15) % 16]!);
  return out;
}

/** Ones' complement of a 32-bit sum, as an unsigned number. */
export function complement(sum: number): number {
  return ~sum >>> 0;
}
