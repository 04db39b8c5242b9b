/**
 * Column layout of a binary table (FITS Standard 4.0, section 7.3): TFORMn = rT(a), field widths
 * summing to NAXIS1, variable-length descriptors (P, Q) pointing into the heap at THEAP.
 */
import { InputError, type ErrorPlace } from '../errors.js';
import type { Header } from './header.js';

/** Bytes per element of each data type (Table 18 of the standard); X counts bits. */
const ELEMENT_BYTES: Record<string, number> = { L: 1, X: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, C: 8, M: 16, P: 8, Q: 16 };

export interface BinColumn {
  /** 1-based column number n of TTYPEn. */
  number: number;
  name: string;
  format: string;
  unit?: string;
  /** Data type letter. */
  type: string;
  repeat: number;
  /** For P/Q columns: the element type in the heap. */
  heapType?: string;
  /** Byte offset of the field within a row. */
  offset: number;
  /** Bytes the field occupies in a row. */
  width: number;
  scale: number;
  zero: number;
  /** TNULLn for integer columns. */
  nullValue?: number;
}

export interface BinLayout {
  rows: number;
  rowBytes: number;
  columns: BinColumn[];
  /** Byte offset of the heap from the start of the data unit. */
  heapOffset: number;
}

const TFORM = /^\s*(\d*)([LXBIJKAEDCMPQ])(.*)$/;

/** Parse TFORMn: repeat count, type and, for P/Q, the heap element type. */
function parseForm(form: string, place: ErrorPlace, key: string): { repeat: number; type: string; heapType?: string } {
  const m = TFORM.exec(form.toUpperCase());
  if (!m) throw new InputError('fits.bad-tform', 'unknown binary-table column format', { ...place, key }, { expected: 'rT with T one of L X B I J K A E D C M P Q', actual: form });
  const repeat = m[1] === '' ? 1 : Number(m[1]);
  const type = m[2]!;
  if (type === 'P' || type === 'Q') {
    const h = /^([LXBIJKAEDCM])/.exec(m[3]!.trim());
    if (!h) throw new InputError('fits.bad-tform', 'variable-length column without element type', { ...place, key }, { expected: 'P or Q followed by a type letter', actual: form });
    return { repeat, type, heapType: h[1]! };
  }
  return { repeat, type };
}

export function binLayout(header: Header, place: ErrorPlace, dataLength: number): BinLayout {
  const rowBytes = header.getNumber('NAXIS1') ?? 0;
  const rows = header.getNumber('NAXIS2') ?? 0;
  const fields = header.getNumber('TFIELDS');
  if (fields === undefined || !Number.isInteger(fields) || fields < 0 || fields > 999) {
    throw new InputError('fits.bad-keyword', 'TFIELDS is missing or invalid', { ...place, key: 'TFIELDS' }, { expected: 'an integer from 0 to 999' });
  }
  const columns: BinColumn[] = [];
  let offset = 0;
  for (let n = 1; n <= fields; n++) {
    const key = `TFORM${n}`;
    const form = header.getString(key);
    if (form === undefined) throw new InputError('fits.bad-keyword', `${key} is missing`, { ...place, key }, { expected: 'a TFORMn card for every column' });
    const parsed = parseForm(form, place, key);
    const width = parsed.type === 'X' ? Math.ceil(parsed.repeat / 8) : parsed.repeat * ELEMENT_BYTES[parsed.type]!;
    const col: BinColumn = {
      number: n,
      name: header.getString(`TTYPE${n}`) ?? `COL${n}`,
      format: form,
      ...parsed,
      offset,
      width,
      scale: header.getNumber(`TSCAL${n}`) ?? 1,
      zero: header.getNumber(`TZERO${n}`) ?? 0,
    };
    const unit = header.getString(`TUNIT${n}`);
    if (unit !== undefined && unit !== '') col.unit = unit;
    const tnull = header.getNumber(`TNULL${n}`);
    if (tnull !== undefined) col.nullValue = tnull;
    columns.push(col);
    offset += width;
  }
  if (offset !== rowBytes) {
    throw new InputError('fits.bad-keyword', 'column widths do not add up to the row length', { ...place, key: 'NAXIS1' }, { expected: `NAXIS1 = ${offset} (sum of TFORMn widths)`, actual: String(rowBytes) });
  }
  const heapOffset = header.getNumber('THEAP') ?? rowBytes * rows;
  if (!Number.isInteger(heapOffset) || heapOffset < rowBytes * rows || heapOffset > dataLength) {
    throw new InputError('fits.bad-keyword', 'THEAP points outside the data unit', { ...place, key: 'THEAP' }, { expected: `${rowBytes * rows} to ${dataLength}`, actual: String(heapOffset) });
  }
  return { rows, rowBytes, columns, heapOffset };
}

/** Find a column by name (case-insensitive, as section 7.2.2 recommends for TTYPEn). */
export function findColumn(layout: BinLayout, name: string): BinColumn | undefined {
  const k = name.toUpperCase();
  return layout.columns.find((c) => c.name.toUpperCase() === k);
}
