/** The product of buildCalibration: everything calibrateScience needs, and the calibrated arc. */
import type { CalibratedFrame, Orientation, Section } from '../../products/frame.js';
import type { Legendre1D } from '../../kernels/legendre.js';
import type { ReferenceFrame } from './detector.js';

export interface CcdCalibration {
  /** flipX is false here: the arc stage decides the direction of the wavelengths. */
  orientation: Orientation;
  /** Trimmed data section, raw 0-based end-exclusive. */
  section: Section;
  /** Internal frame size. */
  width: number;
  height: number;
  /** e-/ADU. */
  gain: number;
  /** e- rms. */
  readNoiseE: number;
  /** ADU, internal orientation, overscan-subtracted. Zero when there were no bias frames. */
  masterBias: Float32Array;
  /** Variance of one master-bias pixel, ADU^2. */
  biasVarianceAdu: number;
  /** Normalised flat (pixel-to-pixel, and the slit illumination when kept), internal; 1 where flatMask is set. */
  masterFlat: Float32Array;
  /** Variance of masterFlat from the counts of the flats. */
  flatVariance: Float32Array;
  /** zeroFlat, badColumn and outsideData bits, internal orientation. */
  flatMask: Uint16Array;
  /**
   * The arcs combined like science (cosmic rays rejected when there are several), bias subtracted
   * and flat-fielded so that line profiles and the science frames share the same pixel response;
   * a single arc is not Laplacian-cleaned (bright, narrow lamp lines; the arc fits reject strays).
   */
  arc: CalibratedFrame;
  /**
   * Bad detector columns: 0-based x in the trimmed raw frame (detector columns). They are internal
   * columns (x) when the frame is not transposed and internal rows (y) when it is.
   */
  badColumns: number[];
  /** The first calibration frame: science frames must match its shape, binning and data section. */
  reference: ReferenceFrame;
  /** Overscan fit along the strip (ADU) of the first arc frame, null without overscan. */
  overscanModel: Legendre1D | null;
  /** Arc structure evidence: mean |dI/dx| over mean |dI/dy| in the raw frame. */
  axisRatio: number;
}
