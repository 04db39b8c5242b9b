/**
 * A fitted sky spline in piecewise-polynomial form (de Boor 1978, "A Practical Guide to Splines",
 * ch. VII): on each interval the model is a cubic in the fraction s of the interval, and its
 * variance b(s)^T Z b(s) a polynomial of degree 6. The sky is evaluated at millions of pixels per
 * fit; by Horner's rule that takes 3 + 6 multiply-adds a pixel instead of four basis cubics and
 * a 4 x 4 quadratic form. The two forms agree to rounding.
 */

/** Monomial coefficients (of s^0..s^3) of 6 B_j(s), j = 0..3 (row j at 4j), the uniform cubic basis on one interval. */
const BASIS = Float64Array.of(1, -3, 3, -1, 4, 0, -6, 3, 1, 3, 3, -3, 0, 0, 0, 1);

/** Per interval k the model's s^0..s^3 coefficients at 4k..4k+3, from the spline's coefficients. */
export function valuePieces(c: Float64Array, nIntervals: number): Float64Array {
  const out = new Float64Array(4 * nIntervals);
  for (let k = 0; k < nIntervals; k++) {
    // The rows of BASIS written out, in their order.
    const c0 = c[k]!;
    const c1 = c[k + 1]!;
    const c2 = c[k + 2]!;
    const c3 = c[k + 3]!;
    out[4 * k] = (c0 + 4 * c1 + c2) / 6;
    out[4 * k + 1] = (-3 * c0 + 3 * c2) / 6;
    out[4 * k + 2] = (3 * c0 - 6 * c1 + 3 * c2) / 6;
    out[4 * k + 3] = (-c0 + 3 * c1 - 3 * c2 + c3) / 6;
  }
  return out;
}

/**
 * Per interval k the variance's s^0..s^6 coefficients at 7k..7k+6, from the in-band covariance
 * (band storage, p = 3: entry (k + p, k + q) at (k + p) * 4 + (p - q)).
 */
export function variancePieces(covariance: Float64Array, nIntervals: number): Float64Array {
  const out = new Float64Array(7 * nIntervals);
  for (let k = 0; k < nIntervals; k++) variancePiece(covariance, k, out);
  return out;
}

/** sum over p, q of Z_pq B_p(s) B_q(s): each pair's product polynomial, the off-diagonal pairs twice. */
function variancePiece(z: Float64Array, k: number, out: Float64Array): void {
  const o = 7 * k;
  for (let p = 0; p < 4; p++) {
    for (let q = 0; q <= p; q++) {
      const f = ((p === q ? 1 : 2) * z[(k + p) * 4 + (p - q)]!) / 36;
      for (let i = 0; i < 4; i++) {
        const fi = f * BASIS[4 * p + i]!;
        for (let j = 0; j < 4; j++) out[o + i + j] += fi * BASIS[4 * q + j]!;
      }
    }
  }
}

/** The model at fraction s of interval k (a = 4k). */
export function pieceValue(value: Float64Array, a: number, s: number): number {
  return value[a]! + s * (value[a + 1]! + s * (value[a + 2]! + s * value[a + 3]!));
}

/** The variance at fraction s of interval k (b = 7k). */
export function pieceVariance(v: Float64Array, b: number, s: number): number {
  return v[b]! + s * (v[b + 1]! + s * (v[b + 2]! + s * (v[b + 3]! + s * (v[b + 4]! + s * (v[b + 5]! + s * v[b + 6]!)))));
}
