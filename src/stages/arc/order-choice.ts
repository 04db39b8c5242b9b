/**
 * Choice of the polynomial orders from the data, by the Bayesian information criterion
 * (Schwarz 1978): BIC = n ln(WRSS / n) + k ln n, with WRSS the weighted residual sum of squares
 * and k the number of coefficients. The points are those kept by a clipped fit at the highest
 * order tried, so that every order is judged on the same set; the lowest BIC wins.
 */
import { fitLegendre1D, fitLegendre2D } from '../../kernels/legendre-fit.js';

function bic(wrss: number, n: number, k: number): number {
  return n * Math.log(wrss / n) + k * Math.log(n);
}

/** Order 1..maxOrder (capped at n / 3, REFERENCE.md common practice) of lambda(x). */
export function chooseOrder1D(x: Float64Array, y: Float64Array, w: Float64Array, maxOrder: number, range: { min: number; max: number }, clipSigma: number): number {
  const top = Math.max(1, Math.min(maxOrder, Math.floor(x.length / 3)));
  const kept = fitLegendre1D(x, y, w, top, range, { clipSigma, robust: true }).used;
  const wk = Float64Array.from(w, (v, i) => (kept[i] ? v : 0));
  let best = 1;
  let bestBic = Infinity;
  for (let o = 1; o <= top; o++) {
    const f = fitLegendre1D(x, y, wk, o, range, { clipSigma: Infinity });
    const b = bic(f.chi2, f.nUsed, o + 1);
    if (b < bestBic - 1e-9) {
      bestBic = b;
      best = o;
    }
  }
  return best;
}

/** Order 0..maxYOrder along y of lambda(x, y), the x order given. */
export function chooseOrderY(
  x: Float64Array,
  y: Float64Array,
  z: Float64Array,
  w: Float64Array,
  xOrder: number,
  maxYOrder: number,
  range: { xMin: number; xMax: number; yMin: number; yMax: number },
  clipSigma: number,
): number {
  const nx = xOrder + 1;
  const top = Math.max(0, Math.min(maxYOrder, Math.floor(x.length / (3 * nx)) - 1));
  const kept = fitLegendre2D(x, y, z, w, xOrder, top, range, { clipSigma, robust: true }).used;
  const wk = Float64Array.from(w, (v, i) => (kept[i] ? v : 0));
  let best = 0;
  let bestBic = Infinity;
  for (let o = 0; o <= top; o++) {
    const f = fitLegendre2D(x, y, z, wk, xOrder, o, range, { clipSigma: Infinity });
    const b = bic(f.chi2, f.nUsed, nx * (o + 1));
    if (b < bestBic - 1e-9) {
      bestBic = b;
      best = o;
    }
  }
  return best;
}
