/**
 * Frames as they travel from the reader to the line fits.
 * Pixel convention: 0-based pixel centres, row-major, pixel (x, y) at index y * width + x.
 */
import type { Header } from '../fits/header.js';
import type { Diagnostic } from '../diagnostics.js';

/**
 * A raw frame as read from disk: physical ADU (after BZERO/BSCALE), the whole frame with overscan.
 * Unsigned 16-bit data (BZERO 32768, BSCALE 1) stay integers in a Uint16Array (exact, half the
 * memory); other data are Float32.
 */
export interface RawFrame {
  /** Path as resolved from the manifest. */
  path: string;
  /** 0-based HDU the image came from. */
  hdu: number;
  header: Header;
  width: number;
  height: number;
  data: Uint16Array | Float32Array;
}

/** A rectangular section in 0-based raw pixel coordinates, end-exclusive. */
export interface Section {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/**
 * How the internal orientation (dispersion along x, wavelength increasing with x) maps to the
 * trimmed raw frame R (width Wr, height Hr):
 *   T(x, y) = transpose ? R(y, x) : R(x, y)        (T has width Hr when transposed)
 *   I(x, y) = flipX ? T(W - 1 - x, y) : T(x, y)    (W = width of T)
 * Internal y runs along the slit in the same sense as the raw axis it came from.
 */
export interface Orientation {
  transpose: boolean;
  flipX: boolean;
}

/** Bits of the MASK extension. Zero means a good pixel. */
export const MASK_BITS = {
  /** At or above the detector's saturation level in any contributing exposure. */
  saturated: 1,
  /** Hot or bad detector column. */
  badColumn: 2,
  /** Cosmic-ray hit (rejected in combination or found by the Laplacian detection). */
  cosmicRay: 4,
  /** Flat-field value too small to divide by. */
  zeroFlat: 8,
  /** Outside the illuminated or valid data area. */
  outsideData: 16,
} as const;

export const MASK_BIT_DESCRIPTIONS: Record<keyof typeof MASK_BITS, string> = {
  saturated: 'saturated in at least one exposure',
  badColumn: 'hot or bad detector column',
  cosmicRay: 'cosmic-ray hit',
  zeroFlat: 'flat field near zero, not divided',
  outsideData: 'outside the valid data area',
};

/** One science exposure that went into a calibrated frame (for the barycentric correction). */
export interface ExposureInfo {
  path: string;
  header: Header;
  /** DATE-OBS as written (UTC, ISO 8601), start of exposure. */
  dateObs: string;
  /** Exposure time in seconds. */
  exptimeS: number;
}

/** A calibrated 2-D spectrum in the internal orientation. */
export interface CalibratedFrame {
  width: number;
  height: number;
  /** Electrons, scaled to the total exposure time `exptimeS`. */
  sci: Float32Array;
  /** Variance of sci, electrons squared. */
  var: Float32Array;
  /** Bit mask, see MASK_BITS. */
  mask: Uint16Array;
  orientation: Orientation;
  /** Trimmed data section of the raw frame this came from. */
  section: Section;
  /** Header of the first contributing exposure. */
  header: Header;
  exposures: ExposureInfo[];
  exptimeS: number;
  gain: number;
  readNoiseE: number;
  /** Per pixel, how many exposures the cosmic-ray rejection left out (frames combined from several exposures). */
  rejected?: Uint8Array;
}

/** A stage's result: its product and what it noticed. */
export interface StageResult<T> {
  product: T;
  diagnostics: Diagnostic[];
}
