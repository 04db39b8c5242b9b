/** Continuum per row: the median over good pixels away from the emission lines (electrons per pixel). */
import { medianOfBuffer } from '../../kernels/robust.js';
import { lowerIndex } from '../../kernels/sorted-search.js';
import type { CalibratedFrame } from '../../products/frame.js';

/**
 * `exclude`: wavelength intervals (Angstrom) to leave out, e.g. each line +- its velocity range;
 * `stride`: use every stride-th column (a coarser, faster profile).
 */
export function continuumProfile(frame: CalibratedFrame, wave: Float64Array, exclude: [number, number][], badBits: number, stride = 1): Float64Array {
  const { width, height } = frame;
  const out = new Float64Array(height);
  const buf = new Float64Array(width);
  const skip = new Uint8Array(width);
  // The work of a row is in functions of their own: each is compiled once, where a loop inside
  // this one had it compiled again for each kind of call (with and without exclusions).
  for (let y = 0; y < height; y++) {
    markExcluded(wave.subarray(y * width, (y + 1) * width), exclude, skip);
    out[y] = medianOfBuffer(buf, gatherRow(frame, y, skip, badBits, stride, buf));
  }
  return out;
}

/** skip[x] = 1 where the row's wavelength falls in an excluded interval, else 0. */
function markExcluded(rowWave: Float64Array, exclude: [number, number][], skip: Uint8Array): void {
  skip.fill(0);
  for (const [a, b] of exclude) skip.fill(1, lowerIndex(rowWave, a), lowerIndex(rowWave, b));
}

/** The good, finite, not skipped pixels of row y (every stride-th column) into buf; returns their count. */
function gatherRow(frame: CalibratedFrame, y: number, skip: Uint8Array, badBits: number, stride: number, buf: Float64Array): number {
  const { width, sci, mask } = frame;
  const row = y * width;
  let n = 0;
  for (let x = 0; x < width; x += stride) {
    const i = row + x;
    if (skip[x] || (mask[i]! & badBits) !== 0 || !Number.isFinite(sci[i]!)) continue;
    buf[n++] = sci[i]!;
  }
  return n;
}
