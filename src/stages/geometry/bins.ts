/** Radial bin edges for the fold (in-plane radius, arcsec). */
import type { PvPoint } from '../../products/curve.js';

/**
 * The default rule: one bin per point of the better-sampled side (the side with more used points).
 * Edges lie half-way between its consecutive radii, the first at 0 and the last half a step beyond
 * its outermost point, so a bin holds about one point of each side at the native sampling, and the
 * other side's points (offset by a fractional centre) fall into the nearest bin.
 */
export function binEdgesFromData(pv: PvPoint[]): number[] {
  const radii = { approaching: [] as number[], receding: [] as number[] };
  for (const p of pv) if (p.exclusion === null) radii[p.side].push(p.radiusArcsec);
  const r = (radii.receding.length >= radii.approaching.length ? radii.receding : radii.approaching).sort((a, b) => a - b);
  const other = radii.receding.length >= radii.approaching.length ? radii.approaching : radii.receding;
  if (r.length === 0) return [];
  const edges = [0];
  for (let k = 1; k < r.length; k++) {
    const mid = (r[k - 1]! + r[k]!) / 2;
    if (mid > edges[edges.length - 1]!) edges.push(mid);
  }
  const lastStep = r.length > 1 ? r[r.length - 1]! - r[r.length - 2]! : r[0]!;
  let last = r[r.length - 1]! + Math.max(lastStep / 2, 1e-9);
  // The other side may reach further: extend with the same step so its points are binned too.
  const reach = other.length > 0 ? Math.max(...other) : 0;
  const step = Math.max(lastStep, 1e-9);
  while (last <= reach) {
    edges.push(last);
    last += step;
  }
  edges.push(last);
  return edges;
}

/** Index of the bin [edges[k], edges[k+1]) holding r, or -1. */
export function binIndex(edges: number[], r: number): number {
  let lo = 0;
  let hi = edges.length - 1;
  if (!(r >= edges[0]!) || !(r < edges[hi]!)) return -1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (r >= edges[mid]!) lo = mid;
    else hi = mid;
  }
  return lo;
}
