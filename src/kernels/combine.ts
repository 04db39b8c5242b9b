/**
 * Pixel-by-pixel sigma-clipped mean of a stack of equally sized images. The rule is the one of
 * astropy.stats.sigma_clip along the stack axis (centre: median of the kept values; bounds
 * centre +- nSigma * scale, inclusive; a rejected value never returns; stop when nothing changes
 * or after maxIterations rounds), then the mean of the kept values.
 */
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

/** Most frames the written-out quick test takes (the usual 3 to 5 bias or flat frames). */
const QUICK_MAX = 5;

/**
 * Fill `out` with the clipped mean; `kept` (optional) receives the number of values kept per pixel.
 * Each pixel's values are sorted once (insertion sort: stacks are small): both bounds are applied
 * to a sorted list, so the kept values are always a contiguous run of it and each round only
 * moves its two ends.
 */
export function clippedMeanStack(stack: readonly Float32Array[], out: Float32Array, options: StackClipOptions, kept?: Uint8Array): void {
  const n = stack.length;
  if (n === 0) throw new RangeError('clippedMeanStack: empty stack');
  const size = out.length;
  for (const image of stack) if (image.length !== size) throw new RangeError(`clippedMeanStack: image of ${image.length} pixels in a stack of ${size}`);
  if (n > 255) throw new RangeError('clippedMeanStack: at most 255 images');
  const v = new Float64Array(n);
  const { noise } = options;
  if (noise === undefined || !(noise.perSignal >= 0)) {
    for (let p = 0; p < size; p++) sortedClip(stack, p, v, options, out, kept);
  } else if (n <= QUICK_MAX) {
    smallStack(stack, options, noise, out, v, kept);
  } else {
    for (let p = 0; p < size; p++) {
      // The quick test of smallStack, with a loop over the frames.
      let low = Infinity;
      let high = -Infinity;
      let sum = 0;
      let i = 0;
      for (; i < n; i++) {
        const x = stack[i]![p]!;
        if (x !== x) break;
        sum += x;
        if (x < low) low = x;
        if (x > high) high = x;
      }
      if (i === n && keepsAll(low, high, options.nSigma, noise)) {
        out[p] = sum / n;
        if (kept) kept[p] = n;
      } else sortedClip(stack, p, v, options, out, kept);
    }
  }
}

/**
 * Most pixels: when max - min fits inside the band of the smallest possible scale (the centre is
 * >= min and the scale grows with it), the first round keeps every value and the result is their
 * mean; sorting (branchy, slow on noise) is only needed otherwise. The test with a margin far
 * above rounding, on the safe side of the exact rule.
 */
function keepsAll(low: number, high: number, nSigma: number, noise: { constant: number; perSignal: number }): boolean {
  return fitsBand(low, high, quickBand(low, nSigma, noise));
}

/** keepsAll's band: nSigma times the scale at the minimum. */
function quickBand(low: number, nSigma: number, noise: { constant: number; perSignal: number }): number {
  return nSigma * Math.sqrt(noise.constant + noise.perSignal * (low > 0 ? low : 0));
}

function fitsBand(low: number, high: number, band: number): boolean {
  return (high - low) * (1 + 1e-9) + 1e-12 * (Math.abs(low) + Math.abs(high)) <= band;
}

/**
 * The sorted path's first round at pixel p of a stack of 3 or 5, exactly: every value within
 * median +- nSigma * scale (the same expressions; max(median, 0) without a branch, exact in the
 * window), so that round keeps them all and stops at the quick mean, which is exact when every
 * value is in the window (false otherwise). Spares the sort for most pixels whose spread is too
 * wide for keepsAll's test from the minimum (about a fifth of a bias stack).
 */
function keepsAllAboutMedian(s0: Float32Array, s1: Float32Array, s2: Float32Array, s3: Float32Array, s4: Float32Array, p: number, n: number, nSigma: number, noise: { constant: number; perSignal: number }): boolean {
  const [a, b, c] = [s0[p]!, s1[p]!, s2[p]!];
  const [d, e] = n === 5 ? [s3[p]!, s4[p]!] : [c, c];
  if (!(inWindow(a) & inWindow(b) & inWindow(c) & inWindow(d) & inWindow(e))) return false;
  const low = min2(min2(min2(a, b), min2(c, d)), e);
  const high = max2(max2(max2(a, b), max2(c, d)), e);
  const centre = n === 5 ? median3(e, max2(min2(a, b), min2(c, d)), min2(max2(a, b), max2(c, d))) : median3(a, b, c);
  const scale = Math.sqrt(noise.constant + noise.perSignal * (0.5 * (centre + Math.abs(centre))));
  return low >= centre - nSigma * scale && high <= centre + nSigma * scale;
}

// Minimum, maximum and median by arithmetic: in the window every difference t of two values is
// exact, so x + (t - |t|) / 2 = min(x, x + t) and x + (t + |t|) / 2 = max(x, x + t) exactly (up to
// the sign of a zero, which no decision of the clipping depends on).
function min2(x: number, y: number): number {
  const t = y - x;
  return x + 0.5 * (t - Math.abs(t));
}

function max2(x: number, y: number): number {
  const t = y - x;
  return x + 0.5 * (t + Math.abs(t));
}

function median3(x: number, y: number, z: number): number {
  return max2(min2(x, y), min2(max2(x, y), z));
}

/** Pixels taken per pass of smallStack (its list of pixels for the sorted path stays small). */
const CHUNK = 4096;

/**
 * Up to QUICK_MAX frames, the quick test written out (several times faster than a loop over
 * them): the last frame stands in for the missing ones, which changes no minimum or maximum.
 * The quick mean is summed in stack order, not sorted order: the same, since float32 values within
 * 2^20 of each other add exactly in a double; otherwise only a double's last bit can differ.
 * Noise makes the test's outcome unpredictable, so nothing branches on it: each chunk of pixels
 * gets the quick mean everywhere and a list of the pixels that fail, which the sorted path then
 * overwrites.
 */
function smallStack(stack: readonly Float32Array[], options: StackClipOptions, noise: { constant: number; perSignal: number }, out: Float32Array, v: Float64Array, kept?: Uint8Array): void {
  const n = stack.length;
  const [s0, s1, s2, s3, s4] = Array.from({ length: QUICK_MAX }, (_, i) => stack[Math.min(i, n - 1)]!);
  const failed = new Int32Array(CHUNK);
  // Without a signal term (a bias) the band is the same at every pixel (the same value: the
  // signal term is 0 for every finite minimum, and an infinite one fails either way).
  const fixedBand = noise.perSignal === 0 ? quickBand(0, options.nSigma, noise) : NaN;
  for (let p0 = 0; p0 < out.length; p0 += CHUNK) {
    const p1 = Math.min(out.length, p0 + CHUNK);
    let count = 0;
    for (let p = p0; p < p1; p++) {
      const a = s0![p]!;
      const b = s1![p]!;
      const c = s2![p]!;
      const d = s3![p]!;
      const e = s4![p]!;
      let sum = 0;
      sum += a;
      if (n > 1) sum += b;
      if (n > 2) sum += c;
      if (n > 3) sum += d;
      if (n > 4) sum += e;
      let low: number;
      let high: number;
      if (inWindow(a) & inWindow(b) & inWindow(c) & (n > 3 ? inWindow(d) & inWindow(e) : 1)) {
        // Minimum and maximum by arithmetic (min2, max2), without the unpredictable branches of
        // Math.min and Math.max.
        low = min2(min2(a, b), c);
        high = max2(max2(a, b), c);
        if (n > 3) {
          low = min2(min2(low, d), e);
          high = max2(max2(high, d), e);
        }
      } else {
        low = Math.min(a, b, c, d, e);
        high = Math.max(a, b, c, d, e);
      }
      out[p] = sum / n;
      if (kept) kept[p] = n;
      // A NaN sum: a NaN value (the sorted path skips it) or opposite infinities (which fail the test).
      failed[count] = p;
      count += +!(sum === sum && fitsBand(low, high, fixedBand === fixedBand ? fixedBand : quickBand(low, options.nSigma, noise)));
    }
    const odd = n === 3 || n === 5;
    for (let j = 0; j < count; j++) {
      const p = failed[j]!;
      if (!(odd && keepsAllAboutMedian(s0!, s1!, s2!, s3!, s4!, p, n, options.nSigma, noise))) sortedClip(stack, p, v, options, out, kept);
    }
  }
}

/** Float32 values whose differences are all exact in a double: 0 and 2^-8 <= |x| < 2^20 (multiples of 2^-31 below 2^20 differ by at most 52 bits). */
const WINDOW_LOW = 2 ** -8;
const WINDOW_HIGH = 2 ** 20;

/** 1 when x (a float32 value) is in the window, else 0 (NaN and infinities included); no branch. */
function inWindow(x: number): number {
  const m = Math.abs(x);
  return +(m < WINDOW_HIGH) & (+(m >= WINDOW_LOW) | +(x === 0));
}

/** Pixel p by the full rule: its values sorted, then the clipping rounds. */
function sortedClip(stack: readonly Float32Array[], p: number, v: Float64Array, options: StackClipOptions, out: Float32Array, kept?: Uint8Array): void {
  const n = stack.length;
  const { nSigma, maxIterations, noise } = options;
  let m = 0;
  for (let i = 0; i < n; i++) {
    const x = stack[i]![p]!;
    if (x !== x) continue;
    let j = m - 1;
    while (j >= 0 && v[j]! > x) {
      v[j + 1] = v[j]!;
      j--;
    }
    v[j + 1] = x;
    m++;
  }
  let lo = 0;
  let hi = m;
  for (let iter = 0; iter < maxIterations && hi > lo; iter++) {
    const count = hi - lo;
    const half = lo + (count >> 1);
    const centre = count % 2 === 1 ? v[half]! : 0.5 * (v[half - 1]! + v[half]!);
    let scale: number;
    if (noise) {
      scale = Math.sqrt(noise.constant + noise.perSignal * (centre > 0 ? centre : 0));
    } else {
      let mean = 0;
      for (let i = lo; i < hi; i++) mean += v[i]!;
      mean /= count;
      let ss = 0;
      for (let i = lo; i < hi; i++) ss += (v[i]! - mean) * (v[i]! - mean);
      scale = Math.sqrt(ss / count);
    }
    const low = centre - nSigma * scale;
    const high = centre + nSigma * scale;
    const lo0 = lo;
    const hi0 = hi;
    while (lo < hi && v[lo]! < low) lo++;
    while (hi > lo && v[hi - 1]! > high) hi--;
    if (lo === lo0 && hi === hi0) break;
  }
  let sum = 0;
  for (let i = lo; i < hi; i++) sum += v[i]!;
  out[p] = hi > lo ? sum / (hi - lo) : NaN;
  if (kept) kept[p] = hi - lo;
}
