/**
 * What `whorl inspect` reports about a FITS file: per HDU its type, size, BITPIX, EXTNAME, pixel
 * statistics in physical units (BLANK, NaN and infinities excluded) and table columns. Pure: it
 * reads a parsed FitsFile, never the disk.
 */
import { median } from '../kernels/robust.js';
import { readImage } from './image.js';
import { readTable } from './table.js';
import type { FitsFile, HduKind, TableColumn } from './types.js';

export const HDU_TYPE_NAMES: Record<HduKind, string> = {
  image: 'image',
  bintable: 'binary table',
  table: 'ascii table',
  'compressed-image': 'compressed image',
  unknown: 'unknown',
};

export interface PixelStats {
  /** Pixels counted in the statistics (finite physical values). */
  count: number;
  min: number;
  max: number;
  mean: number;
  median: number;
  /** Pixels equal to BLANK or stored as NaN. */
  nanOrBlank: number;
  /** Pixels equal to +-Infinity (floating-point images), also left out of the statistics. */
  infinite: number;
}

export interface HduSummary {
  index: number;
  /** image, binary table, ascii table, compressed image or unknown. */
  type: string;
  extname: string | null;
  bitpix: number;
  /** NAXIS1, NAXIS2, ... of the image (the uncompressed image for compressed ones; [columns, rows] not used for tables). */
  dimensions: number[];
  /** Pixel statistics, for images with data; null otherwise. */
  pixels: PixelStats | null;
  /** ZCMPTYPE of compressed images. */
  compression?: string;
  /** Tables: row count and columns. */
  rows?: number;
  columns?: TableColumn[];
}

export function pixelStats(data: ArrayLike<number>, nanOrBlank: number): PixelStats {
  let count = 0;
  let infinite = 0;
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < data.length; i++) {
    const v = data[i]!;
    if (v !== v) continue;
    if (v === Infinity || v === -Infinity) {
      infinite++;
      continue;
    }
    count++;
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  let finite: ArrayLike<number> = data;
  if (infinite > 0) finite = Float64Array.from(data).filter((v) => Number.isFinite(v));
  return count === 0
    ? { count, min: NaN, max: NaN, mean: NaN, median: NaN, nanOrBlank, infinite }
    : { count, min, max, mean: sum / count, median: median(finite), nanOrBlank, infinite };
}

export function summariseFits(file: FitsFile): HduSummary[] {
  return file.hdus.map((hdu) => {
    const h = hdu.header;
    const naxis = h.getNumber('NAXIS') ?? 0;
    const dimensions: number[] = [];
    for (let i = 1; i <= naxis; i++) dimensions.push(h.getNumber(`NAXIS${i}`) ?? 0);
    const s: HduSummary = { index: hdu.index, type: HDU_TYPE_NAMES[hdu.kind], extname: hdu.name ?? null, bitpix: h.getNumber('BITPIX') ?? 0, dimensions, pixels: null };
    if (hdu.kind === 'compressed-image') s.compression = (hdu.tableHeader!.getString('ZCMPTYPE') ?? '').trim();
    if ((hdu.kind === 'image' || hdu.kind === 'compressed-image') && dimensions.length > 0 && dimensions.every((d) => d > 0)) {
      const img = readImage(file, hdu.index);
      s.pixels = pixelStats(img.data, img.blankCount + img.nanCount);
    }
    if (hdu.kind === 'bintable' || hdu.kind === 'table') {
      const t = readTable(file, hdu.index);
      s.rows = t.rows;
      s.columns = t.columns;
    }
    return s;
  });
}
