import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { legendreValue, evalLegendre2D, evalLegendre2DGrid, evalLegendre1D, legendre1DStep, legendre2DStepX } from '../../src/kernels/legendre.js';
import { fitLegendre1D, fitLegendre2D } from '../../src/kernels/legendre-fit.js';

// Reference: Debian python3-numpy, numpy.polynomial.legendre (legval, legfit, legvander2d + lstsq);
// made by fixtures/arc/make_legendre.py.
const ref = JSON.parse(readFileSync(new URL('../../fixtures/arc/legendre.json', import.meta.url), 'utf8'));

describe('legendreValue', () => {
  it('matches numpy.polynomial.legendre.legval for orders 0-9', () => {
    for (const c of ref.legval) {
      c.u.forEach((u: number, i: number) => expect(legendreValue(c.coeffs, u)).toBeCloseTo(c.value[i], 12));
    }
  });
});

describe('fitLegendre1D', () => {
  it('matches numpy legfit coefficients and the (V^T W V)^-1 covariance for a weighted order-4 fit', () => {
    const f = ref.fit1d;
    const w = f.sigma.map((s: number) => 1 / (s * s));
    const fit = fitLegendre1D(f.x, f.y, w, f.order, { min: f.min, max: f.max }, { clipSigma: Infinity });
    fit.model.coeffs.forEach((c, k) => expect(Math.abs(c - f.coeffs[k])).toBeLessThan(1e-9 * Math.max(1, Math.abs(f.coeffs[k]))));
    fit.covariance.forEach((c, k) => expect(Math.abs(c - f.covariance[k])).toBeLessThan(1e-6 * Math.abs(f.covariance[0])));
    expect(fit.nUsed).toBe(f.x.length);
  });

  it('clips a gross outlier and then agrees with numpy on the remaining points', () => {
    const f = ref.fit1d;
    const y = f.y.slice();
    y[7] += 5; // 100 sigma off
    const w = f.sigma.map((s: number) => 1 / (s * s));
    const fit = fitLegendre1D(f.x, y, w, f.order, { min: f.min, max: f.max }, { clipSigma: 3 });
    expect(fit.used[7]).toBe(0);
    // the remaining points are the clean fixture points: numpy's fit on all 40 must be close
    expect(Math.abs(evalLegendre1D(fit.model, 1000) - evalLegendre1D({ kind: 'legendre1d', min: f.min, max: f.max, coeffs: f.coeffs }, 1000))).toBeLessThan(0.05);
  });

  it('throws RangeError when there are fewer points than coefficients', () => {
    expect(() => fitLegendre1D([1, 2], [1, 2], null, 3, { min: 0, max: 3 })).toThrow(RangeError);
  });
});

describe('fitLegendre2D', () => {
  it('matches numpy legvander2d + lstsq coefficients (layout c[j (xOrder+1) + i])', () => {
    const f = ref.fit2d;
    const fit = fitLegendre2D(f.x, f.y, f.z, null, f.xOrder, f.yOrder, { xMin: f.xMin, xMax: f.xMax, yMin: f.yMin, yMax: f.yMax }, { clipSigma: Infinity });
    fit.model.coeffs.forEach((c, k) => expect(c).toBeCloseTo(f.coeffs[k], 9));
  });

  it('evalLegendre2DGrid and evalLegendre2D match numpy legval2d at every pixel centre of a 41 x 10 grid', () => {
    const f = ref.fit2d;
    const g = ref.grid2d;
    const model = { kind: 'legendre2d' as const, xOrder: f.xOrder, yOrder: f.yOrder, xMin: 0, xMax: g.xMax, yMin: 0, yMax: g.yMax, coeffs: f.coeffs };
    const out = evalLegendre2DGrid(model, g.width, g.height, new Float64Array(g.width * g.height));
    out.forEach((v, i) => expect(v).toBeCloseTo(g.values[i], 12));
    for (let y = 0; y < g.height; y++) for (let x = 0; x < g.width; x++) expect(evalLegendre2D(model, x, y)).toBeCloseTo(g.values[y * g.width + x], 12);
  });
});

describe('fitLegendre1D robust clipping', () => {
  it('with 13 points a gross outlier of high leverage hides from RMS clipping but not from robust clipping; the rest then match numpy legfit', () => {
    const f = ref.fit1d;
    const x = [...f.x.slice(0, 12), 50];
    const y = [...f.y.slice(0, 12), evalLegendre1D({ kind: 'legendre1d', min: f.min, max: f.max, coeffs: f.coeffs }, 50) + 1];
    const sigma = [...f.sigma.slice(0, 12), 0.03];
    const w = sigma.map((s: number) => 1 / (s * s));
    const range = { min: f.min, max: f.max };
    // 1 A off (33 sigma) just beyond the lowest point: its leverage bends the fit onto it, so no
    // residual exceeds 3 RMS; its studentised residual (Cook & Weisberg 1982) still stands out
    const plain = fitLegendre1D(x, y, w, 4, range, { clipSigma: 3 });
    expect(plain.used[12]).toBe(1);
    const robust = fitLegendre1D(x, y, w, 4, range, { clipSigma: 3, robust: true });
    expect(robust.used[12]).toBe(0);
    expect(robust.nUsed).toBe(12);
    robust.model.coeffs.forEach((c, k) => expect(Math.abs(c - ref.fit1dSubset.coeffs[k])).toBeLessThan(1e-6 * Math.max(1, Math.abs(ref.fit1dSubset.coeffs[k]))));
  });
});

describe('per-pixel steps of Legendre series', () => {
  it('equal the derivative for a quadratic series (with the textbook P2 = (3u^2 - 1)/2; central differences are exact for quadratics)', () => {
    const m1 = { kind: 'legendre1d' as const, min: 0, max: 1023, coeffs: [6650, 562, -2.6] };
    const m2 = { kind: 'legendre2d' as const, xOrder: 2, yOrder: 0, xMin: 0, xMax: 1023, yMin: 0, yMax: 299, coeffs: [6650, 562, -2.6] };
    for (const x of [0, 100, 511.5, 1023]) {
      const u = (2 * x - 1023) / 1023;
      const derivative = (562 + 3 * -2.6 * u) * (2 / 1023);
      expect(legendre1DStep(m1, x)).toBeCloseTo(derivative, 10);
      expect(legendre2DStepX(m2, x, 150)).toBeCloseTo(derivative, 10);
    }
  });
});
