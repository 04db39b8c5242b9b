/**
 * The mirrored curve and the chi-square of a fold. A disk in circular rotation is antisymmetric
 * about (centre, v_sys): v(c + s) - v_sys = -(v(c - s) - v_sys). For a trial centre c every point i
 * is compared with the curve at its mirror row 2c - y_i, smoothed from all other points:
 * r_i = v_i + u(2c - y_i) - 2 v_sys, with variance e_i^2 + var(u); v_sys minimises chi-square in
 * closed form for each c.
 */
import { lowerIndex, madSigma, median } from '../../kernels/index.js';

/** Points of the curve sorted by row: internal row (fractional), v_los (km/s), error (km/s). */
export interface PvSamples {
  y: Float64Array;
  v: Float64Array;
  e: Float64Array;
  /** Half-width (rows) of the mirror's smoothing kernel; see pvSamples(). */
  kernelRows: number;
  /** Scratch of kernelAt(), one per point: the weights of its first pass, reused by its second. */
  weights: Float64Array;
}

/** An equivalent kernel: the curve at a row is sum_j l[j] v[k[j]] over `size` points, with `variance`. */
interface Kernel {
  k: Int32Array;
  l: Float64Array;
  size: number;
  variance: number;
}

function newKernel(n: number): Kernel {
  return { k: new Int32Array(n), l: new Float64Array(n), size: 0, variance: 0 };
}

/** Samples from sorted arrays, with the kernel width set from the median row spacing. */
export function pvSamples(y: Float64Array, v: Float64Array, e: Float64Array): PvSamples {
  const gaps = new Float64Array(Math.max(0, y.length - 1));
  for (let k = 1; k < y.length; k++) gaps[k - 1] = y[k]! - y[k - 1]!;
  const spacing = gaps.length > 0 ? median(gaps) : 1;
  return { y, v, e, kernelRows: KERNEL_SPACINGS * (spacing > 0 ? spacing : 1), weights: new Float64Array(y.length) };
}

export interface FoldChiSquare {
  chi2: number;
  vSys: number;
  n: number;
}

/** Half-width of the mirror's biweight kernel in median row spacings (about a Gaussian of sigma 0.9 spacing). */
const KERNEL_SPACINGS = 2.5;

/**
 * The equivalent kernel of the curve at row m from the active points other than `skip`: a local
 * linear fit with biweight kernel weights (1 - (x/h)^2)^2 times the error weights (smooth in m, and
 * it averages down the node noise that would make chi-square bumpy), written into `out` from
 * entry `at` on. Its variance does not depend on the velocities, only the value sum l v does.
 * Returns the number of entries, or -1 when m lies outside the points.
 * `lo` is the first point with y >= m - kernelRows (lowerFrom).
 */
function kernelAt(p: PvSamples, active: Uint8Array, skip: number, m: number, lo: number, out: Kernel, at: number): number {
  const { y, e, weights } = p;
  const n = y.length;
  if (!(m >= y[0]! && m <= y[n - 1]!)) return -1;
  const h = p.kernelRows;
  // Weighted sums of the local linear fit in x = y - m; the value at m is the intercept.
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  for (let k = lo; k < n && y[k]! <= m + h; k++) {
    if (active[k] === 0 || k === skip) continue;
    const x = y[k]! - m;
    const q = 1 - (x / h) ** 2;
    const w = (q * q) / (e[k]! * e[k]!);
    weights[k] = w;
    s0 += w;
    s1 += w * x;
    s2 += w * x * x;
  }
  const det = s0 * s2 - s1 * s1;
  if (!(s0 > 0) || !(det > 1e-12 * s0 * s2)) return -1;
  // Equivalent kernel: l_k = w_k (s2 - s1 x_k) / det.
  let variance = 0;
  let j = at;
  for (let k = lo; k < n && y[k]! <= m + h; k++) {
    if (active[k] === 0 || k === skip) continue;
    const l = weights[k]! * ((s2 - s1 * (y[k]! - m)) / det);
    out.k[j] = k;
    out.l[j++] = l;
    variance += l * l * e[k]! * e[k]!;
  }
  out.variance = variance;
  return j - at;
}

/** sum l v over kernel entries [from, to): the curve's value, for the velocities v. */
function kernelValue(kernel: Kernel, from: number, to: number, v: Float64Array): number {
  let value = 0;
  for (let j = from; j < to; j++) value += kernel.l[j]! * v[kernel.k[j]!]!;
  return value;
}

/**
 * lowerIndex(y, x) found by stepping from `from`, the answer for a nearby x: the callers' mirror
 * rows 2c - y_i move steadily down the points, so this takes a step or two, not a binary search.
 */
function lowerFrom(y: Float64Array, x: number, from: number): number {
  let k = from;
  while (k > 0 && y[k - 1]! >= x) k--;
  while (k < y.length && y[k]! < x) k++;
  return k;
}

/**
 * The mirrors' kernels at trial centre c: for every active point i with |y_i - c0| <= half whose
 * mirror row 2c - y_i lies among the points, the equivalent kernel of the curve there (without
 * point i): its entries and variance. They do not depend on the velocities, so a bootstrap keeps
 * them for every draw that tries the centre again and needs only the sums l v (foldChiSquareWith).
 */
export interface MirrorKernels {
  count: number;
  point: Int32Array;
  /** Entries of point j's kernel: [start[j], start[j + 1]) of `entries`. */
  start: Int32Array;
  entries: Kernel;
  variance: Float64Array;
}

export function mirrorKernels(p: PvSamples, active: Uint8Array, c: number, c0: number, half: number): MirrorKernels {
  const { y } = p;
  const n = y.length;
  const point = new Int32Array(n);
  const start = new Int32Array(n + 1);
  const variance = new Float64Array(n);
  // Built in a scratch store that grows as needed (each kernel holds at most n entries, mostly a
  // few), then copied at its size: a bootstrap keeps hundreds of these.
  let entries = building.k.length >= 4 * n ? building : (building = newKernel(4 * n));
  let count = 0;
  let lo = lowerIndex(y, 2 * c - y[0]! - p.kernelRows);
  for (let i = 0; i < n; i++) {
    if (active[i] === 0 || Math.abs(y[i]! - c0) > half) continue;
    const m = 2 * c - y[i]!;
    lo = lowerFrom(y, m - p.kernelRows, lo);
    const at = start[count]!;
    if (entries.k.length - at < n) entries = building = grown(entries, at + n);
    const size = kernelAt(p, active, i, m, lo, entries, at);
    if (size < 0) continue;
    point[count] = i;
    variance[count] = entries.variance;
    start[++count] = at + size;
  }
  const size = start[count]!;
  const kept: Kernel = { k: entries.k.slice(0, size), l: entries.l.slice(0, size), size, variance: 0 };
  return { count, point: point.slice(0, count), start: start.slice(0, count + 1), entries: kept, variance: variance.slice(0, count) };
}

let building = newKernel(0);

function grown(kernel: Kernel, least: number): Kernel {
  const out = newKernel(Math.max(least, 2 * kernel.k.length));
  out.k.set(kernel.k);
  out.l.set(kernel.l);
  return out;
}

/** Chi-square of the fold about row c, comparing the active points with |y - c0| <= half. */
export function foldChiSquare(p: PvSamples, active: Uint8Array, c: number, c0: number, half: number, fixedVSys: number | undefined): FoldChiSquare {
  return foldChiSquareWith(p, mirrorKernels(p, active, c, c0, half), fixedVSys);
}

/** foldChiSquare at the centre of `kernels` (made with the same points and active set), for the velocities of p. */
export function foldChiSquareWith(p: PvSamples, kernels: MirrorKernels, fixedVSys: number | undefined): FoldChiSquare {
  const { v, e } = p;
  const { point, start, entries, variance } = kernels;
  let sw = 0;
  let swx = 0;
  let swxx = 0;
  for (let j = 0; j < kernels.count; j++) {
    const i = point[j]!;
    const w = 1 / (e[i]! ** 2 + variance[j]!);
    const x = v[i]! + kernelValue(entries, start[j]!, start[j + 1]!, v);
    sw += w;
    swx += w * x;
    swxx += w * x * x;
  }
  return foldResult(sw, swx, swxx, kernels.count, fixedVSys);
}

function foldResult(sw: number, swx: number, swxx: number, n: number, fixedVSys: number | undefined): FoldChiSquare {
  if (n === 0) return { chi2: Infinity, vSys: NaN, n };
  // sum w (x - 2 vs)^2 expanded, so one pass suffices.
  const vSys = fixedVSys ?? swx / (2 * sw);
  const chi2 = swxx - 4 * vSys * swx + 4 * vSys * vSys * sw;
  return { chi2, vSys, n };
}

/**
 * Leave out (active = 0) the points that disagree with their mirror by more than `limit` times
 * the robust scatter (MAD) of the normalised residuals (at least 1 sigma), at the centre c and
 * systemic velocity vSys; returns how many. Scaling by the scatter keeps a fold whose errors are
 * all too small, or a centre far off, from losing most of its points. A point far off its mirror
 * also pulls the mirrors of its neighbours' partners, but diluted by the kernel: one pass suffices.
 */
export function dropAsymmetricPoints(p: PvSamples, active: Uint8Array, c: number, c0: number, half: number, vSys: number, limit: number): number {
  const { y, v, e } = p;
  const z = new Float64Array(y.length).fill(NaN);
  const { count, point, start, entries, variance } = mirrorKernels(p, active, c, c0, half);
  for (let j = 0; j < count; j++) {
    const i = point[j]!;
    z[i] = (v[i]! + kernelValue(entries, start[j]!, start[j + 1]!, v) - 2 * vSys) / Math.sqrt(e[i]! ** 2 + variance[j]!);
  }
  const cut = limit * Math.max(1, madSigma(z));
  let dropped = 0;
  for (let i = 0; i < y.length; i++) {
    if (Math.abs(z[i]!) > cut) {
      active[i] = 0;
      dropped++;
    }
  }
  return dropped;
}
