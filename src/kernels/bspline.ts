/**
 * Cubic B-splines on uniformly spaced breakpoints (de Boor 1978, "A Practical Guide to Splines":
 * the uniform cubic basis). Breakpoints t_k = start + k * spacing, k = 0..nIntervals; basis
 * function j (0..nIntervals+2) is non-zero on [t_{j-3}, t_{j+1}], so every point touches 4 of them.
 */

export class UniformCubicBSpline {
  /** Number of basis functions (coefficients). */
  readonly nBasis: number;

  constructor(
    /** First breakpoint (units of the abscissa). */
    readonly start: number,
    /** Breakpoint spacing, > 0. */
    readonly spacing: number,
    readonly nIntervals: number,
  ) {
    if (!(spacing > 0)) throw new RangeError(`UniformCubicBSpline: spacing must be > 0, got ${spacing}`);
    if (!(nIntervals >= 1)) throw new RangeError(`UniformCubicBSpline: need at least one interval, got ${nIntervals}`);
    this.nBasis = nIntervals + 3;
  }

  /** Covering [min, max] with breakpoints about `spacing` apart. */
  static covering(min: number, max: number, spacing: number): UniformCubicBSpline {
    const n = Math.max(1, Math.ceil((max - min) / spacing));
    return new UniformCubicBSpline(min, (max - min) / n || spacing, n);
  }

  /**
   * Fill weights[0..3] with the 4 non-zero basis values at u and return the index of the first
   * (weights[i] belongs to basis first + i). Points outside the breakpoints use the end interval.
   */
  weights(u: number, weights: Float64Array): number {
    const B = UniformCubicBSpline;
    const k = B.interval(u, this.start, this.spacing, this.nIntervals);
    const s = (u - this.start) / this.spacing - k;
    weights[0] = B.basis0(s);
    weights[1] = B.basis1(s);
    weights[2] = B.basis2(s);
    weights[3] = B.basis3(s);
    return k;
  }

  // The pieces of `weights` for a loop over many points, which keeps start, spacing and
  // nIntervals in locals and the basis values in registers (several times faster than a call
  // writing a scratch array): k = interval(u, ...), s = (u - start) / spacing - k, basis_i(s).

  /** First basis index at u: the interval holding u, the end one for points outside (NaN for NaN). */
  static interval(u: number, start: number, spacing: number, nIntervals: number): number {
    const k = Math.floor((u - start) / spacing);
    if (k < 0) return 0;
    if (k >= nIntervals) return nIntervals - 1;
    return k;
  }

  /** Basis first + 0 at fraction s of the interval. */
  static basis0(s: number): number {
    const r = 1 - s;
    return (r * r * r) / 6;
  }

  static basis1(s: number): number {
    const s2 = s * s;
    return (3 * (s2 * s) - 6 * s2 + 4) / 6;
  }

  static basis2(s: number): number {
    const s2 = s * s;
    return (-3 * (s2 * s) + 3 * s2 + 3 * s + 1) / 6;
  }

  static basis3(s: number): number {
    return (s * s * s) / 6;
  }

  /** sum_j coeffs[j] B_j(u), with `scratch` of length >= 4. */
  value(coeffs: ArrayLike<number>, u: number, scratch: Float64Array): number {
    const k = this.weights(u, scratch);
    return coeffs[k]! * scratch[0]! + coeffs[k + 1]! * scratch[1]! + coeffs[k + 2]! * scratch[2]! + coeffs[k + 3]! * scratch[3]!;
  }
}
