/**
 * Images read back exactly as stored, for arrays whorl wrote itself and reads again (the
 * calibration cache): 32-bit floats bit for bit, and unsigned 16-bit integers (BZERO 32768,
 * FITS Standard 4.0 section 5.2.5) as a Uint16Array. readImage computes BZERO + BSCALE x stored
 * in doubles instead, which turns -0 into +0 and may change NaN payloads.
 */
import { InputError } from '../errors.js';
import { hduAt } from './image.js';
import type { FitsFile } from './types.js';
import { decodeUnsigned16 } from './unsigned16.js';
import { LITTLE_ENDIAN } from './endian.js';

interface Stored<T> {
  width: number;
  height: number;
  data: T;
}

/** The 2-D image at `index` with the BITPIX and BZERO it must have; `decode` turns its data bytes into values. */
function storedImage<T extends Float32Array | Uint16Array>(file: FitsFile, index: number, bitpix: number, bzero: number, decode: (bytes: Uint8Array, offset: number, n: number) => T): Stored<T> {
  const hdu = hduAt(file, index);
  const h = hdu.header;
  const place = { file: file.source, hdu: index };
  if (hdu.kind !== 'image' || h.getNumber('BITPIX') !== bitpix || h.getNumber('NAXIS') !== 2 || (h.getNumber('BZERO') ?? 0) !== bzero || (h.getNumber('BSCALE') ?? 1) !== 1) {
    throw new InputError('fits.not-stored-as', 'image is not stored as expected', place, { expected: `a 2-D image, BITPIX ${bitpix}, BZERO ${bzero}, BSCALE 1`, actual: `${hdu.kind}, BITPIX ${h.getNumber('BITPIX')}, NAXIS ${h.getNumber('NAXIS')}` });
  }
  const width = h.getNumber('NAXIS1')!;
  const height = h.getNumber('NAXIS2')!;
  const byteLength = width * height * (Math.abs(bitpix) / 8);
  if (byteLength > hdu.dataLength) throw new InputError('fits.truncated', 'data unit is smaller than the image axes need', place, { expected: `${byteLength} bytes`, actual: `${hdu.dataLength} bytes` });
  return { width, height, data: decode(file.bytes, hdu.dataOffset, width * height) };
}

/** Big-endian float32 values copied bit for bit. */
function decodeFloat32(bytes: Uint8Array, offset: number, n: number): Float32Array {
  const data = new Float32Array(n);
  new Uint8Array(data.buffer).set(bytes.subarray(offset, offset + 4 * n));
  if (LITTLE_ENDIAN) Buffer.from(data.buffer).swap32();
  return data;
}

/** A BITPIX -32 image without scaling, every bit pattern kept (-0, NaN payloads). */
export function storedFloat32(file: FitsFile, index: number): Stored<Float32Array> {
  return storedImage(file, index, -32, 0, decodeFloat32);
}

/** A BITPIX 16, BZERO 32768 image as the unsigned values it stores. */
export function storedUint16(file: FitsFile, index: number): Stored<Uint16Array> {
  return storedImage(file, index, 16, 32768, decodeUnsigned16);
}
