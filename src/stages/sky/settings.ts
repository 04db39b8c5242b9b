/** Settings of the sky stage: every field with its unit and default. */

export interface SkySettings {
  /**
   * Rows to fit the sky from, internal 0-based inclusive ranges (from the manifest). Default:
   * found from the continuum and line-emission profiles along the slit.
   */
  regions?: [number, number][];
  /**
   * Order of the Legendre series along the slit of the multiplicative slit factor g(y) in
   * sky(lambda, y) = g(y) B(lambda). Default 1 (a linear gradient; the flat already removes most
   * of the slit illumination).
   */
  order: number;
  /**
   * Breakpoint spacing of the sky spline B(lambda), in pixels of the local dispersion. Default 1:
   * every sky row then feeds every interval, which keeps the model's noise lowest; on test frames
   * with tilts of 0-4 px over the slit, 0.5-1 px left galaxy rows at their quoted noise.
   */
  knotSpacingPx: number;
  /** Rows at each end of the slit never used as sky (vignetted slit ends; common practice). Default 3. */
  edgeRows: number;
  /** Rows left out between the galaxy and the sky on each side (faint outer light). Default 5. */
  marginRows: number;
  /** Gaps of up to this many rows inside the galaxy's detected light count as galaxy. Default 10. */
  gapRows: number;
  /** A row holds galaxy light when its continuum or emission score exceeds this many robust sigmas. Default 5 (common practice). */
  detectSigma: number;
  /** Pixels further than this many noise sigmas from the sky model are left out of the fit. Default 4 (common practice). */
  clipSigma: number;
  /** Rounds of clipping, each followed by a refit. Default 2. */
  clipIterations: number;
  /** Fewer sky rows than this is warned about (`sky.little-sky`). Default 20. */
  minSkyRows: number;
}

export const DEFAULT_SKY_SETTINGS: Readonly<SkySettings> = Object.freeze({
  order: 1,
  knotSpacingPx: 1,
  edgeRows: 3,
  marginRows: 5,
  gapRows: 10,
  detectSigma: 5,
  clipSigma: 4,
  clipIterations: 2,
  minSkyRows: 20,
});
