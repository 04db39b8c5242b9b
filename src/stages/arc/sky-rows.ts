/**
 * Rows of a science frame that are sky only: the galaxy is found as rows whose median level
 * (over the columns) stands above the sky level by more than `galaxyRowSigma` robust sigmas,
 * with the level and sigma re-estimated from the remaining rows (three rounds).
 */
import { madSigma, median } from '../../kernels/robust.js';
import type { CalibratedFrame } from '../../products/frame.js';

/** Columns sampled for the row medians: enough for a robust level, cheap at 4096 columns. */
const MAX_COLUMNS = 512;

/** Median over (sampled, unmasked) columns of each row, electrons per pixel. */
function rowLevels(frame: CalibratedFrame): Float64Array {
  const { width, height } = frame;
  const step = Math.max(1, Math.floor(width / MAX_COLUMNS));
  const buf = new Float64Array(Math.ceil(width / step));
  const out = new Float64Array(height);
  for (let y = 0; y < height; y++) {
    let n = 0;
    for (let x = 0; x < width; x += step) {
      const i = y * width + x;
      if (frame.mask[i] === 0) buf[n++] = frame.sci[i]!;
    }
    out[y] = n > 0 ? median(buf.subarray(0, n)) : NaN;
  }
  return out;
}

/** 1 for a sky row, 0 for a galaxy (or unusable) row. */
export function skyRowMask(frame: CalibratedFrame, galaxyRowSigma: number): Uint8Array {
  const levels = rowLevels(frame);
  const sky = new Uint8Array(frame.height).fill(1);
  for (let y = 0; y < frame.height; y++) if (!(levels[y] === levels[y])) sky[y] = 0;
  for (let round = 0; round < 3; round++) {
    const kept = levels.filter((_, y) => sky[y] === 1);
    const level = median(kept);
    const sigma = madSigma(kept);
    for (let y = 0; y < frame.height; y++) sky[y] = levels[y]! <= level + galaxyRowSigma * sigma ? 1 : 0;
  }
  return sky;
}

/** 1 for the rows inside the given inclusive ranges (clipped to the frame). */
export function givenSkyRows(ranges: [number, number][], height: number): Uint8Array {
  const sky = new Uint8Array(height);
  for (const [a, b] of ranges) for (let y = Math.max(0, Math.min(a, b)); y <= Math.min(height - 1, Math.max(a, b)); y++) sky[y] = 1;
  return sky;
}
