/**
 * Overscan correction and trimming: the overscan level of each readout line is measured (median
 * across the strip), a low-order Legendre series is fitted along the strip, and its value is
 * subtracted from every data pixel of that line; the result is cut to the data section.
 */
import { fitLegendre1D } from '../../kernels/legendre-fit.js';
import { evalLegendre1D, type Legendre1D } from '../../kernels/legendre.js';
import { medianOfBuffer } from '../../kernels/robust.js';
import { MASK_BITS, type RawFrame } from '../../products/frame.js';
import type { Detector } from './detector.js';

/** A trimmed frame in the raw orientation, ADU, overscan removed. */
export interface TrimmedFrame {
  width: number;
  height: number;
  /** ADU after the overscan fit is subtracted. */
  data: Float32Array;
  /** MASK_BITS.saturated where the raw value reached the saturation level (empty when not asked for). */
  mask: Uint16Array;
  /** The fitted overscan level (ADU) along the strip, or null without an overscan. */
  overscanModel: Legendre1D | null;
  /** RMS (ADU) of the per-line overscan medians about the fit. */
  overscanRmsAdu: number;
  /** Whether the overscan level varies along raw y (strip of columns) or raw x (strip of rows). */
  overscanAlong: 'y' | 'x' | null;
}

/**
 * Arrays of the trimmed size whose values nobody reads any more, for a trimmed frame to be written
 * into instead of new ones (each new full frame costs fresh memory pages); every value is overwritten.
 */
export interface TrimBuffers {
  data?: Float32Array;
  mask?: Uint16Array;
}

/** `withMask` false leaves `mask` empty (bias frames: saturation is not looked at). */
export function trimFrame(frame: RawFrame, det: Detector, overscanOrder: number, withMask = true, reuse: TrimBuffers = {}): TrimmedFrame {
  return trimWithLevel(frame, det, overscanLevel(frame, det, overscanOrder), withMask, reuse);
}

/** trimFrame with the overscan `level` of `frame` already measured. */
export function trimWithLevel(frame: RawFrame, det: Detector, level: OverscanLevel, withMask: boolean, reuse: TrimBuffers = {}): TrimmedFrame {
  const { data: s } = det;
  const width = s.x1 - s.x0;
  const height = s.y1 - s.y0;
  const n = width * height;
  const out = reuse.data ?? new Float32Array(n);
  const mask = withMask ? (reuse.mask?.fill(0) ?? new Uint16Array(n)) : new Uint16Array(0);
  if (out.length !== n || mask.length !== (withMask ? n : 0)) throw new RangeError(`trimFrame: buffers of ${out.length} and ${mask.length} values for a ${width} x ${height} frame`);
  trimLines(frame, det, level, 0, height, out, withMask ? mask : null);
  return { width, height, data: out, mask, overscanModel: level.model, overscanRmsAdu: level.rms, overscanAlong: level.along };
}

/**
 * Trimmed lines y0 .. y1 - 1 (0-based in the data section) of `frame` into out[0 ..), the
 * overscan `level` subtracted; saturation marked in `mask` when given. Lets a combination walk
 * a stack of frames a few lines at a time instead of trimming whole frames.
 */
export function trimLines(frame: RawFrame, det: Detector, level: OverscanLevel, y0: number, y1: number, out: Float32Array, mask: Uint16Array | null): void {
  const { data: s } = det;
  const width = s.x1 - s.x0;
  const src = frame.data;
  const sat = det.saturationAdu;
  // level.values is indexed by raw y (column strip) or raw x (row strip), full frame length.
  const byColumn = level.along === 'x' ? level.values.subarray(s.x0, s.x1) : null;
  for (let y = y0; y < y1; y++) {
    const from = (y + s.y0) * frame.width + s.x0;
    const to = (y - y0) * width;
    if (byColumn) trimByColumn(src, from, byColumn, out, to, width, mask, sat);
    else if (mask) trimLineMasked(src, from, level.along === 'y' ? level.values[y + s.y0]! : 0, out, to, width, mask, sat);
    else trimLine(src, from, level.along === 'y' ? level.values[y + s.y0]! : 0, out, to, width);
  }
}

/** Trimmed lines in `out` [0, count) taken off the master bias from pixel `from` on (rounded to float32, as a bias-subtracted frame holds them). */
export function minusBias(out: Float32Array, bias: Float32Array, from: number, count: number): void {
  for (let j = 0; j < count; j++) out[j] = out[j]! - bias[from + j]!;
}

/** The trimmed value (overscan `level` subtracted, rounded to float32) at x, y of the data section, as trimLines gives it. */
export function trimmedValue(frame: RawFrame, det: Detector, level: OverscanLevel, x: number, y: number): number {
  const s = det.data;
  const v = frame.data[(y + s.y0) * frame.width + s.x0 + x]!;
  const l = level.along === 'x' ? level.values[s.x0 + x]! : level.along === 'y' ? level.values[y + s.y0]! : 0;
  return Math.fround(v - l);
}

// One line each, in functions of one loop: the tests on the mask and the strip direction are
// taken once per line, not per pixel. The level is subtracted and saturation marked in one pass.

function trimLine(src: RawFrame['data'], from: number, level: number, out: Float32Array, to: number, width: number): void {
  for (let x = 0; x < width; x++) out[to + x] = src[from + x]! - level;
}

function trimLineMasked(src: RawFrame['data'], from: number, level: number, out: Float32Array, to: number, width: number, mask: Uint16Array, sat: number): void {
  for (let x = 0; x < width; x++) {
    const v = src[from + x]!;
    out[to + x] = v - level;
    if (v >= sat) mask[to + x] = MASK_BITS.saturated;
  }
}

function trimByColumn(src: RawFrame['data'], from: number, byColumn: Float64Array, out: Float32Array, to: number, width: number, mask: Uint16Array | null, sat: number): void {
  for (let x = 0; x < width; x++) {
    const v = src[from + x]!;
    out[to + x] = v - byColumn[x]!;
    if (mask && v >= sat) mask[to + x] = MASK_BITS.saturated;
  }
}

export interface OverscanLevel {
  along: 'y' | 'x' | null;
  values: Float64Array;
  model: Legendre1D | null;
  rms: number;
}

export function overscanLevel(frame: RawFrame, det: Detector, order: number): OverscanLevel {
  const o = det.overscan;
  if (!o) return { along: null, values: new Float64Array(0), model: null, rms: NaN };
  // The strip's long side runs along the readout direction it samples.
  const along: 'y' | 'x' = o.y1 - o.y0 >= o.x1 - o.x0 ? 'y' : 'x';
  const [lo, hi] = along === 'y' ? [o.y0, o.y1] : [o.x0, o.x1];
  const [acrossLo, acrossHi] = along === 'y' ? [o.x0, o.x1] : [o.y0, o.y1];
  const n = hi - lo;
  const pos = new Float64Array(n);
  const med = new Float64Array(n);
  const scratch = new Float64Array(acrossHi - acrossLo);
  for (let i = 0; i < n; i++) {
    const line = lo + i;
    for (let j = acrossLo; j < acrossHi; j++) {
      scratch[j - acrossLo] = along === 'y' ? frame.data[line * frame.width + j]! : frame.data[j * frame.width + line]!;
    }
    pos[i] = line;
    med[i] = medianOfBuffer(scratch, acrossHi - acrossLo);
  }
  const fitOrder = Math.min(order, n - 2);
  const length = along === 'y' ? frame.height : frame.width;
  const values = new Float64Array(length);
  if (fitOrder < 0) {
    values.fill(med[0]!);
    return { along, values, model: null, rms: 0 };
  }
  const fit = fitLegendre1D(pos, med, null, fitOrder, { min: 0, max: length - 1 }, { clipSigma: 3 });
  for (let i = 0; i < length; i++) values[i] = evalLegendre1D(fit.model, i);
  return { along, values, model: fit.model, rms: fit.rms };
}
