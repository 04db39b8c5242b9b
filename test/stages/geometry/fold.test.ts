import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import type { Geometry, PvPoint } from '../../../src/products/curve.js';
import { binEdgesFromData, binIndex } from '../../../src/stages/geometry/bins.js';
import { foldCurve } from '../../../src/stages/geometry/fold.js';

const ref = JSON.parse(readFileSync(new URL('../../../fixtures/geometry/reference.json', import.meta.url), 'utf8'));

const geometry: Geometry = {
  inclinationDeg: 60, inclinationErrDeg: 0, inclinationSource: 'given', majorAxisPaDeg: 0, slitPaDeg: 0, slitToMajorDeg: 0,
  distanceMpc: 10, arcsecPerPixel: 1, kpcPerArcsec: 0.04848137,
};

function pv(side: PvPoint['side'], radiusArcsec: number, vRot: number, vRotErr: number): PvPoint {
  return {
    bin: 0, yCentre: 0, offsetArcsec: side === 'receding' ? radiusArcsec : -radiusArcsec, vLos: 0, vLosErr: 1,
    radiusArcsec, azimuthDeg: 0, projection: 1, vRot, vRotErr, side, flags: 0, exclusion: null,
  };
}

describe('fold', () => {
  test('one bin: weighted means of each side and of both, 1/sqrt(sum w) and half the side difference match numpy.average (fixtures/geometry/make_reference.py)', () => {
    const f = ref.fold;
    const points = [
      ...f.approaching.v_kms.map((v: number, k: number) => pv('approaching', 5 + k, v, f.approaching.err_kms[k])),
      ...f.receding.v_kms.map((v: number, k: number) => pv('receding', 5.5 + k, v, f.receding.err_kms[k])),
    ];
    const [p] = foldCurve(points, [0, 10], geometry);
    expect(p!.vApproaching).toBeCloseTo(f.v_approaching, 10);
    expect(p!.vReceding).toBeCloseTo(f.v_receding, 10);
    expect(p!.vRot).toBeCloseTo(f.v_rot, 10);
    expect(p!.errStat).toBeCloseTo(f.err_stat, 10);
    expect(p!.errAsymmetry).toBeCloseTo(f.err_asymmetry, 10);
    expect(p!.errTotal).toBeCloseTo(Math.hypot(f.err_stat, f.err_asymmetry), 10);
    expect([p!.nApproaching, p!.nReceding, p!.oneSided]).toEqual([2, 1, false]);
  });

  test('a bin with one side is flagged one-sided and has no asymmetry error; excluded points stay out', () => {
    const points = [pv('receding', 12, 200, 5), { ...pv('approaching', 12, 900, 5), exclusion: 'flagged' as const }];
    const [p] = foldCurve(points, [10, 20], geometry);
    expect(p!.oneSided).toBe(true);
    expect(p!.errAsymmetry).toBe(0);
    expect(p!.vRot).toBe(200);
    expect(Number.isNaN(p!.vApproaching)).toBe(true);
  });
});

describe('bins', () => {
  test('default edges: half-way between the radii of the better-sampled side, from 0, one point of each side per bin', () => {
    const points = [1, 2, 3, 4].map((r) => pv('receding', r, 100, 1)).concat([1.4, 2.4, 3.4].map((r) => pv('approaching', r, 100, 1)));
    const edges = binEdgesFromData(points);
    expect(edges).toEqual([0, 1.5, 2.5, 3.5, 4.5]);
    expect(foldCurve(points, edges, geometry).map((p) => [p.nReceding, p.nApproaching])).toEqual([[1, 1], [1, 1], [1, 1], [1, 0]]);
  });

  test('edges follow the side with more points; binIndex is half-open', () => {
    const points = [1, 2].map((r) => pv('receding', r, 100, 1)).concat([1.2, 2.2, 3.2, 4.2].map((r) => pv('approaching', r, 100, 1)));
    const edges = binEdgesFromData(points);
    expect(edges).toHaveLength(5);
    [0, 1.7, 2.7, 3.7, 4.7].forEach((e, k) => expect(edges[k]).toBeCloseTo(e, 12));
    expect([binIndex([0, 1, 2], 0), binIndex([0, 1, 2], 1), binIndex([0, 1, 2], 2), binIndex([0, 1, 2], -0.1)]).toEqual([0, 1, -1, -1]);
  });
});

test('bins extend with the last step when the less-sampled side reaches further', () => {
  const points = [1, 2, 3].map((r) => pv('receding', r, 100, 1)).concat([1.2, 4.6].map((r) => pv('approaching', r, 100, 1)));
  const edges = binEdgesFromData(points);
  [0, 1.5, 2.5, 3.5, 4.5, 5.5].forEach((e, k) => expect(edges[k]).toBeCloseTo(e, 12));
  expect(foldCurve(points, edges, geometry).reduce((n, p) => n + p.nApproaching + p.nReceding, 0)).toBe(5);
});
