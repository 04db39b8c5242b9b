/**
 * One exposure from trimmed ADU to electrons in the internal orientation: master bias subtracted,
 * divided by the normalised flat, times the gain; variance from Poisson and read noise carried
 * through the bias subtraction and flat division; mask from saturation and the calibration.
 */
import { toInternal } from '../../products/orientation.js';
import type { CcdCalibration } from './calibration.js';
import type { TrimmedFrame } from './overscan.js';

/** The parts of the calibration an exposure needs (all internal orientation). */
export type ExposureCalibration = Pick<
  CcdCalibration,
  'orientation' | 'width' | 'height' | 'gain' | 'readNoiseE' | 'masterBias' | 'biasVarianceAdu' | 'masterFlat' | 'flatVariance' | 'flatMask'
>;

export interface CalibratedExposure {
  /** Electrons (flat-fielded) in this exposure. */
  sci: Float32Array;
  /** Electrons^2. */
  var: Float32Array;
  mask: Uint16Array;
}

/**
 * var = (g max(raw - bias, 0) + RN^2) / F^2, in e^2: the noise of this exposure alone (Poisson on
 * the detected electrons before the flat, and read noise). The errors of the master bias and
 * flat are the same in every exposure, so the combination adds them once (combine-exposures.ts).
 * `trimmed` is consumed: in the usual orientation its arrays become the product, otherwise its
 * data array (dead once oriented) takes the variance. `varianceInto`: an array of the frame's size
 * whose values nobody reads any more, for the variance in the usual orientation (else a new one).
 */
export function calibrateExposure(trimmed: TrimmedFrame, cal: ExposureCalibration, varianceInto?: Float32Array): CalibratedExposure {
  const same = !cal.orientation.transpose && !cal.orientation.flipX;
  const o = same ? trimmed : toInternal(trimmed.data, trimmed.width, trimmed.height, cal.orientation);
  const m = same ? { data: trimmed.mask } : toInternal(trimmed.mask, trimmed.width, trimmed.height, cal.orientation);
  if (o.width !== cal.width || o.height !== cal.height) {
    throw new RangeError(`calibrateExposure: frame ${o.width} x ${o.height} against calibration ${cal.width} x ${cal.height}`);
  }
  const n = cal.width * cal.height;
  const sci = o.data; // reused in place: the oriented copy (or the consumed trimmed frame) is ours
  const variance = !same ? trimmed.data : varianceInto ?? new Float32Array(n);
  if (variance.length !== n || variance.buffer === sci.buffer) throw new RangeError(`calibrateExposure: a variance buffer of ${variance.length} values for ${n} pixels, or the frame's own`);
  const mask = m.data;
  const g = cal.gain;
  const rn2 = cal.readNoiseE * cal.readNoiseE;
  const { masterBias, masterFlat, flatMask } = cal;
  for (let i = 0; i < n; i++) {
    const detected = (sci[i]! - masterBias[i]!) * g;
    const f = masterFlat[i]!;
    sci[i] = detected / f;
    // max(detected, 0) without a branch on its sign (unpredictable on dark pixels): exact for
    // |detected| < 1e300 (2 detected and the halving are exact, a negative gives +0), NaN included by the fallback.
    const abs = Math.abs(detected);
    const poisson = abs < 1e300 ? 0.5 * (detected + abs) : detected > 0 ? detected : 0;
    variance[i] = (poisson + rn2) / (f * f);
    mask[i] = mask[i]! | flatMask[i]!;
  }
  return { sci, var: variance, mask };
}
