/**
 * Fold the two sides into one rotation curve. Per radial bin: error-weighted means of each side
 * and of both; errors: statistical 1/sqrt(sum w); asymmetry = half the difference of the sides
 * (common practice; other conventions exist), compared at the same radius: the two sides' points
 * sit at slightly different radii within a bin (a fractional centre), so the difference the
 * curve's own slope makes over that gap, dV/dR (R_app - R_rec), is taken out first;
 * inclination = V cot(i) sigma_i (sigma_i in rad); err_sys = asymmetry (+) inclination,
 * err_total = stat (+) sys, (+) meaning in quadrature.
 */
import type { CurvePoint, Geometry, PvPoint } from '../../products/curve.js';
import { binIndex } from './bins.js';

interface Sums {
  w: number;
  wv: number;
  wr: number;
  n: number;
}

export function foldCurve(pv: PvPoint[], edges: number[], geometry: Geometry, seeingFwhmArcsec?: number): CurvePoint[] {
  const nBins = Math.max(0, edges.length - 1);
  const sides = { approaching: [] as Sums[], receding: [] as Sums[] };
  for (let k = 0; k < nBins; k++) {
    sides.approaching.push({ w: 0, wv: 0, wr: 0, n: 0 });
    sides.receding.push({ w: 0, wv: 0, wr: 0, n: 0 });
  }
  for (const p of pv) {
    if (p.exclusion !== null) continue;
    const k = binIndex(edges, p.radiusArcsec);
    if (k < 0) continue;
    const s = sides[p.side][k]!;
    const w = 1 / (p.vRotErr * p.vRotErr);
    s.w += w;
    s.wv += w * p.vRot;
    s.wr += w * p.radiusArcsec;
    s.n++;
  }
  const i = (geometry.inclinationDeg * Math.PI) / 180;
  const sigmaI = (geometry.inclinationErrDeg * Math.PI) / 180;
  const beamLimit = seeingFwhmArcsec !== undefined ? 2 * seeingFwhmArcsec : -Infinity;
  const used: number[] = [];
  for (let k = 0; k < nBins; k++) if (sides.approaching[k]!.w + sides.receding[k]!.w > 0) used.push(k);
  const radius = used.map((k) => (sides.approaching[k]!.wr + sides.receding[k]!.wr) / (sides.approaching[k]!.w + sides.receding[k]!.w));
  const speed = used.map((k) => (sides.approaching[k]!.wv + sides.receding[k]!.wv) / (sides.approaching[k]!.w + sides.receding[k]!.w));
  const out: CurvePoint[] = [];
  used.forEach((k, j) => {
    const a = sides.approaching[k]!;
    const r = sides.receding[k]!;
    const w = a.w + r.w;
    const vRot = speed[j]!;
    const rArcsec = radius[j]!;
    const vApproaching = a.n > 0 ? a.wv / a.w : NaN;
    const vReceding = r.n > 0 ? r.wv / r.w : NaN;
    const oneSided = a.n === 0 || r.n === 0;
    const errStat = 1 / Math.sqrt(w);
    const lo = Math.max(0, j - 1);
    const hi = Math.min(used.length - 1, j + 1);
    const slope = hi > lo ? (speed[hi]! - speed[lo]!) / (radius[hi]! - radius[lo]!) : 0;
    const errAsymmetry = oneSided ? 0 : Math.abs(vApproaching - vReceding - slope * (a.wr / a.w - r.wr / r.w)) / 2;
    const errInclination = Math.abs(vRot) * (sigmaI / Math.tan(i));
    const errSys = Math.hypot(errAsymmetry, errInclination);
    out.push({
      rArcsec,
      rKpc: rArcsec * geometry.kpcPerArcsec,
      vRot,
      errStat,
      errSys,
      errTotal: Math.hypot(errStat, errSys),
      errAsymmetry,
      errInclination,
      vApproaching,
      vApproachingErr: a.n > 0 ? 1 / Math.sqrt(a.w) : NaN,
      vReceding,
      vRecedingErr: r.n > 0 ? 1 / Math.sqrt(r.w) : NaN,
      nApproaching: a.n,
      nReceding: r.n,
      oneSided,
      beamSmeared: rArcsec < beamLimit,
    });
  });
  return out;
}
