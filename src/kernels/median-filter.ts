/**
 * Square median filters of float images with mirrored edges (the 'reflect' mode of
 * scipy.ndimage: d c b a | a b c d | d c b a). Window (2r + 1)^2 is odd, so the median is a pixel
 * value, and every method here returns it exactly.
 * 3x3 uses sorted columns shared along the row (the median of nine is the median of the largest
 * column minimum, the median of the column medians and the smallest column maximum). Larger
 * windows slide a histogram over rank bins (Huang's running-histogram median): each pixel's bin
 * is its rank class among a sample of the image, the histogram says which bin holds the median,
 * and the few window values in that bin are ordered exactly.
 */
import { selectInPlace } from './robust.js';

/** Index of coordinate i (may be outside [0, n)) under the mirror rule. */
export function reflectIndex(i: number, n: number): number {
  if (n === 1) return 0;
  const period = 2 * n;
  let k = i % period;
  if (k < 0) k += period;
  return k < n ? k : period - 1 - k;
}

function reflectMap(n: number, r: number): Int32Array {
  const map = new Int32Array(n + 2 * r);
  for (let i = -r; i < n + r; i++) map[i + r] = reflectIndex(i, n);
  return map;
}

/** Median-filter `src` (width x height) with a (2 radius + 1)^2 window into `out` (a new array if absent). */
export function medianFilter(src: Float32Array, width: number, height: number, radius: number, out?: Float32Array): Float32Array {
  if (src.length !== width * height) throw new RangeError(`medianFilter: ${src.length} pixels is not ${width} x ${height}`);
  if (!(Number.isInteger(radius) && radius >= 0)) throw new RangeError(`medianFilter: invalid radius ${radius}`);
  const dst = out ?? new Float32Array(src.length);
  if (dst === src) throw new RangeError('medianFilter: out must not be src');
  if (radius === 0) {
    dst.set(src);
    return dst;
  }
  if (radius === 1) return median3x3(src, width, height, dst);
  return histogramMedian(src, width, height, radius, dst);
}

/** Rank classes for the running histogram. */
const BINS = 64;
const SAMPLES = 8192;

/** Bin of every pixel: the number of sampled quantile edges at or below its value (NaN goes last). */
function rankBins(src: Float32Array): Uint16Array {
  const stride = Math.max(1, Math.floor(src.length / SAMPLES));
  const sample = new Float64Array(Math.ceil(src.length / stride));
  let m = 0;
  for (let i = 0; i < src.length; i += stride) if (src[i] === src[i]) sample[m++] = src[i]!;
  const sorted = sample.subarray(0, m).sort();
  const edges = new Float64Array(BINS - 1);
  for (let k = 1; k < BINS; k++) edges[k - 1] = m > 0 ? sorted[Math.min(m - 1, Math.floor((k * m) / BINS))]! : 0;
  const bins = new Uint16Array(src.length);
  for (let i = 0; i < src.length; i++) {
    const v = src[i]!;
    if (v !== v) {
      bins[i] = BINS - 1;
      continue;
    }
    let lo = 0;
    let hi = BINS - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (edges[mid]! <= v) lo = mid + 1;
      else hi = mid;
    }
    bins[i] = lo;
  }
  return bins;
}

function histogramMedian(src: Float32Array, width: number, height: number, radius: number, dst: Float32Array): Float32Array {
  const xs = reflectMap(width, radius);
  const ys = reflectMap(height, radius);
  const size = 2 * radius + 1;
  const k = (size * size) >> 1;
  const bins = rankBins(src);
  const hist = new Int32Array(BINS);
  const rows = new Int32Array(size);
  const scratch = new Float32Array(size * size);
  for (let y = 0; y < height; y++) {
    hist.fill(0);
    for (let dy = 0; dy < size; dy++) rows[dy] = ys[y + dy]! * width;
    for (let dy = 0; dy < size; dy++) for (let dx = 0; dx < size; dx++) hist[bins[rows[dy]! + xs[dx]!]!]++;
    let b = 0;
    let below = 0; // window values in bins < b
    while (below + hist[b]! <= k) below += hist[b++]!;
    for (let x = 0; ; ) {
      // Order the window values of bin b exactly.
      let c = 0;
      for (let dy = 0; dy < size; dy++) {
        const row = rows[dy]!;
        for (let dx = 0; dx < size; dx++) {
          const i = row + xs[x + dx]!;
          if (bins[i] === b) scratch[c++] = src[i]!;
        }
      }
      dst[y * width + x] = selectInPlace(scratch, c, k - below);
      if (++x === width) break;
      const out = xs[x - 1]!;
      const into = xs[x + size - 1]!;
      for (let dy = 0; dy < size; dy++) {
        const bo = bins[rows[dy]! + out]!;
        hist[bo]--;
        if (bo < b) below--;
        const bi = bins[rows[dy]! + into]!;
        hist[bi]++;
        if (bi < b) below++;
      }
      while (below > k) below -= hist[--b]!;
      while (below + hist[b]! <= k) below += hist[b++]!;
    }
  }
  return dst;
}

/** Median of the (2 radius + 1)^2 window about one pixel (same edge rule), for sparse use. */
export function medianAt(src: Float32Array, width: number, height: number, x: number, y: number, radius: number, scratch: Float32Array): number {
  let k = 0;
  for (let dy = -radius; dy <= radius; dy++) {
    const row = reflectIndex(y + dy, height) * width;
    for (let dx = -radius; dx <= radius; dx++) scratch[k++] = src[row + reflectIndex(x + dx, width)]!;
  }
  return selectInPlace(scratch, k, k >> 1);
}

function median3x3(src: Float32Array, width: number, height: number, dst: Float32Array): Float32Array {
  const xs = reflectMap(width, 1);
  // Sorted triples (lo, mid, hi) of each column of the current window rows, padded by one each side.
  const lo = new Float32Array(width + 2);
  const mid = new Float32Array(width + 2);
  const hi = new Float32Array(width + 2);
  for (let y = 0; y < height; y++) {
    const r0 = reflectIndex(y - 1, height) * width;
    const r1 = y * width;
    const r2 = reflectIndex(y + 1, height) * width;
    for (let c = 0; c < width + 2; c++) {
      const x = xs[c]!;
      let a = src[r0 + x]!;
      let b = src[r1 + x]!;
      let d = src[r2 + x]!;
      let t: number;
      if (a > b) { t = a; a = b; b = t; }
      if (b > d) { t = b; b = d; d = t; }
      if (a > b) { t = a; a = b; b = t; }
      lo[c] = a;
      mid[c] = b;
      hi[c] = d;
    }
    for (let x = 0; x < width; x++) {
      const maxLo = Math.max(lo[x]!, lo[x + 1]!, lo[x + 2]!);
      const minHi = Math.min(hi[x]!, hi[x + 1]!, hi[x + 2]!);
      const medMid = median3(mid[x]!, mid[x + 1]!, mid[x + 2]!);
      dst[y * width + x] = median3(maxLo, medMid, minHi);
    }
  }
  return dst;
}

function median3(a: number, b: number, c: number): number {
  return Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
}
