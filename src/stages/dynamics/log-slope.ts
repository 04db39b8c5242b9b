/**
 * Logarithmic slope d ln V / d ln R by weighted least squares of ln V on ln R
 * (sigma_lnV = sigma_V / V), through weightedLeastSquares of src/kernels.
 */
import { weightedLeastSquares } from '../../kernels/index.js';

export interface SlopeFit {
  slope: number;
  slopeErr: number;
}

/** Slope of ln V against ln R over the given points; NaN with fewer than two usable points. */
export function fitLogSlope(rKpc: ArrayLike<number>, vKms: ArrayLike<number>, errKms: ArrayLike<number>): SlopeFit {
  const n = rKpc.length;
  const design = new Float64Array(2 * n);
  const y = new Float64Array(n);
  const w = new Float64Array(n);
  let used = 0;
  for (let k = 0; k < n; k++) {
    const r = rKpc[k]!;
    const v = vKms[k]!;
    const e = errKms[k]!;
    if (!(r > 0 && v > 0 && e > 0)) continue;
    design[2 * k] = 1;
    design[2 * k + 1] = Math.log(r);
    y[k] = Math.log(v);
    w[k] = (v / e) ** 2;
    used++;
  }
  if (used < 2) return { slope: NaN, slopeErr: NaN };
  try {
    const fit = weightedLeastSquares(design, n, 2, y, w);
    return { slope: fit.coeffs[1]!, slopeErr: Math.sqrt(fit.covariance[3]!) };
  } catch {
    // Coincident radii make the normal matrix singular: no slope there.
    return { slope: NaN, slopeErr: NaN };
  }
}
