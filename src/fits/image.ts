/**
 * Image data units (FITS Standard 4.0, sections 5.2-5.3 and 4.4.2.5): big-endian stored values to
 * physical values, physical = BZERO + BSCALE x stored, integer BLANK pixels to NaN.
 */
import { InputError } from '../errors.js';
import type { Header } from './header.js';
import { readTiledImage } from './tiled-image.js';
import type { FitsFile, Hdu, ImageData } from './types.js';
import { decodeUnsigned16 } from './unsigned16.js';

export interface ReadImageOptions {
  /** Return a Float32Array whatever BITPIX is (raw frames); default: Float64Array for BITPIX 32, 64, -64. */
  float32?: boolean;
}

/** BZERO, BSCALE and (integer images only) BLANK of an image header. */
export function scalingOf(header: Header, bitpix: number): { zero: number; scale: number; blank: number | undefined } {
  const blank = bitpix > 0 ? header.getNumber('BLANK') : undefined;
  return { zero: header.getNumber('BZERO') ?? 0, scale: header.getNumber('BSCALE') ?? 1, blank };
}

/** The HDU at `index`, or an InputError naming the file. */
export function hduAt(file: FitsFile, index: number): Hdu {
  const hdu = file.hdus[index];
  if (!hdu) {
    throw new InputError('fits.no-hdu', `no HDU ${index}`, { file: file.source, hdu: index }, { expected: `an HDU index from 0 to ${file.hdus.length - 1}` });
  }
  return hdu;
}

function outputFor(bitpix: number, n: number, float32: boolean): Float32Array | Float64Array {
  return float32 || bitpix === 8 || bitpix === 16 || bitpix === -32 ? new Float32Array(n) : new Float64Array(n);
}

/** Decode n stored values starting at `offset` into physical values; returns the BLANK and NaN counts. */
export function decodeStored(
  bytes: Uint8Array,
  offset: number,
  bitpix: number,
  out: Float32Array | Float64Array,
  zero: number,
  scale: number,
  blank: number | undefined,
): { blankCount: number; nanCount: number } {
  const n = out.length;
  const view = new DataView(bytes.buffer, bytes.byteOffset + offset, n * (Math.abs(bitpix) / 8));
  const b = blank ?? NaN; // NaN never equals a stored integer: no BLANK test needed
  let blankCount = 0;
  let nanCount = 0;
  switch (bitpix) {
    case 8:
      for (let i = 0; i < n; i++) {
        const v = view.getUint8(i);
        if (v === b) (out[i] = NaN), blankCount++;
        else out[i] = zero + scale * v;
      }
      break;
    case 16:
      // Hot path for raw frames: bytes combined by hand, faster than DataView.getInt16 in V8.
      if (blank === undefined) {
        for (let i = 0, o = offset; i < n; i++, o += 2) out[i] = zero + scale * (((bytes[o]! << 24) >> 16) | bytes[o + 1]!);
        break;
      }
      for (let i = 0, o = offset; i < n; i++, o += 2) {
        const v = ((bytes[o]! << 24) >> 16) | bytes[o + 1]!;
        if (v === b) (out[i] = NaN), blankCount++;
        else out[i] = zero + scale * v;
      }
      break;
    case 32:
      for (let i = 0; i < n; i++) {
        const v = view.getInt32(4 * i);
        if (v === b) (out[i] = NaN), blankCount++;
        else out[i] = zero + scale * v;
      }
      break;
    case 64:
      for (let i = 0; i < n; i++) {
        // hi x 2^32 + lo is exact below 2^53; larger magnitudes round like any double would.
        const v = view.getInt32(8 * i) * 4294967296 + view.getUint32(8 * i + 4);
        if (v === b) (out[i] = NaN), blankCount++;
        else out[i] = zero + scale * v;
      }
      break;
    case -32:
      for (let i = 0; i < n; i++) {
        const v = view.getFloat32(4 * i);
        if (v !== v) nanCount++;
        out[i] = zero + scale * v;
      }
      break;
    default:
      for (let i = 0; i < n; i++) {
        const v = view.getFloat64(8 * i);
        if (v !== v) nanCount++;
        out[i] = zero + scale * v;
      }
  }
  return { blankCount, nanCount };
}

/** Pixel values of an image HDU (plain or tile-compressed) in physical units. */
export function readImage(file: FitsFile, index: number, options: ReadImageOptions = {}): ImageData {
  const hdu = hduAt(file, index);
  if (hdu.kind === 'compressed-image') return readTiledImage(file, hdu, options.float32 ?? false);
  const { bitpix, axes, n } = plainImage(file, index);
  const out = outputFor(bitpix, n, options.float32 ?? false);
  const { zero, scale, blank } = scalingOf(hdu.header, bitpix);
  const counts = decodeStored(file.bytes, hdu.dataOffset, bitpix, out, zero, scale, blank);
  return { width: axes[0]!, height: axes[1] ?? 1, axes, data: out, ...counts };
}

/**
 * The pixels of a plain image HDU as a Uint16Array when its physical values are the unsigned
 * 16-bit integers of the usual convention (BITPIX 16, BZERO 32768, BSCALE 1, no BLANK; FITS
 * Standard 4.0 section 5.2.5): the values readImage gives, exactly, in half the memory of a
 * Float32Array. Undefined for any other image.
 */
export function readUnsigned16(file: FitsFile, index: number): { width: number; height: number; data: Uint16Array } | undefined {
  const hdu = hduAt(file, index);
  if (hdu.kind !== 'image' || hdu.header.getNumber('BITPIX') !== 16 || !(hdu.header.getNumber('NAXIS')! > 0)) return undefined;
  const { zero, scale, blank } = scalingOf(hdu.header, 16);
  if (zero !== 32768 || scale !== 1 || blank !== undefined) return undefined;
  const { axes, n } = plainImage(file, index);
  return { width: axes[0]!, height: axes[1] ?? 1, data: decodeUnsigned16(file.bytes, hdu.dataOffset, n) };
}

/** BITPIX, axes and pixel count of the plain image HDU at `index`, checked against its data unit. */
function plainImage(file: FitsFile, index: number): { bitpix: number; axes: number[]; n: number } {
  const hdu = hduAt(file, index);
  const place = { file: file.source, hdu: index };
  if (hdu.kind !== 'image') {
    throw new InputError('fits.not-image', 'HDU is not an image', place, { expected: 'an image or compressed-image HDU', actual: hdu.kind });
  }
  const bitpix = hdu.header.getNumber('BITPIX')!;
  const axes: number[] = [];
  for (let i = 1; i <= (hdu.header.getNumber('NAXIS') ?? 0); i++) axes.push(hdu.header.getNumber(`NAXIS${i}`)!);
  if (axes.length === 0) throw new InputError('fits.no-image-data', 'HDU has no data (NAXIS = 0)', { ...place, key: 'NAXIS' }, { expected: 'NAXIS >= 1' });
  const n = axes.reduce((a, b) => a * b, 1);
  if (n * (Math.abs(bitpix) / 8) > hdu.dataLength) {
    throw new InputError('fits.bad-keyword', 'data unit is smaller than the image axes need', { ...place, key: 'GCOUNT' }, { expected: `${n * (Math.abs(bitpix) / 8)} bytes`, actual: `${hdu.dataLength} bytes (GCOUNT x (PCOUNT + NAXIS1 x ...))` });
  }
  return { bitpix, axes, n };
}
