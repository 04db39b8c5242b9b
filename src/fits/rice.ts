/**
 * Rice decompression of one tile (RICE_1 of the Tiled Image Compression convention; Pence, Seaman
 * & White 2009, PASP 121, 414; White & Greenfield 1999): the first value verbatim in BYTEPIX bytes,
 * then blocks of BLOCKSIZE first differences, each block with a FS code: all-zero, Rice(FS), or
 * verbatim BYTEPIX*8-bit differences; differences are zig-zag mapped.
 * The bit buffer is kept in a double (exact to 2^53) because it can hold more than 32 bits.
 */

const POW2 = Float64Array.from({ length: 54 }, (_, i) => 2 ** i);

/** Decode `n` values into out[0..n); values wrap like BYTEPIX-byte integers (unsigned for 1 byte, signed otherwise). Calls `fail` on a stream that ends early. */
export function riceDecode(input: Uint8Array, n: number, blockSize: number, bytePix: 1 | 2 | 4, out: Int32Array, fail: (message: string) => never): void {
  const fsBits = bytePix === 1 ? 3 : bytePix === 2 ? 4 : 5;
  const fsMax = bytePix === 1 ? 6 : bytePix === 2 ? 14 : 25;
  const bBits = 8 * bytePix;
  const end = input.length;
  if (end < bytePix + 1) fail(`Rice stream of ${end} bytes is too short`);
  const wrap = bytePix === 1 ? (v: number) => v & 0xff : bytePix === 2 ? (v: number) => (v << 16) >> 16 : (v: number) => v | 0;
  let c = 0;
  let last = 0;
  for (let j = 0; j < bytePix; j++) last = last * 256 + input[c++]!;
  last = wrap(last);
  let b = input[c++]!;
  let nbits = 8;
  const next = (): number => {
    if (c >= end) fail(`Rice stream ends after ${end} bytes, before all ${n} pixels were decoded`);
    return input[c++]!;
  };
  for (let i = 0; i < n; ) {
    nbits -= fsBits;
    while (nbits < 0) {
      b = b * 256 + next();
      nbits += 8;
    }
    const fs = Math.floor(b / POW2[nbits]!) - 1;
    b %= POW2[nbits]!;
    const iMax = Math.min(i + blockSize, n);
    if (fs < 0) {
      for (; i < iMax; i++) out[i] = last;
    } else if (fs === fsMax) {
      for (; i < iMax; i++) {
        let k = bBits - nbits;
        let diff = b * POW2[k]!;
        for (k -= 8; k >= 0; k -= 8) diff += next() * POW2[k]!;
        if (nbits > 0) {
          b = next();
          diff += Math.floor(b / POW2[-k]!);
          b %= POW2[nbits]!;
        } else {
          b = 0;
        }
        const mapped = diff % 2 === 0 ? diff / 2 : -(diff - 1) / 2 - 1;
        last = wrap(mapped + last);
        out[i] = last;
      }
    } else if (fs > fsMax) {
      fail(`Rice block code ${fs} exceeds the maximum ${fsMax}`);
    } else {
      for (; i < iMax; i++) {
        while (b === 0) {
          nbits += 8;
          b = next();
        }
        // b < 256 here: the leading one bit ends the unary count of zeros.
        const nzero = nbits - (32 - Math.clz32(b));
        nbits -= nzero + 1;
        b -= POW2[nbits]!;
        nbits -= fs;
        while (nbits < 0) {
          b = b * 256 + next();
          nbits += 8;
        }
        const diff = nzero * POW2[fs]! + Math.floor(b / POW2[nbits]!);
        b %= POW2[nbits]!;
        const mapped = diff % 2 === 0 ? diff / 2 : -(diff - 1) / 2 - 1;
        last = wrap(mapped + last);
        out[i] = last;
      }
    }
  }
}
