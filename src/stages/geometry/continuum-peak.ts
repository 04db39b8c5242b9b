/** Where the symmetry search for the kinematic centre starts: the continuum peak along the slit. */

/**
 * Row of the continuum peak (internal, fractional): the largest 3-row running mean, refined by the
 * vertex of a parabola through it and its neighbours. Null when the profile has no positive flux.
 */
export function continuumPeakRow(profile: Float64Array): number | null {
  const n = profile.length;
  if (n === 0) return null;
  const smooth = (k: number): number => {
    let s = 0;
    let m = 0;
    for (let j = Math.max(0, k - 1); j <= Math.min(n - 1, k + 1); j++) {
      const v = profile[j]!;
      if (Number.isFinite(v)) {
        s += v;
        m++;
      }
    }
    return m > 0 ? s / m : NaN;
  };
  let best = -1;
  let bestValue = 0;
  for (let k = 0; k < n; k++) {
    const v = smooth(k);
    if (v > bestValue) {
      bestValue = v;
      best = k;
    }
  }
  if (best < 0) return null;
  if (best === 0 || best === n - 1) return best;
  const l = smooth(best - 1);
  const r = smooth(best + 1);
  const curvature = l - 2 * bestValue + r;
  return curvature < 0 ? best + (0.5 * (l - r)) / curvature : best;
}
