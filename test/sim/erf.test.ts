import { describe, expect, it } from 'vitest';
import { addPixelGaussian, erf } from '../../src/sim/erf.js';
import { REFERENCE } from './reference.js';

describe('erf', () => {
  it('matches scipy.special.erf within 1.5e-7 (the bound of Abramowitz & Stegun 7.1.26)', () => {
    REFERENCE.erf.x.forEach((x, i) => expect(Math.abs(erf(x) - REFERENCE.erf.erf[i]!)).toBeLessThan(1.5e-7));
  });
});

describe('addPixelGaussian', () => {
  for (const c of REFERENCE.pixelGaussian) {
    it(`integrates a Gaussian (centre ${c.centre}, sigma ${c.sigma}) over pixels as scipy.stats.norm.cdf differences do`, () => {
      const out = new Float32Array(c.n);
      addPixelGaussian(out, 0, c.n, c.centre, c.sigma, c.flux);
      c.values.forEach((v, d) => expect(Math.abs(out[d]! - v)).toBeLessThan(2e-7 * c.flux + 1e-5 * Math.abs(v)));
    });
  }

  it('conserves the flux and puts the centroid at the centre for a line inside the row (moments of a Gaussian)', () => {
    for (const [centre, sigma] of [[40.0, 1.3], [40.37, 1.3], [61.81, 2.2], [20.5, 0.8]] as const) {
      const out = new Float32Array(100);
      addPixelGaussian(out, 0, 100, centre, sigma, 1e5);
      let sum = 0;
      let moment = 0;
      let second = 0;
      out.forEach((v, d) => {
        sum += v;
        moment += v * d;
      });
      const mean = moment / sum;
      out.forEach((v, d) => (second += v * (d - mean) ** 2));
      expect(Math.abs(sum - 1e5)).toBeLessThan(0.05);
      expect(Math.abs(mean - centre)).toBeLessThan(1e-4);
      // Pixel integration adds the variance of a unit box, 1/12 (Sheppard's correction).
      expect(Math.abs(second / sum - (sigma * sigma + 1 / 12))).toBeLessThan(1e-3);
    }
  });

  it('adds into a row at an offset and loses the flux beyond the row ends, as a detector edge does', () => {
    const out = new Float32Array(30);
    addPixelGaussian(out, 10, 10, 0, 1, 100);
    const total = out.reduce((a, b) => a + b, 0);
    expect(out.slice(0, 10).every((v) => v === 0)).toBe(true);
    expect(out.slice(20).every((v) => v === 0)).toBe(true);
    expect(Math.abs(total - 50 * (1 + erf(0.5 / Math.SQRT2)))).toBeLessThan(1e-3);
  });
});
