/**
 * The sky model sky(lambda, y) = g(y) B(lambda): B a cubic B-spline in wavelength fitted to the
 * sky pixels of all sky rows at their own wavelengths (so the tilt of sky lines along the slit is
 * followed and the sampling across a sky line is finer than one row gives; after Kelson 2003,
 * PASP 115, 688), g(y) a low-order Legendre slit factor. g comes first, from the per-row median
 * ratio of the data to a spline with breakpoints one pixel apart (every sky row then feeds every
 * spline interval, so B cannot take up a slit gradient); B is then refitted on the finer
 * breakpoints with g held. A small second-difference penalty (P-splines, Eilers & Marx 1996,
 * Stat. Sci. 11, 89) keeps B defined in wavelength gaps. Fit, clip, refit; the in-band inverse of
 * the normal matrix gives the model's own variance at every pixel.
 */
import { bandedInverseInBand, factorBandedLdl, solveBandedLdl } from '../../kernels/banded-ldl.js';
import { UniformCubicBSpline } from '../../kernels/bspline.js';
import { evalLegendre1D } from '../../kernels/legendre.js';
import { fitLegendre1D } from '../../kernels/legendre-fit.js';
import { medianOfBuffer } from '../../kernels/robust.js';

/** Penalty weight relative to the mean diagonal of the normal matrix (small: fills gaps, hardly bends fitted parts). */
const PENALTY = 1e-6;
const BAND = 3;

export interface SkyFitInput {
  width: number;
  height: number;
  sci: Float32Array;
  var: Float32Array;
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
  /** Pixels used in the last fit. */
  used: number;
}

export function fitSkySpline(input: SkyFitInput, order: number, knotSpacingPx: number, clipSigma: number, iterations: number): SkySpline | null {
  const { width, height, wave } = input;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < wave.length; i++) {
    if (wave[i]! < lo) lo = wave[i]!;
    if (wave[i]! > hi) hi = wave[i]!;
  }
  const dispersion = (hi - lo) / Math.max(1, width - 1);
  const slit = new Float64Array(height).fill(1);
  if (order > 0) {
    const coarse = fitSpline(input, UniformCubicBSpline.covering(lo, hi, dispersion), slit);
    if (coarse === null) return null;
    fitSlit(input, coarse, order);
  }
  const spline = UniformCubicBSpline.covering(lo, hi, knotSpacingPx * dispersion);
  let fit: SkySpline | null = null;
  for (let round = 0; round <= iterations; round++) {
    fit = fitSpline(input, spline, slit);
    if (fit === null || round === iterations || clip(input, fit, clipSigma) === 0) break;
  }
  return fit;
}

function fitSpline(input: SkyFitInput, spline: UniformCubicBSpline, slit: Float64Array): SkySpline | null {
  const { width, height, sci, wave, use } = input;
  const n = spline.nBasis;
  const w4 = BAND + 1;
  const normal = new Float64Array(n * w4);
  const rhs = new Float64Array(n);
  const b = new Float64Array(4);
  let used = 0;
  for (let y = 0; y < height; y++) {
    const g = slit[y]!;
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (!use[i]) continue;
      const v = input.var[i]!;
      if (!(v > 0)) continue;
      used++;
      const wt = 1 / v;
      const k = spline.weights(wave[i]!, b);
      for (let p = 0; p < 4; p++) {
        const bp = g * b[p]!;
        rhs[k + p] += wt * bp * sci[i]!;
        for (let q = 0; q <= p; q++) normal[(k + p) * w4 + (p - q)] += wt * bp * g * b[q]!;
      }
    }
  }
  if (used < n / 4) return null;
  addPenalty(normal, n);
  if (!factorBandedLdl(normal, n, BAND)) return null;
  solveBandedLdl(normal, n, BAND, rhs);
  const covariance = new Float64Array(n * w4);
  bandedInverseInBand(normal, n, BAND, covariance);
  return { spline, coeffs: rhs, covariance, slit, used };
}

/** Add PENALTY * mean diagonal * D^T D, D the second-difference operator on the coefficients. */
function addPenalty(normal: Float64Array, n: number): void {
  const w4 = BAND + 1;
  let mean = 0;
  for (let k = 0; k < n; k++) mean += normal[k * w4]!;
  const kappa = (PENALTY * mean) / n || PENALTY;
  const d = [1, -2, 1];
  for (let r = 0; r + 2 < n; r++) {
    for (let p = 0; p < 3; p++) for (let q = 0; q <= p; q++) normal[(r + p) * w4 + (p - q)] += kappa * d[p]! * d[q]!;
  }
  // An empty stretch at the very ends is held by a tiny ridge so the system stays definite.
  for (let k = 0; k < n; k++) normal[k * w4] += kappa * 1e-6;
}

/**
 * g(y): per sky row the median of data / B over its good pixels, fitted by a clipped Legendre
 * series in y and scaled to a mean of 1 over the sky rows. Writes fit.slit.
 */
function fitSlit(input: SkyFitInput, fit: SkySpline, order: number): void {
  const { width, height, sci, wave, use } = input;
  const ratios = new Float64Array(width);
  const rows: number[] = [];
  const values: number[] = [];
  const b = new Float64Array(4);
  for (let y = 0; y < height; y++) {
    let n = 0;
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (!use[i]) continue;
      const s = fit.spline.value(fit.coeffs, wave[i]!, b);
      if (s > 0) ratios[n++] = sci[i]! / s;
    }
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

/** Drop used pixels further than clipSigma noise sigmas from the model; returns how many. */
function clip(input: SkyFitInput, fit: SkySpline, clipSigma: number): number {
  const { width, height, sci, wave, use } = input;
  const b = new Float64Array(4);
  let dropped = 0;
  for (let y = 0; y < height; y++) {
    const g = fit.slit[y]!;
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (!use[i]) continue;
      const r = sci[i]! - g * fit.spline.value(fit.coeffs, wave[i]!, b);
      if (r * r > clipSigma * clipSigma * input.var[i]!) {
        use[i] = 0;
        dropped++;
      }
    }
  }
  return dropped;
}

/** Model value and its variance (from the coefficient covariance) at wavelength lambda in row y. */
export function skyAt(fit: SkySpline, lambda: number, y: number, b: Float64Array): { value: number; variance: number } {
  const k = fit.spline.weights(lambda, b);
  const w4 = BAND + 1;
  let value = 0;
  let variance = 0;
  for (let p = 0; p < 4; p++) {
    value += fit.coeffs[k + p]! * b[p]!;
    for (let q = 0; q < 4; q++) {
      const hi = Math.max(k + p, k + q);
      const lo = Math.min(k + p, k + q);
      variance += b[p]! * b[q]! * fit.covariance[hi * w4 + (hi - lo)]!;
    }
  }
  const g = fit.slit[y]!;
  return { value: g * value, variance: g * g * variance };
}
