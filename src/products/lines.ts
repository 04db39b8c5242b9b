/**
 * Emission-line measurements per row bin (stages sky and lines).
 * Rows are internal 0-based; writers convert to 1-based raw rows at the edge.
 */

/** Flag bits of a line measurement. Zero means clean. */
export const LINE_FLAGS = {
  lowSnr: 1,
  poorFit: 2,
  atBound: 4,
  maskedPixels: 8,
  skyResidual: 16,
  blended: 32,
  notConverged: 64,
  widthConstrained: 128,
} as const;

export type LineFlagName = keyof typeof LINE_FLAGS;

export interface RowBin {
  /** First and last internal row of the bin, inclusive. */
  rowStart: number;
  rowEnd: number;
  /** Flux-weighted centre row of the bin (fractional). */
  yCentre: number;
}

export interface LineMeasurement {
  bin: number;
  /** Manifest name, e.g. `Halpha`. */
  line: string;
  /** Name of the tied group it was fitted in, e.g. `Halpha+NII`. */
  group: string;
  /** Rest wavelength in air, Angstrom. */
  restAir: number;
  /** Centroid in internal x pixels. */
  centerPx: number;
  /** Observed air wavelength (Angstrom) and its 1-sigma error. */
  wavelength: number;
  wavelengthErr: number;
  /** Observed Gaussian sigma (Angstrom) and instrumental sigma at that place. */
  sigmaObsAngstrom: number;
  sigmaInstrAngstrom: number;
  /** Intrinsic velocity dispersion (km/s), instrumental width removed in quadrature; NaN if unresolved. */
  sigmaKms: number;
  sigmaKmsErr: number;
  /** Integrated line flux in electrons and its error. */
  flux: number;
  fluxErr: number;
  snr: number;
  chi2Reduced: number;
  flags: number;
}

/** The data and model of one bin's group fit, for the report's small multiples. */
export interface BinFit {
  bin: number;
  group: string;
  wavelength: Float64Array;
  data: Float32Array;
  error: Float32Array;
  model: Float32Array;
  /** Pixels left out of the fit (masked, or the core of another catalogue line). */
  excluded: Uint8Array;
}

export interface SkyModel {
  /** Internal rows (inclusive ranges) used to fit the sky. */
  skyRegions: [number, number][];
  /** Internal rows where the galaxy was found. */
  galaxyRegion: [number, number];
  /** Sky spectrum along x at the central row (electrons), for the report. */
  skySpectrum: Float32Array;
  /** RMS of sky-subtracted sky rows divided by their noise, per x (near 1 is good). */
  residualNormRms: Float32Array;
  /** Slit factor g(y) per internal row of the model sky(lambda, y) = g(y) B(lambda) (1 = flat). */
  slitFactor: Float32Array;
  /** Line-emission score per row used to find the galaxy (sum of noise sigmas above 3 over the first sky model). */
  emissionProfile: Float64Array;
}

export interface LineTable {
  bins: RowBin[];
  measurements: LineMeasurement[];
  fits: BinFit[];
  /** Continuum flux per internal row (electrons per pixel, median over line-free columns). */
  continuumProfile: Float64Array;
  sky: SkyModel;
}
