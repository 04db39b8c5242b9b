/**
 * calibrateScience: the science exposures of one target -> one calibrated frame in electrons
 * (scaled to the total exposure time), with variance and mask, internal orientation.
 * Several exposures: combined with cosmic-ray rejection (combine-exposures.ts). One exposure:
 * van Dokkum's Laplacian cleaning (laplacian-clean.ts) unless cleanSingleExposure is off.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { InputError } from '../../errors.js';
import { takeFloat32, takeUint16 } from '../../kernels/frame-pool.js';
import { MASK_BITS, type CalibratedFrame, type RawFrame, type StageResult } from '../../products/frame.js';
import type { CcdCalibration } from './calibration.js';
import { combineExposures, MAX_EXPOSURES } from './combine-exposures.js';
import { checkSameDetector, resolveDetector } from './detector.js';
import type { ExposureCalibration } from './exposure.js';
import { exposureInfo } from './exposure-info.js';
import { laplacianClean } from './laplacian-clean.js';
import { overscanLevel } from './overscan.js';
import { exposureFromRaw } from './raw-exposure.js';
import { checkCcdSettings, type CcdSettings } from './settings.js';

/** Mask bits that keep a pixel out of the Laplacian detection and of the replacement medians. */
const UNUSABLE = MASK_BITS.saturated | MASK_BITS.badColumn | MASK_BITS.zeroFlat | MASK_BITS.outsideData;

/**
 * A science header whose GAIN or RDNOISE differs from the calibration's (another readout mode)
 * makes the electrons and the variance wrong; the calibration's values are used, with a warning.
 * Values fixed in the manifest are not compared: they overrule every header.
 */
function warnOnOtherReadout(frame: RawFrame, cal: Pick<CcdCalibration, 'gain' | 'readNoiseE'>, settings: CcdSettings, log: DiagnosticLog): void {
  const checks = [
    { key: 'GAIN', fixed: settings.gain !== undefined, used: cal.gain, unit: 'e-/ADU' },
    { key: 'RDNOISE', fixed: settings.readNoise !== undefined, used: cal.readNoiseE, unit: 'e-' },
  ];
  for (const c of checks) {
    const own = frame.header.getNumber(c.key);
    if (c.fixed || own === undefined || Math.abs(own - c.used) <= 1e-6 * Math.abs(c.used)) continue;
    log.warn('readout-differs', `${c.key} of this exposure differs from the calibration frames'; the calibration's value is used`, {
      place: { file: frame.path, hdu: frame.hdu }, expected: `${c.used} ${c.unit}`, actual: `${own} ${c.unit}`,
    });
  }
}

/** `cal` without its calibrated arc: the science needs the masters and the detector only. */
export function calibrateScience(science: RawFrame[], cal: Omit<CcdCalibration, 'arc'>, settings: CcdSettings): StageResult<CalibratedFrame> {
  const log = new DiagnosticLog('ccd');
  checkCcdSettings(settings);
  if (science.length === 0) throw new InputError('ccd.no-science', 'no science frames', { key: 'frames' }, { expected: 'one or more science exposures' });
  if (science.length > MAX_EXPOSURES) throw new InputError('ccd.too-many-exposures', `${science.length} exposures in one target`, { key: 'frames' }, { expected: `at most ${MAX_EXPOSURES}` });
  // The calibration's gain and read noise hold for the science too (same detector and readout).
  const detSettings = { ...settings, gain: cal.gain, readNoise: cal.readNoiseE };
  const infos = science.map((f) => {
    checkSameDetector(f, resolveDetector(f, detSettings), cal.reference);
    warnOnOtherReadout(f, cal, settings, log);
    return exposureInfo(f, true);
  });
  const det = cal.reference.detector;
  const exposureCal: ExposureCalibration = cal;
  // Each exposure in pooled dead frames where there are any (every value is overwritten).
  const n = cal.width * cal.height;
  const pooled = { float32: () => takeFloat32(n), uint16: () => takeUint16(n) };
  const exposures = science.map((f) => exposureFromRaw(f, det, overscanLevel(f, det, settings.overscanOrder), exposureCal, pooled));
  const combined = combineExposures(exposures, infos.map((e) => e.exptimeS), exposureCal, settings);
  const frame: CalibratedFrame = {
    width: cal.width, height: cal.height, sci: combined.sci, var: combined.var, mask: combined.mask,
    orientation: cal.orientation, section: cal.section, header: science[0]!.header, exposures: infos,
    exptimeS: combined.exptimeS, gain: cal.gain, readNoiseE: cal.readNoiseE,
  };
  if (science.length > 1) {
    frame.rejected = combined.rejected;
    log.info('cosmic-rays', `${combined.hits} cosmic-ray pixel(s) rejected in ${science.length} exposures (${combined.grown} with their neighbours)`, { actual: combined.hits });
  } else if (settings.cleanSingleExposure) {
    const skip = new Uint16Array(frame.mask.length);
    for (let i = 0; i < skip.length; i++) skip[i] = frame.mask[i]! & UNUSABLE;
    const clean = laplacianClean(frame.sci, frame.var, skip, cal.width, cal.height, settings.laplacian);
    let count = 0;
    for (let i = 0; i < clean.hits.length; i++) {
      if (!clean.hits[i]) continue;
      count++;
      frame.mask[i] = frame.mask[i]! | MASK_BITS.cosmicRay;
      frame.var[i] = clean.noise[i]! * clean.noise[i]!;
    }
    frame.sci = clean.cleaned;
    log.info('cosmic-rays', `${count} cosmic-ray pixel(s) found by the Laplacian method in ${clean.perRound.length} round(s) (${clean.perRound.join(', ')})`, { actual: count });
  } else {
    log.warn('cosmic-rays-kept', 'a single exposure and cleanSingleExposure off: cosmic rays are not removed');
  }
  let saturated = 0;
  for (let i = 0; i < frame.mask.length; i++) if (frame.mask[i]! & MASK_BITS.saturated) saturated++;
  if (saturated > 0) log.warn('saturated', `${saturated} saturated pixel(s)`, { actual: saturated });
  return { product: frame, diagnostics: log.items };
}
