/**
 * Doppler conventions and the combination of velocities (km/s).
 * Optical cz = c (l - l0)/l0; radio c (1 - l0/l); relativistic c (l^2 - l0^2)/(l^2 + l0^2)
 * (e.g. Greisen et al. 2006, A&A 446, 747, WCS Paper III, table 1). The observed and rest
 * wavelengths must be in the same medium (both air or both vacuum).
 */
import { SPEED_OF_LIGHT_KMS as C } from './constants.js';

export type Convention = 'optical' | 'radio' | 'relativistic';

function checkPositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`${name}: must be a positive finite wavelength, got ${value}`);
}

/** Line-of-sight velocity (km/s) of a line seen at `observed` with rest wavelength `rest` (same unit and medium). */
export function velocityFromWavelength(observed: number, rest: number, convention: Convention = 'optical'): number {
  checkPositive('observed', observed);
  checkPositive('rest', rest);
  switch (convention) {
    case 'optical':
      return (C * (observed - rest)) / rest;
    case 'radio':
      return C * (1 - rest / observed);
    case 'relativistic': {
      const r2 = (observed / rest) ** 2;
      return (C * (r2 - 1)) / (r2 + 1);
    }
  }
}

/** Observed wavelength (unit of `rest`) of a line with rest wavelength `rest` moving at `vKms`. */
export function wavelengthFromVelocity(rest: number, vKms: number, convention: Convention = 'optical'): number {
  checkPositive('rest', rest);
  const beta = vKms / C;
  switch (convention) {
    case 'optical':
      return rest * (1 + beta);
    case 'radio':
      if (!(beta < 1)) throw new RangeError(`radio velocity must be below c, got ${vKms} km/s`);
      return rest / (1 - beta);
    case 'relativistic':
      if (!(Math.abs(beta) < 1)) throw new RangeError(`relativistic velocity must be below c in size, got ${vKms} km/s`);
      return rest * Math.sqrt((1 + beta) / (1 - beta));
  }
}

/**
 * Apply a frame correction (km/s, e.g. barycentric) to an observed optical cz (km/s), multiplicatively:
 * (1 + z_true) = (1 + z_obs)(1 + v/c), i.e. cz_obs + v + cz_obs v / c (Wright & Eastman 2014, PASP 126, 838).
 */
export function applyFrameCorrection(czObsKms: number, correctionKms: number): number {
  return czObsKms + correctionKms + (czObsKms * correctionKms) / C;
}

/**
 * Velocity (km/s) of a point relative to a system, both in one convention, from
 * (1 + z_pec) = (1 + z)/(1 + z_sys): optical c (z - z_sys)/(1 + z_sys) (the default);
 * relativistic (v - v_sys)/(1 - v v_sys / c^2), the relativistic subtraction; radio
 * (v - v_sys)/(1 - v_sys/c).
 */
export function relativeVelocity(czKms: number, czSysKms: number, convention: Convention = 'optical'): number {
  switch (convention) {
    case 'optical':
      return (czKms - czSysKms) / (1 + czSysKms / C);
    case 'relativistic':
      return (czKms - czSysKms) / (1 - (czKms * czSysKms) / (C * C));
    case 'radio':
      return (czKms - czSysKms) / (1 - czSysKms / C);
  }
}
