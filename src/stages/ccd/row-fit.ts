/**
 * Legendre fits along x of every row of an image (the flat's shape along the dispersion), with
 * the clipping rule of kernels/legendre-fit.ts (clip |r| > clipSigma sqrt(chi2 / n_kept), points
 * may return, stop when the kept set holds). Faster than one fitLegendre1D per row on full
 * frames: the design matrix and the normal matrix of a fully usable row are built once, and each
 * row or clipping round only subtracts the outer products of the points it leaves out. The
 * model is taken at every x once per row, at the end: chi2 comes from the normal equations, and
 * the clipping rounds test the residuals about a reference model (the last row's, scaled, or the
 * first fit's), taking again at the current coefficients only the points that the distance to the
 * reference could move across the limit, so every decision, and the result, is the plain rule's.
 */
import { choleskyFactor, choleskySolve } from '../../kernels/cholesky.js';
import { legendreBasis, normalise } from '../../kernels/legendre.js';
import { addTerms, copyModel, countOnes, dot, keptSquares, lastTerms, maskRow, modelBound, modelFromResidual, modelTerms, proposeCandidates, proposeNear, sameCoefficients, scaledResiduals, type ProposalLists } from './row-fit-passes.js';

/** chi2 from the normal equations below this fraction of sum y^2 is rounding: taken from the residuals instead. */
const ROUNDING = 1e-9;
/** The last row's model serves as the first reference when within this fraction of the clipping limit. */
const NEAR_FRACTION = 0.25;
/** Residuals within these fractions of the first limit are the candidates of later rounds (limits move by a few per cent). */
const CANDIDATE_BAND = [0.7, 1.4] as const;

export interface RowFitOptions {
  clipSigma: number;
  maxIterations: number;
}

export class RowLegendreFitter {
  private readonly nc: number;
  private readonly design: Float64Array;
  /** The design matrix by basis function: byColumn[k * width + x]. */
  private readonly byColumn: Float64Array;
  private readonly fullNormal: Float64Array;
  private readonly normal: Float64Array;
  /** The normal matrix of the usable pattern last seen, and that pattern. */
  private readonly baseNormal: Float64Array;
  private readonly baseUsable: Uint8Array;
  private baseValid = false;
  private readonly work: Float64Array;
  private readonly rhs: Float64Array;
  private readonly coeffs: Float64Array;
  private readonly kept: Uint8Array;
  private readonly residual: Float64Array;
  /** The row with its unusable points set to 0. */
  private readonly maskedRow: Float64Array;
  /** The kept set a clipping round proposes. */
  private readonly trial: Uint8Array;
  /** Stands in for the basis functions past the order in passes of four. */
  private readonly zeros: Float64Array;
  /** The points where `trial` differs from `kept` and the candidates near the limit, in order of x. */
  private readonly lists: ProposalLists;
  /** A pass's four coefficients, then the same for the mirrored x. */
  private readonly terms = new Float64Array(8);
  /** The coefficients at which `residual` was last taken at every x. */
  private readonly reference: Float64Array;
  /** Sum of squares of the kept values (chi2 = this - coeffs . rhs at the solution). */
  private sumSquares = 0;
  /** The last row's model (before rounding to float32) and coefficients, once a row has been fitted. */
  private readonly previous: Float64Array;
  private readonly previousCoeffs: Float64Array;
  private previousHolds = false;

  /** Series of `order` over x = 0 .. width - 1 (u = normalise(x, 0, width - 1)). */
  constructor(readonly width: number, readonly order: number) {
    const nc = order + 1;
    this.nc = nc;
    this.design = new Float64Array(width * nc);
    const basis = new Float64Array(nc);
    for (let x = 0; x < width; x++) this.design.set(legendreBasis(normalise(x, 0, width - 1), order, basis), x * nc);
    this.byColumn = new Float64Array(width * nc);
    for (let x = 0; x < width; x++) for (let k = 0; k < nc; k++) this.byColumn[k * width + x] = this.design[x * nc + k]!;
    this.fullNormal = new Float64Array(nc * nc);
    for (let x = 0; x < width; x++) this.accumulate(this.fullNormal, x, 1);
    this.normal = new Float64Array(nc * nc);
    this.baseNormal = new Float64Array(nc * nc);
    this.baseUsable = new Uint8Array(width);
    this.work = new Float64Array(nc * nc);
    this.rhs = new Float64Array(nc);
    this.coeffs = new Float64Array(nc);
    this.kept = new Uint8Array(width);
    this.residual = new Float64Array(width);
    this.maskedRow = new Float64Array(width);
    this.trial = new Uint8Array(width);
    this.zeros = new Float64Array(width);
    this.reference = new Float64Array(nc);
    this.previous = new Float64Array(width);
    this.previousCoeffs = new Float64Array(nc);
    this.lists = { changes: new Int32Array(width), candidates: new Int32Array(width), counts: new Int32Array(3) };
  }

  /**
   * Fit `row` where `usable` is 1, writing the model at every x into `model`. Returns false (and
   * leaves `model` alone) when fewer than 2 (order + 1) points are usable.
   */
  fit(row: ArrayLike<number>, usable: Uint8Array, model: Float32Array, options: RowFitOptions): boolean {
    const { width, nc, kept, residual, trial, coeffs, reference, lists } = this;
    const minKept = nc + 1;
    let count = countOnes(usable, width);
    if (count < 2 * nc) return false;
    this.startNormal(usable);
    kept.set(usable);
    // Unusable points enter the right-hand side as exact zeros (adding 0 changes no sum), which keeps its loop branch-free.
    this.sumSquares = maskRow(row, usable, this.maskedRow, width);
    this.startRhs();
    // `residual` holds row - model(reference) (exact: `exact`), or undefined values (`holds` false).
    let holds = false;
    let exact = false;
    let candidatesHold = false;
    let lo = 0;
    let hi = 0;
    // Each pass over x is a function or method of its own, so V8 compiles this one once.
    for (let iter = 0; ; iter++) {
      if (!this.solve()) return false;
      let chi2 = this.sumSquares - dot(coeffs, this.rhs, nc);
      const trusted = chi2 > ROUNDING * this.sumSquares;
      if (iter === 0 && trusted) holds = this.startFromPrevious(row, options.clipSigma * Math.sqrt(chi2 / count));
      if (!trusted || !holds) {
        chi2 = this.residuals(row);
        reference.set(coeffs);
        holds = true;
        exact = true;
        candidatesHold = false;
      }
      if (iter >= options.maxIterations || !(chi2 > 0)) break;
      // The new kept set into `trial`, applied only when it holds enough points.
      const limit = options.clipSigma * Math.sqrt(chi2 / count);
      const bound = modelBound(coeffs, reference, nc, limit);
      // Points far from the limit at which the candidates were listed cannot cross one near it.
      let next: number;
      if (candidatesHold && lo + bound <= limit && hi - bound > limit) {
        next = proposeCandidates(row, residual, limit, bound, this.design, coeffs, nc, kept, trial, lists);
      } else {
        lo = CANDIDATE_BAND[0] * limit;
        hi = CANDIDATE_BAND[1] * limit;
        next = proposeNear(row, usable, residual, limit, bound, this.design, coeffs, nc, kept, trial, lists, lo, hi, width);
        candidatesHold = true;
      }
      if (next < minKept) break;
      const changed = this.applyTrial(row);
      count = next;
      if (!changed) break;
    }
    // The model is row - residual, as at the last coefficients' residuals; taken again when those are other ones'.
    if (exact && sameCoefficients(coeffs, reference, nc)) modelFromResidual(row, residual, this.previous, width);
    else this.residuals(row, this.previous);
    copyModel(this.previous, model, width);
    this.previousCoeffs.set(coeffs);
    this.previousHolds = true;
    return true;
  }

  /**
   * residual = row - s * (the last row's model), s = the ratio of the constant terms, when the
   * bound on the model's distance from it (reference = s * its coefficients) is below
   * NEAR_FRACTION of the clipping limit: neighbouring rows differ by a scale and noise, so most
   * points are then decided from it. False when there is no last row or it is too far.
   */
  private startFromPrevious(row: ArrayLike<number>, limit: number): boolean {
    const { nc, coeffs, reference, previousCoeffs } = this;
    if (!this.previousHolds) return false;
    const s = coeffs[0]! / previousCoeffs[0]!;
    if (!(s > 0 && s < Infinity)) return false;
    for (let k = 0; k < nc; k++) reference[k] = s * previousCoeffs[k]!;
    if (!(modelBound(coeffs, reference, nc, limit) <= NEAR_FRACTION * limit)) return false;
    scaledResiduals(row, this.previous, s, this.residual, this.width);
    return true;
  }

  /** Right-hand side by basis function from maskedRow (the same sums, in the same order, as per point). */
  private startRhs(): void {
    const { width, nc, maskedRow: masked } = this;
    // Four sums per pass over x: independent chains the processor overlaps (each still in order of x).
    for (let k = 0; k < nc; k += 4) {
      const [d0, d1, d2, d3] = this.columns(k);
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let x = 0; x < width; x++) {
        const m = masked[x]!;
        s0 += m * d0[x]!;
        s1 += m * d1[x]!;
        s2 += m * d2[x]!;
        s3 += m * d3[x]!;
      }
      const sums = [s0, s1, s2, s3];
      for (let j = 0; j < 4 && k + j < nc; j++) this.rhs[k + j] = sums[j]!;
    }
  }

  /** kept = trial at the points listed in `changes` (in order of x), the normal matrix and right-hand side updated point by point; false when none changed. */
  private applyTrial(row: ArrayLike<number>): boolean {
    const { normal, kept, trial } = this;
    const { changes, counts } = this.lists;
    const n = counts[0]!;
    for (let i = 0; i < n; i++) {
      const x = changes[i]!;
      const keep = trial[x]!;
      const sign = keep ? 1 : -1;
      this.accumulate(normal, x, sign);
      this.addRhs(row[x]!, x, sign);
      this.sumSquares += sign * row[x]! * row[x]!;
      kept[x] = keep;
    }
    return n > 0;
  }

  /**
   * residual = row - model at every x (the model's terms added in order k = 0, 1, ...); returns
   * chi2 over the kept points. Four basis functions per pass over x, the last pass also taking
   * the residual; basis functions past the order enter as zero columns with coefficient -0 (their
   * terms are -0, which adding leaves every sum as it was, signed zeros included). x and its
   * mirror width - 1 - x share one pass: u is negated exactly, so P_k there is (-1)^k P_k(u)
   * bit for bit, and the mirror's terms are the same products with the odd coefficients negated.
   * With `model`, the last pass writes row - residual there instead (and chi2 is not taken).
   */
  private residuals(row: ArrayLike<number>, model?: Float64Array): number {
    const { width, nc, coeffs, residual } = this;
    const c = (k: number): number => (k < nc ? coeffs[k]! : -0);
    // The mirror's coefficient: negated for odd k within the order (the zero columns' -0 stays).
    const m = (k: number): number => (k < nc && k % 2 === 1 ? -coeffs[k]! : c(k));
    for (let k = 0; k < nc; k += 4) {
      const [d0, d1, d2, d3] = this.columns(k);
      const terms = [c(k), c(k + 1), c(k + 2), c(k + 3), m(k), m(k + 1), m(k + 2), m(k + 3)] as const;
      this.terms.set(terms);
      if (k + 4 < nc) addTerms(d0, d1, d2, d3, this.terms, residual, k === 0, width);
      else if (model) modelTerms(row, d0, d1, d2, d3, this.terms, residual, k === 0, model, width);
      else lastTerms(row, d0, d1, d2, d3, this.terms, residual, k === 0, width);
    }
    return model ? NaN : keptSquares(residual, this.kept, width);
  }

  /** Basis functions k .. k + 3 by x (zero columns past the order). */
  private columns(k: number): [Float64Array, Float64Array, Float64Array, Float64Array] {
    const { width, nc, byColumn, zeros } = this;
    const column = (j: number): Float64Array => (j < nc ? byColumn.subarray(j * width, (j + 1) * width) : zeros);
    return [column(k), column(k + 1), column(k + 2), column(k + 3)];
  }

  /**
   * `normal` = the normal matrix of the points of `usable`. Rows of a frame mostly share one
   * pattern (bad and unlit columns), so the last pattern's matrix is kept and reused.
   */
  private startNormal(usable: Uint8Array): void {
    const { width, baseUsable } = this;
    let same = this.baseValid;
    for (let x = 0; same && x < width; x++) same = usable[x] === baseUsable[x];
    if (!same) {
      this.baseNormal.set(this.fullNormal);
      for (let x = 0; x < width; x++) if (!usable[x]) this.accumulate(this.baseNormal, x, -1);
      baseUsable.set(usable);
      this.baseValid = true;
    }
    this.normal.set(this.baseNormal);
  }

  private accumulate(target: Float64Array, x: number, sign: number): void {
    const { nc, design } = this;
    const o = x * nc;
    for (let a = 0; a < nc; a++) {
      const da = sign * design[o + a]!;
      for (let b = 0; b <= a; b++) target[a * nc + b] += da * design[o + b]!;
    }
  }

  private addRhs(y: number, x: number, sign: number): void {
    const o = x * this.nc;
    for (let a = 0; a < this.nc; a++) this.rhs[a] += sign * y * this.design[o + a]!;
  }

  private solve(): boolean {
    const { nc, normal, work } = this;
    for (let a = 0; a < nc; a++) for (let b = 0; b <= a; b++) work[a * nc + b] = normal[a * nc + b]!;
    if (!choleskyFactor(work, nc)) return false;
    this.coeffs.set(this.rhs);
    choleskySolve(work, nc, this.coeffs);
    return true;
  }
}
