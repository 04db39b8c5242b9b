/**
 * Decoding one compressed tile into stored values (Tiled Image Compression convention): RICE_1,
 * GZIP_1 (gzip of big-endian values), GZIP_2 (gzip of byte-shuffled values: all first bytes, then
 * all second bytes, ...), NOCOMPRESS.
 */
import { unzipSync } from 'node:zlib';
import { riceDecode } from './rice.js';

export type TileCodec = 'RICE_1' | 'GZIP_1' | 'GZIP_2' | 'NOCOMPRESS';

export const TILE_CODECS: Record<string, TileCodec> = { RICE_1: 'RICE_1', RICE_ONE: 'RICE_1', GZIP_1: 'GZIP_1', GZIP_2: 'GZIP_2', NOCOMPRESS: 'NOCOMPRESS' };

export function gunzipTile(bytes: Uint8Array, expectedBytes: number, fail: (m: string) => never): Uint8Array {
  let raw: Uint8Array;
  try {
    raw = unzipSync(bytes, { maxOutputLength: Math.max(expectedBytes, 1) });
  } catch (e) {
    return fail(`gzip tile cannot be inflated: ${(e as Error).message}`);
  }
  if (raw.length !== expectedBytes) fail(`gzip tile inflates to ${raw.length} bytes instead of ${expectedBytes}`);
  return raw;
}

function unshuffle(raw: Uint8Array, n: number, size: number): Uint8Array {
  const out = new Uint8Array(raw.length);
  for (let j = 0; j < size; j++) for (let i = 0; i < n; i++) out[i * size + j] = raw[j * n + i]!;
  return out;
}

/** Big-endian values of `size` bytes (integers, or floats when `float`) into out[0..n). */
export function readBigEndian(raw: Uint8Array, n: number, size: number, float: boolean, out: Float64Array): void {
  const view = new DataView(raw.buffer, raw.byteOffset, n * size);
  if (float) {
    if (size === 4) for (let i = 0; i < n; i++) out[i] = view.getFloat32(4 * i);
    else for (let i = 0; i < n; i++) out[i] = view.getFloat64(8 * i);
    return;
  }
  switch (size) {
    case 1: for (let i = 0; i < n; i++) out[i] = view.getUint8(i); break;
    case 2: for (let i = 0; i < n; i++) out[i] = view.getInt16(2 * i); break;
    case 4: for (let i = 0; i < n; i++) out[i] = view.getInt32(4 * i); break;
    default: for (let i = 0; i < n; i++) out[i] = view.getInt32(8 * i) * 4294967296 + view.getUint32(8 * i + 4);
  }
}

export interface TileCodecParams {
  codec: TileCodec;
  /** Bytes per stored value: ZBITPIX/8 for integer images, 4 for quantised floats. */
  size: number;
  /** Stored values are floats (unquantised floating-point tile). */
  float: boolean;
  blockSize: number;
  bytePix: 1 | 2 | 4;
}

/** Decode the `n` stored values of one tile into out[0..n). */
export function decodeTile(bytes: Uint8Array, n: number, p: TileCodecParams, out: Float64Array, ints: Int32Array, fail: (m: string) => never): void {
  if (p.codec === 'RICE_1') {
    riceDecode(bytes, n, p.blockSize, p.bytePix, ints, fail);
    for (let i = 0; i < n; i++) out[i] = ints[i]!;
    return;
  }
  let raw = bytes;
  if (p.codec !== 'NOCOMPRESS') raw = gunzipTile(bytes, n * p.size, fail);
  else if (raw.length < n * p.size) fail(`uncompressed tile holds ${raw.length} bytes instead of ${n * p.size}`);
  if (p.codec === 'GZIP_2') raw = unshuffle(raw, n, p.size);
  readBigEndian(raw, n, p.size, p.float, out);
}
