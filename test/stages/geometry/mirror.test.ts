import { describe, expect, test } from 'vitest';
import { foldChiSquare, foldChiSquareWith, mirrorKernels, pvSamples } from '../../../src/stages/geometry/mirror.js';
import { Rng } from '../../../src/kernels/random.js';

// Irregular rows (as bins give), a rotation-like curve with noise, errors growing outward.
function curve(seed: number) {
  const rnd = new Rng(seed);
  const y: number[] = [];
  for (let row = 20; row < 180; row += 1 + 2 * rnd.uniform()) y.push(row);
  const e = y.map((r) => 3 + 0.04 * Math.abs(r - 100));
  const v = y.map((r, k) => 1200 + Math.tanh((r - 100.3) / 8) * 140 + e[k]! * rnd.normal());
  return pvSamples(Float64Array.from(y), Float64Array.from(v), Float64Array.from(e));
}

/**
 * The fold by its definition, written out plainly: the mirror value at 2c - y_i is the intercept
 * of a weighted straight-line fit (normal equations solved by Cramer's rule) to the other active
 * points within the kernel half-width, weights biweight / e^2; chi-square with v_sys at its
 * closed-form minimum.
 */
function referenceFold(p: ReturnType<typeof curve>, active: Uint8Array, c: number, c0: number, half: number) {
  const { y, v, e } = p;
  const h = p.kernelRows;
  const rows: { r: number; w: number }[] = [];
  for (let i = 0; i < y.length; i++) {
    if (!active[i] || Math.abs(y[i]! - c0) > half) continue;
    const m = 2 * c - y[i]!;
    if (m < y[0]! || m > y[y.length - 1]!) continue;
    const near = [...y.keys()].filter((k) => k !== i && active[k] && Math.abs(y[k]! - m) <= h);
    const w = near.map((k) => (1 - ((y[k]! - m) / h) ** 2) ** 2 / e[k]! ** 2);
    const sx = (f: (k: number, j: number) => number) => near.reduce((s, k, j) => s + f(k, j), 0);
    const s0 = sx((_, j) => w[j]!);
    const s1 = sx((k, j) => w[j]! * (y[k]! - m));
    const s2 = sx((k, j) => w[j]! * (y[k]! - m) ** 2);
    const det = s0 * s2 - s1 * s1;
    if (!(s0 > 0) || !(det > 1e-12 * s0 * s2)) continue;
    const l = near.map((k, j) => (w[j]! * (s2 - s1 * (y[k]! - m))) / det);
    const value = near.reduce((s, k, j) => s + l[j]! * v[k]!, 0);
    const variance = near.reduce((s, k, j) => s + l[j]! ** 2 * e[k]! ** 2, 0);
    rows.push({ r: v[i]! + value, w: 1 / (e[i]! ** 2 + variance) });
  }
  const vSys = rows.reduce((s, q) => s + q.w * q.r, 0) / (2 * rows.reduce((s, q) => s + q.w, 0));
  return { n: rows.length, vSys, chi2: rows.reduce((s, q) => s + q.w * (q.r - 2 * vSys) ** 2, 0) };
}

describe('fold chi-square and kept mirror kernels', () => {
  const p = curve(11);
  const active = new Uint8Array(p.y.length).fill(1);
  for (let k = 3; k < active.length; k += 17) active[k] = 0;

  test('agrees with the fold written out from its definition', () => {
    for (const c of [98.7, 100.3, 101.05]) {
      const f = foldChiSquare(p, active, c, 100, 60, undefined);
      const r = referenceFold(p, active, c, 100, 60);
      expect(f.n).toBe(r.n);
      expect(f.vSys).toBeCloseTo(r.vSys, 9);
      expect(f.chi2 / r.chi2).toBeCloseTo(1, 9);
    }
  });

  test('kernels kept at a centre give the very fold of new velocities, bit for bit (many kernels: the store grows)', () => {
    const rnd = new Rng(5);
    for (const c of [99.2, 100.3, 100.9]) {
      const kernels = mirrorKernels(p, active, c, 100, 60);
      expect(kernels.count).toBeGreaterThan(50);
      for (let draw = 0; draw < 5; draw++) {
        const drawn = { ...p, v: Float64Array.from(p.v, (x, k) => x + p.e[k]! * rnd.normal()) };
        for (const fixed of [undefined, 1201.5]) expect(foldChiSquareWith(drawn, kernels, fixed)).toEqual(foldChiSquare(drawn, active, c, 100, 60, fixed));
      }
    }
  });

  test('a centre whose mirrors leave the points compares fewer of them, kept or not', () => {
    // Points in rows 100-180 mirror about row 150 onto rows 120-200: those past the last point drop out.
    const inWindow = [...p.y].filter((r, k) => active[k] && Math.abs(r - 140) <= 40).length;
    const kernels = mirrorKernels(p, active, 150, 140, 40);
    const f = foldChiSquare(p, active, 150, 140, 40, undefined);
    expect(f.n).toBeLessThan(inWindow - 5);
    expect(kernels.count).toBe(f.n);
    expect(foldChiSquareWith(p, kernels, undefined)).toEqual(f);
    expect(f.n).toBe(referenceFold(p, active, 150, 140, 40).n);
  });
});
