/** Binary searches in an increasing Float64Array (wavelengths along a row, rows of samples). */

/** Index of the first value >= x (the length when there is none). */
export function lowerIndex(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Index of the value nearest to x (the lower one on a tie); -1 for an empty array. */
export function nearestIndex(sorted: Float64Array, x: number): number {
  const i = lowerIndex(sorted, x);
  if (i === 0) return sorted.length > 0 ? 0 : -1;
  if (i === sorted.length) return i - 1;
  return x - sorted[i - 1]! <= sorted[i]! - x ? i - 1 : i;
}
