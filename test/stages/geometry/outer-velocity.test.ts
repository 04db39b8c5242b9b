import { describe, expect, it } from 'vitest';
import type { CurvePoint } from '../../../src/products/curve.js';
import { outerVelocity } from '../../../src/stages/geometry/outer-velocity.js';

function point(rArcsec: number, vRot: number, errTotal: number, oneSided: boolean): CurvePoint {
  return { rArcsec, vRot, errTotal, oneSided } as CurvePoint;
}

describe('outerVelocity', () => {
  it('is the inverse-variance weighted mean of the three outermost two-sided points', () => {
    const pts = [point(10, 180, 2, false), point(20, 200, 2, false), point(30, 204, 4, false), point(40, 206, 4, false)];
    const { v, err } = outerVelocity(pts);
    // numpy.average([200, 204, 206], weights=1/[2, 4, 4]**2, returned=True) (python3-numpy): 201.6666..., sum of weights 0.375
    expect(v).toBeCloseTo(201.66666666666666, 10);
    expect(err).toBeCloseTo(1.6329931618554523, 10);
  });

  it('leaves out a one-sided end bin when three two-sided points exist', () => {
    const pts = [point(10, 200, 3, false), point(20, 202, 3, false), point(30, 201, 3, false), point(50, 253, 18, true)];
    expect(outerVelocity(pts).v).toBeCloseTo(201, 10);
  });

  it('falls back to every point when fewer than three are two-sided', () => {
    const pts = [point(10, 200, 3, true), point(20, 210, 3, true), point(30, 220, 3, false)];
    expect(outerVelocity(pts).v).toBeCloseTo(210, 10);
  });
});
