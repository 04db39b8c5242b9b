/**
 * A focused Levenberg-Marquardt solver for small weighted least-squares problems (a few
 * parameters, tens to hundreds of points): Marquardt's multiplicative damping
 * (J^T W J + lambda diag(J^T W J)) delta = J^T W r (Marquardt 1963, SIAM J. Appl. Math. 11, 431),
 * box bounds by projection with the bound-pushing parameters frozen for the step, convergence on
 * the relative decrease of chi-square, and the covariance (J^T W J)^-1 at the solution.
 * The workspace is reused between calls and iterations: nothing is allocated per iteration.
 */
import { choleskyFactor, choleskyInverse, choleskySolve } from './cholesky.js';

export interface LmModel {
  nParams: number;
  /** Fill model values and the Jacobian (row-major nPoints x nParams, d model / d param) at params. */
  evaluate(params: Float64Array, x: Float64Array, model: Float64Array, jacobian: Float64Array): void;
}

export interface LmOptions {
  /** Lower bounds per parameter (-Infinity for none). Default: unbounded. */
  lower?: Float64Array;
  /** Upper bounds per parameter (+Infinity for none). Default: unbounded. */
  upper?: Float64Array;
  /** Largest number of trial steps. Default 100. */
  maxIterations?: number;
  /** Stop when an accepted step lowers chi-square by less than this fraction. Default 1e-7. */
  relTolerance?: number;
  /** Starting damping lambda. Default 1e-3 (Marquardt's choice, common practice). */
  initialDamping?: number;
}

export interface LmResult {
  params: Float64Array;
  /** (J^T W J)^-1 at the solution, row-major nParams x nParams; NaN when singular. Not scaled by chi2/dof. */
  covariance: Float64Array;
  /** The model at the solution (what evaluate gives at params), so a caller need not evaluate it again. */
  model: Float64Array;
  /** sum w (y - model)^2 at the solution. */
  chi2: number;
  /** Points with positive weight minus the number of parameters. */
  dof: number;
  /** Trial steps taken. */
  iterations: number;
  converged: boolean;
  /** Per parameter: true when it ends on its lower or upper bound. */
  atBound: boolean[];
}

/** Damping beyond which no step can lower chi-square: the solution is a minimum to rounding. */
const MAX_DAMPING = 1e16;
const MIN_DAMPING = 1e-12;

class Workspace {
  readonly model: Float64Array;
  readonly trialModel: Float64Array;
  readonly jacobian: Float64Array;
  readonly trialJacobian: Float64Array;
  readonly normal: Float64Array;
  readonly system: Float64Array;
  readonly gradient: Float64Array;
  readonly step: Float64Array;
  readonly params: Float64Array;
  readonly trial: Float64Array;
  readonly frozen: Uint8Array;
  busy = false;

  constructor(
    readonly maxPoints: number,
    readonly maxParams: number,
  ) {
    this.model = new Float64Array(maxPoints);
    this.trialModel = new Float64Array(maxPoints);
    this.jacobian = new Float64Array(maxPoints * maxParams);
    this.trialJacobian = new Float64Array(maxPoints * maxParams);
    this.normal = new Float64Array(maxParams * maxParams);
    this.system = new Float64Array(maxParams * maxParams);
    this.gradient = new Float64Array(maxParams);
    this.step = new Float64Array(maxParams);
    this.params = new Float64Array(maxParams);
    this.trial = new Float64Array(maxParams);
    this.frozen = new Uint8Array(maxParams);
  }
}

let shared: Workspace | null = null;

function acquire(nPoints: number, nParams: number): Workspace {
  if (shared && !shared.busy && shared.maxPoints >= nPoints && shared.maxParams >= nParams) return shared;
  const ws = new Workspace(Math.max(nPoints, shared?.maxPoints ?? 0), Math.max(nParams, shared?.maxParams ?? 0));
  if (!shared || !shared.busy) shared = ws;
  return ws;
}

/** Fit `model` to y(x) with weights (1 / variance; 0 excludes a point) starting from `initial`. */
export function levenbergMarquardt(
  model: LmModel,
  x: Float64Array,
  y: Float64Array,
  weights: Float64Array,
  initial: Float64Array,
  options: LmOptions = {},
): LmResult {
  const n = model.nParams;
  const m = x.length;
  if (y.length !== m || weights.length !== m) throw new RangeError(`levenbergMarquardt: x, y and weights differ in length (${m}, ${y.length}, ${weights.length})`);
  if (initial.length !== n) throw new RangeError(`levenbergMarquardt: initial has ${initial.length} values for ${n} parameters`);
  const lower = options.lower;
  const upper = options.upper;
  const maxIterations = options.maxIterations ?? 100;
  const relTolerance = options.relTolerance ?? 1e-7;

  const ws = acquire(m, n);
  ws.busy = true;
  try {
    let p = ws.params.subarray(0, n);
    let t = ws.trial.subarray(0, n);
    let f = ws.model.subarray(0, m);
    let ft = ws.trialModel.subarray(0, m);
    let jac = ws.jacobian.subarray(0, m * n);
    let jt = ws.trialJacobian.subarray(0, m * n);
    const a = ws.normal;
    const sys = ws.system;
    const g = ws.gradient;
    const step = ws.step;
    const frozen = ws.frozen;

    for (let k = 0; k < n; k++) p[k] = clamp(initial[k]!, lower?.[k], upper?.[k]);
    model.evaluate(p, x, f, jac);
    let chi2 = chiSquare(y, f, weights);
    normalEquations(jac, y, f, weights, m, n, a, g);

    let lambda = options.initialDamping ?? 1e-3;
    let iterations = 0;
    let converged = chi2 === 0;
    while (!converged && iterations < maxIterations) {
      iterations++;
      // The rare paths (a parameter on a bound, a rejected step) compute their values here, at
      // every step, with the same operations: code that has never run has no type feedback, and
      // reaching it would send the compiled solver back to the interpreter to be compiled again.
      const raised = lambda * 10;
      const overDamped = raised > MAX_DAMPING;
      let maxDiag = 0;
      for (let k = 0; k < n; k++) maxDiag = Math.max(maxDiag, a[k * n + k]!);
      for (let k = 0; k < n; k++) {
        // A parameter on a bound whose gradient points outward stays there for this step.
        const pk = p[k]!;
        const gk = g[k]!;
        const atLower = lower !== undefined ? pk <= lower[k]! : false;
        const atUpper = upper !== undefined ? pk >= upper[k]! : false;
        const outwardLow = gk <= 0;
        const outwardHigh = gk >= 0;
        frozen[k] = (atLower && outwardLow) || (atUpper && outwardHigh) ? 1 : 0;
      }
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) sys[i * n + j] = frozen[i] || frozen[j] ? 0 : a[i * n + j]!;
        const d = Math.max(a[i * n + i]!, 1e-15 * maxDiag, Number.MIN_VALUE);
        sys[i * n + i] = frozen[i] ? 1 : d * (1 + lambda);
        step[i] = frozen[i] ? 0 : g[i]!;
      }
      if (!choleskyFactor(sys, n)) {
        lambda = raised;
        if (overDamped) break;
        continue;
      }
      choleskySolve(sys, n, step);
      let moved = false;
      for (let k = 0; k < n; k++) {
        t[k] = clamp(p[k]! + step[k]!, lower?.[k], upper?.[k]);
        if (t[k] !== p[k]) moved = true;
      }
      if (!moved) {
        converged = true;
        break;
      }
      model.evaluate(t, x, ft, jt);
      const chi2Trial = chiSquare(y, ft, weights);
      if (chi2Trial <= chi2) {
        const relative = chi2 > 0 ? (chi2 - chi2Trial) / chi2 : 0;
        const tp = p;
        p = t;
        t = tp;
        const tf = f;
        f = ft;
        ft = tf;
        const tj = jac;
        jac = jt;
        jt = tj;
        chi2 = chi2Trial;
        normalEquations(jac, y, f, weights, m, n, a, g);
        // A small decrease counts as convergence only near the Gauss-Newton regime: under heavy
        // damping a step is a short gradient step whose small decrease says little.
        if (relative < relTolerance && lambda <= 1) converged = true;
        lambda = Math.max(lambda / 10, MIN_DAMPING);
      } else {
        lambda = raised;
        if (overDamped) converged = true;
      }
    }

    const covariance = new Float64Array(n * n);
    sys.set(a.subarray(0, n * n));
    if (choleskyFactor(sys, n)) choleskyInverse(sys, n, covariance, step);
    else covariance.fill(NaN);

    let used = 0;
    for (let i = 0; i < m; i++) if (weights[i]! > 0) used++;
    const atBound: boolean[] = [];
    for (let k = 0; k < n; k++) atBound.push((lower !== undefined && p[k]! <= lower[k]!) || (upper !== undefined && p[k]! >= upper[k]!));
    return { params: Float64Array.from(p), covariance, model: f.slice(), chi2, dof: used - n, iterations, converged, atBound };
  } finally {
    ws.busy = false;
  }
}

function clamp(v: number, lo: number | undefined, hi: number | undefined): number {
  if (lo !== undefined && v < lo) return lo;
  if (hi !== undefined && v > hi) return hi;
  return v;
}

function chiSquare(y: Float64Array, f: Float64Array, w: Float64Array): number {
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    const wi = w[i]!;
    if (wi > 0) {
      const r = y[i]! - f[i]!;
      s += wi * r * r;
    }
  }
  return s;
}

/** a = J^T W J (n x n), g = J^T W (y - f). */
function normalEquations(jac: Float64Array, y: Float64Array, f: Float64Array, w: Float64Array, m: number, n: number, a: Float64Array, g: Float64Array): void {
  a.fill(0, 0, n * n);
  g.fill(0, 0, n);
  for (let i = 0; i < m; i++) {
    const wi = w[i]!;
    if (!(wi > 0)) continue;
    const r = wi * (y[i]! - f[i]!);
    const row = i * n;
    for (let k = 0; k < n; k++) {
      const jk = jac[row + k]!;
      g[k] += jk * r;
      // A zero derivative (a line's flux far from it) adds only zeros to its row: a + 0 is a
      // (the sums start at +0 and never become -0), so skipping it changes no bit.
      if (jk === 0) continue;
      const wj = wi * jk;
      const ak = k * n;
      for (let l = 0; l <= k; l++) a[ak + l] += wj * jac[row + l]!;
    }
  }
  for (let k = 0; k < n; k++) for (let l = 0; l < k; l++) a[l * n + k] = a[k * n + l]!;
}
