/**
 * Pixel-by-pixel sigma-clipped mean of a stack of equally sized images. The rule is the one of
 * astropy.stats.sigma_clip along the stack axis (centre: median of the kept values; bounds
 * centre +- nSigma * scale, inclusive; a rejected value never returns; stop when nothing changes
 * or after maxIterations rounds), then the mean of the kept values.
 */
import { medianOfBuffer } from './robust.js';

export interface StackClipOptions {
  /** Half-width of the kept band in units of the scale. */
  nSigma: number;
  /** Most clipping rounds. */
  maxIterations: number;
  /**
   * Scale from a noise model, sigma^2 = constant + perSignal * max(centre, 0), in the data's
   * units squared (for ADU: constant = (RN/g)^2, perSignal = 1/g). Absent: the population
   * standard deviation of the kept values (astropy's default `std`).
   */
  noise?: { constant: number; perSignal: number };
}

/** Fill `out` with the clipped mean; `kept` (optional) receives the number of values kept per pixel. */
export function clippedMeanStack(stack: readonly Float32Array[], out: Float32Array, options: StackClipOptions, kept?: Uint8Array): void {
  const n = stack.length;
  if (n === 0) throw new RangeError('clippedMeanStack: empty stack');
  const size = out.length;
  for (const image of stack) if (image.length !== size) throw new RangeError(`clippedMeanStack: image of ${image.length} pixels in a stack of ${size}`);
  if (n > 255) throw new RangeError('clippedMeanStack: at most 255 images');
  const values = new Float64Array(n);
  const work = new Float64Array(n);
  const alive = new Uint8Array(n);
  const { nSigma, maxIterations, noise } = options;
  for (let p = 0; p < size; p++) {
    for (let i = 0; i < n; i++) {
      const v = stack[i]![p]!;
      values[i] = v;
      alive[i] = v === v ? 1 : 0;
    }
    for (let iter = 0; iter < maxIterations; iter++) {
      let m = 0;
      for (let i = 0; i < n; i++) if (alive[i]) work[m++] = values[i]!;
      if (m === 0) break;
      const centre = medianOfBuffer(work, m);
      let scale: number;
      if (noise) {
        scale = Math.sqrt(noise.constant + noise.perSignal * (centre > 0 ? centre : 0));
      } else {
        let mean = 0;
        for (let i = 0; i < n; i++) if (alive[i]) mean += values[i]!;
        mean /= m;
        let ss = 0;
        for (let i = 0; i < n; i++) if (alive[i]) ss += (values[i]! - mean) ** 2;
        scale = Math.sqrt(ss / m);
      }
      const lo = centre - nSigma * scale;
      const hi = centre + nSigma * scale;
      let changed = 0;
      for (let i = 0; i < n; i++) {
        if (alive[i] && (values[i]! < lo || values[i]! > hi)) {
          alive[i] = 0;
          changed++;
        }
      }
      if (changed === 0) break;
    }
    let sum = 0;
    let m = 0;
    for (let i = 0; i < n; i++) {
      if (alive[i]) {
        sum += values[i]!;
        m++;
      }
    }
    out[p] = m > 0 ? sum / m : NaN;
    if (kept) kept[p] = m;
  }
}
