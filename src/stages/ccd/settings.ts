/**
 * Settings of the CCD stage. Every field has its unit and default; header keywords fill what the
 * settings leave out (gain, read noise, sections, saturation), and a value set here wins.
 */
import { InputError } from '../../errors.js';

/** Van Dokkum (2001, PASP 113, 1420) Laplacian cosmic-ray detection on a single exposure. */
export interface LaplacianSettings {
  /** Detection limit on the noise-normalised, large-structure-removed Laplacian S' (paper's sigma_lim). Default 4.5 [recalled, REFERENCE.md]. */
  sigmaLim: number;
  /** Fraction of sigmaLim for the neighbours of a detection (paper's sigma_frac). Default 0.3 [recalled]. */
  sigmaFrac: number;
  /** Least contrast of the Laplacian over the fine-structure image (paper's f_lim). Default 2 [recalled]. */
  fLim: number;
  /** Detection rounds, each on the image cleaned by the previous ones. Default 4 [recalled]. */
  iterations: number;
  /**
   * whorl's own addition for long-slit spectra: a candidate must also stand sigmaLim sigmas (from
   * the neighbours' variance) above the median of its usable slit neighbours (same internal x,
   * y +-1, +-2), since emission and sky lines are smooth along the slit and cosmic rays are not.
   * Default true.
   */
  slitProtection: boolean;
}

export interface CcdSettings {
  /** Raw axis along which wavelength runs; `auto` decides from the arc frames' line structure. Default `auto`. */
  dispersionAxis: 'auto' | 'x' | 'y';
  /** Detector gain, e-/ADU. Default: header GAIN; missing both is an InputError. */
  gain?: number;
  /** Read noise, e- (rms per pixel). Default: header RDNOISE; missing both is an InputError. */
  readNoise?: number;
  /** Overscan strip, FITS 1-based inclusive '[x1:x2,y1:y2]'. Default: header BIASSEC; none means no overscan correction. */
  biasSection?: string;
  /** Data area, FITS 1-based inclusive '[x1:x2,y1:y2]'. Default: header DATASEC, else the whole frame. */
  dataSection?: string;
  /** Saturation level in raw ADU (before any subtraction). Default: header SATURATE, else 65535. */
  saturationAdu?: number;
  /** Order of the Legendre series fitted along the overscan strip. Default 3 (common practice: low order). */
  overscanOrder: number;
  /** Clipping threshold (noise sigmas) for the bias, flat and arc combinations. Default 3 (common practice). */
  combineSigma: number;
  /** Most clipping rounds in those combinations. Default 5 (common practice). */
  combineIterations: number;
  /** Order of the Legendre series fitted along the dispersion to normalise the flat. Default 9. */
  flatOrder: number;
  /** Keep the slit illumination profile in the flat (divide by one spectral shape for all rows). Default false. */
  flatKeepsIllumination: boolean;
  /** Normalised flat values below this are masked (zeroFlat) and not divided. Default 0.2 (common practice). */
  flatMinimum: number;
  /** Rows (slit ends) and columns whose median combined flat is below this fraction of the typical one are outsideData. Default 0.1 (common practice). */
  illuminationMinimum: number;
  /** A detector column is bad when its median departs from its neighbours' by this many robust sigmas. Default 10 (common practice). */
  badColumnSigma: number;
  /** Cosmic-ray threshold (noise sigmas) when several exposures are combined. Default 5 (common practice). */
  crSigma: number;
  /** Fractional scatter between exposures added to the noise model (seeing, transparency), so bright line cores are not clipped. Default 0.03 (common practice). */
  crRelativeScatter: number;
  /** Exposure pixels adjacent (8-neighbours) to a rejected hit are rejected too, to this radius in pixels. Default 1. */
  crGrow: number;
  /** Clean a lone science exposure with van Dokkum's Laplacian method. Default true. */
  cleanSingleExposure: boolean;
  laplacian: LaplacianSettings;
}

export const DEFAULT_LAPLACIAN_SETTINGS: LaplacianSettings = Object.freeze({
  sigmaLim: 4.5,
  sigmaFrac: 0.3,
  fLim: 2,
  iterations: 4,
  slitProtection: true,
});

export const DEFAULT_CCD_SETTINGS: CcdSettings = Object.freeze({
  dispersionAxis: 'auto',
  overscanOrder: 3,
  combineSigma: 3,
  combineIterations: 5,
  flatOrder: 9,
  flatKeepsIllumination: false,
  flatMinimum: 0.2,
  illuminationMinimum: 0.1,
  badColumnSigma: 10,
  crSigma: 5,
  crRelativeScatter: 0.03,
  crGrow: 1,
  cleanSingleExposure: true,
  laplacian: DEFAULT_LAPLACIAN_SETTINGS,
}) as CcdSettings;

/** Throws InputError (key = the setting's name) for a value outside its range. */
export function checkCcdSettings(s: CcdSettings): void {
  const bad = (key: string, expected: string, actual: unknown): never => {
    throw new InputError('ccd.invalid-setting', `invalid CCD setting ${key}`, { key }, { expected, actual: String(actual) });
  };
  if (!['auto', 'x', 'y'].includes(s.dispersionAxis)) bad('dispersionAxis', "'auto', 'x' or 'y'", s.dispersionAxis);
  if (s.saturationAdu !== undefined && !(s.saturationAdu > 0)) bad('saturationAdu', 'ADU > 0', s.saturationAdu);
  const integers: [keyof CcdSettings, number, number][] = [['overscanOrder', 0, 20], ['combineIterations', 1, 100], ['flatOrder', 0, 30], ['crGrow', 0, 5]];
  for (const [key, lo, hi] of integers) {
    const v = s[key] as number;
    if (!(Number.isInteger(v) && v >= lo && v <= hi)) bad(key, `an integer in [${lo}, ${hi}]`, v);
  }
  const positives: (keyof CcdSettings)[] = ['combineSigma', 'crSigma', 'badColumnSigma'];
  for (const key of positives) if (!((s[key] as number) > 0)) bad(key, '> 0', s[key]);
  const fractions: (keyof CcdSettings)[] = ['flatMinimum', 'illuminationMinimum', 'crRelativeScatter'];
  for (const key of fractions) if (!((s[key] as number) >= 0 && (s[key] as number) < 1)) bad(key, 'in [0, 1)', s[key]);
  const l = s.laplacian;
  if (!(l.sigmaLim > 0)) bad('laplacian.sigmaLim', '> 0', l.sigmaLim);
  if (!(l.sigmaFrac > 0 && l.sigmaFrac <= 1)) bad('laplacian.sigmaFrac', 'in (0, 1]', l.sigmaFrac);
  if (!(l.fLim > 0)) bad('laplacian.fLim', '> 0', l.fLim);
  if (!(Number.isInteger(l.iterations) && l.iterations >= 1 && l.iterations <= 20)) bad('laplacian.iterations', 'an integer in [1, 20]', l.iterations);
}
