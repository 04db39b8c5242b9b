import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { chi2ErrorScale, chi2NoiseLimit } from '../../src/kernels/chi2-scale.js';
import { Rng } from '../../src/kernels/random.js';

const TAIL: { dof: number; limit: number; tail: number }[] = JSON.parse(readFileSync(new URL('../../fixtures/kernels/chi2-tail.json', import.meta.url), 'utf8'));

/** Chi-square of `dof` unit-variance normal deviates whose stated errors are `stated` (truth 1). */
function drawChi2(rng: Rng, dof: number, stated: number): number {
  let chi2 = 0;
  for (let k = 0; k < dof; k++) chi2 += (rng.normal() / stated) ** 2;
  return chi2;
}

describe('chi2ErrorScale', () => {
  it('noise limit has the chi-square tail scipy gives (python3-scipy chi2.sf, fixtures/kernels/chi2-tail.json)', () => {
    for (const r of TAIL) expect(chi2NoiseLimit(r.dof)).toBeCloseTo(r.limit, 10);
  });

  it('leaves honest errors alone as often as the scipy tail says (seeded injection, within 4 binomial sigmas)', () => {
    const rng = new Rng(7);
    const draws = 4000;
    for (const r of TAIL) {
      let scaled = 0;
      for (let t = 0; t < draws; t++) if (chi2ErrorScale(drawChi2(rng, r.dof, 1), r.dof) !== 1) scaled++;
      expect(Math.abs(scaled - draws * r.tail)).toBeLessThan(4 * Math.sqrt(draws * r.tail) + 1);
    }
  });

  it('recovers an injected error underestimate of 2 (stated errors half the truth) within 10% at dof 200', () => {
    const rng = new Rng(11);
    const dof = 200;
    expect(chi2ErrorScale(drawChi2(rng, dof, 0.5), dof)).toBeGreaterThan(1.8);
    expect(chi2ErrorScale(drawChi2(rng, dof, 0.5), dof)).toBeLessThan(2.2);
  });

  it('is 1 without degrees of freedom', () => {
    expect(chi2ErrorScale(10, 0)).toBe(1);
    expect(chi2ErrorScale(10, -1)).toBe(1);
  });
});
