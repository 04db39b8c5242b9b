/**
 * Precession of mean equatorial directions between equinoxes, IAU 1976 model (Lieske et al. 1977,
 * A&A 58, 1; the angles zeta, z, theta as tabulated in the Explanatory Supplement to the Astronomical
 * Almanac, 1992) [memory; within 0.2 arcsec of astropy FK5 (IAU 2006 precession) from 1900 to 2050, test/physics/precession.test.ts].
 * Good to well under an arcsecond within a few centuries of J2000; an arcminute of direction error
 * moves a barycentric correction by less than 0.009 km/s.
 */

const ARCSEC_TO_RAD = Math.PI / 648000;

/** Unit vector (x, y, z) of an equatorial direction. */
export function equatorialUnitVector(raDeg: number, decDeg: number): [number, number, number] {
  const a = (raDeg * Math.PI) / 180;
  const d = (decDeg * Math.PI) / 180;
  return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
}

/**
 * Direction of the mean equator and equinox of J2000 for a direction given at the mean equinox
 * `equinoxYear` (a Julian epoch, e.g. 1950; B1950 differs from J1950 by 0.08 day, negligible here).
 */
export function precessToJ2000(v: [number, number, number], equinoxYear: number): [number, number, number] {
  if (equinoxYear === 2000) return v;
  const t = (equinoxYear - 2000) / 100;
  const zeta = (2306.2181 * t + 0.30188 * t * t + 0.017998 * t * t * t) * ARCSEC_TO_RAD;
  const z = (2306.2181 * t + 1.09468 * t * t + 0.018203 * t * t * t) * ARCSEC_TO_RAD;
  const theta = (2004.3109 * t - 0.42665 * t * t - 0.041833 * t * t * t) * ARCSEC_TO_RAD;
  const [cz, sz] = [Math.cos(zeta), Math.sin(zeta)];
  const [cZ, sZ] = [Math.cos(z), Math.sin(z)];
  const [ct, st] = [Math.cos(theta), Math.sin(theta)];
  // P = R3(-z) R2(theta) R3(-zeta) takes J2000 to the equinox; its transpose takes it back.
  const p = [
    [cZ * ct * cz - sZ * sz, -cZ * ct * sz - sZ * cz, -cZ * st],
    [sZ * ct * cz + cZ * sz, -sZ * ct * sz + cZ * cz, -sZ * st],
    [st * cz, -st * sz, ct],
  ];
  return [
    p[0]![0]! * v[0] + p[1]![0]! * v[1] + p[2]![0]! * v[2],
    p[0]![1]! * v[0] + p[1]![1]! * v[1] + p[2]![1]! * v[2],
    p[0]![2]! * v[0] + p[1]![2]! * v[1] + p[2]![2]! * v[2],
  ];
}
