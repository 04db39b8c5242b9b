/**
 * Cosmic rays in a single exposure by van Dokkum's (2001, PASP 113, 1420) Laplacian edge
 * detection. Per round: L+ (kernels/laplacian.ts); S = L+ / (2 N) with the noise N the square
 * root of the 5x5 median of the variance frame (the paper's (1/g) sqrt(g M5 + RN^2), here with
 * the flat division included); S' = S - M5(S) removes smooth structure; a pixel is a hit when
 * S' > sigmaLim and L+ / F > fLim, F = M3(I) - M7(M3(I)) the fine-structure image (which spares
 * compact real features), and, with slitProtection, when it stands sigmaLim sigmas above the
 * median of its slit neighbours. Neighbours of hits with S' > sigmaFrac sigmaLim are hits too. Hits are
 * replaced by the median of the good pixels along the slit, and the next round runs on the cleaned
 * image. N, M5(S), M3 and M7 are only evaluated where a test needs them.
 */
import { positiveLaplacian, positiveLaplacianAt } from '../../kernels/laplacian.js';
import { medianAt, reflectIndex } from '../../kernels/median-filter.js';
import { medianOfBuffer, selectInPlace } from '../../kernels/robust.js';
import type { LaplacianSettings } from './settings.js';

export interface LaplacianResult {
  /** The image with hits replaced. */
  cleaned: Float32Array;
  /** 1 where a hit was found. */
  hits: Uint8Array;
  /** Hits found in each round. */
  perRound: number[];
  /** The noise model N (e-), filled where it was needed (at least at every hit), 0 elsewhere. */
  noise: Float32Array;
}

/** A change of the image reaches the tests of pixels this far away (L+ 1, M5(S) 2, M7 of M3 3 + 1). */
const REACH = 4;

/**
 * `skip`: pixels already masked (bad columns, saturation, ...): never hits, never used to replace.
 * Only pixels whose upper bound on S (from the 5x5 minimum of the variance, which is at most the
 * 5x5 median) passes sigmaLim are examined; later rounds only look within REACH of the pixels
 * the previous round replaced. The result is the same as evaluating every image in full.
 */
export function laplacianClean(
  sci: Float32Array,
  variance: Float32Array,
  skip: Uint16Array,
  width: number,
  height: number,
  s: LaplacianSettings,
): LaplacianResult {
  const n = width * height;
  const scratch = new Float32Array(49);
  const m3 = new Float32Array(49);
  const image = sci.slice();
  fillSkipped(image, skip, width, height, scratch);
  const lowNoise = boxMinimum5(variance, width, height);
  for (let i = 0; i < n; i++) lowNoise[i] = Math.sqrt(lowNoise[i]! > 1e-6 ? lowNoise[i]! : 1e-6);
  const noise = new Float32Array(n);
  const noiseAt = (q: number): number => {
    if (noise[q] === 0) {
      const x = q % width;
      const v = medianAt(variance, width, height, x, (q - x) / width, 2, scratch);
      noise[q] = Math.sqrt(v > 1e-6 ? v : 1e-6);
    }
    return noise[q]!;
  };
  const lap = positiveLaplacian(image, width, height);
  const sAt = (x: number, y: number): number => {
    const q = reflectIndex(y, height) * width + reflectIndex(x, width);
    return lap[q]! / (2 * noiseAt(q));
  };
  const window = new Float32Array(25);
  /** S' = S - M5(S). */
  const sPrime = (x: number, y: number): number => {
    let k = 0;
    for (let dy = -2; dy <= 2; dy++) for (let dx = -2; dx <= 2; dx++) window[k++] = sAt(x + dx, y + dy);
    return sAt(x, y) - selectInPlace(window, 25, 12);
  };
  /** F = M3(I) - M7(M3(I)). */
  const fine = (x: number, y: number): number => {
    let k = 0;
    for (let dy = -3; dy <= 3; dy++) for (let dx = -3; dx <= 3; dx++) m3[k++] = medianAt(image, width, height, reflectIndex(x + dx, width), reflectIndex(y + dy, height), 1, window);
    return medianAt(image, width, height, x, y, 1, window) - selectInPlace(m3, 49, 24);
  };
  const hits = new Uint8Array(n);
  const perRound: number[] = [];
  const fresh: number[] = [];
  let candidates: number[] | null = null; // null: the whole image
  const lapLimit = 2 * s.sigmaLim;
  for (let round = 0; round < s.iterations; round++) {
    fresh.length = 0;
    const examine = (p: number): void => {
      if (hits[p] || skip[p] || !(lap[p]! > lapLimit * lowNoise[p]!)) return;
      const x = p % width;
      const y = (p - x) / width;
      if (!(sAt(x, y) > s.sigmaLim) || !(sPrime(x, y) > s.sigmaLim)) return;
      const f = fine(x, y);
      if (f > 0 && !(lap[p]! > s.fLim * f)) return;
      if (s.slitProtection && !standsOutOfSlit(image, variance, skip, width, height, x, y, s.sigmaLim, scratch)) return;
      hits[p] = 1;
      fresh.push(p);
    };
    if (candidates === null) for (let p = 0; p < n; p++) examine(p);
    else for (const p of candidates) examine(p);
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
          if (hits[q] || skip[q] || !(sAt(xx, yy) > limit)) continue;
          if (sPrime(xx, yy) > limit) {
            hits[q] = 1;
            fresh.push(q);
          }
        }
      }
    }
    perRound.push(fresh.length);
    if (fresh.length === 0) break;
    for (const p of fresh) image[p] = replacement(image, hits, skip, width, height, p, scratch);
    for (const p of neighbourhood(fresh, width, height, 1)) {
      const x = p % width;
      lap[p] = positiveLaplacianAt(image, width, height, x, (p - x) / width);
    }
    candidates = neighbourhood(fresh, width, height, REACH);
  }
  for (let p = 0; p < n; p++) if (skip[p]) image[p] = sci[p]!; // masked pixels keep their values
  return { cleaned: image, hits, perRound, noise };
}

/** Pixels within `radius` (square) of any of `pixels`, each once. */
function neighbourhood(pixels: number[], width: number, height: number, radius: number): number[] {
  const seen = new Set<number>();
  for (const p of pixels) {
    const x = p % width;
    const y = (p - x) / width;
    for (let yy = Math.max(0, y - radius); yy <= Math.min(height - 1, y + radius); yy++) {
      for (let xx = Math.max(0, x - radius); xx <= Math.min(width - 1, x + radius); xx++) seen.add(yy * width + xx);
    }
  }
  return [...seen];
}

/** Minimum over the 5x5 window clipped to the image (separable): a lower bound of the mirrored 5x5 median. */
function boxMinimum5(src: Float32Array, width: number, height: number): Float32Array {
  const rows = new Float32Array(src.length);
  for (let y = 0; y < height; y++) {
    const r = y * width;
    for (let x = 0; x < width; x++) {
      let m = src[r + x]!;
      for (let xx = Math.max(0, x - 2); xx <= Math.min(width - 1, x + 2); xx++) if (src[r + xx]! < m) m = src[r + xx]!;
      rows[r + x] = m;
    }
  }
  const out = new Float32Array(src.length);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let m = rows[y * width + x]!;
      for (let yy = Math.max(0, y - 2); yy <= Math.min(height - 1, y + 2); yy++) if (rows[yy * width + x]! < m) m = rows[yy * width + x]!;
      out[y * width + x] = m;
    }
  }
  return out;
}

const SLIT_OFFSETS = [-2, -1, 1, 2] as const;
/** Variance of a value minus the median of four like it, in units of one value's: 1 + 0.298 [computed: numpy Monte Carlo of the median of four normals]. */
const SLIT_DIFFERENCE_VARIANCE = 1.3;

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
