/**
 * trimFrame and calibrateExposure in one pass over the pixels, for a science exposure in the usual
 * orientation (nothing to reorient): the trimmed frame is never written out and read back. Each
 * trimmed value is rounded to float32 as the trimmed frame stores it, then the arithmetic of
 * calibrateExposure follows in the same order, so the values are the same bits.
 */
import { MASK_BITS, type RawFrame } from '../../products/frame.js';
import type { Detector } from './detector.js';
import { calibrateExposure, type CalibratedExposure, type ExposureCalibration } from './exposure.js';
import { trimWithLevel, type OverscanLevel } from './overscan.js';

/** Where an exposure's arrays come from: dead arrays of the frame's size (every value is overwritten), or undefined for new ones. */
export interface ExposureBuffers {
  float32: () => Float32Array | undefined;
  uint16: () => Uint16Array | undefined;
}

/**
 * `frame` (overscan `level`) from raw ADU to a calibrated exposure: in one pass in the usual
 * orientation, else trimmed, then reoriented and calibrated. The same values either way.
 */
export function exposureFromRaw(frame: RawFrame, det: Detector, level: OverscanLevel, cal: ExposureCalibration, buffers: ExposureBuffers): CalibratedExposure {
  const n = cal.width * cal.height;
  if (!cal.orientation.transpose && !cal.orientation.flipX) {
    return calibrateRawExposure(frame, det, level, cal, { sci: buffers.float32() ?? new Float32Array(n), var: buffers.float32() ?? new Float32Array(n), mask: buffers.uint16() ?? new Uint16Array(n) });
  }
  // Reoriented, the trimmed data array takes the variance (see calibrateExposure).
  return calibrateExposure(trimWithLevel(frame, det, level, true, { data: buffers.float32(), mask: buffers.uint16() }), cal);
}

/** The calibration's constants and arrays, and the exposure's arrays being written. */
interface LineInput {
  src: RawFrame['data'];
  sat: number;
  g: number;
  rn2: number;
  bias: Float32Array;
  flat: Float32Array;
  flatMask: Uint16Array;
  out: CalibratedExposure;
}

/**
 * `frame` trimmed to det.data with the overscan `level` subtracted, calibrated into `into` (arrays
 * of the calibration's size, every value overwritten). Only for cal.orientation without transpose
 * or flip (a RangeError otherwise).
 */
export function calibrateRawExposure(frame: RawFrame, det: Detector, level: OverscanLevel, cal: ExposureCalibration, into: CalibratedExposure): CalibratedExposure {
  const s = det.data;
  const width = s.x1 - s.x0;
  const height = s.y1 - s.y0;
  const n = width * height;
  if (cal.orientation.transpose || cal.orientation.flipX || cal.width !== width || cal.height !== height) {
    throw new RangeError(`calibrateRawExposure: a ${width} x ${height} frame as it is, against a calibration of ${cal.width} x ${cal.height} (transpose ${cal.orientation.transpose}, flip ${cal.orientation.flipX})`);
  }
  const { sci, var: variance, mask } = into;
  if (sci.length !== n || variance.length !== n || mask.length !== n || sci.buffer === variance.buffer) throw new RangeError(`calibrateRawExposure: buffers of ${sci.length}, ${variance.length} and ${mask.length} values (distinct) for ${n} pixels`);
  const c: LineInput = {
    src: frame.data, sat: det.saturationAdu, g: cal.gain, rn2: cal.readNoiseE * cal.readNoiseE,
    bias: cal.masterBias, flat: cal.masterFlat, flatMask: cal.flatMask, out: into,
  };
  // level.values is indexed by raw y (column strip) or raw x (row strip), as in trimLines; a row
  // strip's level (or none) is spread over a line so that one loop serves every strip.
  const byColumn = level.along === 'x' ? level.values.subarray(s.x0, s.x1) : null;
  const lineLevels = byColumn ?? new Float64Array(width);
  for (let y = 0; y < height; y++) {
    const from = (y + s.y0) * frame.width + s.x0;
    if (!byColumn) lineLevels.fill(level.along === 'y' ? level.values[y + s.y0]! : 0);
    calibrateLine(c, from, y * width, width, lineLevels);
  }
  return into;
}

// One line, in a function of one loop (V8 compiles it once). The pixel arithmetic is
// calibrateExposure's; see there for the branch-free max(detected, 0).

function calibrateLine(c: LineInput, from: number, to: number, width: number, levels: Float64Array): void {
  const { src, sat, g, rn2, bias, flat, flatMask } = c;
  const { sci, var: variance, mask } = c.out;
  for (let x = 0; x < width; x++) {
    const v = src[from + x]!;
    const i = to + x;
    const detected = (Math.fround(v - levels[x]!) - bias[i]!) * g;
    const f = flat[i]!;
    sci[i] = detected / f;
    const abs = Math.abs(detected);
    const poisson = abs < 1e300 ? 0.5 * (detected + abs) : detected > 0 ? detected : 0;
    variance[i] = (poisson + rn2) / (f * f);
    mask[i] = (v >= sat ? MASK_BITS.saturated : 0) | flatMask[i]!;
  }
}
