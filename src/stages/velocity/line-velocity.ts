/**
 * One measurement's line-of-sight velocity: the Doppler ratio of observed to rest wavelength in
 * one medium, the frame correction applied to the redshift multiplicatively,
 * (1 + z_true) = (1 + z_obs)(1 + z_corr) (Wright & Eastman 2014), then the convention.
 */
import { airToVacuum } from '../../physics/air-vacuum.js';
import { SPEED_OF_LIGHT_KMS } from '../../physics/constants.js';
import { velocityFromWavelength, type Convention } from '../../physics/doppler.js';

export interface LineVelocity {
  /** km/s in the chosen convention and frame; NaN when the wavelength is not usable. */
  vLos: number;
  /** 1-sigma error (km/s) from the wavelength error; NaN when that error is missing or not positive. */
  vLosErr: number;
}

/**
 * Velocity of a line seen at `observedAir` (Angstrom, air, error `observedErr`) with rest wavelength
 * `restAir` (Angstrom, air), corrected by `correctionKms` (= c z_corr).
 */
export function lineVelocity(observedAir: number, observedErr: number, restAir: number, correctionKms: number, convention: Convention, medium: 'air' | 'vacuum'): LineVelocity {
  if (!(observedAir > 0) || !Number.isFinite(observedAir) || !(restAir > 0)) return { vLos: NaN, vLosErr: NaN };
  const scale = 1 + correctionKms / SPEED_OF_LIGHT_KMS;
  const toMedium = medium === 'vacuum' ? airToVacuum : (w: number) => w;
  const rest = toMedium(restAir);
  const at = (observed: number) => velocityFromWavelength(toMedium(observed) * scale, rest, convention);
  const vLos = at(observedAir);
  if (!(observedErr > 0) || !Number.isFinite(observedErr)) return { vLos, vLosErr: NaN };
  // Slope by a central difference over +-0.01 A: exact for optical, 1e-9 relative for the others.
  const h = 0.01;
  const slope = (at(observedAir + h) - at(observedAir - h)) / (2 * h);
  return { vLos, vLosErr: Math.abs(slope) * observedErr };
}
