import { describe, expect, test } from 'vitest';
import { StageError } from '../../../src/errors.js';
import type { RotationCurve } from '../../../src/products/curve.js';
import { buildRotationCurve } from '../../../src/stages/geometry/index.js';
import { Rng } from '../../../src/kernels/random.js';
import { risingFlat, synthLines, synthVelocities, type DiskTruth } from './synthetic.js';

const ROWS = 200;
const SCALE = 0.4; // arcsec per row
const settingsFor = (t: DiskTruth) => ({ arcsecPerPixel: SCALE, distanceMpc: 20, inclinationDeg: t.inclinationDeg, majorAxisPaDeg: 30, slitPaDeg: 30 + t.slitToMajorDeg });

function stats(a: number[]): { mean: number; std: number } {
  const mean = a.reduce((s, x) => s + x, 0) / a.length;
  return { mean, std: Math.sqrt(a.reduce((s, x) => s + (x - mean) ** 2, 0) / (a.length - 1)) };
}

describe('deprojection and fold of a noiseless disk', () => {
  test('slit 20 deg from the major axis at i = 60: R/r = 1.16230, sin i cos theta = 0.70016 (REFERENCE.md Geometry), V recovered exactly', () => {
    const t: DiskTruth = { centreRow: 100.3, vSysKms: 4321, inclinationDeg: 60, slitToMajorDeg: 20, arcsecPerPixel: SCALE, curve: risingFlat(180, 6) };
    const v = synthVelocities(t, { rows: ROWS, seed: 1, error: () => 1e-9 });
    const curve = buildRotationCurve(v, synthLines(v, ROWS, 100), { ...settingsFor(t), centreRow: t.centreRow, systemicVelocityKms: t.vSysKms }).product;
    expect(curve.centreSource).toBe('given');
    expect(curve.vSys).toBe(4321);
    for (const p of curve.pv) {
      expect(p.radiusArcsec / Math.abs(p.offsetArcsec)).toBeCloseTo(1.1623, 4);
      expect(p.projection).toBeCloseTo(0.70016, 5);
      expect(p.vRot).toBeCloseTo(t.curve(p.radiusArcsec), 6);
    }
    // Each bin's weighted-mean radius carries the weighted-mean speed; the curve is nearly linear within a bin.
    for (const p of curve.points) expect(Math.abs(p.vRot - t.curve(p.rArcsec))).toBeLessThan(0.05);
    expect(curve.points.every((p) => !p.oneSided || p.rArcsec > 40)).toBe(true);
  });

  test('radii in kpc use 1 arcsec = 4.848136811e-3 D kpc at D Mpc (REFERENCE.md Constants, from pi / 648000)', () => {
    const t: DiskTruth = { centreRow: 100, vSysKms: 3000, inclinationDeg: 60, slitToMajorDeg: 0, arcsecPerPixel: SCALE, curve: () => 200 };
    const v = synthVelocities(t, { rows: ROWS, seed: 8, error: () => 1 });
    const curve = buildRotationCurve(v, synthLines(v, ROWS, 100), { ...settingsFor(t), distanceMpc: 17.5 }).product;
    expect(curve.geometry.kpcPerArcsec / (4.848136811e-3 * 17.5)).toBeCloseTo(1, 9);
    for (const p of curve.points) expect(p.rKpc).toBeCloseTo(p.rArcsec * 4.848136811e-3 * 17.5, 9);
    for (const l of curve.light) expect(l.rKpc).toBeCloseTo(l.rArcsec * 4.848136811e-3 * 17.5, 9);
  });

  test('the inclination error propagates as V cot(i) sigma_i: 1.01% per degree at i = 60 (REFERENCE.md Geometry)', () => {
    const t: DiskTruth = { centreRow: 100, vSysKms: 3000, inclinationDeg: 60, slitToMajorDeg: 0, arcsecPerPixel: SCALE, curve: () => 200 };
    const v = synthVelocities(t, { rows: ROWS, seed: 2, error: () => 1e-6 });
    const curve = buildRotationCurve(v, synthLines(v, ROWS, 100), { ...settingsFor(t), inclinationErrDeg: 1, centreRow: 100, systemicVelocityKms: 3000 }).product;
    for (const p of curve.points.filter((q) => q.rArcsec > 1)) expect(p.errInclination / p.vRot).toBeCloseTo(0.0101, 4);
  });

  test('the receding side is found whichever way the disk turns, and the light profile folds back onto itself', () => {
    const t: DiskTruth = { centreRow: 99.6, vSysKms: 2500, inclinationDeg: 50, slitToMajorDeg: 0, arcsecPerPixel: SCALE, curve: (r) => -risingFlat(150, 5)(r) };
    const v = synthVelocities(t, { rows: ROWS, seed: 3, error: () => 0.01 });
    const curve = buildRotationCurve(v, synthLines(v, ROWS, 99.6, 15), { ...settingsFor(t), centreRow: 99.6, systemicVelocityKms: 2500 }).product;
    expect(curve.recedingSense).toBe(-1);
    expect(curve.points.every((p) => p.vRot > 0 || p.rArcsec < 0.5)).toBe(true);
    expect(curve.pv.filter((p) => p.offsetArcsec < 0 && p.exclusion === null).every((p) => p.side === 'receding')).toBe(true);
    // Exponential profile 100 exp(-|y - 99.6| / 15) read at 99.6 +- k rows: both sides equal it
    // (away from the cusp at k = 0, where linear interpolation between rows cannot follow it).
    const light = curve.light.filter((q) => !q.oneSided);
    expect(light.length).toBeGreaterThan(90);
    for (const l of light.slice(1)) {
      const k = l.rArcsec / SCALE;
      expect(Math.abs(l.fluxApproaching / l.fluxReceding - 1)).toBeLessThan(1e-4);
      expect(Math.abs(l.flux / (100 * Math.exp(-k / 15)) - 1)).toBeLessThan(1e-3);
    }
  });
});

describe('injection and recovery (seeded synthetic curves)', () => {
  test.each([0, 20])('slit %i deg from the major axis: v_sys within 2 km/s, centre within errors, pulls of V of unit width', (dphi) => {
    const rnd = new Rng(11 + dphi);
    const pullsV: number[] = [];
    const pullsC: number[] = [];
    const pullsS: number[] = [];
    for (let k = 0; k < 30; k++) {
      const t: DiskTruth = { centreRow: 100 + rnd.uniform(), vSysKms: 4000 + 400 * rnd.uniform(), inclinationDeg: 60, slitToMajorDeg: dphi, arcsecPerPixel: SCALE, curve: risingFlat(180, 6) };
      const v = synthVelocities(t, { rows: ROWS, seed: 1000 * dphi + k, error: (s) => 3 + 0.08 * Math.abs(s) });
      const c: RotationCurve = buildRotationCurve(v, synthLines(v, ROWS, t.centreRow + 2 * rnd.normal()), settingsFor(t)).product;
      expect(Math.abs(c.vSys - t.vSysKms)).toBeLessThan(2);
      pullsC.push((c.centreRow - t.centreRow) / c.centreRowErr);
      pullsS.push((c.vSys - t.vSysKms) / c.vSysErr);
      for (const p of c.points) pullsV.push((p.vRot - t.curve(p.rArcsec)) / p.errTotal);
    }
    for (const pulls of [pullsV, pullsC, pullsS]) {
      const s = stats(pulls);
      expect(s.std).toBeGreaterThan(0.7);
      expect(s.std).toBeLessThan(1.3);
      expect(Math.abs(s.mean)).toBeLessThan(4 / Math.sqrt(pulls.length) + 0.1);
    }
  });

  test('a falling curve (Plummer 1911 sphere, V ~ R / (R^2 + a^2)^(3/4)) is classed as declining towards Keplerian', () => {
    const a = 4; // arcsec
    const plummer = (r: number): number => (250 * (r / a)) / (1 + (r / a) ** 2) ** 0.75;
    const t: DiskTruth = { centreRow: 100.2, vSysKms: 5000, inclinationDeg: 70, slitToMajorDeg: 0, arcsecPerPixel: SCALE, curve: plummer };
    const v = synthVelocities(t, { rows: ROWS, seed: 77, error: (s) => 2 + 0.02 * Math.abs(s) });
    const c = buildRotationCurve(v, synthLines(v, ROWS, 100), settingsFor(t)).product;
    expect(c.shape).toBe('keplerian');
    expect(c.outerLogSlope).toBeLessThan(-0.35);
  });
});

describe('exclusions and failures', () => {
  const t: DiskTruth = { centreRow: 100, vSysKms: 3000, inclinationDeg: 60, slitToMajorDeg: 80, arcsecPerPixel: SCALE, curve: risingFlat(200, 5) };
  const v = synthVelocities(t, { rows: ROWS, seed: 5, error: () => 2 });

  test('a slit 80 deg from the major axis lies in the minor-axis wedge: no curve (StageError) unless the wedge is narrowed', () => {
    expect(() => buildRotationCurve(v, synthLines(v, ROWS, 100), settingsFor(t))).toThrow(StageError);
    const c = buildRotationCurve(v, synthLines(v, ROWS, 100), { ...settingsFor(t), minCosTheta: 0.05 });
    expect(c.product.points.length).toBeGreaterThan(10);
    expect(c.diagnostics.some((d) => d.rule === 'geometry.near-minor-axis')).toBe(false);
  });

  test('points inside two seeing FWHM are flagged as beam-smeared (common practice); fewer than 6 points is a StageError', () => {
    const u = synthVelocities({ ...t, slitToMajorDeg: 0 }, { rows: ROWS, seed: 6, error: () => 2 });
    const c = buildRotationCurve(u, synthLines(u, ROWS, 100), { ...settingsFor({ ...t, slitToMajorDeg: 0 }), seeingFwhmArcsec: 1.2 }).product;
    expect(c.points.filter((p) => p.beamSmeared).every((p) => p.rArcsec < 2.4)).toBe(true);
    expect(c.points.filter((p) => !p.beamSmeared).every((p) => p.rArcsec >= 2.4)).toBe(true);
    const few = { ...u, points: u.points.slice(0, 5) };
    expect(() => buildRotationCurve(few, synthLines(few, ROWS, 100), settingsFor(t))).toThrow(/at least 6/);
  });

  test('with no velocity in any bin (frames without emission lines, say) the error counts the bins and says what to check', () => {
    const none = { ...v, points: v.points.map((p) => ({ ...p, vLos: NaN, vLosErr: NaN })) };
    expect(() => buildRotationCurve(none, synthLines(none, ROWS, 100), settingsFor(t))).toThrow(
      new RegExp(`0 usable velocity points \\(of ${v.points.length} row bins, 0 carry flags that keep them out and ${v.points.length} have no velocity\\).*science exposures`),
    );
  });
});
