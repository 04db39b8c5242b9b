import { describe, expect, it } from 'vitest';
import { weightedMean } from '../../src/kernels/weighted-mean.js';

describe('weightedMean', () => {
  it('agrees with numpy.average(v, weights=1/e**2, returned=True) and sum(((v - mean)/e)**2) (python3-numpy)', () => {
    // /usr/bin/python3: v = [1.2, 0.8, 1.1, 1.5], e = [0.1, 0.2, 0.15, 0.3]
    const r = weightedMean([1.2, 0.8, 1.1, 1.5], [0.1, 0.2, 0.15, 0.3]);
    expect(r.mean).toBeCloseTo(1.1384615384615384, 12);
    expect(r.err).toBeCloseTo(0.07442084075352508, 12);
    expect(r.chi2).toBeCloseTo(4.76068376068376, 10);
  });

  it('is NaN for no values', () => {
    const r = weightedMean([], []);
    expect(Number.isNaN(r.mean)).toBe(true);
  });
});
