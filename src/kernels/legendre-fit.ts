/**
 * Least-squares Legendre fits (1-D and tensor-product 2-D) with iterative sigma clipping.
 * Clipping: after each fit, every point whose normalised residual |r_i| sqrt(w_i) exceeds
 * clipSigma times the scale of the normalised residuals of the kept points (their RMS, or with
 * `robust` their MAD x 1.4826, and then only the worst few per round) is left out of the next
 * fit; points may come back; it stops when
 * the kept set no longer changes (common practice).
 */
import { legendreBasis, normalise, type Legendre1D, type Legendre2D } from './legendre.js';
import { quadraticForm, weightedLeastSquares } from './least-squares.js';
import { madSigma } from './robust.js';

export interface LegendreFitOptions {
  /** Clipping threshold in units of the RMS normalised residual; Infinity disables. Default 3. */
  clipSigma?: number;
  /** Most clipping rounds. Default 5 (20 with `robust`, which leaves out fewer points per round). */
  maxIterations?: number;
  /** Never clip below this many kept points (the fit keeps the best ones). Default nCoeffs + 1. */
  minKept?: number;
  /**
   * Scale the threshold by the MAD of the normalised residuals instead of their RMS, and leave out
   * at most 5% of the kept points per round, the worst first (default false): with few points one
   * gross outlier inflates the RMS enough to hide itself, or bends the fit enough to push good
   * points out with it.
   */
  robust?: boolean;
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
  const fit = clippedFit(design1D(x, order, range), n, nc, y, weights, options);
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
  const nc = (xOrder + 1) * (yOrder + 1);
  const fit = clippedFit(design2D(x, y, xOrder, yOrder, range), n, nc, z, weights, options);
  return { ...fit, model: { kind: 'legendre2d', xOrder, yOrder, ...range, coeffs: Array.from(fit.coeffs) } };
}

// The design matrices are built in functions of their own: code after a long loop has no type
// feedback when V8 compiles that loop on the fly, and the fit after it would send every later
// call back to the interpreter.

/** Row i: P_k(u_i), k = 0..order. */
function design1D(x: ArrayLike<number>, order: number, range: { min: number; max: number }): Float64Array {
  const n = x.length;
  const nc = order + 1;
  const design = new Float64Array(n * nc);
  const basis = new Float64Array(nc);
  for (let i = 0; i < n; i++) {
    legendreBasis(normalise(x[i]!, range.min, range.max), order, basis);
    design.set(basis, i * nc);
  }
  return design;
}

/** Row i: P_k(u_i) P_j(v_i) at column j (xOrder + 1) + k. */
function design2D(x: ArrayLike<number>, y: ArrayLike<number>, xOrder: number, yOrder: number, range: { xMin: number; xMax: number; yMin: number; yMax: number }): Float64Array {
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
  return design;
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
  const maxIterations = options.maxIterations ?? (options.robust ? 20 : 5);
  const minKept = Math.max(options.minKept ?? nc + 1, nc);
  // The data as a Float64Array whatever the caller passed (plain arrays or typed ones): one kind of
  // array keeps this function and the solver it calls compiled once.
  const yv = Float64Array.from(y);
  const base = new Float64Array(n);
  for (let i = 0; i < n; i++) base[i] = weights ? weights[i]! : 1;
  const w = base.slice();
  const used = new Uint8Array(n);
  const residuals = new Float64Array(n);
  for (let iter = 0; ; iter++) {
    const fit = weightedLeastSquares(design, n, nc, yv, w);
    let nUsed = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      let m = 0;
      for (let k = 0; k < nc; k++) m += design[i * nc + k]! * fit.coeffs[k]!;
      residuals[i] = yv[i]! - m;
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
    const scores = options.robust ? studentised(design, n, nc, residuals, base, w, fit.covariance) : normalisedResiduals(residuals, base);
    const limit = clipSigma * (options.robust ? robustScale(scores, w) : Math.sqrt(fit.chi2 / nUsed));
    const next = nextWeights(scores, base, w, limit, options.robust === true);
    let kept = 0;
    let changed = false;
    for (let i = 0; i < n; i++) {
      if (next[i]! > 0) kept++;
      if (next[i] !== w[i]) changed = true;
    }
    if (kept < minKept) return done;
    w.set(next);
    if (!changed) return done;
  }
}

/** In robust mode at most this share of the kept points (and at least one) leaves per round, the worst first. */
const ROBUST_SHARE_PER_ROUND = 0.05;

/**
 * Weights of the next round: points beyond `limit` (normalised) are left out and left-out points
 * within it come back. In robust mode only the worst few of the kept points leave per round, so
 * that a fit bent by one gross outlier does not throw out the good points around it.
 */
function nextWeights(scores: Float64Array, base: Float64Array, w: Float64Array, limit: number, robust: boolean): Float64Array {
  const n = scores.length;
  const next = new Float64Array(n);
  const beyond: number[] = [];
  for (let i = 0; i < n; i++) {
    if (!(base[i]! > 0)) continue;
    if (Math.abs(scores[i]!) <= limit) next[i] = base[i]!;
    else if (robust && w[i]! > 0) beyond.push(i);
  }
  if (robust) {
    let nKept = 0;
    for (let i = 0; i < n; i++) if (w[i]! > 0) nKept++;
    beyond.sort((a, b) => Math.abs(scores[b]!) - Math.abs(scores[a]!));
    const leave = Math.max(1, Math.ceil(ROBUST_SHARE_PER_ROUND * nKept));
    for (const i of beyond.slice(leave)) next[i] = base[i]!;
  }
  return next;
}

/** r_i sqrt(w_i) with the given (unclipped) weights. */
function normalisedResiduals(residuals: Float64Array, base: Float64Array): Float64Array {
  return residuals.map((r, i) => r * Math.sqrt(base[i]!));
}

/**
 * Studentised residuals: r_i sqrt(w_i) / sqrt(1 - h_i) for the kept points and / sqrt(1 + h_i)
 * for the left-out ones, h_i = w_i a_i^T (A^T W A)^-1 a_i the leverage (Cook & Weisberg 1982,
 * Residuals and Influence in Regression). A point that pulls the fit onto itself scores high.
 */
function studentised(design: Float64Array, n: number, nc: number, residuals: Float64Array, base: Float64Array, w: Float64Array, covariance: Float64Array): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const h = base[i]! * quadraticForm(covariance, nc, design, i * nc);
    const kept = w[i]! > 0;
    out[i] = (residuals[i]! * Math.sqrt(base[i]!)) / Math.sqrt(kept ? Math.max(1 - h, 1e-12) : 1 + h);
  }
  return out;
}

/** MAD x 1.4826 of the scores of the kept points (rows of weight > 0); their RMS when the MAD is 0. */
function robustScale(scores: Float64Array, w: Float64Array): number {
  const normalised: number[] = [];
  let sumSq = 0;
  for (let i = 0; i < scores.length; i++) {
    if (!(w[i]! > 0)) continue;
    const r = scores[i]!;
    normalised.push(r);
    sumSq += r * r;
  }
  const mad = madSigma(normalised);
  return mad > 0 ? mad : Math.sqrt(sumSq / normalised.length);
}
