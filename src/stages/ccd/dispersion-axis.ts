/**
 * Which raw axis the dispersion runs along, from an arc: lamp lines are narrow along the
 * dispersion and extended along the slit, so neighbour differences across the lines (along the
 * dispersion) are much larger than along them. Noise and cosmic rays add to both equally.
 */

export interface AxisEvidence {
  axis: 'x' | 'y';
  /** Mean |I(x+1, y) - I(x, y)| over mean |I(x, y+1) - I(x, y)|: >> 1 for dispersion along x. */
  ratio: number;
}

/** Ratios closer to 1 than this leave the axis undecided (common practice). */
export const CLEAR_AXIS_RATIO = 1.5;

/**
 * `arc` minus `bias` (each difference rounded to float32, as a bias-subtracted frame holds it),
 * width x height. Two bias-subtracted lines at a time instead of a bias-subtracted copy of the frame.
 */
export function dispersionAxisFromArc(arc: Float32Array, bias: Float32Array, width: number, height: number): AxisEvidence {
  let dx = 0;
  let dy = 0;
  let line = new Float32Array(width);
  let below = new Float32Array(width);
  for (let x = 0; x < width; x++) line[x] = arc[x]! - bias[x]!;
  for (let y = 0; y < height - 1; y++) {
    const next = (y + 1) * width;
    for (let x = 0; x < width; x++) below[x] = arc[next + x]! - bias[next + x]!;
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
