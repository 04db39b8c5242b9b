/**
 * Cosmic rays in a single exposure by van Dokkum's (2001, PASP 113, 1420) Laplacian edge
 * detection. Per round: L+ (kernels/laplacian.ts); S = L+ / (2 N) with the noise N the square
 * root of the 5x5 median of the variance frame (the paper's (1/g) sqrt(g M5 + RN^2), here with
 * the flat division included); S' = S - M5(S) removes smooth structure; a pixel is a hit when
 * S' > sigmaLim and L+ / F > fLim, F = M3(I) - M7(M3(I)) the fine-structure image (which spares
 * compact real features), and, with slitProtection, when it stands sigmaLim sigmas above the
 * median of its slit neighbours. Neighbours of hits with S' > sigmaFrac sigmaLim are hits too. Hits are
 * replaced by the median of the good pixels along the slit, and the next round runs on the cleaned
 * image. M5(S) and M7 are only evaluated where a test needs them.
 */
import { positiveLaplacian } from '../../kernels/laplacian.js';
import { medianAt, medianFilter } from '../../kernels/median-filter.js';
import { medianOfBuffer } from '../../kernels/robust.js';
import type { LaplacianSettings } from './settings.js';

export interface LaplacianResult {
  /** The image with hits replaced. */
  cleaned: Float32Array;
  /** 1 where a hit was found. */
  hits: Uint8Array;
  /** Hits found in each round. */
  perRound: number[];
  /** The noise model N used (e-), for the variance of replaced pixels. */
  noise: Float32Array;
}

/** `skip`: pixels already masked (bad columns, saturation, ...): never hits, never used to replace. */
export function laplacianClean(
  sci: Float32Array,
  variance: Float32Array,
  skip: Uint16Array,
  width: number,
  height: number,
  s: LaplacianSettings,
): LaplacianResult {
  const n = width * height;
  const noise = medianFilter(variance, width, height, 2);
  for (let i = 0; i < n; i++) noise[i] = Math.sqrt(noise[i]! > 1e-6 ? noise[i]! : 1e-6);
  const scratch = new Float32Array(49);
  const image = sci.slice();
  fillSkipped(image, skip, width, height, scratch);
  const hits = new Uint8Array(n);
  const lap = new Float32Array(n);
  const sig = new Float32Array(n);
  const m3 = new Float32Array(n);
  const perRound: number[] = [];
  const fresh: number[] = [];
  for (let round = 0; round < s.iterations; round++) {
    positiveLaplacian(image, width, height, lap);
    for (let i = 0; i < n; i++) sig[i] = lap[i]! / (2 * noise[i]!);
    medianFilter(image, width, height, 1, m3);
    fresh.length = 0;
    for (let p = 0; p < n; p++) {
      if (!(sig[p]! > s.sigmaLim) || hits[p] || skip[p]) continue;
      const x = p % width;
      const y = (p - x) / width;
      if (!(sig[p]! - medianAt(sig, width, height, x, y, 2, scratch) > s.sigmaLim)) continue;
      const fine = m3[p]! - medianAt(m3, width, height, x, y, 3, scratch);
      if (fine > 0 && !(lap[p]! > s.fLim * fine)) continue;
      if (s.slitProtection && !standsOutOfSlit(image, variance, skip, width, height, x, y, s.sigmaLim, scratch)) continue;
      hits[p] = 1;
      fresh.push(p);
    }
    // Neighbours of this round's hits, at the lower limit.
    const found = fresh.length;
    const limit = s.sigmaFrac * s.sigmaLim;
    for (let k = 0; k < found; k++) {
      const p = fresh[k]!;
      const x = p % width;
      const y = (p - x) / width;
      for (let yy = Math.max(0, y - 1); yy <= Math.min(height - 1, y + 1); yy++) {
        for (let xx = Math.max(0, x - 1); xx <= Math.min(width - 1, x + 1); xx++) {
          const q = yy * width + xx;
          if (hits[q] || skip[q] || !(sig[q]! > limit)) continue;
          if (sig[q]! - medianAt(sig, width, height, xx, yy, 2, scratch) > limit) {
            hits[q] = 1;
            fresh.push(q);
          }
        }
      }
    }
    perRound.push(fresh.length);
    if (fresh.length === 0) break;
    for (const p of fresh) image[p] = replacement(image, hits, skip, width, height, p, scratch);
  }
  for (let p = 0; p < n; p++) if (skip[p]) image[p] = sci[p]!; // masked pixels keep their values
  return { cleaned: image, hits, perRound, noise };
}

const SLIT_OFFSETS = [-2, -1, 1, 2] as const;
/** Variance of a value minus the median of four like it: 1 + (1.2^2 / 4) (common practice for small medians). */
const SLIT_DIFFERENCE_VARIANCE = 1.36;

/**
 * Whether I(x, y) exceeds the median of its usable slit neighbours I(x, y +- 1), I(x, y +- 2) by
 * more than `limit` sigmas, the sigma from the neighbours' own variance: right at a line core,
 * unlike the 5x5 median of the variance, which the narrow line pulls low.
 */
function standsOutOfSlit(image: Float32Array, variance: Float32Array, skip: Uint16Array, width: number, height: number, x: number, y: number, limit: number, scratch: Float32Array): boolean {
  let k = 0;
  for (const dy of SLIT_OFFSETS) {
    const yy = y + dy;
    if (yy >= 0 && yy < height && !skip[yy * width + x]) scratch[k++] = image[yy * width + x]!;
  }
  if (k === 0) return true;
  const reference = medianOfBuffer(scratch, k);
  k = 0;
  for (const dy of SLIT_OFFSETS) {
    const yy = y + dy;
    if (yy >= 0 && yy < height && !skip[yy * width + x]) scratch[k++] = variance[yy * width + x]!;
  }
  const sigma = Math.sqrt(SLIT_DIFFERENCE_VARIANCE * medianOfBuffer(scratch, k));
  return image[y * width + x]! - reference > limit * sigma;
}

/**
 * Median of the good pixels of the same internal column within 3 rows (along the slit, where a
 * spectrum changes slowly: a 5x5 median would cut a dip into a narrow line core and start false
 * detections beside it); the 5x5 window when the column has none; the pixel itself without either.
 */
function replacement(image: Float32Array, hits: Uint8Array, skip: Uint16Array, width: number, height: number, p: number, scratch: Float32Array): number {
  const x = p % width;
  const y = (p - x) / width;
  let k = 0;
  for (let yy = Math.max(0, y - 3); yy <= Math.min(height - 1, y + 3); yy++) {
    const q = yy * width + x;
    if (!hits[q] && !skip[q]) scratch[k++] = image[q]!;
  }
  if (k > 0) return medianOfBuffer(scratch, k);
  for (let yy = Math.max(0, y - 2); yy <= Math.min(height - 1, y + 2); yy++) {
    for (let xx = Math.max(0, x - 2); xx <= Math.min(width - 1, x + 2); xx++) {
      const q = yy * width + xx;
      if (!hits[q] && !skip[q]) scratch[k++] = image[q]!;
    }
  }
  return k > 0 ? medianOfBuffer(scratch, k) : image[p]!;
}

/** Masked pixels take the median of the usable pixels of their 5x5 window, so hot columns do not hide hits beside them. */
function fillSkipped(image: Float32Array, skip: Uint16Array, width: number, height: number, scratch: Float32Array): void {
  for (let p = 0; p < image.length; p++) {
    if (!skip[p]) continue;
    const x = p % width;
    const y = (p - x) / width;
    let k = 0;
    for (let yy = Math.max(0, y - 2); yy <= Math.min(height - 1, y + 2); yy++) {
      for (let xx = Math.max(0, x - 2); xx <= Math.min(width - 1, x + 2); xx++) {
        const q = yy * width + xx;
        if (!skip[q]) scratch[k++] = image[q]!;
      }
    }
    if (k > 0) image[p] = medianOfBuffer(scratch, k);
  }
}
