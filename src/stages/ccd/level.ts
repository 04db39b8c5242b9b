/** The typical level of an image: the median of a regular sample of at most ~100000 pixels (fast on full frames). */
import { medianOfBuffer } from '../../kernels/robust.js';

export const LEVEL_SAMPLES = 100000;

/**
 * Median of the values at pixels 0, stride, 2 stride, ... of an image of n pixels, stride =
 * max(1, floor(n / LEVEL_SAMPLES)); NaN skipped. `valueAt(p)` gives the value at pixel p.
 */
export function sampledMedian(n: number, valueAt: (p: number) => number): number {
  const stride = Math.max(1, Math.floor(n / LEVEL_SAMPLES));
  const buf = new Float64Array(Math.ceil(n / stride));
  let k = 0;
  for (let i = 0; i < n; i += stride) {
    const v = valueAt(i);
    if (v === v) buf[k++] = v;
  }
  return medianOfBuffer(buf, k);
}
