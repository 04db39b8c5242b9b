/**
 * Kinematic centre and systemic velocity from the symmetry of the position-velocity curve.
 * A disk in circular rotation is antisymmetric about (centre, v_sys): v(c + s) - v_sys =
 * -(v(c - s) - v_sys). For a trial centre c every point i is compared with the curve interpolated
 * at its mirror row 2c - y_i (from all other points): r_i = v_i + u(2c - y_i) - 2 v_sys, with
 * variance e_i^2 + var(u). v_sys minimises chi-square in closed form for each c; c is found by a
 * grid search refined by golden section. Errors: delete-one jackknife of the whole fit (the
 * residuals share interpolation nodes, so the chi-square curvature would not be a fair error).
 */

/** Points of the curve sorted by row: internal row (fractional), v_los (km/s), error (km/s). */
export interface PvSamples {
  y: Float64Array;
  v: Float64Array;
  e: Float64Array;
}

export interface SymmetryOptions {
  /** Where the search starts (internal row), e.g. the continuum peak. */
  startRow: number;
  /** Half-width of the centre search (rows). */
  searchRows: number;
  fixedCentreRow?: number;
  fixedVSysKms?: number;
}

export interface SymmetryResult {
  centreRow: number;
  centreRowErr: number;
  vSysKms: number;
  vSysErrKms: number;
  chi2Reduced: number;
  nCompared: number;
  /** True when the best centre lies at the edge of the searched range. */
  atSearchEdge: boolean;
}

const GRID_STEP_ROWS = 0.05;
const MIN_COMPARED = 6;
/** Half-width (rows) of the second, narrow search and of the jackknife refits. */
const NARROW_SEARCH_ROWS = 1;
/** A point left out moves the centre by about its error / sqrt(n): the refits search this close (rows). */
const JACKKNIFE_REACH_ROWS = 0.3;

interface Fold {
  chi2: number;
  vSys: number;
  n: number;
}

/** Next active index from k in direction dir (skipping `skip`), or -1. */
function nextActive(active: Uint8Array, skip: number, k: number, dir: 1 | -1): number {
  while (k >= 0 && k < active.length && (active[k] === 0 || k === skip)) k += dir;
  return k >= 0 && k < active.length ? k : -1;
}

/**
 * The curve at row m from the active points other than `skip`, by Catmull-Rom cubic Hermite
 * interpolation (C1, so chi-square is smooth in the centre and its minimum never sticks to a
 * node); out = [value, variance]. False outside the points.
 */
function interpolate(p: PvSamples, active: Uint8Array, skip: number, m: number, out: Float64Array): boolean {
  const { y, v, e } = p;
  let lo = 0;
  let hi = y.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (y[mid]! < m) lo = mid + 1;
    else hi = mid;
  }
  const a = nextActive(active, skip, lo - 1, -1);
  const b = nextActive(active, skip, lo, 1);
  if (a < 0 || b < 0) return false;
  const a0 = nextActive(active, skip, a - 1, -1);
  const b1 = nextActive(active, skip, b + 1, 1);
  const pa = a0 < 0 ? a : a0;
  const pb = b1 < 0 ? b : b1;
  const span = y[b]! - y[a]!;
  if (!(span > 0)) {
    out[0] = (v[a]! + v[b]!) / 2;
    out[1] = (e[a]! ** 2 + e[b]! ** 2) / 4;
    return true;
  }
  const t = (m - y[a]!) / span;
  const t2 = t * t;
  const t3 = t2 * t;
  const h00 = 2 * t3 - 3 * t2 + 1;
  const h10 = t3 - 2 * t2 + t;
  const h01 = -2 * t3 + 3 * t2;
  const h11 = t3 - t2;
  // Tangents (v_b - v_pa)/(y_b - y_pa) and (v_pb - v_a)/(y_pb - y_a), written as weights on the four values.
  const ka = (h10 * span) / (y[b]! - y[pa]!);
  const kb = (h11 * span) / (y[pb]! - y[a]!);
  // At the ends the outer point is the inner one: merge the weights so its variance counts once.
  let wa = h00 - kb;
  let wb = h01 + ka;
  let wpa = -ka;
  let wpb = kb;
  if (pa === a) {
    wa += wpa;
    wpa = 0;
  }
  if (pb === b) {
    wb += wpb;
    wpb = 0;
  }
  const value = wpa * v[pa]! + wa * v[a]! + wb * v[b]! + wpb * v[pb]!;
  const variance = (wpa * e[pa]!) ** 2 + (wa * e[a]!) ** 2 + (wb * e[b]!) ** 2 + (wpb * e[pb]!) ** 2;
  out[0] = value;
  out[1] = variance;
  return true;
}

/** Chi-square of the fold about row c, comparing the active points with |y - c0| <= half. */
function fold(p: PvSamples, active: Uint8Array, c: number, c0: number, half: number, fixedVSys: number | undefined, scratch: Float64Array): Fold {
  const { y, v, e } = p;
  let sw = 0;
  let swx = 0;
  let swxx = 0;
  let n = 0;
  for (let i = 0; i < y.length; i++) {
    if (active[i] === 0 || Math.abs(y[i]! - c0) > half) continue;
    if (!interpolate(p, active, i, 2 * c - y[i]!, scratch)) continue;
    const w = 1 / (e[i]! ** 2 + scratch[1]!);
    const x = v[i]! + scratch[0]!;
    sw += w;
    swx += w * x;
    swxx += w * x * x;
    n++;
  }
  if (n === 0) return { chi2: Infinity, vSys: NaN, n };
  // sum w (x - 2 vs)^2 expanded, so one pass suffices.
  const vSys = fixedVSys ?? swx / (2 * sw);
  const chi2 = swxx - 4 * vSys * swx + 4 * vSys * vSys * sw;
  return { chi2, vSys, n };
}

interface Best {
  centre: number;
  fold: Fold;
  atEdge: boolean;
  /** Row about which the compared window and the search were laid. */
  windowCentre: number;
  searchRows: number;
}

/** Best centre in [lo, hi]: grid, then golden section about the best grid node. */
function searchCentre(p: PvSamples, active: Uint8Array, lo: number, hi: number, c0: number, half: number, fixedVSys: number | undefined, scratch: Float64Array): Best {
  const steps = Math.max(1, Math.ceil((hi - lo) / GRID_STEP_ROWS));
  const step = (hi - lo) / steps;
  let bestK = 0;
  let bestChi2 = Infinity;
  for (let k = 0; k <= steps; k++) {
    const f = fold(p, active, lo + k * step, c0, half, fixedVSys, scratch);
    if (f.chi2 < bestChi2) {
      bestChi2 = f.chi2;
      bestK = k;
    }
  }
  const a = lo + Math.max(0, bestK - 1) * step;
  const b = lo + Math.min(steps, bestK + 1) * step;
  const refined = golden(p, active, a, b, c0, half, fixedVSys, scratch);
  return { ...refined, atEdge: bestK === 0 || bestK === steps, searchRows: (hi - lo) / 2 };
}

/** Golden-section minimum of chi-square over centres in [a, b]. */
function golden(p: PvSamples, active: Uint8Array, a: number, b: number, c0: number, half: number, fixedVSys: number | undefined, scratch: Float64Array): Best {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = fold(p, active, x1, c0, half, fixedVSys, scratch).chi2;
  let f2 = fold(p, active, x2, c0, half, fixedVSys, scratch).chi2;
  while (b - a > 1e-4) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = fold(p, active, x1, c0, half, fixedVSys, scratch).chi2;
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = fold(p, active, x2, c0, half, fixedVSys, scratch).chi2;
    }
  }
  const centre = (a + b) / 2;
  return { centre, fold: fold(p, active, centre, c0, half, fixedVSys, scratch), atEdge: false, windowCentre: c0, searchRows: 0 };
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

function searchAbout(p: PvSamples, active: Uint8Array, c0: number, searchRows: number, fixedVSys: number | undefined, scratch: Float64Array): Best {
  const { search, half } = searchWindow(p, c0, searchRows);
  if (search === 0) return { centre: c0, fold: fold(p, active, c0, c0, half, fixedVSys, scratch), atEdge: false, windowCentre: c0, searchRows: 0 };
  return searchCentre(p, active, c0 - search, c0 + search, c0, half, fixedVSys, scratch);
}

/** Full fit: the centre searched about the start, then again narrowly about that result (more rows compared). */
function fitOnce(p: PvSamples, active: Uint8Array, opts: SymmetryOptions, scratch: Float64Array): Best {
  if (opts.fixedCentreRow !== undefined) return searchAbout(p, active, opts.fixedCentreRow, 0, opts.fixedVSysKms, scratch);
  const coarse = searchAbout(p, active, opts.startRow, opts.searchRows, opts.fixedVSysKms, scratch);
  if (coarse.atEdge) return coarse;
  return searchAbout(p, active, coarse.centre, NARROW_SEARCH_ROWS, opts.fixedVSysKms, scratch);
}

/** A jackknife refit: same compared window as the full fit, golden section close to its centre. */
function refit(p: PvSamples, active: Uint8Array, best: Best, fixedVSys: number | undefined, scratch: Float64Array): Best {
  const { half } = searchWindow(p, best.windowCentre, best.searchRows);
  if (best.searchRows === 0) return { ...best, fold: fold(p, active, best.centre, best.windowCentre, half, fixedVSys, scratch) };
  const [lo, hi] = [best.centre - JACKKNIFE_REACH_ROWS, best.centre + JACKKNIFE_REACH_ROWS];
  return golden(p, active, lo, hi, best.windowCentre, half, fixedVSys, scratch);
}

/** Fit the centre and v_sys (either may be fixed) with jackknife errors. */
export function fitSymmetry(p: PvSamples, opts: SymmetryOptions): SymmetryResult | null {
  const n = p.y.length;
  const active = new Uint8Array(n).fill(1);
  const scratch = new Float64Array(2);
  const best = fitOnce(p, active, opts, scratch);
  if (best.fold.n < MIN_COMPARED) return null;
  const fitsCentre = opts.fixedCentreRow === undefined;
  // Each jackknife refit repeats the final search with one point left out; sums of deviations
  // from the full fit keep the variance free of cancellation.
  let sc = 0;
  let scc = 0;
  let sv = 0;
  let svv = 0;
  let m = 0;
  for (let d = 0; d < n; d++) {
    active[d] = 0;
    const j = refit(p, active, best, opts.fixedVSysKms, scratch);
    active[d] = 1;
    if (!Number.isFinite(j.fold.vSys)) continue;
    const dc = j.centre - best.centre;
    const dv = j.fold.vSys - best.fold.vSys;
    sc += dc;
    scc += dc * dc;
    sv += dv;
    svv += dv * dv;
    m++;
  }
  const jackVar = (s: number, ss: number): number => (m > 1 ? Math.max(0, ((m - 1) / m) * (ss - (s * s) / m)) : NaN);
  const nFree = (fitsCentre ? 1 : 0) + (opts.fixedVSysKms === undefined ? 1 : 0);
  return {
    centreRow: best.centre,
    centreRowErr: fitsCentre ? Math.sqrt(jackVar(sc, scc)) : 0,
    vSysKms: best.fold.vSys,
    vSysErrKms: opts.fixedVSysKms === undefined ? Math.sqrt(jackVar(sv, svv)) : 0,
    chi2Reduced: best.fold.chi2 / Math.max(1, best.fold.n - nFree),
    nCompared: best.fold.n,
    atSearchEdge: best.atEdge,
  };
}
