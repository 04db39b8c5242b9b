/**
 * Emission-line measurements per row bin (stages sky and lines).
 * Rows are internal 0-based; writers convert to 1-based raw rows at the edge.
 */

/** Flag bits of a line measurement. Zero means clean. Criteria: src/stages/lines/measurements.ts and settings.ts. */
export const LINE_FLAGS = {
  /** Flux S/N below the bin target (snrTarget). */
  lowSnr: 1,
  /** Reduced chi-square above poorFitChi2. */
  poorFit: 2,
  /** Centre or width on its bound, or this line's flux held at zero. */
  atBound: 4,
  /** A masked pixel within 3 sigma of the line centre. */
  maskedPixels: 8,
  /** Sky residual (SkyModel.residualNormRms) above skyResidualLimit within 2 sigma of the centre. */
  skyResidual: 16,
  /** Another line of the group closer than two FWHM. */
  blended: 32,
  /** The fit stopped on its iteration budget. */
  notConverged: 64,
  /** Width held at the median of the high-S/N bins (S/N below freeWidthSnr); no dispersion error. */
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
  /** Index into LineTable.bins. */
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
  /** flux / fluxErr (0 when the error is not positive). */
  snr: number;
  /** Chi-square per degree of freedom of the group fit this line took part in. */
  chi2Reduced: number;
  /** Sum of LINE_FLAGS bits. */
  flags: number;
}

/** The data and model of one bin's group fit, for the report's small multiples. */
export interface BinFit {
  /** Index into LineTable.bins, and the tied group's name. */
  bin: number;
  group: string;
  /** Air wavelength of each pixel of the fit window (Angstrom). */
  wavelength: Float64Array;
  /** Summed bin spectrum, its 1-sigma error and the fitted model, electrons per pixel. */
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
