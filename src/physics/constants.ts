/**
 * Physical and astronomical constants (SI unless the name says otherwise).
 * Sources: SI definition of the metre (c); IAU 2012 Resolution B2 (au); IAU 2015 Resolution B2 (pc,
 * via au and the exact 648000/pi factor) and B3 (nominal solar GM). See /work/shared/REFERENCE.md.
 */

/** Speed of light in vacuum, km/s (exact, SI). */
export const SPEED_OF_LIGHT_KMS = 299792.458;

/** Nominal solar mass parameter GM_sun, m^3 s^-2 (exact, IAU 2015 Resolution B3). */
export const GM_SUN_M3_S2 = 1.3271244e20;

/** Astronomical unit, m (exact, IAU 2012 Resolution B2). */
export const AU_M = 149597870700;

/** One radian in arcseconds: 648000 / pi. */
const ARCSEC_PER_RAD = 648000 / Math.PI;

/** One arcsecond in radians (pi / 648000). */
export const ARCSEC_RAD = 1 / ARCSEC_PER_RAD;

/** Parsec in metres: au x 648000/pi (IAU 2015 Resolution B2). */
export const PC_M = AU_M * ARCSEC_PER_RAD;

/** Kiloparsec in metres (3.085677581491367e19 m). */
export const KPC_M = 1000 * PC_M;

/**
 * Gravitational constant in kpc (km/s)^2 / M_sun, derived from GM_sun and the kpc:
 * G = GM_sun / (1 M_sun) / (1e6 m^2/s^2 per (km/s)^2) / KPC_M = 4.300917e-6.
 */
export const G_KPC_KMS2_PER_MSUN = GM_SUN_M3_S2 / 1e6 / KPC_M;

/** Projected size of one arcsecond at a distance (Mpc), in kpc (small-angle, exact in tan). */
export function kpcPerArcsec(distanceMpc: number): number {
  if (!(distanceMpc > 0) || !Number.isFinite(distanceMpc)) throw new RangeError(`kpcPerArcsec: invalid distance ${distanceMpc} Mpc`);
  return distanceMpc * 1000 * ARCSEC_RAD;
}
