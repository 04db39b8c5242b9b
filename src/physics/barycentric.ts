/**
 * Velocity corrections from the observatory to the solar-system barycentre or the Sun's centre.
 * Earth's state from astronomy-engine (VSOP87 + the outer planets' pull on the Sun, J2000 mean
 * equator); the observer's motion from its Earth-rotation model. Sign convention as astropy's
 * `SkyCoord.radial_velocity_correction`: cz_true = applyFrameCorrection(cz_obs, correction).
 */
import { BaryState, Body, HelioState, KM_PER_AU, Observer, ObserverState } from 'astronomy-engine';
import { SPEED_OF_LIGHT_KMS as C, GM_SUN_M3_S2 } from './constants.js';
import type { Site } from './coordinates.js';
import { precessToJ2000, equatorialUnitVector } from './precession.js';

/** Where the telescope points. */
export interface Pointing {
  raDeg: number;
  decDeg: number;
  /** Mean equinox of the coordinates, Julian year; default 2000 (ICRS taken equal to J2000). */
  equinox?: number;
}

const KMS_PER_AU_DAY = KM_PER_AU / 86400;
/** Earth's GM, m^3 s^-2 (IERS Conventions 2010, table 1.1) [memory]. */
const GM_EARTH_M3_S2 = 3.986004418e14;
const C_M_S = C * 1000;

type Vec = [number, number, number];
const dot = (a: Vec, b: Vec): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const dist = (a: Vec, b: Vec): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

/**
 * Correction (km/s) to add to a topocentric radial velocity, at the instant `time` (UTC), for a
 * target at `pointing` seen from `site`.
 * - barycentric: Wright & Eastman (2014, PASP 126, 838) eq. 28 without the Shapiro delay and the
 *   target's own motion: z_B = gamma (1 + beta.n) / (1 + Phi/c^2) - 1, with the observer's
 *   barycentric velocity beta c and the Newtonian potential Phi = -sum GM/r (< 0) of the Sun and
 *   the Earth at the observer (gamma and Phi together ~ +0.005 km/s; the Moon's and Jupiter's
 *   terms, below 0.001 m/s, are left out).
 * - heliocentric: the classical projection of the observer's heliocentric velocity, beta.n c.
 */
export function radialVelocityCorrection(time: Date, pointing: Pointing, site: Site, frame: 'barycentric' | 'heliocentric' = 'barycentric'): number {
  if (!Number.isFinite(time.getTime())) throw new RangeError('radialVelocityCorrection: invalid time');
  if (!Number.isFinite(pointing.raDeg) || !(pointing.decDeg >= -90 && pointing.decDeg <= 90)) throw new RangeError(`radialVelocityCorrection: invalid pointing ${pointing.raDeg}, ${pointing.decDeg} deg`);
  if (!(site.latitudeDeg >= -90 && site.latitudeDeg <= 90) || !Number.isFinite(site.longitudeDeg) || !Number.isFinite(site.heightM)) throw new RangeError('radialVelocityCorrection: invalid site');
  const n = precessToJ2000(equatorialUnitVector(pointing.raDeg, pointing.decDeg), pointing.equinox ?? 2000);
  const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.heightM);
  const topo = ObserverState(time, observer, false);
  const earth = frame === 'barycentric' ? BaryState(Body.Earth, time) : HelioState(Body.Earth, time);
  const v: Vec = [(earth.vx + topo.vx) * KMS_PER_AU_DAY, (earth.vy + topo.vy) * KMS_PER_AU_DAY, (earth.vz + topo.vz) * KMS_PER_AU_DAY];
  const beta: Vec = [v[0] / C, v[1] / C, v[2] / C];
  if (frame === 'heliocentric') return dot(beta, n) * C;

  const auM = KM_PER_AU * 1000;
  const obs: Vec = [(earth.x + topo.x) * auM, (earth.y + topo.y) * auM, (earth.z + topo.z) * auM];
  const sunBary = BaryState(Body.Sun, time);
  const sun: Vec = [sunBary.x * auM, sunBary.y * auM, sunBary.z * auM];
  const earthPos: Vec = [earth.x * auM, earth.y * auM, earth.z * auM];
  const wellDepth = GM_SUN_M3_S2 / dist(obs, sun) + GM_EARTH_M3_S2 / dist(obs, earthPos);
  const gamma = 1 / Math.sqrt(1 - dot(beta, beta));
  const zB = (gamma * (1 + dot(beta, n))) / (1 - wellDepth / (C_M_S * C_M_S)) - 1;
  return zB * C;
}
