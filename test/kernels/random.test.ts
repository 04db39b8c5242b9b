import { describe, expect, it } from 'vitest';
import { POISSON_NORMAL_THRESHOLD, Rng, streamSeed } from '../../src/kernels/random.js';
import { REFERENCE } from '../sim/reference.js';

/** Pearson chi-square of counts against a pmf, pooling bins with < 5 expected. */
function chiSquare(counts: number[], pmf: number[], n: number): { chi2: number; dof: number } {
  let chi2 = 0;
  let bins = 0;
  let poolO = 0;
  let poolE = 0;
  for (let k = 0; k < pmf.length; k++) {
    poolO += counts[k] ?? 0;
    poolE += pmf[k]! * n;
    if (poolE >= 5) {
      chi2 += (poolO - poolE) ** 2 / poolE;
      bins++;
      poolO = 0;
      poolE = 0;
    }
  }
  return { chi2, dof: bins - 1 };
}

describe('Rng', () => {
  it('repeats the same sequence for the same seed and differs between stream labels', () => {
    const a = new Rng(streamSeed(7, 'frame:raw/sci_001.fits'));
    const b = new Rng(streamSeed(7, 'frame:raw/sci_001.fits'));
    const c = new Rng(streamSeed(7, 'frame:raw/sci_002.fits'));
    const sa = Array.from({ length: 8 }, () => a.nextUint32());
    expect(Array.from({ length: 8 }, () => b.nextUint32())).toEqual(sa);
    expect(Array.from({ length: 8 }, () => c.nextUint32())).not.toEqual(sa);
  });

  it('draws uniforms in (0, 1) with mean 1/2 and variance 1/12 (uniform distribution moments)', () => {
    const r = new Rng(11);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    let min = 1;
    let max = 0;
    for (let i = 0; i < n; i++) {
      const u = r.uniform();
      s += u;
      s2 += u * u;
      min = Math.min(min, u);
      max = Math.max(max, u);
    }
    expect(min).toBeGreaterThan(0);
    expect(max).toBeLessThan(1);
    expect(Math.abs(s / n - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(0.002);
  });

  it('draws normals with unit variance and the tail fractions of scipy.special.ndtr', () => {
    const r = new Rng(12);
    const n = 400_000;
    let s = 0;
    let s2 = 0;
    const beyond = { '1': 0, '2': 0, '3': 0 };
    for (let i = 0; i < n; i++) {
      const z = r.normal();
      s += z;
      s2 += z * z;
      const a = Math.abs(z);
      if (a > 1) beyond['1']++;
      if (a > 2) beyond['2']++;
      if (a > 3) beyond['3']++;
    }
    expect(Math.abs(s / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    for (const z of ['1', '2', '3'] as const) {
      const p = REFERENCE.normalTail[`${z}.0`]!;
      // Binomial 5-sigma band around the scipy tail probability.
      expect(Math.abs(beyond[z] / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    }
  });

  it('draws normals that pass a chi-square test against scipy.special.ndtr bin probabilities, tails included (p > 0.001)', () => {
    const { edges, p } = REFERENCE.normalBins;
    const r = new Rng(streamSeed(9, 'normal-bins'));
    const n = 1_000_000;
    const counts = new Array<number>(p.length).fill(0);
    const step = edges[1]! - edges[0]!;
    for (let i = 0; i < n; i++) {
      const z = r.normal();
      const k = z < edges[0]! ? 0 : Math.min(p.length - 1, 1 + Math.floor((z - edges[0]!) / step));
      counts[k]!++;
    }
    const { chi2, dof } = chiSquare(counts, p, n);
    expect(dof).toBeGreaterThan(30);
    expect(chi2).toBeLessThan(REFERENCE.chi2ppf999[String(dof)]!);
  });

  for (const lambda of ['0.7', '3.0', '12.5', '39.0']) {
    it(`draws Poisson(${lambda}) counts that pass a chi-square test against scipy.stats.poisson.pmf (p > 0.001)`, () => {
      const pmf = REFERENCE.poissonPmf[lambda]!;
      const r = new Rng(streamSeed(3, `poisson-${lambda}`));
      const n = 100_000;
      const counts: number[] = [];
      for (let i = 0; i < n; i++) {
        const k = r.poisson(Number(lambda));
        counts[k] = (counts[k] ?? 0) + 1;
      }
      const { chi2, dof } = chiSquare(counts, pmf, n);
      expect(chi2).toBeLessThan(REFERENCE.chi2ppf999[String(dof)]!);
    });
  }

  it('keeps mean and variance lambda above the normal-approximation threshold (Poisson moments)', () => {
    for (const lambda of [POISSON_NORMAL_THRESHOLD, 500, 40_000]) {
      const r = new Rng(streamSeed(5, `big-${lambda}`));
      const n = 100_000;
      let s = 0;
      let s2 = 0;
      for (let i = 0; i < n; i++) {
        const k = r.poisson(lambda);
        s += k;
        s2 += k * k;
      }
      const mean = s / n;
      const variance = s2 / n - mean * mean;
      expect(Math.abs(mean - lambda)).toBeLessThan(5 * Math.sqrt(lambda / n));
      // Variance of the sample variance ~ 2 lambda^2 / n; rounding adds 1/12.
      expect(Math.abs(variance - lambda - 1 / 12)).toBeLessThan(5 * lambda * Math.sqrt(2 / n) + 0.1);
    }
  });
});
