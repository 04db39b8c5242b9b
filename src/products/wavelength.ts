/** The wavelength solution (stage arc) and its diagnostics. Wavelengths: Angstrom, standard air. */
import type { Legendre2D } from '../kernels/legendre.js';

export interface ArcLineMeasurement {
  /** Laboratory air wavelength (Angstrom) of the identified line. */
  wavelength: number;
  /** Lamp element, e.g. `Ne`. */
  element: string;
  /** Measured centroid, internal x pixel (0-based centre). */
  x: number;
  /** Internal row (centre of the band it was measured in). */
  y: number;
  /** Gaussian sigma of the line, pixels. */
  sigmaPx: number;
  /** Solution minus laboratory wavelength, Angstrom. */
  residualAngstrom: number;
  /** False when rejected by clipping. */
  used: boolean;
}

export interface FlexureMeasurement {
  /** Shift added to the arc solution to match the sky lines, Angstrom (and km/s at the line). */
  shiftAngstrom: number;
  shiftErrAngstrom: number;
  shiftKms: number;
  lines: { wavelength: number; name: string; measured: number; error: number; used: boolean }[];
}

export interface WavelengthSolution {
  /** Internal frame size. */
  width: number;
  height: number;
  /** Air wavelength (Angstrom) of every internal pixel centre, row-major, flexure shift included. */
  wave: Float64Array;
  /** The fitted model lambda(x, y) in Angstrom (before the flexure shift). */
  model: Legendre2D;
  /** Instrumental Gaussian sigma in pixels as a function of (x, y). */
  lsfSigmaPx: Legendre2D;
  /** True when the internal frame was flipped so that wavelength increases with x. */
  flipX: boolean;
  /** One entry per identified line per row band it was traced in. */
  lines: ArcLineMeasurement[];
  /**
   * RMS of (solution - laboratory wavelength) over the used entries of `lines`, Angstrom: the
   * scatter of one measured line position about the solution (tested against the true position
   * errors on simulated arcs), not the error of the solution itself, which is smaller by about
   * sqrt(used positions / coefficients).
   */
  rmsAngstrom: number;
  /** The same RMS in pixels (each residual divided by the local dispersion). */
  rmsPx: number;
  /** The same RMS as a velocity (km/s) at the wavelength of the detector centre. */
  rmsKms: number;
  /** Wavelength range covered by identified lines (outside is extrapolation). */
  identifiedRange: [number, number];
  flexure: FlexureMeasurement | null;
}
