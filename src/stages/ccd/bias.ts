/** Master bias: the sigma-clipped mean of the trimmed, overscan-corrected bias frames (raw orientation). */
import { clippedMeanStack } from '../../kernels/combine.js';
import type { RawFrame } from '../../products/frame.js';
import type { Detector } from './detector.js';
import { overscanLevel, trimLines } from './overscan.js';
import type { CcdSettings } from './settings.js';

export interface MasterBias {
  /** ADU, trimmed raw orientation. */
  data: Float32Array;
  /** Variance of one pixel of the master, ADU^2: the read noise over the number of frames. */
  varianceAdu: number;
  count: number;
}

/** Lines of every frame trimmed and combined at a time (small buffers instead of whole trimmed frames). */
const BLOCK_LINES = 64;

/** Clipped against the read noise (a bias has no signal): sigma = RN / g in ADU. */
export function combineBias(frames: RawFrame[], det: Detector, overscanOrder: number, settings: CcdSettings): MasterBias {
  const width = det.data.x1 - det.data.x0;
  const height = det.data.y1 - det.data.y0;
  const data = new Float32Array(width * height);
  if (frames.length === 0) return { data, varianceAdu: 0, count: 0 };
  const rnAdu = det.readNoiseE / det.gain;
  const options = { nSigma: settings.combineSigma, maxIterations: settings.combineIterations, noise: { constant: rnAdu * rnAdu, perSignal: 0 } };
  const levels = frames.map((f) => overscanLevel(f, det, overscanOrder));
  const blocks = frames.map(() => new Float32Array(BLOCK_LINES * width));
  for (let y0 = 0; y0 < height; y0 += BLOCK_LINES) {
    const y1 = Math.min(height, y0 + BLOCK_LINES);
    const lines = blocks.map((b, i) => {
      trimLines(frames[i]!, det, levels[i]!, y0, y1, b, null);
      return b.subarray(0, (y1 - y0) * width);
    });
    clippedMeanStack(lines, data.subarray(y0 * width, y1 * width), options);
  }
  return { data, varianceAdu: (rnAdu * rnAdu) / frames.length, count: frames.length };
}
