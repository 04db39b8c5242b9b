/**
 * Mapping between the trimmed raw frame and the internal orientation (dispersion along x,
 * wavelength increasing with x); the convention is stated on `Orientation` in frame.ts.
 */
import type { CalibratedFrame, Orientation } from './frame.js';

export type PixelArray = Float32Array | Float64Array | Uint16Array;

export interface OrientedImage<T extends PixelArray> {
  data: T;
  width: number;
  height: number;
}

/** The trimmed raw image (rawWidth x rawHeight) in the internal orientation. */
export function toInternal<T extends PixelArray>(raw: T, rawWidth: number, rawHeight: number, o: Orientation): OrientedImage<T> {
  checkSize(raw, rawWidth, rawHeight);
  const width = o.transpose ? rawHeight : rawWidth;
  const height = o.transpose ? rawWidth : rawHeight;
  if (!o.transpose && !o.flipX) return { data: raw.slice() as T, width, height }; // the usual case: one block copy
  const out = new (raw.constructor as new (n: number) => T)(raw.length);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) {
      const tx = o.flipX ? width - 1 - x : x; // position in the transposed (or not) frame T
      out[row + x] = o.transpose ? raw[tx * rawWidth + y]! : raw[y * rawWidth + tx]!;
    }
  }
  return { data: out, width, height };
}

/** The inverse of toInternal: an internal image (width x height) back in the trimmed raw orientation. */
export function toRaw<T extends PixelArray>(internal: T, width: number, height: number, o: Orientation): OrientedImage<T> {
  checkSize(internal, width, height);
  const rawWidth = o.transpose ? height : width;
  const rawHeight = o.transpose ? width : height;
  if (!o.transpose && !o.flipX) return { data: internal.slice() as T, width: rawWidth, height: rawHeight };
  const out = new (internal.constructor as new (n: number) => T)(internal.length);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) {
      const tx = o.flipX ? width - 1 - x : x;
      if (o.transpose) out[tx * rawWidth + y] = internal[row + x]!;
      else out[y * rawWidth + tx] = internal[row + x]!;
    }
  }
  return { data: out, width: rawWidth, height: rawHeight };
}

/** A new frame mirrored in internal x, with orientation.flipX toggled (sci, var and mask alike). */
export function flipFrameX(frame: CalibratedFrame): CalibratedFrame {
  return {
    ...frame,
    sci: mirrorRows(frame.sci, frame.width, frame.height),
    var: mirrorRows(frame.var, frame.width, frame.height),
    mask: mirrorRows(frame.mask, frame.width, frame.height),
    orientation: { ...frame.orientation, flipX: !frame.orientation.flipX },
  };
}

function mirrorRows<T extends PixelArray>(src: T, width: number, height: number): T {
  const out = new (src.constructor as new (n: number) => T)(src.length);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) out[row + x] = src[row + width - 1 - x]!;
  }
  return out;
}

function checkSize(data: PixelArray, width: number, height: number): void {
  if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0) || data.length !== width * height) {
    throw new RangeError(`orientation: image of ${data.length} pixels is not ${width} x ${height}`);
  }
}
