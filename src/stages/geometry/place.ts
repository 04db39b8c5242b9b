/**
 * Place each velocity bin in the disk: offset from the kinematic centre, in-plane radius and
 * azimuth (thin disk, physics/disk.ts), and its own rotation speed
 * V = (v_los - v_sys)_rel / |sin i cos theta|, with (v - v_sys)_rel = c (z - z_sys)/(1 + z_sys).
 */
import { SPEED_OF_LIGHT_KMS, diskCoordinates, relativeVelocity } from '../../physics/index.js';
import type { Geometry, PvExclusion, PvPoint, VelocityPoint } from '../../products/curve.js';

export interface PlaceOptions {
  centreRow: number;
  vSysKms: number;
  geometry: Geometry;
  minCosTheta: number;
  rejectFlags: number;
}

/** +1 when velocities above v_sys lie towards increasing row (error-weighted vote of the usable points). */
export function recedingSense(points: VelocityPoint[], centreRow: number, vSysKms: number, rejectFlags: number): 1 | -1 {
  let vote = 0;
  for (const p of points) {
    if (!usable(p, rejectFlags) || p.yCentre === centreRow) continue;
    vote += (Math.sign(p.yCentre - centreRow) * (p.vLos - vSysKms)) / (p.vLosErr * p.vLosErr);
  }
  return vote >= 0 ? 1 : -1;
}

export function usable(p: VelocityPoint, rejectFlags: number): boolean {
  return Number.isFinite(p.vLos) && Number.isFinite(p.yCentre) && p.vLosErr > 0 && Number.isFinite(p.vLosErr) && (p.flags & rejectFlags) === 0;
}

export function placePoints(points: VelocityPoint[], sense: 1 | -1, o: PlaceOptions): PvPoint[] {
  const g = o.geometry;
  return points.map((p) => {
    const offsetArcsec = (p.yCentre - o.centreRow) * g.arcsecPerPixel;
    const disk = diskCoordinates(offsetArcsec, g.slitToMajorDeg, g.inclinationDeg);
    const towardsReceding = Math.sign(offsetArcsec) * sense;
    // physics/disk.ts measures the azimuth from the major axis on the positive-offset side.
    const azimuthDeg = sense === 1 ? disk.azimuthDeg : wrapDeg(disk.azimuthDeg + 180);
    const projection = Math.abs(disk.projection);
    let exclusion: PvExclusion | null = null;
    if (!usable(p, o.rejectFlags)) exclusion = Number.isFinite(p.vLos) && p.vLosErr > 0 ? 'flagged' : 'invalid';
    else if (offsetArcsec === 0) exclusion = 'centre';
    else if (projection < o.minCosTheta * Math.sin((g.inclinationDeg * Math.PI) / 180)) exclusion = 'minor-axis';
    const ok = exclusion === null;
    return {
      bin: p.bin,
      yCentre: p.yCentre,
      offsetArcsec,
      vLos: p.vLos,
      vLosErr: p.vLosErr,
      radiusArcsec: disk.radiusArcsec,
      azimuthDeg,
      projection,
      vRot: ok ? (towardsReceding * relativeVelocity(p.vLos, o.vSysKms)) / projection : NaN,
      vRotErr: ok ? p.vLosErr / (projection * (1 + o.vSysKms / SPEED_OF_LIGHT_KMS)) : NaN,
      side: towardsReceding > 0 ? 'receding' : 'approaching',
      flags: p.flags,
      exclusion,
    };
  });
}

function wrapDeg(a: number): number {
  return a > 180 ? a - 360 : a <= -180 ? a + 360 : a;
}
