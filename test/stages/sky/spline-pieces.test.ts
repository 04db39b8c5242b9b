/**
 * The sky model evaluated from its piecewise-polynomial form: values against
 * scipy.interpolate.BSpline, variances against b(u)^T Z b(u) with b the rows of scipy's B-spline
 * design matrix (Debian python3-scipy, python3-numpy; fixtures/lines/make_spline_band.py).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { UniformCubicBSpline } from '../../../src/kernels/bspline.js';
import { emptySums } from '../../../src/stages/sky/sky-normal.js';
import { evaluateRow, type SkySpline } from '../../../src/stages/sky/sky-spline.js';
import { valuePieces, variancePieces } from '../../../src/stages/sky/spline-pieces.js';

const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/lines/spline_band.json', import.meta.url), 'utf8')) as {
  spline: { start: number; spacing: number; nIntervals: number; coeffs: number[]; u: number[]; values: number[] };
  covariance: { matrix: number[][]; variance: number[] };
};

describe('sky spline pieces', () => {
  const { start, spacing, nIntervals, coeffs, u, values } = fixture.spline;
  const spline = new UniformCubicBSpline(start, spacing, nIntervals);
  const n = spline.nBasis;
  const c = Float64Array.from(coeffs);
  // Band storage, p = 3: entry (i, j), 0 <= i - j <= 3, at i * 4 + (i - j).
  const covariance = new Float64Array(4 * n);
  for (let i = 0; i < n; i++) for (let j = Math.max(0, i - 3); j <= i; j++) covariance[i * 4 + (i - j)] = fixture.covariance.matrix[i]![j]!;
  // u near 6500 with breakpoints 0.4 apart: the fraction s is known to ~1e-12, which bounds the agreement.
  const slit = 1.07;
  const fit: SkySpline = { spline, coeffs: c, covariance, slit: Float64Array.of(slit), used: 0, dropped: 0, sums: emptySums(n), pieces: valuePieces(c, nIntervals) };

  it('gives scipy BSpline values and the design-matrix variance b^T Z b, times the slit factor and its square', () => {
    const value = new Float64Array(u.length);
    const variance = new Float64Array(u.length);
    evaluateRow(fit, Float64Array.from(u), 0, u.length, 0, value, { out: variance, pieces: variancePieces(covariance, nIntervals) });
    const scale = Math.max(...values.map(Math.abs));
    values.forEach((v, i) => expect(Math.abs(value[i]! - slit * v)).toBeLessThan(1e-12 * scale));
    fixture.covariance.variance.forEach((v, i) => expect(Math.abs(variance[i]! / (slit * slit * v) - 1)).toBeLessThan(1e-11));
  });

  it('evaluates the value alone the same way', () => {
    const value = new Float64Array(u.length);
    evaluateRow(fit, Float64Array.from(u), 0, u.length, 0, value, null);
    const scale = Math.max(...values.map(Math.abs));
    values.forEach((v, i) => expect(Math.abs(value[i]! - slit * v)).toBeLessThan(1e-12 * scale));
  });
});
