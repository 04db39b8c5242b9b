/** Settings of the lines stage: every field with its unit and default. */

export interface LineSettings {
  /** Manifest names of the lines to measure (Halpha, NII6583, NII6548, SII6716, ...). Default ['Halpha', 'NII6583', 'NII6548']. */
  lines: string[];
  /**
   * Integrated-flux S/N a bin must reach before it stops taking rows. Default 8: centroid errors
   * near 10 km/s at the simulated resolution, and safely above S/N 5, below which free-width fits
   * quote too-small centroid errors.
   */
  snrTarget: number;
  /** Expected line-of-sight velocity, optical cz (km/s). Default: found from the strongest peak near H-alpha in the central rows. */
  redshiftGuessKms?: number;
  /** Most rows summed into one bin. Default 15. */
  maxBinRows: number;
  /** Bins that miss snrTarget in a row, after which the walk along the slit stops on that side. Default 2. */
  maxFailedBins: number;
  /**
   * Multiply errors by sqrt(chi2/dof) where chi2/dof lies beyond its 3-sigma noise range
   * 1 + 3 sqrt(2/dof) (errors are never shrunk). Default true.
   */
  scaleByChi2: boolean;
  /** Below this S/N the width is held at the median of the bins above it (flag widthConstrained). Default 10. */
  freeWidthSnr: number;
  /** How far (km/s) a centroid may move from its starting guess (the previous bin). Default 300. */
  velocityToleranceKms: number;
  /** Fitting window: this many observed sigmas beyond the outermost group members, plus the velocity tolerance. Default 6. */
  windowSigmas: number;
  /** Reduced chi-square above which a fit is flagged poorFit. Default 3 (common practice). */
  poorFitChi2: number;
  /** Normalised sky residual RMS (SkyModel.residualNormRms) above which a line core is flagged skyResidual. Default 2 (common practice). */
  skyResidualLimit: number;
  /** Largest intrinsic gas dispersion (km/s) the width may take. Default 300. */
  maxDispersionKms: number;
}

export const DEFAULT_LINE_SETTINGS: Readonly<LineSettings> = Object.freeze({
  lines: ['Halpha', 'NII6583', 'NII6548'],
  snrTarget: 8,
  maxBinRows: 15,
  maxFailedBins: 2,
  scaleByChi2: true,
  freeWidthSnr: 10,
  velocityToleranceKms: 300,
  windowSigmas: 6,
  poorFitChi2: 3,
  skyResidualLimit: 2,
  maxDispersionKms: 300,
});
