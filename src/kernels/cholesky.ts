/**
 * Cholesky factorisation of small dense symmetric positive-definite matrices (row-major n x n),
 * in place and without allocation: the normal equations of the Levenberg-Marquardt solver.
 */

/**
 * Replace the lower triangle of `a` by L with a = L L^T (the upper triangle is left as it was).
 * Returns false when `a` is not positive definite (a pivot <= 0 or not finite).
 */
export function choleskyFactor(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j]!;
    for (let k = 0; k < j; k++) d -= a[j * n + k]! * a[j * n + k]!;
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j]!;
      for (let k = 0; k < j; k++) s -= a[i * n + k]! * a[j * n + k]!;
      a[i * n + j] = s / ljj;
    }
  }
  return true;
}

/** Solve L L^T x = b in place in `b`, with L from choleskyFactor. */
export function choleskySolve(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= l[i * n + k]! * b[k]!;
    b[i] = s / l[i * n + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < n; k++) s -= l[k * n + i]! * b[k]!;
    b[i] = s / l[i * n + i]!;
  }
}

/** Fill `out` (n x n) with (L L^T)^-1, using `column` (length >= n) as scratch. */
export function choleskyInverse(l: Float64Array, n: number, out: Float64Array, column: Float64Array): void {
  for (let j = 0; j < n; j++) {
    column.fill(0, 0, n);
    column[j] = 1;
    choleskySolve(l, n, column);
    for (let i = 0; i < n; i++) out[i * n + j] = column[i]!;
  }
}
