import { weightedMean } from '../../kernels/weighted-mean.js';
import type { CurvePoint } from '../../products/curve.js';

/** The number of outermost curve points averaged into vOuter. */
export const OUTER_POINTS = 3;

/**
 * Weighted mean (by err_total) of the outermost points, and its error. Points seen on both sides
 * are preferred: a lone one-sided end bin is the faintest and least checked part of the curve.
 */
export function outerVelocity(points: CurvePoint[]): { v: number; err: number } {
  const twoSided = points.filter((p) => !p.oneSided && Number.isFinite(p.vRot));
  const pool = twoSided.length >= OUTER_POINTS ? twoSided : points;
  const outer = [...pool].sort((a, b) => a.rArcsec - b.rArcsec).slice(-OUTER_POINTS);
  const m = weightedMean(outer.map((p) => p.vRot), outer.map((p) => p.errTotal));
  return { v: m.mean, err: m.err };
}
