/**
 * Faint line emission inside the sky rows (the outer disk beyond the detected galaxy) is too
 * faint per pixel for the clipping, yet coherent along the slit: summed over a block of sky rows
 * it stands out. Such pixels are left out of the sky fit so the sky model does not take up the
 * galaxy's own lines.
 */

/** Block z above which a sky-row pixel counts as emission (common practice for a detection). */
const Z_LIMIT = 4;
/** A column masked in more than this fraction of the sky rows is a sky-line misfit, not emission: keep it. */
const MAX_FRACTION = 0.5;

/**
 * residual = data - sky model. For each sky row, residuals and variances of the used pixels are
 * summed over the sky rows within halfRows; pixels whose block z exceeds Z_LIMIT (and their two
 * neighbours along the row) are removed from `use` and set to `mark` in `emission` (a round's own
 * mark tells its pixels from earlier rounds'). Returns the number removed.
 */
export function maskCoherentEmission(width: number, height: number, residual: Float32Array, variance: Float32Array, use: Uint8Array, emission: Uint8Array, skyRows: Uint8Array, halfRows: number, mark = 1): number {
  const block: Block = { width, height, residual, variance, use, skyRows, sum: new Float64Array(width), vsum: new Float64Array(width) };
  const marked = new Uint8Array(width * height);
  const perColumn = new Int32Array(width);
  let nSky = 0;
  // The row work is in functions of their own (module level, not closures made at each call), so
  // V8 compiles each once.
  for (let y = 0; y < halfRows; y++) addRow(block, y, 1);
  for (let y = 0; y < height; y++) {
    addRow(block, y + halfRows, 1);
    addRow(block, y - halfRows - 1, -1);
    if (!skyRows[y]) continue;
    nSky++;
    markRow(block, y, marked, perColumn);
  }
  let removed = 0;
  for (let y = 0; y < height; y++) {
    if (!skyRows[y]) continue;
    for (let x = 0, i = y * width; x < width; x++, i++) {
      if (!marked[i] || perColumn[x]! > MAX_FRACTION * nSky) continue;
      use[i] = 0;
      emission[i] = mark;
      removed++;
    }
  }
  return removed;
}

/** The image and the running block sums of residual and variance per column over the block's sky rows. */
interface Block {
  width: number;
  height: number;
  residual: Float32Array;
  variance: Float32Array;
  use: Uint8Array;
  skyRows: Uint8Array;
  sum: Float64Array;
  vsum: Float64Array;
}

/** Add (sign 1) or remove (sign -1) the used pixels of sky row y to the block sums; rows outside the frame or not sky do nothing. */
function addRow(b: Block, y: number, sign: number): void {
  const { width, height, residual, variance, use, skyRows, sum, vsum } = b;
  if (y < 0 || y >= height || !skyRows[y]) return;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (!use[i]) continue;
    sum[x] += sign * residual[i]!;
    vsum[x] += sign * variance[i]!;
  }
}

/** Mark the used pixels of row y (and their two neighbours) whose block z exceeds Z_LIMIT, counting them per column. */
function markRow(b: Block, y: number, marked: Uint8Array, perColumn: Int32Array): void {
  const { width, use, sum, vsum } = b;
  for (let x = 0; x < width; x++) {
    // sum <= 0 is below the positive limit without its square root.
    if (!(vsum[x]! > 0) || sum[x]! <= 0 || sum[x]! <= Z_LIMIT * Math.sqrt(vsum[x]!)) continue;
    for (let k = Math.max(0, x - 1); k <= Math.min(width - 1, x + 1); k++) {
      const i = y * width + k;
      if (use[i] && !marked[i]) {
        marked[i] = 1;
        perColumn[k]++;
      }
    }
  }
}
