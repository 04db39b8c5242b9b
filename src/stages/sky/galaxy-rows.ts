/**
 * Where along the slit the galaxy is: rows whose continuum (median over the row) stands above
 * the sky level, or whose line emission (significant positive excess over a first sky model,
 * continuum removed) stands above that of the other rows. The galaxy region is the run of such
 * rows around the brightest one, allowing short gaps.
 */
import { madSigma, median, medianOfBuffer } from '../../kernels/robust.js';

/** Row medians use every fourth column: a level from ~1000 pixels is plenty, at a quarter of the cost. */
export const MEDIAN_STRIDE = 4;

/** Median of each row over pixels with good[i] set, every stride-th column (NaN for a row without any). */
export function rowMedians(width: number, height: number, values: Float32Array, good: Uint8Array, scratch: Float64Array, stride = 1): Float64Array {
  const out = new Float64Array(height);
  for (let y = 0; y < height; y++) {
    let n = 0;
    for (let x = 0, i = y * width; x < width; x += stride, i += stride) if (good[i]) scratch[n++] = values[i]!;
    out[y] = medianOfBuffer(scratch, n);
  }
  return out;
}

/**
 * Emission score per row from the residual image (data minus a first sky model): residuals and
 * variances summed over a block of 2 * halfRows + 1 rows centred on the row (faint extended
 * emission stands out in the block long before it does in one row), each block row's median
 * removed, then sum over columns of max(0, z - 3) with z the block's noise-normalised excess.
 */
export function emissionScore(width: number, height: number, residual: Float32Array, variance: Float32Array, good: Uint8Array, halfRows: number, scratch: Float64Array): Float64Array {
  const level = rowMedians(width, height, residual, good, scratch, MEDIAN_STRIDE);
  const block: EmissionBlock = { width, residual, variance, good, level, sum: new Float64Array(width), vsum: new Float64Array(width), count: new Int32Array(width) };
  const out = new Float64Array(height);
  // The row work is in functions of their own (module level, not closures made at each call), so
  // V8 compiles each once.
  for (let y = 0; y < Math.min(height, halfRows); y++) addBlockRow(block, y, 1);
  for (let y = 0; y < height; y++) {
    if (y + halfRows < height) addBlockRow(block, y + halfRows, 1);
    if (y - halfRows - 1 >= 0) addBlockRow(block, y - halfRows - 1, -1);
    out[y] = blockExcess(block);
  }
  return out;
}

/** The residual image and the running sums per column over a block of rows (each row's level removed). */
interface EmissionBlock {
  width: number;
  residual: Float32Array;
  variance: Float32Array;
  good: Uint8Array;
  level: Float64Array;
  sum: Float64Array;
  vsum: Float64Array;
  count: Int32Array;
}

/** Add (sign 1) or remove (sign -1) row y's good pixels to the block sums; a row without a level does nothing. */
function addBlockRow(b: EmissionBlock, y: number, sign: number): void {
  const { width, residual, variance, good, sum, vsum, count } = b;
  const base = b.level[y]!;
  if (base !== base) return;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (!good[i] || !(variance[i]! > 0)) continue;
    sum[x] += sign * (residual[i]! - base);
    vsum[x] += sign * variance[i]!;
    count[x] += sign;
  }
}

/** Sum over columns of max(0, z - 3), z the block's noise-normalised excess. */
function blockExcess(b: EmissionBlock): number {
  const { width, sum, vsum, count } = b;
  let s = 0;
  for (let x = 0; x < width; x++) {
    // A sum that is not positive has z <= 0: no square root needed to see it is not above 3.
    if (count[x]! <= 0 || !(vsum[x]! > 0) || !(sum[x]! > 0)) continue;
    const z = sum[x]! / Math.sqrt(vsum[x]!);
    if (z > 3) s += z - 3;
  }
  return s;
}

/**
 * Rows standing out in a profile: above a robust baseline (a straight line in y fitted to the
 * rows, dropping high ones iteratively) by more than nSigma robust sigmas.
 */
export function rowsAbove(profile: Float64Array, nSigma: number, candidate: Uint8Array): Uint8Array {
  const h = profile.length;
  const keep = Uint8Array.from(candidate);
  const resid = new Float64Array(h);
  let a = 0;
  let b = 0;
  let sigma = 0;
  for (let round = 0; round < 10; round++) {
    [a, b] = lineFit(profile, keep);
    for (let y = 0; y < h; y++) resid[y] = keep[y] ? profile[y]! - (a + b * y) : NaN;
    sigma = madSigma(resid);
    const centre = median(resid);
    let changed = 0;
    for (let y = 0; y < h; y++) {
      if (keep[y] && profile[y]! - (a + b * y) - centre > 3 * sigma) {
        keep[y] = 0;
        changed++;
      }
    }
    if (changed === 0) break;
  }
  const out = new Uint8Array(h);
  const threshold = Math.max(nSigma * sigma, 1e-12);
  for (let y = 0; y < h; y++) if (candidate[y] && profile[y]! - (a + b * y) > threshold) out[y] = 1;
  return out;
}

function lineFit(profile: Float64Array, keep: Uint8Array): [number, number] {
  let n = 0;
  let sy = 0;
  let sx = 0;
  let sxx = 0;
  let sxy = 0;
  for (let y = 0; y < profile.length; y++) {
    const v = profile[y]!;
    if (!keep[y] || v !== v) continue;
    n++;
    sx += y;
    sy += v;
    sxx += y * y;
    sxy += y * v;
  }
  const det = n * sxx - sx * sx;
  if (n < 2 || det === 0) return [n > 0 ? sy / n : 0, 0];
  const b = (n * sxy - sx * sy) / det;
  return [(sy - b * sx) / n, b];
}

/**
 * The run of flagged rows around the row where `strength` peaks among flagged rows, bridging gaps
 * of up to gapRows. Null when no row is flagged.
 */
export function galaxyRun(flagged: Uint8Array, strength: Float64Array, gapRows: number): [number, number] | null {
  let peak = -1;
  for (let y = 0; y < flagged.length; y++) if (flagged[y] && (peak < 0 || strength[y]! > strength[peak]!)) peak = y;
  if (peak < 0) return null;
  let lo = peak;
  let hi = peak;
  for (let y = peak - 1; y >= 0 && lo - y <= gapRows + 1; y--) if (flagged[y]) lo = y;
  for (let y = peak + 1; y < flagged.length && y - hi <= gapRows + 1; y++) if (flagged[y]) hi = y;
  return [lo, hi];
}
