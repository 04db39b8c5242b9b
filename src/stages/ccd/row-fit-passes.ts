/**
 * The passes over x of the flat's row fit (row-fit.ts), each a function of one loop so that V8
 * compiles it once.
 */

/** A clipping round's lists: the points whose kept flag changes, the candidates near the limit, and their counts. */
export interface ProposalLists {
  changes: Int32Array;
  candidates: Int32Array;
  counts: Int32Array;
}

/**
 * residual[x] = (first ? 0 : residual[x]) + d0[x] c0 + d1[x] c1 + d2[x] c2 + d3[x] c3 at x and,
 * with the mirror's coefficients t[4..7] and the same d values, at width - 1 - x.
 */
export function addTerms(d0: Float64Array, d1: Float64Array, d2: Float64Array, d3: Float64Array, t: Float64Array, residual: Float64Array, first: boolean, width: number): void {
  const [c0, c1, c2, c3, m0, m1, m2, m3] = [t[0]!, t[1]!, t[2]!, t[3]!, t[4]!, t[5]!, t[6]!, t[7]!];
  for (let x = 0, y = width - 1; x <= y; x++, y--) {
    const a = d0[x]!;
    const b = d1[x]!;
    const e = d2[x]!;
    const f = d3[x]!;
    const rx = (first ? 0 : residual[x]!) + a * c0 + b * c1 + e * c2 + f * c3;
    const ry = (first ? 0 : residual[y]!) + a * m0 + b * m1 + e * m2 + f * m3;
    // At the middle of an odd width, x = y: the mirror's value is the same point's (u = 0) and is written last only when equal.
    residual[y] = x === y ? rx : ry;
    residual[x] = rx;
  }
}

/** As addTerms, then residual = row - the sum. */
export function lastTerms(row: ArrayLike<number>, d0: Float64Array, d1: Float64Array, d2: Float64Array, d3: Float64Array, t: Float64Array, residual: Float64Array, first: boolean, width: number): void {
  const [c0, c1, c2, c3, m0, m1, m2, m3] = [t[0]!, t[1]!, t[2]!, t[3]!, t[4]!, t[5]!, t[6]!, t[7]!];
  for (let x = 0, y = width - 1; x <= y; x++, y--) {
    const a = d0[x]!;
    const b = d1[x]!;
    const e = d2[x]!;
    const f = d3[x]!;
    const rx = row[x]! - ((first ? 0 : residual[x]!) + a * c0 + b * c1 + e * c2 + f * c3);
    const ry = row[y]! - ((first ? 0 : residual[y]!) + a * m0 + b * m1 + e * m2 + f * m3);
    residual[y] = x === y ? rx : ry;
    residual[x] = rx;
  }
}

/** As lastTerms, writing row - residual into model (the residual itself is not kept). */
export function modelTerms(row: ArrayLike<number>, d0: Float64Array, d1: Float64Array, d2: Float64Array, d3: Float64Array, t: Float64Array, residual: Float64Array, first: boolean, model: Float64Array, width: number): void {
  const [c0, c1, c2, c3, m0, m1, m2, m3] = [t[0]!, t[1]!, t[2]!, t[3]!, t[4]!, t[5]!, t[6]!, t[7]!];
  for (let x = 0, y = width - 1; x <= y; x++, y--) {
    const a = d0[x]!;
    const b = d1[x]!;
    const e = d2[x]!;
    const f = d3[x]!;
    const rx = row[x]! - ((first ? 0 : residual[x]!) + a * c0 + b * c1 + e * c2 + f * c3);
    const ry = row[y]! - ((first ? 0 : residual[y]!) + a * m0 + b * m1 + e * m2 + f * m3);
    model[y] = x === y ? row[x]! - rx : row[y]! - ry;
    model[x] = row[x]! - rx;
  }
}

/** Sum of residual^2 over the kept points, in order of x. */
export function keptSquares(residual: Float64Array, kept: Uint8Array, width: number): number {
  let chi2 = 0;
  for (let x = 0; x < width; x++) {
    const r = residual[x]!;
    if (kept[x]) chi2 += r * r;
  }
  return chi2;
}

export function countOnes(flags: Uint8Array, width: number): number {
  let count = 0;
  for (let x = 0; x < width; x++) count += flags[x]!;
  return count;
}

/** masked = row where usable, exact 0 elsewhere; returns the sum of squares of the usable values. */
export function maskRow(row: ArrayLike<number>, usable: Uint8Array, masked: Float64Array, width: number): number {
  let squares = 0;
  for (let x = 0; x < width; x++) {
    const m = usable[x] ? row[x]! : 0;
    masked[x] = m;
    squares += m * m;
  }
  return squares;
}

export function dot(a: Float64Array, b: Float64Array, n: number): number {
  let s = 0;
  for (let k = 0; k < n; k++) s += a[k]! * b[k]!;
  return s;
}

export function sameCoefficients(a: Float64Array, b: Float64Array, n: number): boolean {
  for (let k = 0; k < n; k++) if (a[k] !== b[k]) return false;
  return true;
}

/**
 * A bound on |model(x) - reference model(x)| over the row: sum |c_k - ref_k|, as |P_k(u)| <= 1
 * on [-1, 1]; widened by a margin far above rounding (1e-9 of the coefficients and the limit).
 */
export function modelBound(coeffs: Float64Array, reference: Float64Array, nc: number, limit: number): number {
  let bound = 0;
  let size = limit;
  for (let k = 0; k < nc; k++) {
    bound += Math.abs(coeffs[k]! - reference[k]!);
    size += Math.abs(coeffs[k]!);
  }
  return bound + 1e-9 * size;
}

/**
 * trial = usable points with |residual at the current coefficients| <= limit, from the residuals
 * about the reference: a point farther than `bound` (the most the two models differ) from the
 * limit keeps its side, the others are tested with their residual taken again. The points where
 * trial differs from kept go into changes, the usable points with a reference |residual| in
 * [lo, hi] into candidates (both in order of x); counts = [changes, candidates, points kept
 * outside the candidates]. Returns the number kept.
 */
export function proposeNear(
  row: ArrayLike<number>,
  usable: Uint8Array,
  residual: Float64Array,
  limit: number,
  bound: number,
  design: Float64Array,
  coeffs: Float64Array,
  nc: number,
  kept: Uint8Array,
  trial: Uint8Array,
  lists: ProposalLists,
  lo: number,
  hi: number,
  width: number,
): number {
  const { changes, candidates, counts } = lists;
  let next = 0;
  let n = 0;
  let c = 0;
  let outside = 0;
  for (let x = 0; x < width; x++) {
    const r = Math.abs(residual[x]!);
    const keep = keepsAt(row, r, x, limit, bound, design, coeffs, nc) & usable[x]!;
    trial[x] = keep;
    next += keep;
    if (keep !== kept[x]) changes[n++] = x;
    const candidate = usable[x] && r >= lo && r <= hi ? 1 : 0;
    if (candidate) candidates[c++] = x;
    else outside += keep;
  }
  counts[0] = n;
  counts[1] = c;
  counts[2] = outside;
  return next;
}

/**
 * 1 when point x is within the limit at the current coefficients, from r = |residual about the
 * reference|: decided by r alone when farther than the bound from the limit, else taken again.
 */
function keepsAt(row: ArrayLike<number>, r: number, x: number, limit: number, bound: number, design: Float64Array, coeffs: Float64Array, nc: number): number {
  if (r + bound <= limit) return 1;
  if (!(r - bound <= limit)) return 0;
  return Math.abs(row[x]! - modelAt(design, coeffs, x, nc)) <= limit ? 1 : 0;
}

function modelAt(design: Float64Array, coeffs: Float64Array, x: number, nc: number): number {
  let m = 0;
  for (let k = 0; k < nc; k++) m += design[x * nc + k]! * coeffs[k]!;
  return m;
}

/**
 * proposeNear over the candidates only, when no other point can change side: every usable point
 * outside [lo, hi] at the reference lies farther than the bound from the limit (the caller
 * checks), so it keeps the side proposeNear gave it when listing them. Returns the number kept.
 */
export function proposeCandidates(row: ArrayLike<number>, residual: Float64Array, limit: number, bound: number, design: Float64Array, coeffs: Float64Array, nc: number, kept: Uint8Array, trial: Uint8Array, lists: ProposalLists): number {
  const { changes, candidates, counts } = lists;
  let next = counts[2]!;
  let n = 0;
  for (let i = 0; i < counts[1]!; i++) {
    const x = candidates[i]!;
    const r = Math.abs(residual[x]!);
    const keep = keepsAt(row, r, x, limit, bound, design, coeffs, nc);
    trial[x] = keep;
    next += keep;
    if (keep !== kept[x]) changes[n++] = x;
  }
  counts[0] = n;
  return next;
}

export function modelFromResidual(row: ArrayLike<number>, residual: Float64Array, model: Float64Array, width: number): void {
  for (let x = 0; x < width; x++) model[x] = row[x]! - residual[x]!;
}

/** residual = row - s * model. */
export function scaledResiduals(row: ArrayLike<number>, model: Float64Array, s: number, residual: Float64Array, width: number): void {
  for (let x = 0; x < width; x++) residual[x] = row[x]! - s * model[x]!;
}

/** out = model rounded to float32. */
export function copyModel(model: Float64Array, out: Float32Array, width: number): void {
  for (let x = 0; x < width; x++) out[x] = model[x]!;
}
