/**
 * Tile-compressed images (Tiled Image Compression convention, Pence et al.; FITS Standard 4.0
 * section 10.1): a BINTABLE with one row per tile, the tile bytes in the heap (COMPRESSED_DATA,
 * 1PB or 1QB), ZSCALE/ZZERO/ZBLANK per tile or as keywords, tiles in row-major order of the grid.
 */
import { InputError, type ErrorPlace } from '../errors.js';
import { binLayout, findColumn, type BinColumn, type BinLayout } from './bintable-layout.js';
import { unquantize, type Quantize } from './dither.js';
import type { Header } from './header.js';
import { readStructure } from './parse.js';
import { decodeTile, TILE_CODECS, type TileCodecParams } from './tile-codecs.js';
import type { FitsFile, Hdu, ImageData } from './types.js';

/** Largest expansion accepted from compressed bytes (gzip's maximum is about 1032:1): bounds allocation on hostile files. */
const MAX_EXPANSION = 1100;

function zParam(th: Header, name: string): number | undefined {
  for (let i = 1; i <= 999; i++) {
    const n = th.getString(`ZNAME${i}`);
    if (n === undefined) return undefined;
    if (n.toUpperCase() === name) return th.getNumber(`ZVAL${i}`);
  }
  return undefined;
}

/** Heap slice of a descriptor column in row r, bounds-checked. */
function heapSlice(file: FitsFile, hdu: Hdu, layout: BinLayout, col: BinColumn, r: number, fail: (m: string) => never): Uint8Array {
  const view = new DataView(file.bytes.buffer, file.bytes.byteOffset + hdu.dataOffset, hdu.dataLength);
  const at = r * layout.rowBytes + col.offset;
  const count = col.type === 'P' ? view.getUint32(at) : Number(view.getBigUint64(at));
  const offset = col.type === 'P' ? view.getUint32(at + 4) : Number(view.getBigUint64(at + 8));
  const size = { B: 1, I: 2, J: 4, K: 8, E: 4, D: 8 }[col.heapType as 'B'] ?? 1;
  const start = layout.heapOffset + offset;
  const end = start + count * size;
  if (end > hdu.dataLength) fail(`tile ${r + 1} points past the heap (bytes ${start}-${end} of a ${hdu.dataLength}-byte data unit)`);
  return file.bytes.subarray(hdu.dataOffset + start, hdu.dataOffset + end);
}

/** A per-tile number: from a column if there is one, else from a keyword. */
function perTile(file: FitsFile, hdu: Hdu, layout: BinLayout, name: string, th: Header): (r: number) => number | undefined {
  const col = findColumn(layout, name);
  if (!col) {
    const v = th.getNumber(name);
    return () => v;
  }
  const view = new DataView(file.bytes.buffer, file.bytes.byteOffset + hdu.dataOffset, hdu.dataLength);
  return (r) => {
    const at = r * layout.rowBytes + col.offset;
    return col.type === 'D' ? view.getFloat64(at) : col.type === 'E' ? view.getFloat32(at) : view.getInt32(at);
  };
}

export function readTiledImage(file: FitsFile, hdu: Hdu, float32: boolean): ImageData {
  const place: ErrorPlace = { file: file.source, hdu: hdu.index };
  const fail = (m: string): never => {
    throw new InputError('fits.bad-tile', m, place, { expected: 'tiles as the Tiled Image Compression convention describes' });
  };
  const th = hdu.tableHeader!;
  const layout = binLayout(th, place, hdu.dataLength);
  const { bitpix, axes } = readStructure(hdu.header, { ...place, key: 'ZBITPIX' }, true);
  const n = axes.reduce((a, b) => a * b, axes.length > 0 ? 1 : 0);
  if (n * (Math.abs(bitpix) / 8) > MAX_EXPANSION * Math.max(hdu.dataLength, 2880)) {
    throw new InputError('fits.bad-tile', 'compressed image claims more pixels than its data could hold', { ...place, key: 'ZNAXIS' }, { expected: `at most ${MAX_EXPANSION} times the ${hdu.dataLength} compressed bytes`, actual: `${axes.join(' x ')} pixels` });
  }
  const cmp = (th.getString('ZCMPTYPE') ?? '').trim().toUpperCase();
  const codec = TILE_CODECS[cmp];
  if (!codec) throw new InputError('fits.unsupported', `tile compression ${cmp} is not supported`, { ...place, key: 'ZCMPTYPE' }, { expected: 'RICE_1, GZIP_1, GZIP_2 or NOCOMPRESS', actual: cmp });
  const tile = axes.map((len, d) => {
    const t = th.getNumber(`ZTILE${d + 1}`) ?? (d === 0 ? len : 1);
    if (!Number.isInteger(t) || t < 1) throw new InputError('fits.bad-tile', `ZTILE${d + 1} is invalid`, { ...place, key: `ZTILE${d + 1}` }, { expected: 'a positive integer', actual: String(t) });
    return Math.min(len, t);
  });
  const grid = axes.map((len, d) => Math.ceil(len / tile[d]!));
  const tiles = grid.reduce((a, b) => a * b, 1);
  if (layout.rows !== tiles) throw new InputError('fits.bad-tile', 'number of table rows does not match the tile grid', { ...place, key: 'NAXIS2' }, { expected: `${tiles} rows`, actual: String(layout.rows) });
  const floatImage = bitpix < 0;
  const quantize = (th.getString('ZQUANTIZ') ?? 'NO_DITHER').trim().toUpperCase();
  const lossless = floatImage && quantize === 'NONE';
  const size = floatImage && !lossless ? 4 : Math.abs(bitpix) / 8;
  const params: TileCodecParams = {
    codec,
    size,
    float: lossless,
    blockSize: zParam(th, 'BLOCKSIZE') ?? 32,
    bytePix: (zParam(th, 'BYTEPIX') ?? Math.min(size, 4)) as 1 | 2 | 4,
  };
  if (!Number.isInteger(params.blockSize) || params.blockSize < 1) fail(`BLOCKSIZE ${params.blockSize} is not a positive integer`);
  if (codec === 'RICE_1' && (lossless || ![1, 2, 4].includes(params.bytePix))) fail(`RICE_1 cannot hold ${lossless ? 'unquantised floats' : `${params.bytePix}-byte values`}`);
  const data = descriptorColumn(layout, 'COMPRESSED_DATA', place);
  const gzipData = findColumn(layout, 'GZIP_COMPRESSED_DATA');
  const rawData = findColumn(layout, 'UNCOMPRESSED_DATA');
  const zscale = perTile(file, hdu, layout, 'ZSCALE', th);
  const zzero = perTile(file, hdu, layout, 'ZZERO', th);
  const zblank = perTile(file, hdu, layout, 'ZBLANK', th);
  const dither0 = th.getNumber('ZDITHER0') ?? 1;
  const blank = floatImage ? undefined : hdu.header.getNumber('BLANK');
  const bzero = hdu.header.getNumber('BZERO') ?? 0;
  const bscale = hdu.header.getNumber('BSCALE') ?? 1;

  const out = float32 || bitpix === 8 || bitpix === 16 || bitpix === -32 ? new Float32Array(n) : new Float64Array(n);
  const maxTile = tile.reduce((a, b) => a * b, 1);
  const stored = new Float64Array(maxTile);
  const ints = new Int32Array(maxTile);
  const values = new Float64Array(maxTile);
  let blankCount = 0;
  let nanCount = 0;
  const g = new Array<number>(axes.length).fill(0); // grid position of the current tile
  for (let r = 0; r < tiles; r++) {
    const sz = axes.map((len, d) => Math.min(tile[d]!, len - g[d]! * tile[d]!));
    const count = sz.reduce((a, b) => a * b, 1);
    let bytes = heapSlice(file, hdu, layout, data, r, fail);
    let p = params;
    if (bytes.length === 0 && gzipData) {
      bytes = heapSlice(file, hdu, layout, gzipData, r, fail);
      p = { ...params, codec: 'GZIP_1', float: true, size: Math.abs(bitpix) / 8 };
    } else if (bytes.length === 0 && rawData) {
      bytes = heapSlice(file, hdu, layout, rawData, r, fail);
      p = { ...params, codec: 'NOCOMPRESS', float: true, size: Math.abs(bitpix) / 8 };
    }
    decodeTile(bytes, count, p, stored, ints, fail);
    const nullValue = zblank(r) ?? blank;
    if (floatImage && !p.float) {
      const scale = zscale(r);
      const zero = zzero(r);
      if (scale === undefined || zero === undefined) fail(`tile ${r + 1} has no ZSCALE/ZZERO`);
      unquantize(stored, count, values, scale!, zero!, quantize as Quantize, r + 1, dither0, nullValue);
      for (let i = 0; i < count; i++) if (values[i] !== values[i]) nanCount++;
    } else {
      for (let i = 0; i < count; i++) {
        const v = stored[i]!;
        if (!floatImage && v === nullValue) (values[i] = NaN), blankCount++;
        else values[i] = bzero + bscale * v;
        if (floatImage && v !== v) nanCount++;
      }
    }
    // Copy the tile's rows (runs along axis 1) into the image.
    const lines = count / sz[0]!;
    const idx = new Array<number>(axes.length).fill(0);
    for (let line = 0; line < lines; line++) {
      let target = g[0]! * tile[0]!;
      let stride = 1;
      for (let d = 0; d < axes.length; d++) {
        if (d > 0) target += (g[d]! * tile[d]! + idx[d]!) * stride;
        stride *= axes[d]!;
      }
      for (let i = 0; i < sz[0]!; i++) out[target + i] = values[line * sz[0]! + i]!;
      for (let d = 1; d < axes.length && ++idx[d]! >= sz[d]!; d++) idx[d] = 0;
    }
    for (let d = 0; d < axes.length && ++g[d]! >= grid[d]!; d++) g[d] = 0;
  }
  return { width: axes[0] ?? 1, height: axes[1] ?? 1, axes, data: out, blankCount, nanCount };
}

function descriptorColumn(layout: BinLayout, name: string, place: ErrorPlace): BinColumn {
  const col = findColumn(layout, name);
  if (!col || (col.type !== 'P' && col.type !== 'Q')) {
    throw new InputError('fits.bad-tile', `compressed image has no ${name} column`, place, { expected: `a ${name} column of format 1PB or 1QB` });
  }
  return col;
}
