/**
 * Least-squares Legendre fits (1-D and tensor-product 2-D) with iterative sigma clipping.
 * Clipping: after each fit, every point whose normalised residual |r_i| sqrt(w_i) exceeds
 * clipSigma times the RMS normalised residual of the kept points is left out of the next fit;
 * points may come back; it stops when the kept set no longer changes (common practice).
 */
import { legendreBasis, normalise, type Legendre1D, type Legendre2D } from './legendre.js';
import { weightedLeastSquares } from './least-squares.js';

export interface LegendreFitOptions {
  /** Clipping threshold in units of the RMS normalised residual; Infinity disables. Default 3. */
  clipSigma?: number;
  /** Most clipping rounds. Default 5. */
  maxIterations?: number;
  /** Never clip below this many kept points (the fit keeps the best ones). Default nCoeffs + 1. */
  minKept?: number;
}

export interface LegendreFitResult<M> {
  model: M;
  /** Coefficient covariance (A^T W A)^-1, row-major; multiply by `reducedChi2` for relative weights. */
  covariance: Float64Array;
  /** 1 where the point was kept in the final fit. */
  used: Uint8Array;
  /** Data minus model for every point (kept or not). */
  residuals: Float64Array;
  /** Unweighted RMS of the residuals of the kept points, in the units of the data. */
  rms: number;
  /** chi2 of the kept points with the given weights, and its degrees of freedom. */
  chi2: number;
  dof: number;
  reducedChi2: number;
  nUsed: number;
}

/** Fit y(x) = sum_k c_k P_k(u), u = normalise(x, min, max). `weights` are inverse variances (null: equal). */
export function fitLegendre1D(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  weights: ArrayLike<number> | null,
  order: number,
  range: { min: number; max: number },
  options: LegendreFitOptions = {},
): LegendreFitResult<Legendre1D> {
  const n = x.length;
  const nc = order + 1;
  const design = new Float64Array(n * nc);
  const basis = new Float64Array(nc);
  for (let i = 0; i < n; i++) {
    legendreBasis(normalise(x[i]!, range.min, range.max), order, basis);
    design.set(basis, i * nc);
  }
  const fit = clippedFit(design, n, nc, y, weights, options);
  return { ...fit, model: { kind: 'legendre1d', min: range.min, max: range.max, coeffs: Array.from(fit.coeffs) } };
}

/** Fit z(x, y) = sum_{j, i} c[j (xOrder + 1) + i] P_i(u) P_j(v) (the Legendre2D layout). */
export function fitLegendre2D(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  weights: ArrayLike<number> | null,
  xOrder: number,
  yOrder: number,
  range: { xMin: number; xMax: number; yMin: number; yMax: number },
  options: LegendreFitOptions = {},
): LegendreFitResult<Legendre2D> {
  const n = x.length;
  const nx = xOrder + 1;
  const nc = nx * (yOrder + 1);
  const design = new Float64Array(n * nc);
  const px = new Float64Array(nx);
  const py = new Float64Array(yOrder + 1);
  for (let i = 0; i < n; i++) {
    legendreBasis(normalise(x[i]!, range.xMin, range.xMax), xOrder, px);
    legendreBasis(normalise(y[i]!, range.yMin, range.yMax), yOrder, py);
    for (let j = 0; j <= yOrder; j++) for (let k = 0; k < nx; k++) design[i * nc + j * nx + k] = px[k]! * py[j]!;
  }
  const fit = clippedFit(design, n, nc, z, weights, options);
  return { ...fit, model: { kind: 'legendre2d', xOrder, yOrder, ...range, coeffs: Array.from(fit.coeffs) } };
}

interface ClippedFit extends Omit<LegendreFitResult<unknown>, 'model'> {
  coeffs: Float64Array;
}

function clippedFit(
  design: Float64Array,
  n: number,
  nc: number,
  y: ArrayLike<number>,
  weights: ArrayLike<number> | null,
  options: LegendreFitOptions,
): ClippedFit {
  const clipSigma = options.clipSigma ?? 3;
  const maxIterations = options.maxIterations ?? 5;
  const minKept = Math.max(options.minKept ?? nc + 1, nc);
  const base = new Float64Array(n);
  for (let i = 0; i < n; i++) base[i] = weights ? weights[i]! : 1;
  const w = base.slice();
  const used = new Uint8Array(n);
  const residuals = new Float64Array(n);
  for (let iter = 0; ; iter++) {
    const fit = weightedLeastSquares(design, n, nc, y, w);
    let nUsed = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      let m = 0;
      for (let k = 0; k < nc; k++) m += design[i * nc + k]! * fit.coeffs[k]!;
      residuals[i] = y[i]! - m;
      used[i] = w[i]! > 0 ? 1 : 0;
      if (used[i]) {
        nUsed++;
        sumSq += residuals[i]! * residuals[i]!;
      }
    }
    const rms = Math.sqrt(sumSq / Math.max(nUsed, 1));
    const reducedChi2 = fit.dof > 0 ? fit.chi2 / fit.dof : NaN;
    const done = { coeffs: fit.coeffs, covariance: fit.covariance, used, residuals, rms, chi2: fit.chi2, dof: fit.dof, reducedChi2, nUsed };
    if (!(clipSigma < Infinity) || iter >= maxIterations || !(fit.chi2 > 0)) return done;
    const limit = clipSigma * Math.sqrt(fit.chi2 / nUsed);
    let changed = false;
    let kept = 0;
    for (let i = 0; i < n; i++) if (base[i]! > 0 && Math.abs(residuals[i]!) * Math.sqrt(base[i]!) <= limit) kept++;
    if (kept < minKept) return done;
    for (let i = 0; i < n; i++) {
      const keep = base[i]! > 0 && Math.abs(residuals[i]!) * Math.sqrt(base[i]!) <= limit;
      const wi = keep ? base[i]! : 0;
      if (wi !== w[i]) changed = true;
      w[i] = wi;
    }
    if (!changed) return done;
  }
}
