/**
 * One Levenberg-Marquardt fit of a tied line group to one window of a bin's spectrum, with
 * bounds on the centre (velocity tolerance), width (instrumental to maximum dispersion) and
 * fluxes (>= 0), errors from (J^T W J)^-1 at the solution.
 */
import { chi2ErrorScale } from '../../kernels/chi2-scale.js';
import { levenbergMarquardt } from '../../kernels/levenberg-marquardt.js';
import { GroupModel, type GroupSpec } from './group-model.js';

/**
 * Iteration budget and chi-square tolerance of a group fit: a line fit with signal converges in
 * 2-6 steps; 50 only cuts short the slow wander of noise-only fits (flagged notConverged). A
 * relative chi-square change of 1e-6 is about 1e-4 in absolute chi-square, far below the 1 that
 * moves a parameter by its error.
 */
const MAX_ITERATIONS = 50;
const REL_TOLERANCE = 1e-6;

export interface Window {
  /** Wavelength (Angstrom, air) and width (Angstrom) of each pixel. */
  wave: Float64Array;
  pixelWidth: Float64Array;
  /** Data (electrons) and weights (1 / variance; 0 excludes the pixel). */
  data: Float64Array;
  weight: Float64Array;
}

export interface GroupGuess {
  /** Observed centre of members[0] (Angstrom) and its observed sigma (Angstrom). */
  centre: number;
  sigma: number;
  /** Free fluxes (electrons), one per free flux parameter. */
  fluxes: number[];
  c0: number;
}

export interface GroupFitOptions {
  centreRange: [number, number];
  sigmaRange: [number, number];
  /** Hold the sigma of members[0] at this value (Angstrom). */
  fixedSigma?: number;
  scaleByChi2: boolean;
}

export interface GroupFit {
  centre: number;
  centreErr: number;
  sigma: number;
  /** 0 when the sigma is held. */
  sigmaErr: number;
  /** Per member: flux and error (electrons). */
  flux: number[];
  fluxErr: number[];
  chi2: number;
  dof: number;
  converged: boolean;
  /** Centre or sigma on a bound; per member: its free flux on its bound (0). */
  shapeAtBound: boolean;
  fluxAtBound: boolean[];
  /** Model at each window pixel. */
  model: Float64Array;
}

export function fitGroup(win: Window, spec: GroupSpec, guess: GroupGuess, options: GroupFitOptions): GroupFit {
  const m = win.wave.length;
  const lambdaRef = 0.5 * (win.wave[0]! + win.wave[m - 1]!);
  const model = new GroupModel(spec, win.pixelWidth, lambdaRef, options.fixedSigma);
  const n = model.nParams;
  const start = new Float64Array(n);
  const lower = new Float64Array(n).fill(-Infinity);
  const upper = new Float64Array(n).fill(Infinity);
  // Index access, not destructuring: destructuring takes the iterator protocol, which made this
  // function several times larger to compile.
  start[0] = guess.centre;
  lower[0] = options.centreRange[0];
  upper[0] = options.centreRange[1];
  const held = options.fixedSigma !== undefined;
  if (!held) {
    start[1] = Math.min(Math.max(guess.sigma, options.sigmaRange[0]), options.sigmaRange[1]);
    lower[1] = options.sigmaRange[0];
    upper[1] = options.sigmaRange[1];
  }
  for (let j = 0; j < spec.nFree; j++) {
    start[model.fluxStart + j] = Math.max(guess.fluxes[j] ?? 0, 0);
    lower[model.fluxStart + j] = 0;
  }
  start[model.c0Index] = guess.c0;
  const r = levenbergMarquardt(model, win.wave, win.data, win.weight, start, { lower, upper, maxIterations: MAX_ITERATIONS, relTolerance: REL_TOLERANCE });
  const scale = options.scaleByChi2 ? chi2ErrorScale(r.chi2, r.dof) : 1;
  const err = (k: number): number => Math.sqrt(r.covariance[k * n + k]!) * scale;
  const flux: number[] = [];
  const fluxErr: number[] = [];
  const fluxAtBound: boolean[] = [];
  for (let k = 0; k < spec.members.length; k++) {
    const fi = model.fluxStart + spec.fluxIndex[k]!;
    flux.push(spec.fluxFactor[k]! * r.params[fi]!);
    fluxErr.push(spec.fluxFactor[k]! * err(fi));
    fluxAtBound.push(r.atBound[fi]!);
  }
  return {
    centre: r.params[0]!,
    centreErr: err(0),
    sigma: held ? options.fixedSigma! : r.params[1]!,
    sigmaErr: held ? 0 : err(1),
    flux,
    fluxErr,
    chi2: r.chi2,
    dof: r.dof,
    converged: r.converged,
    shapeAtBound: r.atBound[0]! || (!held && r.atBound[1]!),
    fluxAtBound,
    model: r.model,
  };
}
