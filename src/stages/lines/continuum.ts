/** Continuum per row: the median over good pixels away from the emission lines (electrons per pixel). */
import { medianOfBuffer } from '../../kernels/robust.js';
import { lowerIndex } from '../../kernels/sorted-search.js';
import type { CalibratedFrame } from '../../products/frame.js';

/**
 * `exclude`: wavelength intervals (Angstrom) to leave out, e.g. each line +- its velocity range;
 * `stride`: use every stride-th column (a coarser, faster profile).
 */
export function continuumProfile(frame: CalibratedFrame, wave: Float64Array, exclude: [number, number][], badBits: number, stride = 1): Float64Array {
  const { width, height, sci, mask } = frame;
  const out = new Float64Array(height);
  const buf = new Float64Array(width);
  const skip = new Uint8Array(width);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    const rowWave = wave.subarray(row, row + width);
    skip.fill(0);
    for (const [a, b] of exclude) skip.fill(1, lowerIndex(rowWave, a), lowerIndex(rowWave, b));
    let n = 0;
    for (let x = 0; x < width; x += stride) {
      const i = row + x;
      if (skip[x] || (mask[i]! & badBits) !== 0 || !Number.isFinite(sci[i]!)) continue;
      buf[n++] = sci[i]!;
    }
    out[y] = medianOfBuffer(buf, n);
  }
  return out;
}
