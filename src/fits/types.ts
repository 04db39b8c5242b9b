/** The shapes the FITS reader returns. Offsets are 0-based byte offsets in the (gunzipped) file. */
import type { Header } from './header.js';

export type HduKind = 'image' | 'bintable' | 'table' | 'compressed-image' | 'unknown';

export interface Hdu {
  /** 0-based position in the file (0 is the primary HDU). */
  index: number;
  kind: HduKind;
  /** For compressed images: the header of the image they hold (Z keywords turned back into image keywords). */
  header: Header;
  /** EXTNAME, when present. */
  name?: string;
  /** Byte offset of the first header card. */
  headerOffset: number;
  /** Byte offset of the data unit (just past the header blocks). */
  dataOffset: number;
  /** Bytes of data, without the padding to 2880: |BITPIX|/8 x GCOUNT x (PCOUNT + NAXIS1 x ... x NAXISn). */
  dataLength: number;
  /** For compressed images: the header of the binary table that stores the tiles. */
  tableHeader?: Header;
}

export interface FitsFile {
  /** Path or label the bytes came from, used in error messages. */
  source: string;
  hdus: Hdu[];
  /** Soft problems noticed while parsing: checksum mismatches, unreadable card values, trailing bytes. */
  warnings: string[];
  /** The whole file (after gunzip); HDU offsets point into it. */
  bytes: Uint8Array;
}

export interface ImageData {
  /** NAXIS1 (1 for NAXIS = 0). */
  width: number;
  /** NAXIS2 (1 for NAXIS = 1); higher axes are stacked after it in `data`. */
  height: number;
  /** NAXIS1, NAXIS2, ... */
  axes: number[];
  /** Physical values (BZERO + BSCALE x stored), row-major, BLANK pixels as NaN. */
  data: Float32Array | Float64Array;
  /** Pixels equal to BLANK (integer images), now NaN in `data`. */
  blankCount: number;
  /** NaN pixels stored as such (floating-point images). */
  nanCount: number;
}

export interface TableColumn {
  /** TTYPEn (or `COLn` when absent). */
  name: string;
  /** TFORMn as written. */
  format: string;
  /** TUNITn. */
  unit?: string;
}

export interface TableData {
  rows: number;
  columns: TableColumn[];
  /**
   * Values of a column (name case-insensitive), TSCALn/TZEROn applied, repeated elements flattened
   * row by row: typed arrays for numbers, boolean[] for L and X, string[] for A, bigint[] for K.
   */
  column(name: string): ArrayLike<number> | boolean[] | string[] | bigint[];
}

export interface ParseOptions {
  /** What a CHECKSUM or DATASUM mismatch does: a warning (default), an InputError, or nothing (not checked). */
  checksum?: 'warn' | 'error' | 'skip';
}
