/**
 * Kinematic centre and systemic velocity from the symmetry of the position-velocity curve: the
 * centre minimises the chi-square of the fold (mirror.ts), found by a grid search refined by
 * golden section. Errors: parametric bootstrap (each draw adds Gaussian noise of the stated
 * errors to every point and re-finds the minimum; seeded, so deterministic), scaled up by
 * sqrt(reduced chi-square) when the sides differ by more than the errors.
 * Chi-square is bumpy in c on the scale of the row spacing (the mirror runs through noisy nodes),
 * so its local curvature, linear propagation, or a delete-one jackknife (removing a node changes
 * the interpolation) all misjudge the error; the bootstrap lets the minimum hop between bumps
 * as the estimate itself does.
 */
import { Rng } from '../../kernels/random.js';
import type { SymmetryFit } from '../../products/curve.js';
import { dropAsymmetricPoints, foldChiSquare, foldChiSquareWith, mirrorKernels, type FoldChiSquare, type MirrorKernels, type PvSamples } from './mirror.js';

export interface SymmetryOptions {
  /** Where the search starts (internal row), e.g. the continuum peak. */
  startRow: number;
  /** Half-width of the centre search (rows). */
  searchRows: number;
  fixedCentreRow?: number;
  fixedVSysKms?: number;
}

/** The fit as the product records it (chi2Reduced, nCompared, nDropped), with the centre and v_sys. */
export interface SymmetryResult extends Pick<SymmetryFit, 'chi2Reduced' | 'nCompared' | 'nDropped'> {
  /** Kinematic centre (internal row, fractional) and its 1-sigma error (rows). */
  centreRow: number;
  centreRowErr: number;
  vSysKms: number;
  vSysErrKms: number;
  /** True when the best centre lies at the edge of the searched range. */
  atSearchEdge: boolean;
}

/** Grid steps of the centre search (rows): coarse about the start, fine about the coarse result. */
const COARSE_STEP_ROWS = 0.2;
const FINE_STEP_ROWS = 0.05;
/** Width (rows) at which the golden section stops: far below any centre error met. */
const GOLDEN_TOLERANCE_ROWS = 1e-3;
/** Grid nodes of a bootstrap draw's search, whatever its reach. */
const BOOTSTRAP_GRID_STEPS = 12;
const MIN_COMPARED = 6;
/** A point this many robust sigmas off its mirror is left out of the centre fit (common practice: 5-sigma clipping). */
export const OUTLIER_SIGMA = 5;
/** Half-width (rows) of the second, narrow search. */
const NARROW_SEARCH_ROWS = 1;

interface Best {
  centre: number;
  fold: FoldChiSquare;
  atEdge: boolean;
  /** Row about which the compared window and the search were laid. */
  windowCentre: number;
  searchRows: number;
}

/** Chi-square of the fold about a trial centre (the points, active set and compared window fixed). */
type Fold = (c: number) => FoldChiSquare;

/** Best centre in [lo, hi]: a grid of `steps` intervals, then golden section about the best node. */
function searchCentre(lo: number, hi: number, steps: number, c0: number, fold: Fold): Best {
  const step = (hi - lo) / steps;
  let bestK = 0;
  let bestChi2 = Infinity;
  for (let k = 0; k <= steps; k++) {
    const f = fold(lo + k * step);
    if (f.chi2 < bestChi2) {
      bestChi2 = f.chi2;
      bestK = k;
    }
  }
  const a = lo + Math.max(0, bestK - 1) * step;
  const b = lo + Math.min(steps, bestK + 1) * step;
  const refined = golden(a, b, c0, fold);
  return { ...refined, atEdge: bestK === 0 || bestK === steps, searchRows: (hi - lo) / 2 };
}

/** Golden-section minimum of chi-square over centres in [a, b]. */
function golden(a: number, b: number, c0: number, fold: Fold): Best {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = fold(x1).chi2;
  let f2 = fold(x2).chi2;
  while (b - a > GOLDEN_TOLERANCE_ROWS) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = fold(x1).chi2;
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = fold(x2).chi2;
    }
  }
  const centre = (a + b) / 2;
  return { centre, fold: fold(centre), atEdge: false, windowCentre: c0, searchRows: 0 };
}

/**
 * The rows compared for centres within c0 +- search: points with |y - c0| <= half, where
 * half = L - 2 search and L is the shorter side from c0, so that every mirror stays inside the
 * data and the same points are compared at every trial centre (no jumps in chi-square).
 */
function searchWindow(p: PvSamples, c0: number, searchRows: number): { search: number; half: number } {
  const n = p.y.length;
  const shorter = Math.min(c0 - p.y[0]!, p.y[n - 1]! - c0);
  const search = Math.max(0, Math.min(searchRows, shorter / 4));
  return { search, half: shorter - 2 * search };
}

function searchAbout(p: PvSamples, active: Uint8Array, c0: number, searchRows: number, stepRows: number, fixedVSys: number | undefined): Best {
  const { search, half } = searchWindow(p, c0, searchRows);
  const fold: Fold = (c) => foldChiSquare(p, active, c, c0, half, fixedVSys);
  if (search === 0) return { centre: c0, fold: fold(c0), atEdge: false, windowCentre: c0, searchRows: 0 };
  const steps = Math.max(2, Math.ceil((2 * search) / stepRows));
  return searchCentre(c0 - search, c0 + search, steps, c0, fold);
}

/** Full fit: the centre searched about the start, then again narrowly about that result (more rows compared). */
function fitOnce(p: PvSamples, active: Uint8Array, opts: SymmetryOptions): Best {
  if (opts.fixedCentreRow !== undefined) return searchAbout(p, active, opts.fixedCentreRow, 0, FINE_STEP_ROWS, opts.fixedVSysKms);
  const coarse = searchAbout(p, active, opts.startRow, opts.searchRows, COARSE_STEP_ROWS, opts.fixedVSysKms);
  if (coarse.atEdge) return coarse;
  return searchAbout(p, active, coarse.centre, NARROW_SEARCH_ROWS, FINE_STEP_ROWS, opts.fixedVSysKms);
}

/** Bootstrap draws: the error of an error from 50 draws is about 10%. */
const BOOTSTRAP_DRAWS = 50;
const BOOTSTRAP_SEED = 20260;
/** First reach (rows) of a draw's search; widened while draws land near its edge. */
const BOOTSTRAP_FIRST_REACH_ROWS = 1;
const BOOTSTRAP_MAX_WIDENINGS = 3;
const BOOTSTRAP_PILOT_DRAWS = 8;

interface Spread {
  /** Sums of squared deviations of the draws from the fit: centre (rows^2), v_sys (km/s)^2. */
  scc: number;
  svv: number;
  /** Largest centre deviation of a draw (rows). */
  maxShift: number;
}

/** The bootstrap draws with a given reach of the centre search (the same seed each time). */
function bootstrap(samples: PvSamples, active: Uint8Array, best: Best, fitsCentre: boolean, fixedVSys: number | undefined, reach: number, draws: number): Spread {
  const n = samples.y.length;
  const { half } = searchWindow(samples, best.windowCentre, best.searchRows);
  const drawn: PvSamples = { ...samples, v: new Float64Array(n) };
  const rng = new Rng(BOOTSTRAP_SEED);
  const out: Spread = { scc: 0, svv: 0, maxShift: 0 };
  // The draws change only the velocities: the mirror kernels at a centre are found once and kept
  // for every draw that tries that centre again (the grid nodes, the first golden-section steps).
  const kept = new Map<number, MirrorKernels>();
  const fold: Fold = (c) => {
    let kernels = kept.get(c);
    if (kernels === undefined) kept.set(c, (kernels = mirrorKernels(samples, active, c, best.windowCentre, half)));
    return foldChiSquareWith(drawn, kernels, fixedVSys);
  };
  for (let b = 0; b < draws; b++) {
    for (let j = 0; j < n; j++) drawn.v[j] = samples.v[j]! + samples.e[j]! * rng.normal();
    // Same compared window as the fit; the centre re-found within the reach of the fitted one.
    const again = fitsCentre ? searchCentre(best.centre - reach, best.centre + reach, BOOTSTRAP_GRID_STEPS, best.windowCentre, fold) : { centre: best.centre, fold: fold(best.centre) };
    out.scc += (again.centre - best.centre) ** 2;
    out.svv += (again.fold.vSys - best.fold.vSys) ** 2;
    out.maxShift = Math.max(out.maxShift, Math.abs(again.centre - best.centre));
  }
  return out;
}

/** Fit the centre and v_sys (either may be fixed), with bootstrap errors. */
export function fitSymmetry(samples: PvSamples, opts: SymmetryOptions): SymmetryResult | null {
  const active = new Uint8Array(samples.y.length).fill(1);
  let best = fitOnce(samples, active, opts);
  if (best.fold.n < MIN_COMPARED) return null;
  const { half } = searchWindow(samples, best.windowCentre, best.searchRows);
  // A centre at the edge of the search is not trusted enough to judge points by.
  const nDropped = best.atEdge ? 0 : dropAsymmetricPoints(samples, active, best.centre, best.windowCentre, half, best.fold.vSys, OUTLIER_SIGMA);
  if (nDropped > 0) best = fitOnce(samples, active, opts);
  if (best.fold.n < MIN_COMPARED) return null;
  const fitsCentre = opts.fixedCentreRow === undefined;
  // A few pilot draws set the reach: a draw near the edge of its search would cut the
  // distribution short, so the reach widens until the pilots land well inside it.
  let reach = BOOTSTRAP_FIRST_REACH_ROWS;
  for (let k = 0; fitsCentre && k < BOOTSTRAP_MAX_WIDENINGS; k++) {
    const pilot = bootstrap(samples, active, best, fitsCentre, opts.fixedVSysKms, reach, BOOTSTRAP_PILOT_DRAWS);
    if (pilot.maxShift <= 0.5 * reach) break;
    reach = 3 * pilot.maxShift;
  }
  const spread = bootstrap(samples, active, best, fitsCentre, opts.fixedVSysKms, reach, BOOTSTRAP_DRAWS);
  const nFree = (fitsCentre ? 1 : 0) + (opts.fixedVSysKms === undefined ? 1 : 0);
  const chi2Reduced = best.fold.chi2 / Math.max(1, best.fold.n - nFree);
  const birge = Math.max(1, Math.sqrt(chi2Reduced));
  return {
    centreRow: best.centre,
    centreRowErr: fitsCentre ? birge * Math.sqrt(spread.scc / BOOTSTRAP_DRAWS) : 0,
    vSysKms: best.fold.vSys,
    vSysErrKms: opts.fixedVSysKms === undefined ? birge * Math.sqrt(spread.svv / BOOTSTRAP_DRAWS) : 0,
    chi2Reduced,
    nCompared: best.fold.n,
    atSearchEdge: best.atEdge,
    nDropped,
  };
}
