/**
 * Where combineFlats takes the lamp flats from (bias subtracted, ADU, float32): whole arrays, or
 * the raw frames trimmed and taken off the master bias a block of lines at a time, so that no
 * trimmed copy of a flat is ever made.
 */
import type { RawFrame } from '../../products/frame.js';
import type { Detector } from './detector.js';
import { minusBias, trimLines, trimmedValue, type OverscanLevel } from './overscan.js';

export interface FlatSource {
  width: number;
  height: number;
  count: number;
  /** Lines y0 .. y1 - 1 of flat i into out[0 ..). */
  lines(i: number, y0: number, y1: number, out: Float32Array): void;
  /** The value of flat i at pixel p (row-major). */
  valueAt(i: number, p: number): number;
}

/** Bias-subtracted flats held as arrays of width x height. */
export function flatsFromArrays(frames: Float32Array[], width: number, height: number): FlatSource {
  return {
    width,
    height,
    count: frames.length,
    lines: (i, y0, y1, out) => out.set(frames[i]!.subarray(y0 * width, y1 * width)),
    valueAt: (i, p) => frames[i]![p]!,
  };
}

/**
 * Raw flats with their overscan `levels`: each value the trimmed one (float32) minus `bias`,
 * rounded to float32, as trimming and then subtracting the bias give it.
 */
export function flatsFromRaw(frames: RawFrame[], det: Detector, levels: OverscanLevel[], bias: Float32Array): FlatSource {
  const width = det.data.x1 - det.data.x0;
  const height = det.data.y1 - det.data.y0;
  const one = new Float32Array(1);
  return {
    width,
    height,
    count: frames.length,
    lines: (i, y0, y1, out) => {
      trimLines(frames[i]!, det, levels[i]!, y0, y1, out, null);
      minusBias(out, bias, y0 * width, (y1 - y0) * width);
    },
    valueAt: (i, p) => {
      one[0] = trimmedValue(frames[i]!, det, levels[i]!, p % width, Math.floor(p / width)) - bias[p]!;
      return one[0]!;
    },
  };
}
