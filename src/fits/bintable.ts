/**
 * Values of binary-table columns (FITS Standard 4.0, section 7.3.3): big-endian fields, TSCALn and
 * TZEROn applied (TZERO 2^15, 2^31, 2^63 for unsigned integers), TNULLn to NaN when scaled.
 */
import { InputError, type ErrorPlace } from '../errors.js';
import type { BinColumn, BinLayout } from './bintable-layout.js';

type ColumnValues = ArrayLike<number> | boolean[] | string[] | bigint[];

const UNSIGNED_ZERO: Record<string, number> = { I: 32768, J: 2147483648 };

function strings(view: DataView, layout: BinLayout, col: BinColumn): string[] {
  const out: string[] = [];
  for (let r = 0; r < layout.rows; r++) {
    let s = '';
    const base = r * layout.rowBytes + col.offset;
    for (let j = 0; j < col.width; j++) {
      const c = view.getUint8(base + j);
      if (c === 0) break; // NUL ends the string (section 7.3.3.1)
      s += String.fromCharCode(c);
    }
    out.push(s.trimEnd());
  }
  return out;
}

function logicals(view: DataView, layout: BinLayout, col: BinColumn): boolean[] {
  const out: boolean[] = [];
  for (let r = 0; r < layout.rows; r++) {
    const base = r * layout.rowBytes + col.offset;
    if (col.type === 'X') for (let j = 0; j < col.repeat; j++) out.push(((view.getUint8(base + (j >> 3)) >> (7 - (j & 7))) & 1) === 1);
    else for (let j = 0; j < col.repeat; j++) out.push(view.getUint8(base + j) === 0x54); // 'T'
  }
  return out;
}

function bigints(view: DataView, layout: BinLayout, col: BinColumn): bigint[] {
  const out: bigint[] = [];
  // TZERO = 2^63 marks unsigned 64-bit integers: reading them unsigned adds exactly that offset.
  const unsigned = col.zero === 9223372036854775808 && col.scale === 1;
  const zero = unsigned || !Number.isInteger(col.zero) ? 0n : BigInt(col.zero);
  for (let r = 0; r < layout.rows; r++) {
    const base = r * layout.rowBytes + col.offset;
    for (let j = 0; j < col.repeat; j++) {
      const at = base + 8 * j;
      out.push(unsigned ? view.getBigUint64(at) ^ 0x8000000000000000n : view.getBigInt64(at) + zero);
    }
  }
  return out;
}

/** Numbers of a B, I, J, E, D, C or M column; unscaled integers keep an integer typed array. */
function numbers(view: DataView, layout: BinLayout, col: BinColumn): ArrayLike<number> {
  const per = col.type === 'C' || col.type === 'M' ? 2 * col.repeat : col.repeat;
  const n = layout.rows * per;
  const scaled = col.scale !== 1 || col.zero !== 0;
  const unsigned = col.scale === 1 && UNSIGNED_ZERO[col.type] === col.zero;
  let out: Float32Array | Float64Array | Uint8Array | Int16Array | Uint16Array | Int32Array | Uint32Array;
  if (unsigned) out = col.type === 'I' ? new Uint16Array(n) : new Uint32Array(n);
  else if (scaled) out = new Float64Array(n);
  else if (col.type === 'B') out = new Uint8Array(n);
  else if (col.type === 'I') out = new Int16Array(n);
  else if (col.type === 'J') out = new Int32Array(n);
  else if (col.type === 'E' || col.type === 'C') out = new Float32Array(n);
  else out = new Float64Array(n);
  const nullValue = col.nullValue;
  let k = 0;
  for (let r = 0; r < layout.rows; r++) {
    const base = r * layout.rowBytes + col.offset;
    for (let j = 0; j < per; j++) {
      let v: number;
      switch (col.type) {
        case 'B': v = view.getUint8(base + j); break;
        case 'I': v = view.getInt16(base + 2 * j); break;
        case 'J': v = view.getInt32(base + 4 * j); break;
        case 'E': case 'C': v = view.getFloat32(base + 4 * j); break;
        default: v = view.getFloat64(base + 8 * j);
      }
      if (unsigned) out[k++] = v + col.zero;
      else if (scaled) out[k++] = v === nullValue ? NaN : col.zero + col.scale * v;
      else out[k++] = v;
    }
  }
  return out;
}

/** All values of one column of a binary table whose data unit starts at `dataOffset`. */
export function binColumnValues(bytes: Uint8Array, dataOffset: number, layout: BinLayout, col: BinColumn, place: ErrorPlace): ColumnValues {
  const view = new DataView(bytes.buffer, bytes.byteOffset + dataOffset, layout.rows * layout.rowBytes);
  switch (col.type) {
    case 'A': return strings(view, layout, col);
    case 'L': case 'X': return logicals(view, layout, col);
    case 'K': return bigints(view, layout, col);
    case 'P': case 'Q':
      throw new InputError('fits.unsupported', `column ${col.name} holds variable-length arrays, which readTable does not return`, { ...place, key: `TFORM${col.number}` }, { expected: 'a fixed-length column', actual: col.format });
    default: return numbers(view, layout, col);
  }
}
