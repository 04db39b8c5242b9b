import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { quadraticForm, weightedLeastSquares } from '../../src/kernels/least-squares.js';

// Reference: Debian python3-numpy, numpy.linalg.lstsq on sqrt(w)-scaled rows and inv(A^T W A);
// made by fixtures/arc/make_legendre.py.
const ref = JSON.parse(readFileSync(new URL('../../fixtures/arc/legendre.json', import.meta.url), 'utf8')).lstsq;

describe('weightedLeastSquares', () => {
  it('matches numpy lstsq coefficients, covariance and chi2 with columns scaled over 6 decades', () => {
    const w = ref.sigma.map((s: number) => 1 / (s * s));
    const r = weightedLeastSquares(Float64Array.from(ref.design), ref.nRows, ref.nCols, ref.y, w);
    r.coeffs.forEach((c, k) => expect(Math.abs(c - ref.coeffs[k]) / Math.abs(ref.coeffs[k])).toBeLessThan(1e-9));
    r.covariance.forEach((c, k) => expect(Math.abs(c - ref.covariance[k])).toBeLessThan(1e-9 * Math.sqrt(Math.abs(ref.covariance[(k % 4) * 5] * ref.covariance[Math.floor(k / 4) * 5]))));
    expect(r.chi2).toBeCloseTo(ref.chi2, 8);
    expect(r.dof).toBe(26);
  });

  it('leaves out rows of weight 0 (same as dropping them)', () => {
    const w = ref.sigma.map((s: number, i: number) => (i < 3 ? 0 : 1 / (s * s)));
    const all = weightedLeastSquares(Float64Array.from(ref.design), ref.nRows, ref.nCols, ref.y, w);
    const dropped = weightedLeastSquares(Float64Array.from(ref.design.slice(12)), ref.nRows - 3, ref.nCols, ref.y.slice(3), w.slice(3));
    all.coeffs.forEach((c, k) => expect(c).toBeCloseTo(dropped.coeffs[k]!, 12));
    expect(all.dof).toBe(23);
  });

  it('leverages w_i a_i^T C a_i from quadraticForm sum to the number of coefficients (trace of the hat matrix; Cook & Weisberg 1982)', () => {
    const w = ref.sigma.map((s: number) => 1 / (s * s));
    const design = Float64Array.from(ref.design);
    const r = weightedLeastSquares(design, ref.nRows, ref.nCols, ref.y, w);
    let trace = 0;
    for (let i = 0; i < ref.nRows; i++) trace += w[i] * quadraticForm(r.covariance, ref.nCols, design, i * ref.nCols);
    expect(trace).toBeCloseTo(ref.nCols, 9);
  });

  it('throws RangeError for a singular system (two equal columns)', () => {
    const design = Float64Array.from({ length: 20 }, (_, i) => (i % 2 === 0 ? i : i - 1));
    expect(() => weightedLeastSquares(design, 10, 2, new Float64Array(10))).toThrow(RangeError);
  });
});
