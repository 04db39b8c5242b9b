/**
 * Which raw axis the dispersion runs along, from an arc: lamp lines are narrow along the
 * dispersion and extended along the slit, so neighbour differences across the lines (along the
 * dispersion) are much larger than along them. Noise and cosmic rays add to both equally.
 */
import type { RawFrame } from '../../products/frame.js';
import type { Detector } from './detector.js';
import { minusBias, trimLines, type OverscanLevel } from './overscan.js';

export interface AxisEvidence {
  axis: 'x' | 'y';
  /** Mean |I(x+1, y) - I(x, y)| over mean |I(x, y+1) - I(x, y)|: >> 1 for dispersion along x. */
  ratio: number;
}

/** Ratios closer to 1 than this leave the axis undecided (common practice). */
export const CLEAR_AXIS_RATIO = 1.5;

/**
 * The first arc's trimmed lines (overscan `level` subtracted, float32) minus `bias` (each
 * difference rounded to float32, as a bias-subtracted frame holds it), width x height. Trimmed and
 * bias-subtracted two lines at a time instead of a trimmed copy of the frame.
 */
export function dispersionAxisFromArc(arc: RawFrame, det: Detector, level: OverscanLevel, bias: Float32Array, width: number, height: number): AxisEvidence {
  let dx = 0;
  let dy = 0;
  let line = new Float32Array(width);
  let below = new Float32Array(width);
  trimLines(arc, det, level, 0, 1, line, null);
  minusBias(line, bias, 0, width);
  for (let y = 0; y < height - 1; y++) {
    trimLines(arc, det, level, y + 1, y + 2, below, null);
    minusBias(below, bias, (y + 1) * width, width);
    for (let x = 0; x < width - 1; x++) {
      const v = line[x]!;
      dx += Math.abs(line[x + 1]! - v);
      dy += Math.abs(below[x]! - v);
    }
    [line, below] = [below, line];
  }
  const ratio = dy > 0 ? dx / dy : Infinity;
  return { axis: ratio >= 1 ? 'x' : 'y', ratio };
}
