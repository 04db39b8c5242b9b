/** Peaks of a 1-D arc spectrum above the local background and the noise (from the VAR extension). */
import { medianOfBuffer } from '../../kernels/robust.js';

/** Columns per block of the background estimate: wide against a line, narrow against scattered light (common practice). */
const BACKGROUND_BLOCK = 64;

/** Background under the lines: medians of blocks of columns, linearly interpolated between block centres. */
export function blockBackground(flux: Float64Array, offset: number, width: number, out = new Float64Array(width)): Float64Array {
  const nBlocks = Math.max(1, Math.round(width / BACKGROUND_BLOCK));
  const centres = new Float64Array(nBlocks);
  const levels = new Float64Array(nBlocks);
  const scratch = new Float64Array(Math.ceil(width / nBlocks) + 1);
  for (let k = 0; k < nBlocks; k++) {
    const x0 = Math.floor((k * width) / nBlocks);
    const x1 = Math.floor(((k + 1) * width) / nBlocks);
    let n = 0;
    for (let x = x0; x < x1; x++) {
      const v = flux[offset + x]!;
      if (v === v) scratch[n++] = v;
    }
    centres[k] = (x0 + x1 - 1) / 2;
    levels[k] = n > 0 ? medianOfBuffer(scratch, n) : 0;
  }
  let k = 0;
  for (let x = 0; x < width; x++) {
    while (k < nBlocks - 2 && x > centres[k + 1]!) k++;
    if (nBlocks === 1) out[x] = levels[0]!;
    else {
      const t = (x - centres[k]!) / (centres[k + 1]! - centres[k]!);
      out[x] = levels[k]! + Math.min(Math.max(t, 0), 1) * (levels[k + 1]! - levels[k]!);
    }
  }
  return out;
}

/**
 * Integer columns of local maxima (the highest within +-2 columns) whose height above the
 * background exceeds `detectSigma` times the noise there. Sorted by column.
 */
export function detectPeaks(flux: Float64Array, variance: Float64Array, offset: number, width: number, background: Float64Array, detectSigma: number): number[] {
  const peaks: number[] = [];
  for (let x = 2; x < width - 2; x++) {
    const v = flux[offset + x]!;
    if (!(v === v)) continue;
    const h = v - background[x]!;
    if (!(h > detectSigma * Math.sqrt(variance[offset + x]!))) continue;
    let isMax = true;
    for (let d = -2; d <= 2 && isMax; d++) {
      if (d === 0) continue;
      const u = flux[offset + x + d]!;
      // ties go to the leftmost column so that a flat top yields one peak
      if (u > v || (d < 0 && u === v)) isMax = false;
    }
    if (isMax) peaks.push(x);
  }
  return peaks;
}
