/** Settings of the arc stage (wavelength solution) and of the sky-line flexure measurement. */
import { InputError } from '../../errors.js';

export interface ArcSettings {
  /** Air wavelength (Angstrom) at the detector centre, from the manifest's approx_wavelength. */
  approxWavelength: number;
  /** Dispersion (Angstrom per pixel, > 0) from the manifest's approx_dispersion; may be off by 10%. */
  approxDispersion: number;
  /**
   * Legendre order along the dispersion. 'auto' (default): the order 1..min(maxXOrder, N_lines / 3)
   * with the lowest Bayesian information criterion n ln(WRSS / n) + k ln n of the central-band fit
   * (see order-choice.ts).
   */
  xOrder: number | 'auto';
  /** Legendre order along the slit (tilt 1, curvature 2). 'auto' (default): the same criterion on the 2-D fit, 0..maxYOrder. */
  yOrder: number | 'auto';
  /** Highest order 'auto' may choose along x. Default 7. */
  maxXOrder: number;
  /** Highest order 'auto' may choose along y. Default 3. */
  maxYOrder: number;
  /** Iterative clipping threshold of the solution fits, in robust sigmas (MAD x 1.4826 of the normalised residuals). Default 3 (common practice). */
  clipSigma: number;
  /** Rows per band in which lines are detected and traced along the slit. Default 16. */
  rowBand: number;
  /** Detection threshold: peak height above the local background in noise sigma. Default 5. */
  detectSigma: number;
  /** Fraction by which the true dispersion may differ from approxDispersion in the search. Default 0.15. */
  dispersionSearch: number;
  /** Distance (Angstrom) the true central wavelength may be from approxWavelength in the search. Default 150. */
  centreSearchAngstrom: number;
  /** Two peaks (or catalogue lines) closer than this many line sigmas are a blend and not used. Default 4. */
  blendSigma: number;
  /** Fewest identified lines for a solution. Default 6. */
  minLines: number;
  /** Above this RMS (pixels) of the central band the identification is refused as wrong. Default 0.25 (REFERENCE.md: > 0.2 px suggests a misidentification; common practice). */
  maxRmsPx: number;
  /**
   * Share of the possible matches (catalogue lines the solution puts on the detector, or the clean
   * peaks if fewer) that must match for the identification to be believed. Default 0.5.
   */
  minMatchedFraction: number;
  /** Largest jump (pixels) of a line between neighbouring bands when tracing along the slit. Default 1.5. */
  traceTolerancePx: number;
}

export const DEFAULT_ARC_SETTINGS: Omit<ArcSettings, 'approxWavelength' | 'approxDispersion'> = Object.freeze({
  xOrder: 'auto',
  yOrder: 'auto',
  maxXOrder: 7,
  maxYOrder: 3,
  clipSigma: 3,
  rowBand: 16,
  detectSigma: 5,
  dispersionSearch: 0.15,
  centreSearchAngstrom: 150,
  blendSigma: 4,
  minLines: 6,
  maxRmsPx: 0.25,
  minMatchedFraction: 0.5,
  traceTolerancePx: 1.5,
});

export interface FlexureSettings {
  /** Fewest peak signal-to-noise of a stacked sky line to use it. Default 5. */
  minSnr: number;
  /** Half-width of the window searched around each sky line, Angstrom (the largest flexure looked for). Default 4. */
  searchAngstrom: number;
  /** Rows whose continuum exceeds the sky level by this many sigma are the galaxy's and are left out. Default 5. */
  galaxyRowSigma: number;
  /** Sky rows given by the user (internal 0-based rows, inclusive ranges): used instead of the row test. */
  skyRows?: [number, number][];
}

export const DEFAULT_FLEXURE_SETTINGS: FlexureSettings = Object.freeze({ minSnr: 5, searchAngstrom: 4, galaxyRowSigma: 5 });

function bad(key: string, expected: string, actual: unknown): never {
  throw new InputError('arc.settings', `invalid arc setting ${key}`, { key }, { expected, actual: String(actual) });
}

/** Throw InputError on flexure settings no science frame could satisfy, naming the setting. */
export function checkFlexureSettings(s: FlexureSettings): void {
  if (!(s.minSnr >= 0)) bad('minSnr', 'a signal-to-noise >= 0', s.minSnr);
  if (!(s.searchAngstrom > 0)) bad('searchAngstrom', 'Angstrom > 0', s.searchAngstrom);
  if (!(s.galaxyRowSigma > 0)) bad('galaxyRowSigma', 'a number of sigmas > 0', s.galaxyRowSigma);
  for (const [k, range] of (s.skyRows ?? []).entries()) {
    if (!(Array.isArray(range) && range.length === 2 && range.every(Number.isInteger))) bad(`skyRows[${k}]`, 'an inclusive range [first, last] of integer rows (internal, 0-based)', JSON.stringify(range));
  }
}

/** Throw InputError on settings no arc could satisfy (the runner validates the manifest; this guards library callers). */
export function checkArcSettings(s: ArcSettings): void {
  if (!(s.approxWavelength > 0)) bad('approxWavelength', 'a wavelength in Angstrom > 0', s.approxWavelength);
  if (!(s.approxDispersion > 0)) bad('approxDispersion', 'Angstrom per pixel > 0', s.approxDispersion);
  if (s.xOrder !== 'auto' && !(Number.isInteger(s.xOrder) && s.xOrder >= 1 && s.xOrder <= 15)) bad('xOrder', "'auto' or an integer 1-15", s.xOrder);
  if (s.yOrder !== 'auto' && !(Number.isInteger(s.yOrder) && s.yOrder >= 0 && s.yOrder <= 8)) bad('yOrder', "'auto' or an integer 0-8", s.yOrder);
  if (!(Number.isInteger(s.maxXOrder) && s.maxXOrder >= 1 && s.maxXOrder <= 15)) bad('maxXOrder', 'an integer 1-15', s.maxXOrder);
  if (!(Number.isInteger(s.maxYOrder) && s.maxYOrder >= 0 && s.maxYOrder <= 8)) bad('maxYOrder', 'an integer 0-8', s.maxYOrder);
  if (!(s.clipSigma > 1)) bad('clipSigma', 'a number > 1', s.clipSigma);
  if (!(Number.isInteger(s.rowBand) && s.rowBand >= 1)) bad('rowBand', 'an integer >= 1', s.rowBand);
  if (!(s.detectSigma > 0)) bad('detectSigma', 'a number > 0', s.detectSigma);
  if (!(s.dispersionSearch >= 0 && s.dispersionSearch < 0.5)) bad('dispersionSearch', 'a fraction in [0, 0.5)', s.dispersionSearch);
  if (!(s.centreSearchAngstrom >= 0)) bad('centreSearchAngstrom', 'Angstrom >= 0', s.centreSearchAngstrom);
  if (!(s.minLines >= 3)) bad('minLines', 'an integer >= 3', s.minLines);
  if (!(s.maxRmsPx > 0)) bad('maxRmsPx', 'pixels > 0', s.maxRmsPx);
  if (!(s.minMatchedFraction >= 0 && s.minMatchedFraction <= 1)) bad('minMatchedFraction', 'a fraction in [0, 1]', s.minMatchedFraction);
  if (!(s.traceTolerancePx > 0)) bad('traceTolerancePx', 'pixels > 0', s.traceTolerancePx);
  if (!(s.blendSigma >= 0)) bad('blendSigma', 'a number >= 0', s.blendSigma);
}
