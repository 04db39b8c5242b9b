/**
 * Unsigned 16-bit integers as FITS stores them (FITS Standard 4.0 section 5.2.5: BITPIX 16,
 * BZERO 32768, big-endian two's complement of value - 32768) decoded to a Uint16Array.
 */

import { takeUint16 } from '../kernels/frame-pool.js';
import { LITTLE_ENDIAN } from './endian.js';

/**
 * The n values stored at bytes[offset ..), in an array of their own (a dead frame's when one is
 * pooled: every value is overwritten). stored = value - 32768 has the bits of
 * value with the top one flipped; a byte copy, a native byte swap and the flip two values at a
 * time are about three times faster than combining the bytes of each value in a loop.
 */
export function decodeUnsigned16(bytes: Uint8Array, offset: number, n: number): Uint16Array {
  const out = takeUint16(n);
  const asBytes = Buffer.from(out.buffer, 0, 2 * n);
  asBytes.set(bytes.subarray(offset, offset + 2 * n));
  if (LITTLE_ENDIAN) asBytes.swap16();
  const pairs = new Uint32Array(out.buffer, 0, n >>> 1);
  for (let i = 0; i < pairs.length; i++) pairs[i] = pairs[i]! ^ 0x80008000;
  if (n & 1) out[n - 1] = out[n - 1]! ^ 0x8000;
  return out;
}
