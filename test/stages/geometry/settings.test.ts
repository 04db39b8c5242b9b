import { describe, expect, test } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { DEFAULT_GEOMETRY_SETTINGS, resolveGeometrySettings, resolveInclination } from '../../../src/stages/geometry/index.js';

const base = { arcsecPerPixel: 0.4, distanceMpc: 20, majorAxisPaDeg: 30, slitPaDeg: 30 };

function codeAndKey(f: () => unknown): [string, string | undefined] {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return [e.code, e.place.key];
    throw e;
  }
  return ['none', undefined];
}

describe('geometry settings', () => {
  test('defaults fill in: q0 = 0.2 (common practice), no inclination error, minor-axis wedge |cos theta| < 0.3', () => {
    const s = resolveGeometrySettings({ ...base, inclinationDeg: 60 });
    expect(s.intrinsicThickness).toBe(0.2);
    expect(s.inclinationErrDeg).toBe(0);
    expect(s.minCosTheta).toBe(DEFAULT_GEOMETRY_SETTINGS.minCosTheta);
    expect(Object.isFrozen(s)).toBe(true);
  });

  test('a missing inclination, a bad value or unordered bins throw InputError naming the setting', () => {
    expect(codeAndKey(() => resolveGeometrySettings(base))).toEqual(['settings.missing', 'inclinationDeg']);
    expect(codeAndKey(() => resolveGeometrySettings({ ...base, inclinationDeg: 95 }))).toEqual(['settings.invalid', 'inclinationDeg']);
    expect(codeAndKey(() => resolveGeometrySettings({ ...base, axisRatio: 1.2 }))).toEqual(['settings.invalid', 'axisRatio']);
    expect(codeAndKey(() => resolveGeometrySettings({ ...base, inclinationDeg: 60, distanceMpc: -1 }))).toEqual(['settings.invalid', 'distanceMpc']);
    expect(codeAndKey(() => resolveGeometrySettings({ ...base, inclinationDeg: 60, radialBinsArcsec: [0, 5, 3] }))).toEqual(['settings.invalid', 'radialBinsArcsec']);
  });
});

describe('inclination', () => {
  test('from the axis ratio by Hubble (1926) with q0 = 0.2: q = 0.5 -> 62.1144 deg, q = 0.7 -> 46.7917 deg (REFERENCE.md Geometry)', () => {
    expect(resolveInclination(resolveGeometrySettings({ ...base, axisRatio: 0.5 })).inclinationDeg).toBeCloseTo(62.1144, 3);
    const r = resolveInclination(resolveGeometrySettings({ ...base, axisRatio: 0.7 }));
    expect(r.inclinationDeg).toBeCloseTo(46.7917, 3);
    expect(r.source).toBe('axis-ratio');
  });

  test('an axis-ratio error becomes an inclination error: di/dq = -q / ((1 - q0^2) sin i cos i), from differentiating Hubble (1926)', () => {
    const q = 0.5;
    const q0 = 0.2;
    const r = resolveInclination(resolveGeometrySettings({ ...base, axisRatio: q, axisRatioErr: 0.01 }));
    const i = (62.1144 * Math.PI) / 180;
    const slope = q / ((1 - q0 * q0) * Math.sin(i) * Math.cos(i)); // rad per unit q
    expect(r.inclinationErrDeg).toBeCloseTo(((slope * 0.01) * 180) / Math.PI, 2);
  });
});
