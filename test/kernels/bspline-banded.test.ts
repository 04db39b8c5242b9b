import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bandedInverseInBand, bandIndex, factorBandedLdl, solveBandedLdl } from '../../src/kernels/banded-ldl.js';
import { UniformCubicBSpline } from '../../src/kernels/bspline.js';

// Reference values from scipy.interpolate.BSpline and numpy.linalg (Debian python3-scipy/numpy),
// fixtures/lines/make_spline_band.py.
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/lines/spline_band.json', import.meta.url), 'utf8')) as {
  spline: { start: number; spacing: number; nIntervals: number; coeffs: number[]; u: number[]; values: number[] };
  band: { n: number; p: number; matrix: number[][]; rhs: number[]; solution: number[]; inverse: number[][] };
};

describe('UniformCubicBSpline', () => {
  it('evaluates like scipy.interpolate.BSpline on uniform knots', () => {
    const { start, spacing, nIntervals, coeffs, u, values } = fixture.spline;
    const s = new UniformCubicBSpline(start, spacing, nIntervals);
    const scratch = new Float64Array(4);
    u.forEach((ui, i) => expect(s.value(coeffs, ui, scratch)).toBeCloseTo(values[i]!, 12));
  });

  it('has weights that sum to one (partition of unity, de Boor 1978)', () => {
    const s = UniformCubicBSpline.covering(0, 7.3, 0.5);
    const w = new Float64Array(4);
    for (const u of [0, 0.01, 3.3, 7.29]) {
      s.weights(u, w);
      expect(w[0]! + w[1]! + w[2]! + w[3]!).toBeCloseTo(1, 14);
    }
  });
});

describe('banded LDL^T', () => {
  const { n, p, matrix, rhs, solution, inverse } = fixture.band;
  const band = (): Float64Array => {
    const a = new Float64Array(n * (p + 1));
    for (let i = 0; i < n; i++) for (let j = Math.max(0, i - p); j <= i; j++) a[bandIndex(i, j, p)] = matrix[i]![j]!;
    return a;
  };

  it('solves like numpy.linalg.solve', () => {
    const a = band();
    expect(factorBandedLdl(a, n, p)).toBe(true);
    const b = Float64Array.from(rhs);
    solveBandedLdl(a, n, p, b);
    b.forEach((v, i) => expect(v).toBeCloseTo(solution[i]!, 12));
  });

  it('gives the inverse inside the band like numpy.linalg.inv', () => {
    const a = band();
    factorBandedLdl(a, n, p);
    const z = new Float64Array(n * (p + 1));
    bandedInverseInBand(a, n, p, z);
    for (let i = 0; i < n; i++) for (let j = Math.max(0, i - p); j <= i; j++) expect(z[bandIndex(i, j, p)]).toBeCloseTo(inverse[i]![j]!, 12);
  });

  it('refuses a matrix that is not positive definite', () => {
    const a = new Float64Array(2 * 2);
    a[0] = 1;
    a[2] = -1;
    a[3] = 2;
    expect(factorBandedLdl(a, 2, 1)).toBe(false);
  });
});
