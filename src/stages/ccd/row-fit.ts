/**
 * Legendre fits along x of every row of an image (the flat's shape along the dispersion), with
 * the clipping rule of kernels/legendre-fit.ts (clip |r| > clipSigma sqrt(chi2 / n_kept), points
 * may return, stop when the kept set holds). Faster than one fitLegendre1D per row on full
 * frames: the design matrix and the normal matrix of a fully usable row are built once, and each
 * row or clipping round only subtracts the outer products of the points it leaves out.
 */
import { choleskyFactor, choleskySolve } from '../../kernels/cholesky.js';
import { legendreBasis, normalise } from '../../kernels/legendre.js';

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
  }

  /**
   * Fit `row` where `usable` is 1, writing the model at every x into `model`. Returns false (and
   * leaves `model` alone) when fewer than 2 (order + 1) points are usable.
   */
  fit(row: ArrayLike<number>, usable: Uint8Array, model: Float32Array, options: RowFitOptions): boolean {
    const { width, nc, kept, residual, trial } = this;
    const minKept = nc + 1;
    let count = countOnes(usable, width);
    if (count < 2 * nc) return false;
    this.startNormal(usable);
    kept.set(usable);
    // Unusable points enter the right-hand side as exact zeros (adding 0 changes no sum), which keeps its loop branch-free.
    maskRow(row, usable, this.maskedRow, width);
    this.startRhs();
    // Each pass over x is a function or method of its own, so V8 compiles this one once.
    for (let iter = 0; ; iter++) {
      if (!this.solve()) return false;
      const chi2 = this.residuals(row);
      if (iter >= options.maxIterations || !(chi2 > 0)) break;
      // The new kept set into `trial`, applied only when it holds enough points.
      const next = proposeKept(usable, residual, options.clipSigma * Math.sqrt(chi2 / count), trial, width);
      if (next < minKept) break;
      const changed = this.applyTrial(row);
      count = next;
      if (!changed) break;
    }
    modelFromResidual(row, residual, model, width);
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

  /** kept = trial, the normal matrix and right-hand side updated point by point; false when nothing changed. */
  private applyTrial(row: ArrayLike<number>): boolean {
    const { width, normal, kept, trial } = this;
    let changed = false;
    for (let x = 0; x < width; x++) {
      const keep = trial[x]!;
      if (keep === kept[x]) continue;
      changed = true;
      const sign = keep ? 1 : -1;
      this.accumulate(normal, x, sign);
      this.addRhs(row[x]!, x, sign);
      kept[x] = keep;
    }
    return changed;
  }

  /**
   * residual = row - model at every x (the model's terms added in order k = 0, 1, ...); returns
   * chi2 over the kept points. Four basis functions per pass over x, the last pass also taking
   * the residual and chi2; basis functions past the order enter as zero columns with coefficient
   * -0 (their terms are -0, which adding leaves every sum as it was, signed zeros included).
   */
  private residuals(row: ArrayLike<number>): number {
    const { width, nc, coeffs, residual, kept } = this;
    const c = (k: number): number => (k < nc ? coeffs[k]! : -0);
    let chi2 = 0;
    for (let k = 0; k < nc; k += 4) {
      const [d0, d1, d2, d3] = this.columns(k);
      const [c0, c1, c2, c3] = [c(k), c(k + 1), c(k + 2), c(k + 3)];
      const first = k === 0;
      if (k + 4 < nc) {
        for (let x = 0; x < width; x++) residual[x] = (first ? 0 : residual[x]!) + d0[x]! * c0 + d1[x]! * c1 + d2[x]! * c2 + d3[x]! * c3;
        continue;
      }
      for (let x = 0; x < width; x++) {
        const r = row[x]! - ((first ? 0 : residual[x]!) + d0[x]! * c0 + d1[x]! * c1 + d2[x]! * c2 + d3[x]! * c3);
        residual[x] = r;
        if (kept[x]) chi2 += r * r;
      }
    }
    return chi2;
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

function countOnes(flags: Uint8Array, width: number): number {
  let count = 0;
  for (let x = 0; x < width; x++) count += flags[x]!;
  return count;
}

/** masked = row where usable, exact 0 elsewhere. */
function maskRow(row: ArrayLike<number>, usable: Uint8Array, masked: Float64Array, width: number): void {
  for (let x = 0; x < width; x++) masked[x] = usable[x] ? row[x]! : 0;
}

/** trial = usable points with |residual| <= limit; returns their number. */
function proposeKept(usable: Uint8Array, residual: Float64Array, limit: number, trial: Uint8Array, width: number): number {
  let next = 0;
  for (let x = 0; x < width; x++) {
    const keep = usable[x] && Math.abs(residual[x]!) <= limit ? 1 : 0;
    trial[x] = keep;
    next += keep;
  }
  return next;
}

function modelFromResidual(row: ArrayLike<number>, residual: Float64Array, model: Float32Array, width: number): void {
  for (let x = 0; x < width; x++) model[x] = row[x]! - residual[x]!;
}
