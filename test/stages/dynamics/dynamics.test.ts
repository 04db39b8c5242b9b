import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { AU_M, KPC_M } from '../../../src/physics/index.js';
import type { CurvePoint } from '../../../src/products/curve.js';
import { computeDynamics } from '../../../src/stages/dynamics/index.js';
import { fitLogSlope } from '../../../src/stages/dynamics/log-slope.js';

const ref = JSON.parse(readFileSync(new URL('../../../fixtures/geometry/reference.json', import.meta.url), 'utf8'));

/** A curve point with only radius, speed and error set (two-sided, no asymmetry). */
function point(rKpc: number, vRot: number, err: number): CurvePoint {
  return {
    rArcsec: rKpc, rKpc, vRot, errStat: err, errSys: 0, errTotal: err, errAsymmetry: 0, errInclination: 0,
    vApproaching: vRot, vApproachingErr: err, vReceding: vRot, vRecedingErr: err, nApproaching: 1, nReceding: 1, oneSided: false, beamSmeared: false,
  };
}

describe('enclosed mass', () => {
  test('V = 200 km/s at 10 kpc encloses 9.30034e10 M_sun (REFERENCE.md Mass, computed from IAU 2015 GM_sun)', () => {
    const d = computeDynamics([point(5, 150, 2), point(10, 200, 2), point(15, 200, 2)]).dynamics[1]!;
    expect(d.massMsun / 9.30034e10).toBeCloseTo(1, 5);
    // sigma_M = 2 sigma_V / V x M
    expect(d.massErrMsun / d.massMsun).toBeCloseTo((2 * 2) / 200, 10);
  });

  test("the planets' mean orbital speeds weigh the Sun: 1 M_sun within 1% (NASA planetary fact sheet speeds; semi-major axes from memory)", () => {
    // Speeds (km/s) as listed in REFERENCE.md [memory of the NASA fact sheet]; semi-major axes (au) recalled [memory].
    const planets: [string, number, number][] = [
      ['Mercury', 0.3871, 47.87], ['Venus', 0.7233, 35.02], ['Earth', 1.0, 29.78], ['Mars', 1.5237, 24.07],
      ['Jupiter', 5.2034, 13.07], ['Saturn', 9.5371, 9.69], ['Uranus', 19.1913, 6.81], ['Neptune', 30.069, 5.43],
    ];
    const auKpc = AU_M / KPC_M;
    const { dynamics } = computeDynamics(planets.map(([, a, v]) => point(a * auKpc, v, 0.005)));
    const masses = dynamics.map((d) => d.massMsun);
    const mean = masses.reduce((s, m) => s + m, 0) / masses.length;
    expect(Math.abs(mean - 1)).toBeLessThan(0.01);
    for (const m of masses) expect(Math.abs(m - 1)).toBeLessThan(0.015);
    // Earth alone: GM_sun within 0.5% of the IAU 2015 nominal value.
    expect(Math.abs(masses[2]! - 1)).toBeLessThan(0.005);
  });
});

describe('logarithmic slope', () => {
  test('weighted ln V - ln R line agrees with numpy.polyfit (fixtures/geometry/make_reference.py)', () => {
    const p = ref.polyfit;
    const fit = fitLogSlope(p.r_kpc, p.v_kms, p.err_kms);
    expect(fit.slope).toBeCloseTo(p.slope, 10);
    expect(fit.slopeErr).toBeCloseTo(p.slope_err, 10);
  });

  test('the Freeman (1970) exponential disk peaks at 2.15 R_d: the local slope changes sign there (scipy Bessel fixture; REFERENCE.md 2.15006 R_d)', () => {
    const f = ref.freeman;
    const points = f.r_kpc.map((r: number, k: number) => point(r, f.v_kms[k], 1));
    const { dynamics } = computeDynamics(points);
    let crossing = NaN;
    for (let k = 1; k + 2 < dynamics.length; k++) {
      const a = dynamics[k]!;
      const b = dynamics[k + 1]!;
      if (a.logSlope > 0 && b.logSlope <= 0) crossing = a.rKpc + ((b.rKpc - a.rKpc) * a.logSlope) / (a.logSlope - b.logSlope);
    }
    expect(crossing / f.scale_kpc).toBeCloseTo(2.15006, 1);
    expect(Number.isNaN(dynamics[0]!.logSlope) && Number.isNaN(dynamics[dynamics.length - 1]!.logSlope)).toBe(true);
  });
});

describe('curve shape', () => {
  test('a flat curve is flat; the Freeman disk beyond 4 R_d declines towards Keplerian (scipy fixture)', () => {
    const flat = computeDynamics([2, 4, 6, 8, 10, 12].map((r) => point(r, 200 + (r % 4 === 0 ? 1 : -1), 3)));
    expect(flat.shape).toBe('flat');
    expect(flat.shapeSummary).toMatch(/inside most of the mass/);
    const f = ref.freeman;
    const outer = f.r_kpc.map((r: number, k: number) => point(r, f.v_kms[k], 0.5)).filter((p: CurvePoint) => p.rKpc >= 4 * f.scale_kpc);
    const kep = computeDynamics(outer);
    expect(kep.shape).toBe('keplerian');
    expect(kep.shapeSummary).toMatch(/outside most of the mass/);
  });

  test('a rising curve is rising, and two points leave the shape undetermined', () => {
    expect(computeDynamics([1, 2, 3, 4, 5, 6].map((r) => point(r, 40 * r, 2))).shape).toBe('rising');
    const few = computeDynamics([point(1, 50, 2), point(2, 90, 2)]);
    expect(few.shape).toBe('undetermined');
    expect(few.diagnostics.map((d) => d.rule)).toContain('dynamics.shape-undetermined');
  });
});
