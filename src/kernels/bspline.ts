/**
 * Cubic B-splines on uniformly spaced breakpoints (de Boor 1978, "A Practical Guide to Splines":
 * the uniform cubic basis). Breakpoints t_k = start + k * spacing, k = 0..nIntervals; basis
 * function j (0..nIntervals+2) is non-zero on [t_{j-3}, t_{j+1}], so every point touches 4 of them.
 */

const SIXTH = 1 / 6;

export class UniformCubicBSpline {
  /** Number of basis functions (coefficients). */
  readonly nBasis: number;
  /** 1 / spacing. */
  readonly inverseSpacing: number;

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
    this.inverseSpacing = 1 / spacing;
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
    const t = (u - this.start) * this.inverseSpacing;
    const k = B.interval(t, this.nIntervals);
    const s = t - k;
    weights[0] = B.basis0(s);
    weights[1] = B.basis1(s);
    weights[2] = B.basis2(s);
    weights[3] = B.basis3(s);
    return k;
  }

  // The pieces of `weights` for a loop over many points, which keeps start, inverseSpacing and
  // nIntervals in locals and the basis values in registers (several times faster than a call
  // writing a scratch array): t = (u - start) * inverseSpacing, k = interval(t, nIntervals),
  // s = t - k, basis_i(s). A product with the inverse spacing, not a quotient: one rounding apart.

  /** First basis index at position t (intervals from the start): the interval holding t, the end one for points outside (NaN for NaN). */
  static interval(t: number, nIntervals: number): number {
    const k = Math.floor(t);
    if (k < 0) return 0;
    if (k >= nIntervals) return nIntervals - 1;
    return k;
  }

  // The basis values: a product with 1/6, not a division (several times the latency): they
  // differ from the quotients by a rounding at most.

  /** Basis first + 0 at fraction s of the interval. */
  static basis0(s: number): number {
    const r = 1 - s;
    return r * r * r * SIXTH;
  }

  static basis1(s: number): number {
    const s2 = s * s;
    return (3 * (s2 * s) - 6 * s2 + 4) * SIXTH;
  }

  static basis2(s: number): number {
    const s2 = s * s;
    return (-3 * (s2 * s) + 3 * s2 + 3 * s + 1) * SIXTH;
  }

  static basis3(s: number): number {
    return s * s * s * SIXTH;
  }

  /** sum_j coeffs[j] B_j(u), with `scratch` of length >= 4. */
  value(coeffs: ArrayLike<number>, u: number, scratch: Float64Array): number {
    const k = this.weights(u, scratch);
    return coeffs[k]! * scratch[0]! + coeffs[k + 1]! * scratch[1]! + coeffs[k + 2]! * scratch[2]! + coeffs[k + 3]! * scratch[3]!;
  }
}
