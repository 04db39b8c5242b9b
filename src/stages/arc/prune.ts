/**
 * Backward deletion of matches that the errors cannot explain. With few lines, one or two wrong
 * positions (a line blended with an unlisted one, a wrong match) bend the fit so much that every
 * residual looks alike and no clipping can single them out. While the kept positions scatter
 * beyond three times their errors (chi2/dof > 9, common practice), the position whose deletion
 * lowers chi2 the most, the largest w_i r_i^2 / (1 - h_i) with h_i its leverage (Cook & Weisberg
 * 1982), is left out, up to a quarter of them. If the fit still does not match the errors then,
 * the model is wrong rather than a few positions (too low an order), and nothing is left out.
 */
import { legendreBasis, normalise, type Legendre1D } from '../../kernels/legendre.js';
import { fitLegendre1D, type LegendreFitResult } from '../../kernels/legendre-fit.js';
import { quadraticForm } from '../../kernels/least-squares.js';

/** Line positions scattering beyond three times their errors (chi2/dof above 9) are a misfit (common practice). */
export const MISFIT_CHI2 = 9;
const MAX_PRUNED_SHARE = 0.25;

export function pruneToErrors(x: Float64Array, y: Float64Array, w: Float64Array, first: LegendreFitResult<Legendre1D>): LegendreFitResult<Legendre1D> {
  const n = x.length;
  const order = first.model.coeffs.length - 1;
  const nc = order + 1;
  const range = { min: first.model.min, max: first.model.max };
  const weights = Float64Array.from(w, (v, i) => (first.used[i] ? v : 0));
  const basis = new Float64Array(nc);
  let fit = first;
  for (let pruned = 0; fit.reducedChi2 > MISFIT_CHI2 && pruned < MAX_PRUNED_SHARE * n && fit.dof > 2; pruned++) {
    let worst = -1;
    let worstGain = 0;
    for (let i = 0; i < n; i++) {
      if (!(weights[i]! > 0)) continue;
      legendreBasis(normalise(x[i]!, range.min, range.max), order, basis);
      const q = quadraticForm(fit.covariance, nc, basis);
      const gain = (weights[i]! * fit.residuals[i]! ** 2) / Math.max(1 - weights[i]! * q, 1e-12);
      if (gain > worstGain) {
        worstGain = gain;
        worst = i;
      }
    }
    if (worst < 0) break;
    weights[worst] = 0;
    fit = fitLegendre1D(x, y, weights, order, range, { clipSigma: Infinity });
  }
  return fit.reducedChi2 > MISFIT_CHI2 ? first : fit;
}
