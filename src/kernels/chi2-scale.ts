/**
 * When a fit's chi-square says its errors are too small. A chi-square of `dof` degrees of freedom
 * has mean dof and variance 2 dof (any statistics handbook, e.g. Press et al., Numerical Recipes,
 * sec. 6.2); more than 3 of those sigmas above the mean is a misfit the errors should admit
 * (common practice), and then the errors are scaled by sqrt(chi2 / dof) (the Birge ratio).
 */

/** Largest chi-square of `dof` degrees of freedom taken as noise: dof + 3 sqrt(2 dof). */
export function chi2NoiseLimit(dof: number): number {
  return dof + 3 * Math.sqrt(2 * dof);
}

/** sqrt(chi2 / dof) when chi2 exceeds chi2NoiseLimit(dof), else 1 (also for dof <= 0). */
export function chi2ErrorScale(chi2: number, dof: number): number {
  if (!(dof > 0)) return 1;
  return chi2 > chi2NoiseLimit(dof) ? Math.sqrt(chi2 / dof) : 1;
}
