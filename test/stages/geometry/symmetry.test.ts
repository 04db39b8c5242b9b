import { describe, expect, test } from 'vitest';
import { fitSymmetry } from '../../../src/stages/geometry/symmetry.js';
import { pvSamples } from '../../../src/stages/geometry/mirror.js';
import { Rng } from '../../../src/kernels/random.js';

/** An antisymmetric curve about (c, vs) sampled every `step` rows, with Gaussian noise of error e(s). */
function samples(seed: number, c: number, vs: number, step: number, e: (s: number) => number) {
  const rnd = new Rng(seed);
  const y: number[] = [];
  const v: number[] = [];
  const err: number[] = [];
  for (let row = 10; row < 190; row += step) {
    const s = row - c;
    y.push(row);
    err.push(e(s));
    v.push(vs + Math.sign(s) * 150 * (1 - Math.exp(-Math.abs(s) / 10)) + e(s) * rnd.normal());
  }
  return pvSamples(Float64Array.from(y), Float64Array.from(v), Float64Array.from(err));
}

describe('centre and systemic velocity by symmetry', () => {
  test('recovered with bootstrap errors of unit pull width, for bins of 1 and 3 rows (injection-recovery, seeded)', () => {
    for (const step of [1, 3]) {
      const pc: number[] = [];
      const pv: number[] = [];
      const rnd = new Rng(40 + step);
      for (let k = 0; k < 40; k++) {
        const c = 99 + 2 * rnd.uniform();
        const fit = fitSymmetry(samples(500 + k, c, 1500, step, (s) => 4 + 0.05 * Math.abs(s)), { startRow: c + 3 * rnd.normal(), searchRows: 8 })!;
        pc.push((fit.centreRow - c) / fit.centreRowErr);
        pv.push((fit.vSysKms - 1500) / fit.vSysErrKms);
      }
      for (const pulls of [pc, pv]) {
        const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
        const std = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
        expect(std).toBeGreaterThan(0.7);
        expect(std).toBeLessThan(1.3);
        expect(Math.abs(mean)).toBeLessThan(0.5);
      }
    }
  });

  test('a fixed centre or v_sys is kept with zero error, and the other one is still fitted', () => {
    const p = samples(9, 100.4, 2000, 1, () => 3);
    const a = fitSymmetry(p, { startRow: 100, searchRows: 8, fixedCentreRow: 100.4 })!;
    expect([a.centreRow, a.centreRowErr]).toEqual([100.4, 0]);
    expect(Math.abs(a.vSysKms - 2000)).toBeLessThan(4 * a.vSysErrKms);
    const b = fitSymmetry(p, { startRow: 100, searchRows: 8, fixedVSysKms: 2000 })!;
    expect([b.vSysKms, b.vSysErrKms]).toEqual([2000, 0]);
    expect(Math.abs(b.centreRow - 100.4)).toBeLessThan(4 * b.centreRowErr);
  });

  test('the same input gives the same result (seeded bootstrap), and a start far off is reported at the search edge', () => {
    const p = samples(10, 100.4, 2000, 1, () => 3);
    expect(fitSymmetry(p, { startRow: 101, searchRows: 8 })).toEqual(fitSymmetry(p, { startRow: 101, searchRows: 8 }));
    expect(fitSymmetry(p, { startRow: 130, searchRows: 8 })!.atSearchEdge).toBe(true);
  });
});

test('a point 40 sigma off (a bad line fit) is left out of the centre fit, and the centre stays within its errors', () => {
  const clean = samples(12, 100.4, 2000, 1, () => 3);
  const v = Float64Array.from(clean.v);
  const k = clean.y.indexOf(104);
  v[k] = v[k]! + 120;
  const dirty = { ...clean, v };
  const a = fitSymmetry(clean, { startRow: 100, searchRows: 8 })!;
  const b = fitSymmetry(dirty, { startRow: 100, searchRows: 8 })!;
  expect(a.nDropped).toBe(0);
  expect(b.nDropped).toBeGreaterThanOrEqual(1);
  expect(Math.abs(b.centreRow - 100.4)).toBeLessThan(3 * b.centreRowErr);
  expect(Math.abs(b.vSysKms - 2000)).toBeLessThan(3 * b.vSysErrKms);
});
