/**
 * Rejections of an exposure combination as bit planes: bit e of pixel p set when exposure e is
 * rejected there; counted, and grown to the neighbours within a radius.
 */

/** Set bits of v. */
export function popcount(v: number): number {
  let c = 0;
  for (let b = v >>> 0; b; b &= b - 1) c++;
  return c;
}

/** One bit per exposure and pixel, in the narrowest array that holds them. */
export type BitPlanes = Uint8Array | Uint16Array | Uint32Array;

/** OR of the bits within `radius` (square window): rejections spread to neighbours in their exposure. */
export function grow(bits: BitPlanes, width: number, height: number, radius: number): BitPlanes {
  const out = bits.slice();
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const b = bits[y * width + x]!;
      if (!b) continue;
      for (let yy = Math.max(0, y - radius); yy <= Math.min(height - 1, y + radius); yy++) {
        for (let xx = Math.max(0, x - radius); xx <= Math.min(width - 1, x + radius); xx++) out[yy * width + xx] = out[yy * width + xx]! | b;
      }
    }
  }
  return out;
}
