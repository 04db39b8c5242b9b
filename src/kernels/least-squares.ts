/**
 * Weighted linear least squares through the normal equations, solved by Cholesky with Jacobi
 * (column) scaling so that badly scaled columns do not cost precision. Meant for the small
 * well-conditioned bases of whorl (Legendre series, sky continua): up to a few dozen columns.
 */
import { choleskyFactor, choleskyInverse } from './cholesky.js';

export interface LeastSquaresResult {
  /** Best-fit coefficients, length nCols. */
  coeffs: Float64Array;
  /**
   * (A^T W A)^-1, row-major nCols x nCols: the coefficient covariance when the weights are
   * inverse variances. Scale by chi2 / dof when they are only relative.
   */
  covariance: Float64Array;
  /** Sum of w_i (y_i - model_i)^2 over the rows with w_i > 0. */
  chi2: number;
  /** Rows with w_i > 0 minus nCols. */
  dof: number;
}

/**
 * Minimise sum_i w_i (y_i - sum_k A[i, k] c_k)^2.
 * `design` is row-major nRows x nCols; `weights` (inverse variances) default to 1, and rows with
 * weight 0 are left out (how callers clip without rebuilding the matrix).
 * Throws RangeError on mismatched sizes and when the normal matrix is singular (fewer usable
 * rows than columns, or degenerate columns).
 */
export function weightedLeastSquares(
  design: Float64Array,
  nRows: number,
  nCols: number,
  y: ArrayLike<number>,
  weights?: ArrayLike<number> | null,
): LeastSquaresResult {
  if (design.length < nRows * nCols) throw new RangeError(`weightedLeastSquares: design has ${design.length} values, expected ${nRows} x ${nCols}`);
  if (y.length < nRows) throw new RangeError(`weightedLeastSquares: y has ${y.length} values, expected ${nRows}`);
  if (weights && weights.length < nRows) throw new RangeError(`weightedLeastSquares: weights have ${weights.length} values, expected ${nRows}`);
  const normal = new Float64Array(nCols * nCols);
  const rhs = new Float64Array(nCols);
  let used = 0;
  for (let i = 0; i < nRows; i++) {
    const w = weights ? weights[i]! : 1;
    if (!(w > 0)) continue;
    used++;
    const row = i * nCols;
    const yi = y[i]!;
    for (let a = 0; a < nCols; a++) {
      const wa = w * design[row + a]!;
      rhs[a] += wa * yi;
      for (let b = 0; b <= a; b++) normal[a * nCols + b] += wa * design[row + b]!;
    }
  }
  if (used < nCols) throw new RangeError(`weightedLeastSquares: ${used} usable rows for ${nCols} coefficients`);
  // Jacobi scaling: solve for s_k c_k with s_k = sqrt(N_kk), so the scaled matrix has a unit diagonal.
  const scale = new Float64Array(nCols);
  for (let a = 0; a < nCols; a++) scale[a] = Math.sqrt(normal[a * nCols + a]!);
  for (let a = 0; a < nCols; a++) {
    for (let b = 0; b <= a; b++) {
      const v = normal[a * nCols + b]! / (scale[a]! * scale[b]!);
      normal[a * nCols + b] = v;
      normal[b * nCols + a] = v;
    }
  }
  if (!choleskyFactor(normal, nCols)) throw new RangeError('weightedLeastSquares: normal matrix is singular');
  const inverse = new Float64Array(nCols * nCols);
  choleskyInverse(normal, nCols, inverse, new Float64Array(nCols));
  const coeffs = new Float64Array(nCols);
  for (let a = 0; a < nCols; a++) {
    let s = 0;
    for (let b = 0; b < nCols; b++) s += inverse[a * nCols + b]! * (rhs[b]! / scale[b]!);
    coeffs[a] = s / scale[a]!;
  }
  for (let a = 0; a < nCols; a++) for (let b = 0; b < nCols; b++) inverse[a * nCols + b] = inverse[a * nCols + b]! / (scale[a]! * scale[b]!);
  let chi2 = 0;
  for (let i = 0; i < nRows; i++) {
    const w = weights ? weights[i]! : 1;
    if (!(w > 0)) continue;
    let m = 0;
    for (let a = 0; a < nCols; a++) m += design[i * nCols + a]! * coeffs[a]!;
    const r = y[i]! - m;
    chi2 += w * r * r;
  }
  return { coeffs, covariance: inverse, chi2, dof: used - nCols };
}

/**
 * a^T C a for the n x n row-major C and the n values of `a` from `offset`: with C the coefficient
 * covariance and a a design row, the variance of the model there (over w_i, the leverage h_i).
 */
export function quadraticForm(c: Float64Array, n: number, a: ArrayLike<number>, offset = 0): number {
  let q = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += c[i * n + j]! * a[offset + j]!;
    q += a[offset + i]! * s;
  }
  return q;
}
