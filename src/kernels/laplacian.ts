/**
 * The positive Laplacian of van Dokkum (2001, PASP 113, 1420, section 2): the image subsampled
 * 2x2, convolved with [[0,-1,0],[-1,4,-1],[0,-1,0]], negative values set to zero, block-averaged
 * back. Written without the subsampled image: a sub-pixel's Laplacian sees its own value twice
 * (the two neighbours inside the block) and one neighbour in x and one in y outside it, so
 *   L+(x, y) = 1/4 sum_{sx, sy = +-1} max(0, 2 I(x, y) - I(x + sx, y) - I(x, y + sy)).
 * Edges mirror (a neighbour outside the image is the edge pixel itself).
 * A lone spike of height A on a flat background gives L+ = 2A.
 */

export function positiveLaplacian(src: Float32Array, width: number, height: number, out?: Float32Array): Float32Array {
  if (src.length !== width * height) throw new RangeError(`positiveLaplacian: ${src.length} pixels is not ${width} x ${height}`);
  const dst = out ?? new Float32Array(src.length);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    const up = y + 1 < height ? row + width : row;
    const down = y > 0 ? row - width : row;
    for (let x = 0; x < width; x++) {
      dst[row + x] = core(2 * src[row + x]!, src[row + (x > 0 ? x - 1 : x)]!, src[row + (x + 1 < width ? x + 1 : x)]!, src[down + x]!, src[up + x]!);
    }
  }
  return dst;
}

/** L+ at one pixel (same rule and edges as positiveLaplacian), for local updates. */
export function positiveLaplacianAt(src: Float32Array, width: number, height: number, x: number, y: number): number {
  const row = y * width;
  return core(
    2 * src[row + x]!,
    src[row + (x > 0 ? x - 1 : x)]!,
    src[row + (x + 1 < width ? x + 1 : x)]!,
    src[(y > 0 ? row - width : row) + x]!,
    src[(y + 1 < height ? row + width : row) + x]!,
  );
}

/** The rule for one pixel from twice its value and its four neighbours. */
function core(v2: number, left: number, right: number, below: number, above: number): number {
  let s = 0;
  let t = v2 - left - below;
  if (t > 0) s += t;
  t = v2 - right - below;
  if (t > 0) s += t;
  t = v2 - left - above;
  if (t > 0) s += t;
  t = v2 - right - above;
  if (t > 0) s += t;
  return 0.25 * s;
}
