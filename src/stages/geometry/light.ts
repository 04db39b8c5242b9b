/**
 * The stellar light along the slit folded about the kinematic centre: continuum flux per row
 * (LineTable.continuumProfile) read at rows centre +- k (k = 0, 1, 2, ... rows, linear
 * interpolation between row centres) and placed at the in-plane radius of that offset.
 */
import { diskCoordinates } from '../../physics/index.js';
import type { Geometry, LightPoint } from '../../products/curve.js';

/** Continuum at fractional row y by linear interpolation; NaN outside the profile. */
function profileAt(profile: Float64Array, y: number): number {
  if (!(y >= 0 && y <= profile.length - 1)) return NaN;
  const k = Math.min(Math.floor(y), profile.length - 2);
  const t = y - k;
  return profile.length === 1 ? profile[0]! : (1 - t) * profile[k]! + t * profile[k + 1]!;
}

export function foldLight(profile: Float64Array, centreRow: number, sense: 1 | -1, geometry: Geometry): LightPoint[] {
  const out: LightPoint[] = [];
  const reach = Math.max(centreRow, profile.length - 1 - centreRow);
  for (let k = 0; k <= reach; k++) {
    const receding = profileAt(profile, centreRow + sense * k);
    const approaching = profileAt(profile, centreRow - sense * k);
    const hasR = Number.isFinite(receding);
    const hasA = Number.isFinite(approaching);
    if (!hasR && !hasA) continue;
    const rArcsec = diskCoordinates(k * geometry.arcsecPerPixel, geometry.slitToMajorDeg, geometry.inclinationDeg).radiusArcsec;
    out.push({
      rArcsec,
      rKpc: rArcsec * geometry.kpcPerArcsec,
      flux: hasR && hasA ? (receding + approaching) / 2 : hasR ? receding : approaching,
      fluxApproaching: approaching,
      fluxReceding: receding,
      oneSided: !(hasR && hasA),
    });
  }
  return out;
}
