/**
 * Encoding of data units for the writer: big-endian image values (stored = (physical - BZERO) /
 * BSCALE, rounded and clipped for integers, NaN as BLANK) and binary-table rows (FITS Standard 4.0,
 * sections 5 and 7.3).
 */
import { InputError } from '../errors.js';
import type { ImageHduSpec, TableHduSpec } from './write-types.js';
import { LITTLE_ENDIAN } from './endian.js';

const INT_RANGE: Record<number, [number, number]> = { 8: [0, 255], 16: [-32768, 32767], 32: [-2147483648, 2147483647] };

/** Stored integer value that marks NaN pixels, when the data have any: the type's minimum, which other values are then clipped above. */
export function blankFor(spec: ImageHduSpec): number | undefined {
  if (spec.bitpix < 0) return undefined;
  const d = spec.data;
  if (d instanceof Uint8Array || d instanceof Uint16Array || d instanceof Int16Array || d instanceof Uint32Array || d instanceof Int32Array) return undefined; // no NaN in integer arrays
  for (let i = 0; i < d.length; i++) if (d[i] !== d[i]) return INT_RANGE[spec.bitpix]![0];
  return undefined;
}

/** Raw frames: unscaled 16-bit values written byte by byte (faster than DataView in V8). */
function encodeInt16(d: ArrayLike<number>, first: number, n: number, zero: number, out: Uint8Array, offset: number): void {
  for (let i = first, o = offset; i < first + n; i++, o += 2) {
    let s = Math.round(d[i]! - zero);
    if (s < -32768) s = -32768;
    else if (s > 32767) s = 32767;
    out[o] = (s >> 8) & 0xff;
    out[o + 1] = s & 0xff;
  }
}

/**
 * Write the stored values of pixels [first, first + count) of the image (default: all of them) at
 * out[offset..).
 */
export function encodeImage(spec: ImageHduSpec, out: Uint8Array, offset: number, blank: number | undefined, first = 0, count = spec.width * spec.height): void {
  const n = count;
  const d = spec.data;
  const bytesPerValue = Math.abs(spec.bitpix) / 8;
  if (LITTLE_ENDIAN && (out.byteOffset + offset) % 8 === 0 && (spec.bitpix < 0 || isUnsigned16(spec, d, blank))) {
    // Copied (or converted, rounding as setFloat32 does) natively, then byte-swapped natively.
    const bytes = Buffer.from(out.buffer, out.byteOffset + offset, n * bytesPerValue);
    const part = ArrayBuffer.isView(d) ? (d as Float32Array).subarray(first, first + n) : Array.prototype.slice.call(d, first, first + n);
    if (spec.bitpix === -32) {
      new Float32Array(out.buffer, out.byteOffset + offset, n).set(part); // d holds the values (checked by the writer)
      bytes.swap32();
    } else if (spec.bitpix === -64) {
      new Float64Array(out.buffer, out.byteOffset + offset, n).set(part);
      bytes.swap64();
    } else {
      // stored = value - 32768 in two's complement: the value's bits with the top one flipped
      const u = new Uint16Array(out.buffer, out.byteOffset + offset, n);
      for (let i = 0; i < n; i++) u[i] = part[i]! ^ 0x8000;
      bytes.swap16();
    }
    return;
  }
  const view = new DataView(out.buffer, out.byteOffset + offset, n * bytesPerValue);
  if (spec.bitpix === -32) {
    for (let i = 0; i < n; i++) view.setFloat32(4 * i, d[first + i]!);
    return;
  }
  if (spec.bitpix === 16 && blank === undefined && (spec.bscale ?? 1) === 1) {
    encodeInt16(d, first, n, spec.bzero ?? 0, out, offset);
    return;
  }
  if (spec.bitpix === -64) {
    for (let i = 0; i < n; i++) view.setFloat64(8 * i, d[first + i]!);
    return;
  }
  const zero = spec.bzero ?? 0;
  const scale = spec.bscale ?? 1;
  const [min, hi] = INT_RANGE[spec.bitpix]!;
  const lo = blank === undefined ? min : min + 1;
  const b = blank ?? 0;
  for (let i = 0; i < n; i++) {
    const v = d[first + i]!;
    let s = Math.round((v - zero) / scale);
    if (v !== v) s = b;
    else if (s < lo) s = lo;
    else if (s > hi) s = hi;
    if (spec.bitpix === 16) view.setInt16(2 * i, s);
    else if (spec.bitpix === 32) view.setInt32(4 * i, s);
    else view.setUint8(i, s);
  }
}

/** Unsigned 16-bit masks (Uint16Array, BZERO 32768, BSCALE 1): every value is stored exactly, no rounding or clipping. */
function isUnsigned16(spec: ImageHduSpec, d: ArrayLike<number>, blank: number | undefined): boolean {
  return spec.bitpix === 16 && d instanceof Uint16Array && spec.bzero === 32768 && (spec.bscale ?? 1) === 1 && blank === undefined;
}

export interface TableColumnLayout {
  /** Bytes per row of this column. */
  width: number;
  /** TFORMn. */
  form: string;
}

/** Widths and TFORMn of the spec's columns; checks that every column has one value per row. */
export function tableLayout(spec: TableHduSpec): { rows: number; columns: TableColumnLayout[]; rowBytes: number } {
  const rows = spec.columns[0]?.values.length ?? 0;
  const columns = spec.columns.map((c) => {
    if (c.values.length !== rows) {
      throw new InputError('fits.write-invalid', `column ${c.name} has ${c.values.length} values, the first column ${rows}`, { key: c.name }, { expected: 'the same number of values in every column' });
    }
    if (c.format !== 'A') return { width: { L: 1, J: 4, K: 8, E: 4, D: 8 }[c.format], form: c.format };
    let w = c.width ?? 1;
    if (c.width === undefined) for (const s of c.values as string[]) w = Math.max(w, String(s).length);
    return { width: w, form: `${w}A` };
  });
  return { rows, columns, rowBytes: columns.reduce((a, c) => a + c.width, 0) };
}

/** Write the table rows at out[offset..). */
export function encodeTable(spec: TableHduSpec, layout: ReturnType<typeof tableLayout>, out: Uint8Array, offset: number): void {
  const view = new DataView(out.buffer, out.byteOffset + offset, layout.rows * layout.rowBytes);
  let colOffset = 0;
  spec.columns.forEach((c, k) => {
    const width = layout.columns[k]!.width;
    const v = c.values;
    for (let r = 0; r < layout.rows; r++) {
      const at = r * layout.rowBytes + colOffset;
      switch (c.format) {
        case 'L': view.setUint8(at, v[r] ? 0x54 : 0x46); break;
        case 'J': view.setInt32(at, Math.round(Number(v[r]))); break;
        case 'K': view.setBigInt64(at, typeof v[r] === 'bigint' ? (v[r] as bigint) : BigInt(Math.round(Number(v[r])))); break;
        case 'E': view.setFloat32(at, Number(v[r])); break;
        case 'D': view.setFloat64(at, Number(v[r])); break;
        default: {
          const s = String(v[r]);
          for (let j = 0; j < width; j++) {
            const ch = j < s.length ? s.charCodeAt(j) : 0x20;
            view.setUint8(at + j, ch >= 0x20 && ch <= 0x7e ? ch : 0x3f);
          }
        }
      }
    }
    colOffset += width;
  });
}
