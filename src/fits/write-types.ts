/** What the writer accepts: one spec per HDU. */
import type { Header } from './header.js';

export interface ImageHduSpec {
  kind: 'image';
  /** EXTNAME (ignored for an image written into the primary HDU unless set). */
  name?: string;
  bitpix: 8 | 16 | 32 | -32 | -64;
  width: number;
  height: number;
  /** Physical values, row-major; stored = round((value - bzero) / bscale) for integer BITPIX. */
  data: ArrayLike<number>;
  /** BZERO; 32768 with bitpix 16 stores unsigned 16-bit values. */
  bzero?: number;
  bscale?: number;
  /** Extra cards; structural keywords (BITPIX, NAXISn, BZERO ...) in it are ignored. */
  header?: Header;
}

export interface TableColumnSpec {
  name: string;
  format: 'L' | 'J' | 'K' | 'E' | 'D' | 'A';
  unit?: string;
  /** Characters per value for A columns (default: the longest string, at least 1). */
  width?: number;
  values: ArrayLike<number> | boolean[] | string[] | bigint[];
}

export interface TableHduSpec {
  kind: 'bintable';
  name: string;
  header?: Header;
  columns: TableColumnSpec[];
}

export type WriteHdu = ImageHduSpec | TableHduSpec;

export interface WriteOptions {
  /** Cards for the primary header (structural keywords ignored). */
  primaryHeader?: Header;
  /** Write the first spec (an image) as the primary HDU, as raw frames are written. */
  imageInPrimary?: boolean;
  /** Add DATASUM and CHECKSUM to every HDU (default true). */
  checksum?: boolean;
}
