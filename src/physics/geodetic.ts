/**
 * Geocentric (ITRS, metres) to geodetic coordinates on the WGS84 ellipsoid (a = 6378137 m,
 * 1/f = 298.257223563, NIMA TR8350.2), by fixed-point iteration on the latitude; used for the
 * OBSGEO-X/Y/Z cards of WCS Paper III. Checked against astropy EarthLocation in the tests.
 */

const A_M = 6378137;
const F = 1 / 298.257223563;
const E2 = F * (2 - F);
const RAD = 180 / Math.PI;

export interface Geodetic {
  latitudeDeg: number;
  /** East positive, (-180, 180]. */
  longitudeDeg: number;
  heightM: number;
}

/** Geodetic latitude, longitude and height of a geocentric point (m). */
export function geodeticFromGeocentric(x: number, y: number, z: number): Geodetic {
  if (![x, y, z].every(Number.isFinite)) throw new RangeError('geodeticFromGeocentric: coordinates must be finite');
  const p = Math.hypot(x, y);
  const longitudeDeg = p === 0 ? 0 : Math.atan2(y, x) * RAD;
  let lat = Math.atan2(z, p * (1 - E2));
  let height = 0;
  // Each step gains ~3 digits away from the poles; 10 steps reach 1e-12 rad anywhere on the Earth.
  for (let i = 0; i < 10; i++) {
    const sin = Math.sin(lat);
    const n = A_M / Math.sqrt(1 - E2 * sin * sin);
    // Near the poles p / cos(lat) is ill-conditioned; use the z form there.
    height = Math.abs(Math.cos(lat)) > 0.1 ? p / Math.cos(lat) - n : z / sin - n * (1 - E2);
    lat = Math.atan2(z, p * (1 - (E2 * n) / (n + height)));
  }
  return { latitudeDeg: lat * RAD, longitudeDeg, heightM: height };
}
