/** Master bias: the sigma-clipped mean of the trimmed, overscan-corrected bias frames (raw orientation). */
import { clippedMeanStack } from '../../kernels/combine.js';
import type { CcdSettings } from './settings.js';
import type { TrimmedFrame } from './overscan.js';

export interface MasterBias {
  /** ADU, trimmed raw orientation. */
  data: Float32Array;
  /** Variance of one pixel of the master, ADU^2: the read noise over the number of frames. */
  varianceAdu: number;
  count: number;
}

/** Clipped against the read noise (a bias has no signal): sigma = RN / g in ADU. */
export function combineBias(frames: TrimmedFrame[], gain: number, readNoiseE: number, width: number, height: number, settings: CcdSettings): MasterBias {
  const data = new Float32Array(width * height);
  if (frames.length === 0) return { data, varianceAdu: 0, count: 0 };
  const rnAdu = readNoiseE / gain;
  clippedMeanStack(
    frames.map((f) => f.data),
    data,
    { nSigma: settings.combineSigma, maxIterations: settings.combineIterations, noise: { constant: rnAdu * rnAdu, perSignal: 0 } },
  );
  return { data, varianceAdu: (rnAdu * rnAdu) / frames.length, count: frames.length };
}
