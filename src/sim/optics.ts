/** Where light of a wavelength lands on the internal frame, from the true optics of a setup. */
import { evalLegendre1D } from '../kernels/legendre.js';
import { lineShiftPx, type SetupTruth } from './truth.js';

/**
 * Undistorted dispersion coordinate p (pixels) at which the dispersion model gives `lambda`
 * (air Angstrom), by Newton's method; may lie outside the detector.
 */
export function undistortedPixel(setup: SetupTruth, lambda: number): number {
  const model = setup.dispersion;
  const mid = 0.5 * (model.min + model.max);
  const slope0 = (evalLegendre1D(model, mid + 0.5) - evalLegendre1D(model, mid - 0.5));
  let p = mid + (lambda - evalLegendre1D(model, mid)) / slope0;
  for (let i = 0; i < 30; i++) {
    const slope = evalLegendre1D(model, p + 0.5) - evalLegendre1D(model, p - 0.5);
    const step = (lambda - evalLegendre1D(model, p)) / slope;
    p += step;
    if (Math.abs(step) < 1e-10) break;
  }
  return p;
}

/** Internal pixel coordinate d (fractional) of wavelength `lambda` in row s. */
export function pixelOfWavelength(setup: SetupTruth, lambda: number, s: number): number {
  return undistortedPixel(setup, lambda) + lineShiftPx(setup, s);
}

/** Air wavelengths (Angstrom) of the pixel edges d - 0.5, d = 0..W, of row s, into out (length W + 1). */
export function rowEdgeWavelengths(setup: SetupTruth, s: number, out: Float64Array): Float64Array {
  const shift = lineShiftPx(setup, s);
  for (let d = 0; d <= setup.internalWidth; d++) out[d] = evalLegendre1D(setup.dispersion, d - 0.5 - shift);
  return out;
}

/** Local dispersion (Angstrom per pixel) at undistorted coordinate p. */
export function dispersionAt(setup: SetupTruth, p: number): number {
  return evalLegendre1D(setup.dispersion, p + 0.5) - evalLegendre1D(setup.dispersion, p - 0.5);
}
