/**
 * Robust statistics on numeric arrays. NaN values are ignored everywhere.
 * Functions that need ordering copy into a scratch buffer (pass one to avoid allocation in loops).
 */

export type NumericArray = ArrayLike<number> & { length: number };

/** Gaussian-consistent scale of the median absolute deviation: 1 / Phi^-1(3/4) (common statistical constant). */
export const MAD_TO_SIGMA = 1.482602218505602;

/** k-th smallest (0-based) of buf[0..n), partially reordering buf in place (Hoare's quickselect). */
export function selectInPlace(buf: Float64Array | Float32Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (hi > lo) {
    const pivot = buf[(lo + hi) >> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (buf[i]! < pivot) i++;
      while (buf[j]! > pivot) j--;
      if (i <= j) {
        const t = buf[i]!;
        buf[i] = buf[j]!;
        buf[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return buf[k]!;
}

/** Copy the finite values of `values` into `scratch` (grown if needed); returns [buffer, count]. */
function finiteInto(values: NumericArray, scratch?: Float64Array): [Float64Array, number] {
  const buf = scratch && scratch.length >= values.length ? scratch : new Float64Array(values.length);
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (v === v) buf[n++] = v;
  }
  return [buf, n];
}

/** Median of the non-NaN values (mean of the two middle values for even counts); NaN when empty. */
export function median(values: NumericArray, scratch?: Float64Array): number {
  const [buf, n] = finiteInto(values, scratch);
  return medianOfBuffer(buf, n);
}

/** Below this many values a plain quickselect is as fast as the bucket pass. */
const BUCKET_MIN = 512;
const BUCKETS = 256;
const bucketCounts = new Int32Array(BUCKETS);

/**
 * k-th smallest (0-based) of buf[0..n) (no NaN), reordering buf: the values are counted into
 * BUCKETS equal-width buckets between their minimum and maximum, and only the bucket that holds
 * rank k is searched further. Exact: the bucket index is a non-decreasing function of the value
 * (correctly rounded subtraction and multiplication are monotonic), so every value of a lower
 * bucket is <= every value of a higher one. Faster than quickselect on large buffers of noisy
 * data, whose comparisons the processor cannot predict; the counting has no data-dependent branch.
 */
export function bucketSelect(buf: Float64Array | Float32Array, n: number, k: number): number {
  if (n < BUCKET_MIN) return selectInPlace(buf, n, k);
  minMax(buf, n, extremes);
  const lo = extremes[0]!;
  const hi = extremes[1]!;
  if (!(hi > lo)) return lo;
  const scale = BUCKETS / (hi - lo);
  if (!Number.isFinite(scale) || !(scale > 0)) return selectInPlace(buf, n, k);
  const counts = countBuckets(buf, n, lo, scale);
  let below = 0;
  let target = 0;
  while (below + counts[target]! <= k) below += counts[target++]!;
  // The target bucket's values to the front (it never holds them all: lo and hi fall in different buckets).
  const m = bucketToFront(buf, n, lo, scale, target);
  return bucketSelect(buf, m, k - below);
}

/** Median of buf[0..n), reordering it. */
export function medianOfBuffer(buf: Float64Array | Float32Array, n: number): number {
  if (n === 0) return NaN;
  if (n >= BUCKET_MIN) {
    // A zero middle value goes to bucketSelect (adjacentRanks only reads buf): which of -0 and +0
    // a selection returns depends on the order it meets them, and callers have seen bucketSelect's.
    const pair = middlePair;
    if (n % 2 === 0 && adjacentRanks(buf, n, (n >> 1) - 1, pair) && pair[0] !== 0 && pair[1] !== 0) return (pair[0]! + pair[1]!) / 2;
    const upper = bucketSelect(buf, n, n >> 1);
    return n % 2 === 1 ? upper : (bucketSelect(buf, n, (n >> 1) - 1) + upper) / 2;
  }
  const upper = selectInPlace(buf, n, n >> 1);
  if (n % 2 === 1) return upper;
  let lower = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (buf[i]! > lower) lower = buf[i]!;
  return (lower + upper) / 2;
}

const middlePair = new Float64Array(2);
let gathered = new Float64Array(0);

/**
 * pair = the k-th and (k + 1)-th smallest of buf[0..n) (n >= BUCKET_MIN, no NaN): one bucket
 * pass (as in bucketSelect) serves both ranks, where two bucketSelect calls make two. In
 * different buckets they are the largest value of the first bucket and the smallest of the next
 * non-empty one; in the same bucket, its values are copied out (compacted in place when buf is
 * already that copy) and searched further. buf is only read. False, with nothing changed, when
 * the values cannot be bucketed (all equal, or a range too wide for a double).
 */
function adjacentRanks(buf: Float64Array | Float32Array, n: number, k: number, pair: Float64Array): boolean {
  const range = valueRange(buf, n);
  if (!range) return false;
  const [lo, scale] = range;
  const counts = countBuckets(buf, n, lo, scale);
  let below = 0;
  let first = 0;
  while (below + counts[first]! <= k) below += counts[first++]!;
  if (below + counts[first]! > k + 1) {
    // Both ranks in one bucket (never all values: the lowest and highest fall in different buckets).
    if (gathered.length < counts[first]!) gathered = new Float64Array(Math.max(counts[first]!, 2 * gathered.length));
    const m = copyBucket(buf, n, lo, scale, first, gathered);
    ranksInPlace(gathered, m, k - below, pair);
  } else {
    let next = first + 1;
    while (counts[next] === 0) next++;
    bucketEdges(buf, n, lo, scale, first, next, pair);
  }
  return true;
}

// The bucket passes, each a function of one loop: V8 compiles them once, where loops after a
// long one in the same function sent bucketSelect and adjacentRanks back to the interpreter.

/** bucketCounts = the number of values of buf[0..n) in each bucket of [lo, lo + BUCKETS / scale]. */
function countBuckets(buf: Float64Array | Float32Array, n: number, lo: number, scale: number): Int32Array {
  const counts = bucketCounts;
  counts.fill(0);
  for (let i = 0; i < n; i++) counts[Math.min(BUCKETS - 1, ((buf[i]! - lo) * scale) | 0)]++;
  return counts;
}

/** The values of bucket `target` to the front of buf[0..n) (swapped, in order of index); returns their number. */
function bucketToFront(buf: Float64Array | Float32Array, n: number, lo: number, scale: number, target: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = buf[i]!;
    if (Math.min(BUCKETS - 1, ((v - lo) * scale) | 0) === target) {
      buf[i] = buf[m]!;
      buf[m++] = v;
    }
  }
  return m;
}

/** The values of bucket `target` of buf[0..n) copied into work (in order of index); returns their number. */
function copyBucket(buf: Float64Array | Float32Array, n: number, lo: number, scale: number, target: number, work: Float64Array): number {
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = buf[i]!;
    if (Math.min(BUCKETS - 1, ((v - lo) * scale) | 0) === target) work[m++] = v;
  }
  return m;
}

/** pair = [largest value of bucket `first`, smallest of bucket `next`] of buf[0..n). */
function bucketEdges(buf: Float64Array | Float32Array, n: number, lo: number, scale: number, first: number, next: number, pair: Float64Array): void {
  let lower = -Infinity;
  let upper = Infinity;
  for (let i = 0; i < n; i++) {
    const v = buf[i]!;
    const b = Math.min(BUCKETS - 1, ((v - lo) * scale) | 0);
    if (b === first && v > lower) lower = v;
    if (b === next && v < upper) upper = v;
  }
  pair[0] = lower;
  pair[1] = upper;
}

const extremes = new Float64Array(2);

/** out = [minimum, maximum] of buf[0..n) (the first of equal extremes, as `<` and `>` find them). */
function minMax(buf: Float64Array | Float32Array, n: number, out: Float64Array): void {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = buf[i]!;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  out[0] = lo;
  out[1] = hi;
}

/** [minimum, BUCKETS / (max - min)] of buf[0..n), or null when the values cannot be bucketed. */
function valueRange(buf: Float64Array | Float32Array, n: number): [number, number] | null {
  minMax(buf, n, extremes);
  const lo = extremes[0]!;
  const hi = extremes[1]!;
  const scale = BUCKETS / (hi - lo);
  return hi > lo && Number.isFinite(scale) && scale > 0 ? [lo, scale] : null;
}

/** adjacentRanks on the scratch copy work[0..m) (reordered), or quickselect when it is small or cannot be bucketed. */
function ranksInPlace(work: Float64Array, m: number, k: number, pair: Float64Array): void {
  if (m >= BUCKET_MIN && adjacentRanks(work, m, k, pair)) return;
  pair[1] = selectInPlace(work, m, k + 1);
  let lower = -Infinity;
  for (let i = 0; i <= k; i++) if (work[i]! > lower) lower = work[i]!;
  pair[0] = lower;
}

/** Median absolute deviation scaled to a Gaussian sigma (MAD x 1.4826). */
export function madSigma(values: NumericArray, scratch?: Float64Array): number {
  const [buf, n] = finiteInto(values, scratch);
  if (n === 0) return NaN;
  const m = medianOfBuffer(buf, n);
  for (let i = 0; i < n; i++) buf[i] = Math.abs(buf[i]! - m);
  return MAD_TO_SIGMA * medianOfBuffer(buf, n);
}

export interface MeanStd {
  mean: number;
  std: number;
  count: number;
}

/** Mean and sample standard deviation (n - 1) of the non-NaN values. */
export function meanStd(values: NumericArray): MeanStd {
  let n = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (v !== v) continue;
    n++;
    const d = v - mean; // Welford's update: stable for large offsets such as bias levels
    mean += d / n;
    m2 += d * (v - mean);
  }
  return { mean: n > 0 ? mean : NaN, std: n > 1 ? Math.sqrt(m2 / (n - 1)) : NaN, count: n };
}

export interface ClippedStats extends MeanStd {
  median: number;
  /** Number of values rejected by the clipping. */
  rejected: number;
}

/**
 * Iterative sigma clipping about the median, with the scale from the standard deviation of
 * the kept values (common practice: 3 sigma, up to 5 iterations).
 */
export function sigmaClippedStats(values: NumericArray, nSigma = 3, maxIterations = 5, scratch?: Float64Array): ClippedStats {
  const [buf, total] = finiteInto(values, scratch);
  let n = total;
  const work = new Float64Array(n);
  let centre = NaN;
  let mean = NaN;
  let std = NaN;
  for (let iter = 0; iter <= maxIterations; iter++) {
    work.set(buf.subarray(0, n));
    centre = medianOfBuffer(work, n);
    const s = meanStd(buf.subarray(0, n));
    mean = s.mean;
    std = s.std;
    if (!(std > 0) || iter === maxIterations) break;
    let kept = 0;
    for (let i = 0; i < n; i++) {
      const v = buf[i]!;
      if (Math.abs(v - centre) <= nSigma * std) buf[kept++] = v;
    }
    if (kept === n) break;
    n = kept;
  }
  return { mean, std, count: n, median: centre, rejected: total - n };
}
