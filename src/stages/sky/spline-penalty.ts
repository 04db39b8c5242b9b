/**
 * The P-spline penalty of the sky fit (Eilers & Marx 1996, Stat. Sci. 11, 89): a small
 * second-difference term on the B-spline coefficients, added to the band of the normal matrix,
 * keeps the sky spline defined in wavelength gaps and hardly bends its fitted parts.
 */

/** Penalty weight relative to the mean diagonal of the normal matrix (small: fills gaps, hardly bends fitted parts). */
const PENALTY = 1e-6;
/** Half-bandwidth of a cubic B-spline normal matrix (band storage, p = 3). */
export const BAND = 3;

/**
 * Add PENALTY * mean diagonal * D^T D, D the second-difference operator on the coefficients.
 * One loop per function: V8 compiles a long loop on the fly, and code after it in the same
 * function would have no type feedback yet and send every later call back to the interpreter.
 */
export function addPenalty(normal: Float64Array, n: number): void {
  const kappa = penaltyWeight(normal, n);
  addSecondDifferences(normal, n, kappa);
  // An empty stretch at the very ends is held by a tiny ridge so the system stays definite.
  addRidge(normal, n, kappa * 1e-6);
}

function penaltyWeight(normal: Float64Array, n: number): number {
  const w4 = BAND + 1;
  let mean = 0;
  for (let k = 0; k < n; k++) mean += normal[k * w4]!;
  return (PENALTY * mean) / n || PENALTY;
}

const SECOND_DIFFERENCE = [1, -2, 1];

function addSecondDifferences(normal: Float64Array, n: number, kappa: number): void {
  const w4 = BAND + 1;
  const d = SECOND_DIFFERENCE;
  for (let r = 0; r + 2 < n; r++) {
    for (let p = 0; p < 3; p++) for (let q = 0; q <= p; q++) normal[(r + p) * w4 + (p - q)] += kappa * d[p]! * d[q]!;
  }
}

function addRidge(normal: Float64Array, n: number, ridge: number): void {
  const w4 = BAND + 1;
  for (let k = 0; k < n; k++) normal[k * w4] += ridge;
}
