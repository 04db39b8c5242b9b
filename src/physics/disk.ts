/**
 * Thin-disk geometry: inclination from the apparent axis ratio and the deprojection of a point on
 * the slit. Formulas in /work/shared/REFERENCE.md "Geometry".
 */

const DEG = Math.PI / 180;

/**
 * Inclination (deg, 0 face-on, 90 edge-on) from the axis ratio q = b/a, Hubble (1926):
 * cos^2 i = (q^2 - q0^2) / (1 - q0^2), with the intrinsic thickness q0 (0.2 is common practice).
 * Axis ratios at or below q0 give 90 deg.
 */
export function inclinationFromAxisRatio(q: number, q0 = 0.2): number {
  if (!(q > 0 && q <= 1)) throw new RangeError(`inclinationFromAxisRatio: axis ratio must be in (0, 1], got ${q}`);
  if (!(q0 >= 0 && q0 < 1)) throw new RangeError(`inclinationFromAxisRatio: intrinsic thickness must be in [0, 1), got ${q0}`);
  if (q <= q0) return 90;
  const cos2 = (q * q - q0 * q0) / (1 - q0 * q0);
  return Math.acos(Math.sqrt(cos2)) / DEG;
}

/** Where a slit point lies in the disk plane. */
export interface DiskPoint {
  /** Deprojected radius in the disk plane, arcsec (>= 0). */
  radiusArcsec: number;
  /** Azimuth in the disk plane, deg in (-180, 180], from the major axis on the side of positive offset (sky x = r cos dphi > 0). */
  azimuthDeg: number;
  /** sin(i) cos(azimuth): v_los - v_sys = V(R) x projection. Signed. */
  projection: number;
}

/**
 * Deproject a point at sky offset `offsetArcsec` along a slit through the centre that makes the
 * angle `slitToMajorDeg` with the major axis, in a thin disk of inclination `inclinationDeg`:
 * x = r cos(dphi) along the major axis, y = r sin(dphi) / cos(i) in the plane;
 * R = sqrt(x^2 + y^2), tan(theta) = y / x.
 * At i = 90 deg a point off the major axis is at infinite radius with projection 0.
 */
export function diskCoordinates(offsetArcsec: number, slitToMajorDeg: number, inclinationDeg: number): DiskPoint {
  if (!(inclinationDeg >= 0 && inclinationDeg <= 90)) throw new RangeError(`diskCoordinates: inclination must be in [0, 90] deg, got ${inclinationDeg}`);
  const along = offsetArcsec * Math.cos(slitToMajorDeg * DEG);
  const across = offsetArcsec * Math.sin(slitToMajorDeg * DEG);
  const cosI = Math.cos(inclinationDeg * DEG);
  // Edge-on: cos i rounds to ~6e-17, so test the projected size rather than dividing blindly.
  const inPlane = across === 0 ? 0 : Math.abs(cosI) < 1e-12 ? Math.sign(across) * Infinity : across / cosI;
  const theta = Math.atan2(inPlane, along);
  const radius = Number.isFinite(inPlane) ? Math.hypot(along, inPlane) : Infinity;
  return { radiusArcsec: radius, azimuthDeg: theta / DEG, projection: Math.sin(inclinationDeg * DEG) * Math.cos(theta) };
}
