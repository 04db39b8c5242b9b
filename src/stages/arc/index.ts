/**
 * Stage arc: the wavelength solution of an arc frame and its zero point in a science frame.
 *
 * solveWavelengths (solve.ts):
 *   band-spectra   mean spectrum of each band of rowBand rows (masked pixels left out)
 *   peaks          local maxima above detectSigma times the noise of the VAR extension
 *   centroids      Gaussian fits (kernels/gaussian-fit): centre, error, width; blends, saturation
 *   first-guess    FFT cross-correlation of the peaks with synthetic arcs over trial dispersions,
 *                  both directions of x
 *   match, prune   pattern matching from the centre outwards with rising order and falling
 *                  tolerance; positions the errors cannot explain are left out
 *   identify       the guess that matches best and passes the acceptance tests, or a StageError
 *   central-solution, order-choice   x order by BIC (or set), last match
 *   trace, slit-fit                  lines followed along the slit, lambda(x, y) fitted with
 *                                    robust clipping, y order by BIC (or set)
 *   extrapolation  diagnostics for the ends beyond the outermost identified lines
 * measureFlexure (flexure.ts, sky-rows.ts): night-sky lines stacked over the sky rows, shift =
 *   weighted mean of catalogue - measured.
 * requireSameGrid (same-grid.ts): the frame/solution size check of flexure, sky and lines.
 */
export * from './settings.js';
export { solveWavelengths } from './solve.js';
export { measureFlexure } from './flexure.js';
