import { describe, expect, it } from 'vitest';
import { evalLegendre1D } from '../../../src/kernels/legendre.js';
import { fitLegendre1D } from '../../../src/kernels/legendre-fit.js';
import { Rng } from '../../../src/kernels/random.js';
import { pruneToErrors } from '../../../src/stages/arc/prune.js';

// lambda(x) of the simulator's small red setup (src/sim/setups.ts): a cubic Legendre series
const truth = { kind: 'legendre1d' as const, min: 0, max: 1023, coeffs: [6648.7, 562.65, -2.6, 0.9] };
const range = { min: 0, max: 1023 };

function lines(n: number, seed: number, sigmaA: number): { x: Float64Array; y: Float64Array; w: Float64Array } {
  const rng = new Rng(seed);
  const x = Float64Array.from({ length: n }, (_, i) => 40 + (i * 940) / (n - 1) + rng.normal() * 10);
  const y = Float64Array.from(x, (v) => evalLegendre1D(truth, v) + rng.normal() * sigmaA);
  return { x, y, w: new Float64Array(n).fill(1 / (sigmaA * sigmaA)) };
}

describe('pruneToErrors', () => {
  it('leaves out two positions 0.8 A off among 13 (errors 0.02 A) that clipping cannot single out', () => {
    const d = lines(13, 1, 0.02);
    d.y[4] += 0.8;
    d.y[12] -= 0.8;
    const first = fitLegendre1D(d.x, d.y, d.w, 4, range, { clipSigma: 3 });
    const pruned = pruneToErrors(d.x, d.y, d.w, first);
    expect(pruned.used[4]).toBe(0);
    expect(pruned.used[12]).toBe(0);
    expect(pruned.nUsed).toBe(11);
    expect(pruned.reducedChi2).toBeLessThan(3);
  });

  it('leaves every position in when the model is wrong (a straight line through a cubic dispersion)', () => {
    const d = lines(13, 2, 0.02);
    const first = fitLegendre1D(d.x, d.y, d.w, 1, range, { clipSigma: Infinity });
    expect(pruneToErrors(d.x, d.y, d.w, first)).toBe(first);
  });

  it('picks by the deletion gain w r^2 / (1 - h) (Cook & Weisberg 1982) the one bad position of 13 and ends on the refit without it', () => {
    const d = lines(13, 3, 0.02);
    d.y[7] += 0.5;
    const first = fitLegendre1D(d.x, d.y, d.w, 3, range, { clipSigma: Infinity });
    const w = d.w.slice();
    w[7] = 0;
    const without = fitLegendre1D(d.x, d.y, w, 3, range, { clipSigma: Infinity });
    const pruned = pruneToErrors(d.x, d.y, d.w, first);
    expect(pruned.used[7]).toBe(0);
    expect(pruned.chi2).toBeCloseTo(without.chi2, 6);
  });
});
