import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, type LmModel } from '../../src/kernels/levenberg-marquardt.js';

interface DecayCase {
  name: string;
  kind: string;
  x: number[];
  y: number[];
  sigma: number[];
  initial: { a: number; b: number };
  params: { a: number; b: number };
  errors?: { a: number; b: number };
  covariance_ab?: number;
  lower?: { a: number; b: number };
  upper?: { a: number | null; b: number };
}

// Reference fits from scipy.optimize.curve_fit (Debian python3-scipy), fixtures/lines/make_curve_fit.py.
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/lines/curve_fit.json', import.meta.url), 'utf8')) as { cases: DecayCase[] };
const decay = fixture.cases.find((c) => c.kind === 'decay')!;
const bounded = fixture.cases.find((c) => c.kind === 'decay-bounded')!;

/** y = a exp(-b x); params [a, b]. */
const decayModel: LmModel = {
  nParams: 2,
  evaluate(p, x, model, jac) {
    for (let i = 0; i < x.length; i++) {
      const e = Math.exp(-p[1]! * x[i]!);
      model[i] = p[0]! * e;
      jac[2 * i] = e;
      jac[2 * i + 1] = -p[0]! * x[i]! * e;
    }
  },
};

function arrays(c: DecayCase): { x: Float64Array; y: Float64Array; w: Float64Array } {
  return { x: Float64Array.from(c.x), y: Float64Array.from(c.y), w: Float64Array.from(c.sigma, (s) => 1 / (s * s)) };
}

describe('levenbergMarquardt', () => {
  it('matches scipy curve_fit parameters, errors and covariance on an exponential decay', () => {
    const { x, y, w } = arrays(decay);
    const r = levenbergMarquardt(decayModel, x, y, w, Float64Array.of(decay.initial.a, decay.initial.b));
    expect(r.converged).toBe(true);
    // Both solvers stop on their own tolerances: agree to 1e-3 of the 1-sigma error.
    expect(Math.abs(r.params[0]! - decay.params.a)).toBeLessThan(1e-3 * decay.errors!.a);
    expect(Math.abs(r.params[1]! - decay.params.b)).toBeLessThan(1e-3 * decay.errors!.b);
    expect(Math.sqrt(r.covariance[0]!) / decay.errors!.a).toBeCloseTo(1, 3);
    expect(Math.sqrt(r.covariance[3]!) / decay.errors!.b).toBeCloseTo(1, 3);
    expect(r.covariance[1]! / decay.covariance_ab!).toBeCloseTo(1, 3);
    expect(r.dof).toBe(x.length - 2);
  });

  it('stops on a lower bound where scipy curve_fit (trf, bounded) stops, and reports it', () => {
    const { x, y, w } = arrays(bounded);
    const lower = Float64Array.of(bounded.lower!.a, bounded.lower!.b);
    const upper = Float64Array.of(Infinity, bounded.upper!.b);
    const r = levenbergMarquardt(decayModel, x, y, w, Float64Array.of(bounded.initial.a, bounded.initial.b), { lower, upper });
    expect(r.params[1]).toBe(1.1);
    expect(r.atBound).toEqual([false, true]);
    expect(Math.abs(r.params[0]! - bounded.params.a)).toBeLessThan(1e-3);
  });

  it('ignores points of zero weight', () => {
    const { x, y, w } = arrays(decay);
    const yBad = y.slice();
    const wBad = w.slice();
    yBad[5] = 1e6;
    wBad[5] = 0;
    const r = levenbergMarquardt(decayModel, x, yBad, wBad, Float64Array.of(50, 0.5));
    const clean = levenbergMarquardt(decayModel, x, y, w, Float64Array.of(50, 0.5));
    expect(r.dof).toBe(clean.dof - 1);
    expect(Math.abs(r.params[1]! - clean.params[1]!)).toBeLessThan(3 * Math.sqrt(clean.covariance[3]!));
  });

  it('reports non-convergence when the iteration budget is too small', () => {
    const { x, y, w } = arrays(decay);
    const r = levenbergMarquardt(decayModel, x, y, w, Float64Array.of(1, 5), { maxIterations: 2 });
    expect(r.converged).toBe(false);
    expect(r.iterations).toBe(2);
  });

  it('gives NaN covariance for a degenerate model instead of a wrong number', () => {
    const degenerate: LmModel = {
      nParams: 2,
      evaluate(p, x, model, jac) {
        for (let i = 0; i < x.length; i++) {
          model[i] = p[0]! + p[1]!;
          jac[2 * i] = 1;
          jac[2 * i + 1] = 1;
        }
      },
    };
    const r = levenbergMarquardt(degenerate, Float64Array.of(0, 1, 2), Float64Array.of(1, 2, 3), Float64Array.of(1, 1, 1), Float64Array.of(0, 0));
    expect(r.params[0]! + r.params[1]!).toBeCloseTo(2, 6);
    expect(Number.isNaN(r.covariance[0])).toBe(true);
  });

  it('rejects arrays of different lengths', () => {
    expect(() => levenbergMarquardt(decayModel, new Float64Array(3), new Float64Array(2), new Float64Array(3), new Float64Array(2))).toThrow(RangeError);
  });
  it('returns the model at the solution in memory of its own (the same values evaluate gives)', () => {
    const { x, y, w } = arrays(decay);
    const start = Float64Array.of(decay.initial.a, decay.initial.b);
    const r = levenbergMarquardt(decayModel, x, y, w, start);
    const expected = new Float64Array(x.length);
    decayModel.evaluate(r.params, x, expected, new Float64Array(2 * x.length));
    expect(Array.from(r.model)).toEqual(Array.from(expected));
    // chi2 is that of the returned model's residuals.
    let chi2 = 0;
    for (let i = 0; i < x.length; i++) chi2 += w[i]! * (y[i]! - r.model[i]!) * (y[i]! - r.model[i]!);
    expect(chi2).toBe(r.chi2);
    const again = levenbergMarquardt(decayModel, x, y, w, start);
    expect(again.model).not.toBe(r.model);
    expect(again.model.buffer).not.toBe(r.model.buffer);
    expect(Array.from(again.model)).toEqual(Array.from(r.model));
  });

  it('fits a model whose Jacobian has exact zeros (a line far from most points) as scipy curve_fit does', () => {
    // a exp(-(x - mu)^2 / 2 s^2) + c with the line's derivatives exactly 0 beyond 7 sigma (as the
    // line-group model has them), so the normal equations skip zero rows for most points.
    const line: LmModel = {
      nParams: 4,
      evaluate(p, x, model, jac) {
        for (let i = 0; i < x.length; i++) {
          const d = x[i]! - p[1]!;
          const s = p[2]!;
          const e = d * d > 49 * s * s ? 0 : Math.exp((-0.5 * d * d) / (s * s));
          model[i] = p[0]! * e + p[3]!;
          jac[4 * i] = e;
          jac[4 * i + 1] = (p[0]! * e * d) / (s * s);
          jac[4 * i + 2] = (p[0]! * e * d * d) / (s * s * s);
          jac[4 * i + 3] = 1;
        }
      },
    };
    const x = Float64Array.from({ length: 100 }, (_, i) => i);
    const y = Float64Array.from(x, (xi) => 100 * Math.exp(-0.5 * ((xi - 30) / 2) ** 2) + 10 + 0.5 * Math.sin(xi));
    const r = levenbergMarquardt(line, x, y, new Float64Array(100).fill(1), Float64Array.of(80, 31, 2.5, 9));
    // scipy.optimize.curve_fit (Debian python3-scipy 1.x), same data, p0 and unit sigma, absolute_sigma.
    const params = [99.58708398006634, 30.00116976895327, 2.0134846297364373, 9.988935127954347];
    const errors = [0.6526170328276837, 0.015135527988956291, 0.015435025606567423, 0.10582537701212955];
    expect(r.converged).toBe(true);
    for (let k = 0; k < 4; k++) {
      expect(Math.abs(r.params[k]! - params[k]!)).toBeLessThan(1e-3 * errors[k]!);
      expect(Math.sqrt(r.covariance[5 * k]!) / errors[k]!).toBeCloseTo(1, 3);
    }
  });
});
