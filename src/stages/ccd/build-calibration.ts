/**
 * buildCalibration: bias, flat and arc frames -> master bias, normalised flat, masks, the
 * orientation and the calibrated arc. Pure: frames in, products and diagnostics out.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { InputError, StageError } from '../../errors.js';
import { giveBack } from '../../kernels/frame-pool.js';
import { MASK_BITS, type CalibratedFrame, type RawFrame, type StageResult } from '../../products/frame.js';
import { toInternal } from '../../products/orientation.js';
import { combineBias } from './bias.js';
import type { CcdCalibration } from './calibration.js';
import { combineExposures } from './combine-exposures.js';
import { checkSameDetector, resolveDetector, type ReferenceFrame } from './detector.js';
import { CLEAR_AXIS_RATIO, dispersionAxisFromArc } from './dispersion-axis.js';
import { findBadColumns } from './bad-columns.js';
import type { ExposureCalibration } from './exposure.js';
import { exposureFromRaw } from './raw-exposure.js';
import { exposureInfo } from './exposure-info.js';
import { combineFlats, normaliseFlat } from './flat.js';
import { flatsFromRaw } from './flat-source.js';
import { overscanLevel } from './overscan.js';
import { checkCcdSettings, type CcdSettings } from './settings.js';

export interface CalibrationFrames {
  bias: RawFrame[];
  flat: RawFrame[];
  arc: RawFrame[];
}

export function buildCalibration(frames: CalibrationFrames, settings: CcdSettings): StageResult<CcdCalibration> {
  const log = new DiagnosticLog('ccd');
  checkCcdSettings(settings);
  if (frames.arc.length === 0) throw new InputError('ccd.no-arc', 'no arc frames: the orientation and the wavelength solution need at least one', { key: 'arc' }, { expected: 'one or more arc frames' });
  const all = [...frames.bias, ...frames.flat, ...frames.arc];
  const first = all[0]!;
  const reference: ReferenceFrame = { path: first.path, width: first.width, height: first.height, detector: resolveDetector(first, settings) };
  const det = reference.detector;
  for (const f of all.slice(1)) {
    const d = resolveDetector(f, settings);
    checkSameDetector(f, d, reference);
    if (settings.gain === undefined && d.gain !== det.gain) {
      log.warn('gain-differs', `GAIN ${d.gain} differs from ${det.gain} of ${first.path}; using ${det.gain}`, { place: { file: f.path } });
    }
  }
  // Frames are combined one kind at a time, to keep memory low; the arcs are calibrated last, into
  // dead buffers where there are some (fresh full frames cost page faults). The first arc's
  // overscan is measured here, so the diagnostics keep their order.
  const tw = det.data.x1 - det.data.x0;
  const th = det.data.y1 - det.data.y0;
  const arcLevel = overscanLevel(frames.arc[0]!, det, settings.overscanOrder);
  const overscanModel = arcLevel.model;
  if (!det.overscan) log.info('no-overscan', 'no overscan section (BIASSEC): the bias level comes from the bias frames alone');
  else log.info('overscan', `overscan fitted along raw ${arcLevel.along} (Legendre order ${settings.overscanOrder}), RMS ${arcLevel.rms.toFixed(3)} ADU about the fit`, { place: { file: frames.arc[0]!.path }, actual: arcLevel.rms });

  for (const f of frames.bias) {
    const t = f.header.getNumber('EXPTIME');
    // Common practice: a bias is a zero-second readout; an exposed frame adds light to every frame.
    if (t !== undefined && t > 0) log.warn('bias-exposed', `bias frame with EXPTIME = ${t} s: a bias is a zero-second readout; is it a bias?`, { place: { file: f.path }, expected: 'EXPTIME = 0', actual: t });
  }
  const bias = combineBias(frames.bias, det, settings.overscanOrder, settings);
  if (bias.count === 0) log.warn('no-bias', 'no bias frames: only the overscan is subtracted');
  // The flats are trimmed, taken off the bias and scaled a block of lines at a time as they are combined.
  const flatLevels = frames.flat.map((f) => overscanLevel(f, det, settings.overscanOrder));
  const combinedFlat = frames.flat.length > 0 ? combineFlats(flatsFromRaw(frames.flat, det, flatLevels, bias.data), det.gain, det.readNoiseE, settings) : null;
  if (combinedFlat) checkFlatLit(combinedFlat.levelAdu, det.readNoiseE / det.gain, frames.flat.map((f) => f.path));

  const evidence = dispersionAxisFromArc(frames.arc[0]!, det, arcLevel, bias.data, tw, th);
  const clear = evidence.ratio >= CLEAR_AXIS_RATIO || evidence.ratio <= 1 / CLEAR_AXIS_RATIO;
  let axis = settings.dispersionAxis === 'auto' ? evidence.axis : settings.dispersionAxis;
  if (settings.dispersionAxis === 'auto' && !clear) {
    log.warn('axis-unclear', `the arc does not show clearly which axis the dispersion runs along; taking ${axis}`, { place: { file: frames.arc[0]!.path }, expected: `ratio >= ${CLEAR_AXIS_RATIO} or <= ${(1 / CLEAR_AXIS_RATIO).toFixed(3)}`, actual: evidence.ratio });
  } else if (settings.dispersionAxis !== 'auto' && clear && evidence.axis !== settings.dispersionAxis) {
    log.warn('axis-disagrees', `dispersion_axis is ${settings.dispersionAxis} but the arc lines look dispersed along ${evidence.axis}`, { place: { file: frames.arc[0]!.path }, actual: evidence.ratio });
  }
  axis = axis === 'y' ? 'y' : 'x';
  const orientation = { transpose: axis === 'y', flipX: false };

  const bad = findBadColumns(bias.count > 0 ? bias.data : null, combinedFlat?.data ?? null, tw, th, det.readNoiseE / det.gain, settings.badColumnSigma);
  const badRaw = new Uint16Array(tw * th);
  for (const x of bad.columns) for (let y = 0; y < th; y++) badRaw[y * tw + x] = MASK_BITS.badColumn;
  if (bad.columns.length > 0) {
    const list = bad.columns.map((x, i) => `${x + 1} (${bad.reasons[i]})`).join(', ');
    log.info('bad-columns', `${bad.columns.length} bad detector column(s), 1-based in the trimmed frame, found in: ${list}`, { actual: bad.columns.length });
  }
  // In the usual orientation the raw-orientation arrays serve as they are (none is changed later).
  const same = !orientation.transpose && !orientation.flipX;
  const internal = <T extends Float32Array | Uint16Array>(raw: T): T => (same ? raw : toInternal(raw, tw, th, orientation).data);
  const badInternal = { data: internal(badRaw), width: orientation.transpose ? th : tw, height: orientation.transpose ? tw : th };
  const width = badInternal.width;
  const height = badInternal.height;
  const masterBias = internal(bias.data);

  let masterFlat: Float32Array;
  let flatVariance: Float32Array;
  let flatMask: Uint16Array;
  let combinedInternal: Float32Array | null = null;
  let flatModel: Float32Array | null = null;
  if (combinedFlat) {
    combinedInternal = internal(combinedFlat.data);
    const normalised = normaliseFlat(combinedInternal, width, height, badInternal.data, {
      gain: det.gain, readNoiseE: det.readNoiseE, biasVarianceAdu: bias.varianceAdu, count: combinedFlat.count,
    }, settings, same ? bad.flatColumnMedians ?? undefined : undefined);
    ({ flat: masterFlat, variance: flatVariance, mask: flatMask, model: flatModel } = normalised);
    if (normalised.unfitRows.length > 0) log.warn('flat-dark-rows', `${normalised.unfitRows.length} row(s) without enough flat light are masked`, { actual: normalised.unfitRows.length });
    let zero = 0;
    for (let i = 0; i < flatMask.length; i++) if (flatMask[i]! & MASK_BITS.zeroFlat) zero++;
    if (zero > 0) log.info('flat-zero', `${zero} pixel(s) with a flat below ${settings.flatMinimum} masked, not divided`, { actual: zero });
  } else {
    log.warn('no-flat', 'no flat frames: the pixel response is not corrected');
    masterFlat = new Float32Array(width * height).fill(1);
    flatVariance = new Float32Array(width * height);
    flatMask = badInternal.data;
  }
  // Dead now, unless a product shares their memory: the combined flat, the flat's smooth model and the bad-column images.
  const live = [masterBias, masterFlat, flatVariance, flatMask];
  const spareData = unshared([combinedFlat?.data, combinedInternal, flatModel].filter((a) => a != null), live);
  const spareMask = unshared([badRaw, badInternal.data], live);

  const exposureCal: ExposureCalibration = {
    orientation, width, height, gain: det.gain, readNoiseE: det.readNoiseE,
    masterBias, biasVarianceAdu: bias.varianceAdu, masterFlat, flatVariance, flatMask,
  };
  const arcInfos = frames.arc.map((f) => exposureInfo(f, false));
  // The arcs from raw to calibrated, into dead buffers while there are some.
  const spares = { float32: () => spareData.pop(), uint16: () => spareMask.pop() };
  const arcExposures = frames.arc.map((f, i) => exposureFromRaw(f, det, i === 0 ? arcLevel : overscanLevel(f, det, settings.overscanOrder), exposureCal, spares));
  const arcCombined = combineExposures(arcExposures, arcInfos.map((e) => e.exptimeS), exposureCal, settings);
  if (arcCombined.hits > 0) log.info('arc-cosmic-rays', `${arcCombined.hits} cosmic-ray pixel(s) rejected in the arc combination`, { actual: arcCombined.hits });
  const arc: CalibratedFrame = {
    width, height, sci: arcCombined.sci, var: arcCombined.var, mask: arcCombined.mask, orientation,
    section: det.data, header: frames.arc[0]!.header, exposures: arcInfos, exptimeS: arcCombined.exptimeS,
    gain: det.gain, readNoiseE: det.readNoiseE,
  };
  if (arcExposures.length > 1) arc.rejected = arcCombined.rejected;
  // The arc exposures after the first, consumed by the combination, and the unused spares are
  // dead: pooled for the science frames.
  const products = [masterBias, masterFlat, flatVariance, flatMask, arc.sci, arc.var, arc.mask];
  giveBack(...unshared([...spareData, ...arcExposures.slice(1).flatMap((e) => [e.sci, e.var])], products), ...unshared([...spareMask, ...arcExposures.slice(1).map((e) => e.mask)], products));
  const product: CcdCalibration = {
    orientation, section: det.data, width, height, gain: det.gain, readNoiseE: det.readNoiseE,
    masterBias, biasVarianceAdu: bias.varianceAdu, masterFlat, flatVariance, flatMask, arc,
    badColumns: bad.columns, reference, overscanModel, axisRatio: evidence.ratio,
  };
  return { product, diagnostics: log.items };
}

/** The arrays of `candidates` (each once) that share memory with none of `live`: writing them changes no product. */
function unshared<T extends Float32Array | Uint16Array>(candidates: T[], live: (Float32Array | Uint16Array)[]): T[] {
  const out: T[] = [];
  for (const c of candidates) if (!live.some((l) => l.buffer === c.buffer) && !out.some((o) => o.buffer === c.buffer)) out.push(c);
  return out;
}

/** A lamp flat well exposed over most of the detector: median above this many read-noise sigmas (common practice: flats hold thousands of ADU). */
const FLAT_MIN_MEDIAN_SIGMAS = 20;

/**
 * The flats (ADU above the bias) must hold lamp light: normalising noise by a fit to noise gives
 * a flat of random factors. `level`: the combination's common level, the mean of the flats'
 * sampled medians (the combined flat's median is that level, as every flat is scaled to it). A
 * StageError names the frames (most often bias or dark frames listed as flats).
 */
function checkFlatLit(level: number, readNoiseAdu: number, paths: string[]): void {
  if (level >= FLAT_MIN_MEDIAN_SIGMAS * readNoiseAdu) return;
  throw new StageError('ccd', 'flat-unlit', `the flat frames (${paths.join(', ')}) hold no lamp light: median ${level.toFixed(1)} ADU above the bias, below ${FLAT_MIN_MEDIAN_SIGMAS} times the read noise (${(FLAT_MIN_MEDIAN_SIGMAS * readNoiseAdu).toFixed(1)} ADU); check that they are lamp flats`);
}
