/**
 * The sky model sky(lambda, y) = g(y) B(lambda): B a cubic B-spline in wavelength fitted to the
 * sky pixels of all sky rows at their own wavelengths (so the tilt of sky lines along the slit is
 * followed and the sampling across a sky line is finer than one row gives; after Kelson 2003,
 * PASP 115, 688), g(y) a low-order Legendre slit factor. g comes first, from the per-row median
 * ratio of the data to a spline with breakpoints one pixel apart (every sky row then feeds every
 * spline interval, so B cannot take up a slit gradient); B is then refitted on the finer
 * breakpoints with g held. A small second-difference penalty (P-splines, Eilers & Marx 1996,
 * Stat. Sci. 11, 89) keeps B defined in wavelength gaps. Fit, clip, refit (the clipped pixels
 * taken out of the normal equations, sky-normal.ts); the in-band inverse of the normal matrix
 * gives the model's own variance at every pixel.
 */
import { bandedInverseInBand, factorBandedLdl, solveBandedLdl } from '../../kernels/banded-ldl.js';
import { UniformCubicBSpline } from '../../kernels/bspline.js';
import { evalLegendre1D } from '../../kernels/legendre.js';
import { fitLegendre1D } from '../../kernels/legendre-fit.js';
import { medianOfBuffer } from '../../kernels/robust.js';
import type { CalibratedFrame } from '../../products/frame.js';
import { addRow, clipRow, emptySums, removeMarked, type NormalSums } from './sky-normal.js';
import { addPenalty, BAND } from './spline-penalty.js';
import { pieceValue, pieceVariance, valuePieces, variancePieces } from './spline-pieces.js';

const B = UniformCubicBSpline;

/** Rows between those that set the slit factor g: g is smooth along the slit and each row's median is already precise. */
const SLIT_ROW_STEP = 4;

/** The frame's pixels (electrons, variance electrons^2), their air wavelengths (Angstrom) and which may be used. */
export interface SkyFitInput extends Pick<CalibratedFrame, 'width' | 'height' | 'sci' | 'var'> {
  wave: Float64Array;
  /** 1 where a pixel may be used (a good pixel of a sky row); updated by the clipping. */
  use: Uint8Array;
}

export interface SkySpline {
  spline: UniformCubicBSpline;
  coeffs: Float64Array;
  /** In-band inverse of the penalised normal matrix (band storage, p = 3): coefficient covariance. */
  covariance: Float64Array;
  /** Slit factor g per row. */
  slit: Float64Array;
  /** Pixels used in the fit, and those its clipping dropped. */
  used: number;
  dropped: number;
  /** The unpenalised normal equations of the fit (its own copy), for refits without some pixels. */
  sums: NormalSums;
  /** The model in piecewise-polynomial form (spline-pieces.ts), for evaluation. */
  pieces: Float64Array;
}

export function fitSkySpline(input: SkyFitInput, order: number, knotSpacingPx: number, clipSigma: number, iterations: number, rowStep = 1): SkySpline | null {
  const { width, height, wave } = input;
  // Wavelength increases along each row (internal orientation): its ends bound the range.
  let lo = Infinity;
  let hi = -Infinity;
  for (let y = 0; y < height; y++) {
    lo = Math.min(lo, wave[y * width]!);
    hi = Math.max(hi, wave[y * width + width - 1]!);
  }
  const dispersion = (hi - lo) / Math.max(1, width - 1);
  const slit = new Float64Array(height).fill(1);
  const rows = rowsInUse(input);
  if (order > 0) {
    const coarse = fitSpline(input, rows, UniformCubicBSpline.covering(lo, hi, dispersion), slit, Math.max(rowStep, SLIT_ROW_STEP));
    if (coarse === null) return null;
    fitSlit(input, rows, coarse, order);
  }
  const spline = UniformCubicBSpline.covering(lo, hi, knotSpacingPx * dispersion);
  let fit = fitSpline(input, rows, spline, slit, rowStep);
  // Each round clips against the current model and takes the clipped pixels out of its sums;
  // a round that drops nothing has converged.
  const limit2 = clipSigma * clipSigma;
  for (let round = 0; round < iterations && fit !== null; round++) {
    const sums = refitStart(fit.sums);
    for (const y of rows) if (y % rowStep === 0) clipRow(input, spline, fit.pieces, slit[y]!, y, limit2, sums);
    if (sums.dropped === 0) break;
    fit = solve(spline, slit, sums);
  }
  return fit;
}

/**
 * The fit without the pixels of `rows` marked `mark` in `marks` (pixels `fit` used; the caller
 * clears them in its `use`), slit factor held: the refit after masking a few pixels.
 */
export function refitWithout(fit: SkySpline, input: SkyFitInput, rows: Uint8Array, marks: Uint8Array, mark: number): SkySpline | null {
  const sums = refitStart(fit.sums);
  for (let y = 0; y < rows.length; y++) if (rows[y]) removeMarked(input, fit.spline, fit.slit[y]!, y, marks, mark, sums);
  return solve(fit.spline, fit.slit, sums);
}

/**
 * The rows holding a used pixel. The clipping only clears `use`, so they stay a superset through
 * the rounds; the fits skip the other rows (most of the frame) without visiting their pixels.
 */
function rowsInUse(input: SkyFitInput): Int32Array {
  const { width, height, use } = input;
  const rows: number[] = [];
  for (let y = 0; y < height; y++) {
    for (let x = 0, i = y * width; x < width; x++, i++) {
      if (use[i]) {
        rows.push(y);
        break;
      }
    }
  }
  return Int32Array.from(rows);
}

/** Least squares of the spline on the used pixels of every rowStep-th row (of `rows`, the rows holding any). */
function fitSpline(input: SkyFitInput, rows: Int32Array, spline: UniformCubicBSpline, slit: Float64Array, rowStep: number): SkySpline | null {
  const sums = emptySums(spline.nBasis);
  for (const y of rows) if (y % rowStep === 0) addRow(input, spline, slit[y]!, y, sums);
  return solve(spline, slit, sums);
}

/** The penalised solution of the sums (kept as they are) and its in-band covariance. */
function solve(spline: UniformCubicBSpline, slit: Float64Array, sums: NormalSums): SkySpline | null {
  const n = spline.nBasis;
  if (sums.used < n / 4) return null;
  const normal = sums.normal.slice();
  const rhs = sums.rhs.slice();
  addPenalty(normal, n);
  if (!factorBandedLdl(normal, n, BAND)) return null;
  solveBandedLdl(normal, n, BAND, rhs);
  const covariance = new Float64Array(n * 4);
  bandedInverseInBand(normal, n, BAND, covariance);
  return { spline, coeffs: rhs, covariance, slit, used: sums.used, dropped: sums.dropped, sums, pieces: valuePieces(rhs, spline.nIntervals) };
}

/** A copy of a fit's sums to take pixels out of (the fit keeps its own); nothing dropped yet. */
function refitStart(s: NormalSums): NormalSums {
  return { normal: s.normal.slice(), rhs: s.rhs.slice(), used: s.used, dropped: 0 };
}

/**
 * g(y): per sky row the median of data / B over its good pixels, fitted by a clipped Legendre
 * series in y and scaled to a mean of 1 over the sky rows. Writes fit.slit.
 */
function fitSlit(input: SkyFitInput, inUse: Int32Array, fit: SkySpline, order: number): void {
  const { width, height } = input;
  const ratios = new Float64Array(width);
  const rows: number[] = [];
  const values: number[] = [];
  for (const y of inUse) {
    if (y % SLIT_ROW_STEP !== 0) continue;
    const n = rowRatios(input, fit, y, ratios);
    if (n < width / 4) continue;
    rows.push(y);
    values.push(medianOfBuffer(ratios, n));
  }
  if (rows.length <= order + 1) return;
  const result = fitLegendre1D(rows, values, null, order, { min: 0, max: height - 1 }, { clipSigma: 3 });
  let mean = 0;
  for (const y of rows) mean += evalLegendre1D(result.model, y);
  mean /= rows.length;
  for (let y = 0; y < height; y++) fit.slit[y] = evalLegendre1D(result.model, y) / mean;
}

/** data / B of the used pixels of row y where B > 0, into ratios[0..n); returns n. A function of its own, compiled once (as addRow). */
function rowRatios(input: SkyFitInput, fit: SkySpline, y: number, ratios: Float64Array): number {
  const { width, sci, wave, use } = input;
  const { start, inverseSpacing, nIntervals } = fit.spline;
  const pieces = fit.pieces;
  let n = 0;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (!use[i]) continue;
    const t = (wave[i]! - start) * inverseSpacing;
    const k = B.interval(t, nIntervals);
    const value = pieceValue(pieces, 4 * k, t - k);
    if (value > 0) ratios[n++] = sci[i]! / value;
  }
  return n;
}

/** Where evaluateRow puts the model's variance, and the variance's pieces (variancePieces of the fit's covariance). */
export interface ModelVariance {
  out: Float64Array;
  pieces: Float64Array;
}

/**
 * Model values of the pixels offset..offset+width-1 (row y) into value[0..width), and with
 * `variance` the model's variance b^T Z b (Z the coefficient covariance) into variance.out.
 */
export function evaluateRow(fit: SkySpline, wave: Float64Array, offset: number, width: number, y: number, value: Float64Array, variance: ModelVariance | null): void {
  const { start, inverseSpacing, nIntervals } = fit.spline;
  const pv = fit.pieces;
  const g = fit.slit[y]!;
  const g2 = g * g;
  // A boolean and one array type each keep the loop monomorphic (a nullable array is tested at every pixel).
  const withVariance = variance !== null;
  const modelVar = variance?.out ?? value;
  const pz = variance?.pieces ?? pv;
  for (let x = 0; x < width; x++) {
    const t = (wave[offset + x]! - start) * inverseSpacing;
    const k = B.interval(t, nIntervals);
    const s = t - k;
    value[x] = g * pieceValue(pv, 4 * k, s);
    if (withVariance) modelVar[x] = g2 * pieceVariance(pz, 7 * k, s);
  }
}

/** out = data - model at every pixel of the rows set in `rows` (of every row when null); rows of `width` pixels, one per slit row of the fit. */
export function subtractModel(fit: SkySpline, wave: Float64Array, data: Float32Array, width: number, rows: Uint8Array | null, out: Float32Array): void {
  const height = fit.slit.length;
  const value = new Float64Array(width);
  for (let y = 0; y < height; y++) {
    if (rows !== null && !rows[y]) continue;
    evaluateRow(fit, wave, y * width, width, y, value, null);
    for (let x = 0, i = y * width; x < width; x++, i++) out[i] = data[i]! - value[x]!;
  }
}

/** sciOut = data - model and varOut = variance + the model's own variance, at every pixel. */
export function subtractModelWithVariance(fit: SkySpline, wave: Float64Array, data: Float32Array, variance: Float32Array, width: number, sciOut: Float32Array, varOut: Float32Array): void {
  const height = fit.slit.length;
  const value = new Float64Array(width);
  const modelVar: ModelVariance = { out: new Float64Array(width), pieces: variancePieces(fit.covariance, fit.spline.nIntervals) };
  for (let y = 0; y < height; y++) {
    evaluateRow(fit, wave, y * width, width, y, value, modelVar);
    for (let x = 0, i = y * width; x < width; x++, i++) {
      sciOut[i] = data[i]! - value[x]!;
      varOut[i] = variance[i]! + modelVar.out[x]!;
    }
  }
}
