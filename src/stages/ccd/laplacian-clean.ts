/**
 * Cosmic rays in a single exposure by van Dokkum's (2001, PASP 113, 1420) Laplacian edge
 * detection. Per round: L+ (kernels/laplacian.ts); S = L+ / (2 N) with the noise N the square
 * root of the 5x5 median of the variance frame (the paper's (1/g) sqrt(g M5 + RN^2), here with
 * the flat division included); S' = S - M5(S) removes smooth structure; a pixel is a hit when
 * S' > sigmaLim and L+ / F > fLim, F = M3(I) - M7(M3(I)) the fine-structure image (which spares
 * compact real features), and, with slitProtection, when it stands sigmaLim N above the median of
 * its slit neighbours. Neighbours of hits with S' > sigmaFrac sigmaLim are hits too. Hits are
 * replaced by the median of the good pixels around them and the next round runs on the cleaned
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
  const image = sci.slice();
  const hits = new Uint8Array(n);
  const lap = new Float32Array(n);
  const sig = new Float32Array(n);
  const m3 = new Float32Array(n);
  const scratch = new Float32Array(49);
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
      if (s.slitProtection && !(image[p]! - slitMedian(image, width, height, x, y, scratch) > s.sigmaLim * noise[p]!)) continue;
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
  return { cleaned: image, hits, perRound, noise };
}

const SLIT_OFFSETS = [-2, -1, 1, 2] as const;

/** Median of I(x, y +- 1), I(x, y +- 2) that exist. */
function slitMedian(image: Float32Array, width: number, height: number, x: number, y: number, scratch: Float32Array): number {
  let k = 0;
  for (const dy of SLIT_OFFSETS) {
    const yy = y + dy;
    if (yy >= 0 && yy < height) scratch[k++] = image[yy * width + x]!;
  }
  return medianOfBuffer(scratch, k);
}

/** Median of the good pixels in the 5x5 window (7x7 if none); the pixel itself when nothing is good. */
function replacement(image: Float32Array, hits: Uint8Array, skip: Uint16Array, width: number, height: number, p: number, scratch: Float32Array): number {
  const x = p % width;
  const y = (p - x) / width;
  for (const r of [2, 3]) {
    let k = 0;
    for (let yy = Math.max(0, y - r); yy <= Math.min(height - 1, y + r); yy++) {
      for (let xx = Math.max(0, x - r); xx <= Math.min(width - 1, x + r); xx++) {
        const q = yy * width + xx;
        if (!hits[q] && !skip[q]) scratch[k++] = image[q]!;
      }
    }
    if (k > 0) return medianOfBuffer(scratch, k);
  }
  return image[p]!;
}
