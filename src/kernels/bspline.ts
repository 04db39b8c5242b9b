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
    let k = Math.floor((u - this.start) / this.spacing);
    if (k < 0) k = 0;
    else if (k >= this.nIntervals) k = this.nIntervals - 1;
    const s = (u - this.start) / this.spacing - k;
    const s2 = s * s;
    const s3 = s2 * s;
    const r = 1 - s;
    weights[0] = (r * r * r) / 6;
    weights[1] = (3 * s3 - 6 * s2 + 4) / 6;
    weights[2] = (-3 * s3 + 3 * s2 + 3 * s + 1) / 6;
    weights[3] = s3 / 6;
    return k;
  }

  /** sum_j coeffs[j] B_j(u), with `scratch` of length >= 4. */
  value(coeffs: ArrayLike<number>, u: number, scratch: Float64Array): number {
    const k = this.weights(u, scratch);
    return coeffs[k]! * scratch[0]! + coeffs[k + 1]! * scratch[1]! + coeffs[k + 2]! * scratch[2]! + coeffs[k + 3]! * scratch[3]!;
  }
}
