/**
 * One Gaussian on a linear continuum, fitted by Levenberg-Marquardt to points x, y with weights
 * (1 / variance; 0 excludes a point):
 *   f(x) = amplitude exp(-(x - centre)^2 / (2 sigma^2)) + c0 + c1 (x - xRef)
 * The Gaussian is sampled at x (not integrated over pixels): centroids are unaffected by symmetry;
 * the fitted sigma of a pixel-integrated line is about sqrt(sigma^2 + 1/12) in pixel units.
 */
import { levenbergMarquardt, type LmModel } from './levenberg-marquardt.js';

export interface GaussianGuess {
  /** Peak height above the continuum (units of y). */
  amplitude: number;
  /** Centre (units of x). */
  centre: number;
  /** Gaussian sigma (units of x), > 0. */
  sigma: number;
  /** Continuum at the midpoint of the x span (default 0). */
  c0?: number;
  /** Continuum slope per unit x (default 0). */
  c1?: number;
}

export interface GaussianFitOptions {
  /** Hold sigma at this value instead of fitting it (the width constraint at low S/N). */
  fixedSigma?: number;
  /** Allowed sigma range. Default [initial / 5, initial * 5], common practice. */
  sigmaRange?: [number, number];
  /** Allowed centre range. Default: the span of x. */
  centreRange?: [number, number];
  /** Fit the slope c1 (default true); false fits a flat continuum. */
  fitSlope?: boolean;
  /** Keep the amplitude >= 0 (default false, so that noise-only fits stay unbiased). */
  positive?: boolean;
  /** Multiply the errors by sqrt(chi2 / dof) (default false: errors from the variances as given). */
  scaleByChi2?: boolean;
  maxIterations?: number;
  relTolerance?: number;
}

export interface GaussianFitErrors {
  amplitude: number;
  centre: number;
  /** 0 when sigma was fixed. */
  sigma: number;
  c0: number;
  /** 0 when the slope was not fitted. */
  c1: number;
  flux: number;
}

export interface GaussianFitResult {
  amplitude: number;
  centre: number;
  sigma: number;
  c0: number;
  c1: number;
  /** Reference point of the continuum (midpoint of the x span). */
  xRef: number;
  /** amplitude * sigma * sqrt(2 pi): the area under the Gaussian (units of y times x). */
  flux: number;
  /** 1-sigma errors from the covariance (J^T W J)^-1, scaled by sqrt(chi2/dof) if asked. */
  errors: GaussianFitErrors;
  chi2: number;
  dof: number;
  iterations: number;
  converged: boolean;
  /** True when the centre or sigma ends on a bound. */
  atBound: boolean;
}

/** Parameters: [amplitude, centre, sigma?, c0, c1?] (sigma and c1 present only when fitted). */
class GaussianLineModel implements LmModel {
  readonly nParams: number;
  constructor(
    readonly xRef: number,
    readonly fixedSigma: number | undefined,
    readonly fitSlope: boolean,
  ) {
    this.nParams = 3 + (fixedSigma === undefined ? 1 : 0) + (fitSlope ? 1 : 0);
  }

  evaluate(p: Float64Array, x: Float64Array, model: Float64Array, jac: Float64Array): void {
    const n = this.nParams;
    const freeSigma = this.fixedSigma === undefined;
    const amp = p[0]!;
    const centre = p[1]!;
    const sigma = freeSigma ? p[2]! : this.fixedSigma!;
    const ic0 = freeSigma ? 3 : 2;
    const c0 = p[ic0]!;
    const c1 = this.fitSlope ? p[ic0 + 1]! : 0;
    const inv2s2 = 1 / (2 * sigma * sigma);
    for (let i = 0; i < x.length; i++) {
      const d = x[i]! - centre;
      const e = Math.exp(-d * d * inv2s2);
      const dx = x[i]! - this.xRef;
      model[i] = amp * e + c0 + c1 * dx;
      const row = i * n;
      const ae = amp * e;
      jac[row] = e;
      jac[row + 1] = (ae * d) / (sigma * sigma);
      if (freeSigma) jac[row + 2] = (ae * d * d) / (sigma * sigma * sigma);
      jac[row + ic0] = 1;
      if (this.fitSlope) jac[row + ic0 + 1] = dx;
    }
  }
}

export function fitGaussianLine(x: Float64Array, y: Float64Array, weights: Float64Array, initial: GaussianGuess, options: GaussianFitOptions = {}): GaussianFitResult {
  if (!(initial.sigma > 0)) throw new RangeError(`fitGaussianLine: initial sigma must be > 0, got ${initial.sigma}`);
  if (options.fixedSigma !== undefined && !(options.fixedSigma > 0)) throw new RangeError(`fitGaussianLine: fixedSigma must be > 0, got ${options.fixedSigma}`);
  const m = x.length;
  let xMin = Infinity;
  let xMax = -Infinity;
  for (let i = 0; i < m; i++) {
    if (x[i]! < xMin) xMin = x[i]!;
    if (x[i]! > xMax) xMax = x[i]!;
  }
  const xRef = (xMin + xMax) / 2;
  const fitSlope = options.fitSlope ?? true;
  const model = new GaussianLineModel(xRef, options.fixedSigma, fitSlope);
  const n = model.nParams;
  const freeSigma = options.fixedSigma === undefined;
  const ic0 = freeSigma ? 3 : 2;

  const start = new Float64Array(n);
  const lower = new Float64Array(n).fill(-Infinity);
  const upper = new Float64Array(n).fill(Infinity);
  start[0] = initial.amplitude;
  if (options.positive) lower[0] = 0;
  const [cLo, cHi] = options.centreRange ?? [xMin, xMax];
  start[1] = initial.centre;
  lower[1] = cLo;
  upper[1] = cHi;
  if (freeSigma) {
    const [sLo, sHi] = options.sigmaRange ?? [initial.sigma / 5, initial.sigma * 5];
    start[2] = initial.sigma;
    lower[2] = sLo;
    upper[2] = sHi;
  }
  start[ic0] = initial.c0 ?? 0;
  if (fitSlope) start[ic0 + 1] = initial.c1 ?? 0;

  const lmOptions: { lower: Float64Array; upper: Float64Array; maxIterations?: number; relTolerance?: number } = { lower, upper };
  if (options.maxIterations !== undefined) lmOptions.maxIterations = options.maxIterations;
  if (options.relTolerance !== undefined) lmOptions.relTolerance = options.relTolerance;
  const r = levenbergMarquardt(model, x, y, weights, start, lmOptions);

  const scale = options.scaleByChi2 && r.dof > 0 ? Math.sqrt(r.chi2 / r.dof) : 1;
  const cov = r.covariance;
  const err = (k: number): number => Math.sqrt(cov[k * n + k]!) * scale;
  const amplitude = r.params[0]!;
  const sigma = freeSigma ? r.params[2]! : options.fixedSigma!;
  const root2pi = Math.sqrt(2 * Math.PI);
  // flux = A s sqrt(2 pi): var = 2 pi (s^2 var A + A^2 var s + 2 A s cov(A, s))
  const fluxVar = freeSigma ? 2 * Math.PI * (sigma * sigma * cov[0]! + amplitude * amplitude * cov[2 * n + 2]! + 2 * amplitude * sigma * cov[2]!) : 2 * Math.PI * sigma * sigma * cov[0]!;
  return {
    amplitude,
    centre: r.params[1]!,
    sigma,
    c0: r.params[ic0]!,
    c1: fitSlope ? r.params[ic0 + 1]! : 0,
    xRef,
    flux: amplitude * sigma * root2pi,
    errors: {
      amplitude: err(0),
      centre: err(1),
      sigma: freeSigma ? err(2) : 0,
      c0: err(ic0),
      c1: fitSlope ? err(ic0 + 1) : 0,
      flux: Math.sqrt(Math.max(fluxVar, 0)) * scale,
    },
    chi2: r.chi2,
    dof: r.dof,
    iterations: r.iterations,
    converged: r.converged,
    atBound: r.atBound[1]! || (freeSigma && r.atBound[2]!),
  };
}
