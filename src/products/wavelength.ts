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
  lines: ArcLineMeasurement[];
  rmsAngstrom: number;
  rmsPx: number;
  /** RMS expressed as a velocity at the centre of the range. */
  rmsKms: number;
  /** Wavelength range covered by identified lines (outside is extrapolation). */
  identifiedRange: [number, number];
  flexure: FlexureMeasurement | null;
}
