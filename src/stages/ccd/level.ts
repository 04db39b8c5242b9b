/** The typical level of an image: the median of a regular sample of at most ~100000 pixels (fast on full frames). */
import { medianOfBuffer } from '../../kernels/robust.js';

export const LEVEL_SAMPLES = 100000;

/** Median of data[0], data[stride], ... with stride = max(1, floor(n / LEVEL_SAMPLES)); NaN skipped. */
export function sampledMedian(data: Float32Array): number {
  const stride = Math.max(1, Math.floor(data.length / LEVEL_SAMPLES));
  const buf = new Float64Array(Math.ceil(data.length / stride));
  let k = 0;
  for (let i = 0; i < data.length; i += stride) {
    const v = data[i]!;
    if (v === v) buf[k++] = v;
  }
  return medianOfBuffer(buf, k);
}
