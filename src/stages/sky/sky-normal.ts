/**
 * The normal equations of the sky spline fit, kept unfactored with the model so that pixels can
 * later be taken out of them: a clipping round or the emission mask drops a few thousand pixels
 * of millions, and subtracting their terms from the sums (a rank-one downdate per pixel) gives the
 * refit's very equations without visiting the kept pixels again.
 */
import { UniformCubicBSpline } from '../../kernels/bspline.js';
import type { SkyFitInput } from './sky-spline.js';
import { pieceValue } from './spline-pieces.js';

const B = UniformCubicBSpline;

/** The sums of a fit: the band of the normal matrix (band storage, p = 3), its right-hand side, pixel counts. */
export interface NormalSums {
  normal: Float64Array;
  rhs: Float64Array;
  used: number;
  dropped: number;
}

export function emptySums(nBasis: number): NormalSums {
  return { normal: new Float64Array(nBasis * 4), rhs: new Float64Array(nBasis), used: 0, dropped: 0 };
}

/**
 * Add the used pixels of row y (slit factor g) to the sums. A function per row: small, it is
 * compiled once, where a pixel loop inside the fit had the fit compiled again for each kind of call.
 */
export function addRow(input: SkyFitInput, spline: UniformCubicBSpline, g: number, y: number, sums: NormalSums): void {
  const { width, use } = input;
  const variance = input.var;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (!use[i] || !(variance[i]! > 0)) continue;
    addPixel(input, spline, g, i, 1, sums);
  }
}

/**
 * Pixels of row y further than sqrt(limit2) noise sigmas from the fitted model (its pieces, slit
 * factor g, the factor the sums were made with) are cleared in `use` and taken out of the sums.
 */
export function clipRow(input: SkyFitInput, spline: UniformCubicBSpline, pieces: Float64Array, g: number, y: number, limit2: number, sums: NormalSums): void {
  const { width, sci, wave, use } = input;
  const variance = input.var;
  const { start, inverseSpacing, nIntervals } = spline;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (!use[i]) continue;
    const v = variance[i]!;
    if (!(v > 0)) continue;
    const t = (wave[i]! - start) * inverseSpacing;
    const k = B.interval(t, nIntervals);
    const res = sci[i]! - g * pieceValue(pieces, 4 * k, t - k);
    if (res * res > limit2 * v) {
      use[i] = 0;
      addPixel(input, spline, g, i, -1, sums);
    }
  }
}

/** Take the pixels of row y with marks[i] === mark (pixels the sums hold) out of the sums. */
export function removeMarked(input: SkyFitInput, spline: UniformCubicBSpline, g: number, y: number, marks: Uint8Array, mark: number, sums: NormalSums): void {
  const { width } = input;
  const variance = input.var;
  for (let x = 0, i = y * width; x < width; x++, i++) {
    if (marks[i] !== mark || !(variance[i]! > 0)) continue;
    addPixel(input, spline, g, i, -1, sums);
  }
}

/** Add (sign 1) or subtract (sign -1) pixel i's terms g^2 b b^T / v and g d b / v. */
function addPixel(input: SkyFitInput, spline: UniformCubicBSpline, g: number, i: number, sign: number, sums: NormalSums): void {
  const { start, inverseSpacing, nIntervals } = spline;
  const { normal, rhs } = sums;
  const v = input.var[i]!;
  const u = input.wave[i]!;
  const t = (u - start) * inverseSpacing;
  const k = B.interval(t, nIntervals);
  const s = t - k;
  const b0 = B.basis0(s);
  const b1 = B.basis1(s);
  const b2 = B.basis2(s);
  const b3 = B.basis3(s);
  const w = (sign * g * g) / v;
  const wd = (sign * g * input.sci[i]!) / v;
  if (sign > 0) sums.used++;
  else {
    sums.used--;
    sums.dropped++;
  }
  rhs[k] += wd * b0;
  rhs[k + 1] += wd * b1;
  rhs[k + 2] += wd * b2;
  rhs[k + 3] += wd * b3;
  const a = k * 4;
  // Band storage: entry (k + p, k + q) at (k + p) * 4 + (p - q).
  const w0 = w * b0;
  const w1 = w * b1;
  const w2 = w * b2;
  const w3 = w * b3;
  normal[a] += w0 * b0;
  normal[a + 4] += w1 * b1;
  normal[a + 5] += w1 * b0;
  normal[a + 8] += w2 * b2;
  normal[a + 9] += w2 * b1;
  normal[a + 10] += w2 * b0;
  normal[a + 12] += w3 * b3;
  normal[a + 13] += w3 * b2;
  normal[a + 14] += w3 * b1;
  normal[a + 15] += w3 * b0;
}
