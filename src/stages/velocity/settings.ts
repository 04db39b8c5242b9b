/** Settings of the velocity stage. Velocities km/s; wavelengths Angstrom. */
import type { Pointing } from '../../physics/barycentric.js';
import type { Site } from '../../physics/coordinates.js';

export interface VelocitySettings {
  /** Doppler convention of the output velocities. Default `optical` (cz). */
  convention: 'optical' | 'relativistic';
  /** Rest frame the velocities are corrected to. Default `barycentric`. */
  frame: 'barycentric' | 'heliocentric';
  /**
   * Medium in which observed and rest wavelengths are compared. The measured wavelengths are air;
   * `vacuum` converts both the observed and the rest wavelength to vacuum (Morton 2000) first,
   * which removes the dispersion of air from the Doppler ratio (about 0.04 km/s at cz = 5000 km/s
   * near H-alpha). Default `air`.
   */
  restMedium: 'air' | 'vacuum';
  /** Observatory site; overrides the OBSGEO-B/-L/-H cards of the exposures (manifest key `site` of the setup). */
  site?: Site;
  /** Sky coordinates of the target; override the RA/DEC/EQUINOX cards (manifest key `coordinates` of the target). */
  pointing?: Pointing;
}

export const DEFAULT_VELOCITY_SETTINGS: VelocitySettings = Object.freeze({
  convention: 'optical',
  frame: 'barycentric',
  restMedium: 'air',
});
