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

export function dispersionAxisFromArc(arc: Float32Array, width: number, height: number): AxisEvidence {
  let dx = 0;
  let dy = 0;
  for (let y = 0; y < height - 1; y++) {
    const row = y * width;
    for (let x = 0; x < width - 1; x++) {
      const v = arc[row + x]!;
      dx += Math.abs(arc[row + x + 1]! - v);
      dy += Math.abs(arc[row + width + x]! - v);
    }
  }
  const ratio = dy > 0 ? dx / dy : Infinity;
  return { axis: ratio >= 1 ? 'x' : 'y', ratio };
}
