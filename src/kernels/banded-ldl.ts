/**
 * Symmetric positive-definite banded matrices: LDL^T factorisation, solves, and the entries of
 * the inverse inside the band (the "selected inversion" recurrence of Takahashi, Fagan & Chin 1973:
 * Z_ij = delta_ij / d_i - sum_{k=i+1..i+p} L_ki Z_kj), which give the variance of a spline model
 * at any point without forming the full inverse.
 * Storage: lower band, row-major n x (p + 1), entry (i, j) with 0 <= i - j <= p at i * (p + 1) + (i - j).
 */

/** Index of (i, j), j <= i <= j + p, in the band storage. */
export function bandIndex(i: number, j: number, p: number): number {
  return i * (p + 1) + (i - j);
}

/** Factor in place: the diagonal holds D, the off-diagonals L (unit lower). False if not positive definite. */
export function factorBandedLdl(a: Float64Array, n: number, p: number): boolean {
  const w = p + 1;
  for (let j = 0; j < n; j++) {
    let d = a[j * w]!;
    const k0 = Math.max(0, j - p);
    for (let k = k0; k < j; k++) {
      const ljk = a[j * w + (j - k)]!;
      d -= ljk * ljk * a[k * w]!;
    }
    if (!(d > 0) || !Number.isFinite(d)) return false;
    a[j * w] = d;
    const iEnd = Math.min(n - 1, j + p);
    for (let i = j + 1; i <= iEnd; i++) {
      let s = a[i * w + (i - j)]!;
      const kStart = Math.max(0, i - p);
      for (let k = kStart; k < j; k++) s -= a[i * w + (i - k)]! * a[j * w + (j - k)]! * a[k * w]!;
      a[i * w + (i - j)] = s / d;
    }
  }
  return true;
}

/**
 * Solve (L D L^T) x = b in place, with `a` from factorBandedLdl. Each sweep is a function of its
 * own: code after a long loop in the same function is compiled on the fly without feedback and
 * sent V8 back to the interpreter at every call.
 */
export function solveBandedLdl(a: Float64Array, n: number, p: number, b: Float64Array): void {
  forwardSweep(a, n, p, b);
  divideByDiagonal(a, n, p, b);
  backwardSweep(a, n, p, b);
}

function forwardSweep(a: Float64Array, n: number, p: number, b: Float64Array): void {
  const w = p + 1;
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let k = Math.max(0, i - p); k < i; k++) s -= a[i * w + (i - k)]! * b[k]!;
    b[i] = s;
  }
}

function divideByDiagonal(a: Float64Array, n: number, p: number, b: Float64Array): void {
  const w = p + 1;
  for (let i = 0; i < n; i++) b[i] = b[i]! / a[i * w]!;
}

function backwardSweep(a: Float64Array, n: number, p: number, b: Float64Array): void {
  const w = p + 1;
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    const kEnd = Math.min(n - 1, i + p);
    for (let k = i + 1; k <= kEnd; k++) s -= a[k * w + (k - i)]! * b[k]!;
    b[i] = s;
  }
}

/** Z(k, j) for |k - j| <= p from the band storage (symmetric); a module-level function, not a closure made at each call (a new closure is a new call target to V8). */
function bandEntry(z: Float64Array, w: number, k: number, j: number): number {
  return k >= j ? z[k * w + (k - j)]! : z[j * w + (j - k)]!;
}

/** Fill `z` (same band storage) with the entries of the inverse inside the band, from the factor `a`. */
export function bandedInverseInBand(a: Float64Array, n: number, p: number, z: Float64Array): void {
  const w = p + 1;
  for (let i = n - 1; i >= 0; i--) {
    const kEnd = Math.min(n - 1, i + p);
    for (let j = kEnd; j >= i; j--) {
      let s = i === j ? 1 / a[i * w]! : 0;
      for (let k = i + 1; k <= kEnd; k++) s -= a[k * w + (k - i)]! * bandEntry(z, w, k, j);
      z[j * w + (j - i)] = s;
    }
  }
}
