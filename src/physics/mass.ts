/** Newtonian masses and circular speeds. */
import { G_KPC_KMS2_PER_MSUN } from './constants.js';

/** Mass (M_sun) inside radius R (kpc) for a circular speed V (km/s), spherical: M = V^2 R / G. */
export function enclosedMassMsun(vKms: number, rKpc: number): number {
  return (vKms * vKms * rKpc) / G_KPC_KMS2_PER_MSUN;
}

/** Circular (Keplerian) speed, km/s, at radius `radiusM` (m) around a mass parameter GM (m^3 s^-2): sqrt(GM / r). */
export function circularSpeedKms(gmM3S2: number, radiusM: number): number {
  if (!(radiusM > 0)) throw new RangeError(`circularSpeedKms: radius must be positive, got ${radiusM} m`);
  if (!(gmM3S2 >= 0)) throw new RangeError(`circularSpeedKms: GM must be non-negative, got ${gmM3S2}`);
  return Math.sqrt(gmM3S2 / radiusM) / 1000;
}
