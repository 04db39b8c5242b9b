/**
 * The light that reaches the detector, in internal orientation (d along the dispersion, s along
 * the slit), electrons per pixel before the slit illumination and pixel sensitivity. Each source
 * is rendered row by row: the wavelengths of the row's pixel edges once, then each line added
 * only over the pixels near it as a pixel-integrated Gaussian.
 */
import { SPEED_OF_LIGHT_KMS } from '../physics/constants.js';
import { addPixelGaussian } from './erf.js';
import { dispersionAt, pixelOfWavelength, rowEdgeWavelengths, undistortedPixel } from './optics.js';
import { lineShiftPx, trueLsfSigmaPx, type SetupTruth } from './truth.js';

/** An emission line of the same flux in every row (lamp or sky). */
export interface UniformLine {
  /** Air wavelength, Angstrom. */
  wavelength: number;
  /** Electrons per row. */
  electrons: number;
}

/** Add lines that are the same in every row (arc lamp, night sky) to `out` (W x H, row-major). */
export function addUniformLines(setup: SetupTruth, lines: UniformLine[], out: Float32Array): void {
  const W = setup.internalWidth;
  for (const line of lines) {
    const p = undistortedPixel(setup, line.wavelength);
    if (p < -20 || p > W + 20) continue;
    const sigma = trueLsfSigmaPx(setup, p);
    for (let s = 0; s < setup.internalHeight; s++) {
      addPixelGaussian(out, s * W, W, pixelOfWavelength(setup, line.wavelength, s), sigma, line.electrons);
    }
  }
}

/**
 * Add a continuum of spectral density `density(lambda)` (electrons per Angstrom per row) times a
 * per-row factor `rowFactor[s]`, integrated over each pixel's wavelength interval.
 */
export function addContinuum(setup: SetupTruth, density: (lambda: number) => number, rowFactor: Float64Array, out: Float32Array): void {
  const W = setup.internalWidth;
  const edges = new Float64Array(W + 1);
  const values = new Float64Array(W);
  for (let s = 0; s < setup.internalHeight; s++) {
    const f = rowFactor[s]!;
    if (f === 0) continue;
    rowEdgeWavelengths(setup, s, edges);
    for (let d = 0; d < W; d++) {
      const l0 = edges[d]!;
      const l1 = edges[d + 1]!;
      values[d] = density(0.5 * (l0 + l1)) * (l1 - l0);
    }
    const base = s * W;
    for (let d = 0; d < W; d++) out[base + d] += f * values[d]!;
  }
}

/** One emission line of a moving source: rest wavelength and electrons per row. */
export interface MovingLine {
  restAngstrom: number;
  /** Electrons in each row (length H). */
  electrons: Float64Array;
}

/**
 * Add galaxy lines whose observed wavelength changes with row: `observedFactor[s]` multiplies the
 * rest wavelength (1 + z_obs). The line width is the LSF and the gas dispersion in quadrature.
 */
export function addMovingLines(setup: SetupTruth, lines: MovingLine[], observedFactor: Float64Array, gasDispersionKms: number, out: Float32Array): void {
  const W = setup.internalWidth;
  for (const line of lines) {
    for (let s = 0; s < setup.internalHeight; s++) {
      const flux = line.electrons[s]!;
      if (!(flux > 0)) continue;
      const lambda = line.restAngstrom * observedFactor[s]!;
      const p = undistortedPixel(setup, lambda);
      const centre = p + lineShiftPx(setup, s);
      if (centre < -20 || centre > W + 20) continue;
      const lsf = trueLsfSigmaPx(setup, centre);
      const gasPx = (lambda * gasDispersionKms) / SPEED_OF_LIGHT_KMS / dispersionAt(setup, p);
      addPixelGaussian(out, s * W, W, centre, Math.sqrt(lsf * lsf + gasPx * gasPx), flux);
    }
  }
}
