/**
 * Restoring quantised floating-point tiles (Tiled Image Compression convention, section on
 * ZQUANTIZ; Pence, White & Seaman 2010): value = (stored - r + 0.5) x ZSCALE + ZZERO with r from
 * the convention's sequence of 10000 uniform deviates (Park & Miller 1988 minimal standard
 * generator, a = 16807, m = 2^31 - 1, seed 1), started at tile row number + ZDITHER0 - 2.
 */

/** Stored value meaning "undefined pixel" in quantised tiles (the convention's NULL_VALUE). */
export const QUANTISED_NULL = -2147483647;
/** Stored value meaning exactly 0.0 under SUBTRACTIVE_DITHER_2 (the convention's ZERO_VALUE). */
export const QUANTISED_ZERO = -2147483646;

const N_RANDOM = 10000;
let sequence: Float32Array | undefined;

/**
 * The convention's random sequence, held in single precision as cfitsio holds it (the restored
 * values depend on that rounding); its last seed must be 1043618065 (checked in the tests).
 */
export function ditherSequence(): { values: Float32Array; lastSeed: number } {
  const values = new Float32Array(N_RANDOM);
  const a = 16807;
  const m = 2147483647;
  let seed = 1;
  for (let i = 0; i < N_RANDOM; i++) {
    const t = a * seed;
    seed = t - m * Math.floor(t / m);
    values[i] = seed / m;
  }
  return { values, lastSeed: seed };
}

export type Quantize = 'NO_DITHER' | 'SUBTRACTIVE_DITHER_1' | 'SUBTRACTIVE_DITHER_2';

/**
 * Restore n quantised values of tile `tileRow` (1-based row of the table) into out[at..at+n).
 * `nullValue` is the tile's ZBLANK (undefined: no null pixels).
 */
export function unquantize(stored: ArrayLike<number>, n: number, out: Float64Array, scale: number, zero: number, method: Quantize, tileRow: number, dither0: number, nullValue: number | undefined): void {
  if (method === 'NO_DITHER') {
    for (let i = 0; i < n; i++) out[i] = stored[i] === nullValue ? NaN : stored[i]! * scale + zero;
    return;
  }
  const r = (sequence ??= ditherSequence().values);
  let iSeed = (((tileRow - 1 + dither0 - 1) % N_RANDOM) + N_RANDOM) % N_RANDOM;
  let next = Math.floor(r[iSeed]! * 500);
  const zeroCode = method === 'SUBTRACTIVE_DITHER_2' ? QUANTISED_ZERO : undefined;
  for (let i = 0; i < n; i++) {
    const s = stored[i]!;
    if (s === nullValue) out[i] = NaN;
    else if (s === zeroCode) out[i] = 0;
    else out[i] = (s - r[next]! + 0.5) * scale + zero;
    next++;
    if (next === N_RANDOM) {
      iSeed = (iSeed + 1) % N_RANDOM;
      next = Math.floor(r[iSeed]! * 500);
    }
  }
}
