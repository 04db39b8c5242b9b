/** What the outer slope of the curve says about the mass (thresholds in settings.ts). */
import type { CurveShape } from '../../products/curve.js';
import type { DynamicsSettings } from './settings.js';
import type { SlopeFit } from './log-slope.js';

/** Keplerian fall-off of a point mass: V proportional to R^-1/2. */
const KEPLERIAN_SLOPE = -0.5;

export function classifyShape(outer: SlopeFit, s: DynamicsSettings): CurveShape {
  const { slope, slopeErr } = outer;
  if (!Number.isFinite(slope) || !(slopeErr <= s.maxSlopeErr)) return 'undetermined';
  if (Math.abs(slope) <= s.flatSlope) return 'flat';
  if (slope > 0) return 'rising';
  if (Math.abs(slope - KEPLERIAN_SLOPE) <= Math.max(s.keplerianTolerance, 2 * slopeErr) || slope < KEPLERIAN_SLOPE) return 'keplerian';
  return 'declining';
}

export const SHAPE_SENTENCES: Record<CurveShape, string> = {
  rising: 'rising: the curve has not turned over, so the slit has not reached the radius that encloses most of the mass',
  flat: 'flat: the radius is still inside most of the mass (the enclosed mass keeps growing in proportion to radius)',
  declining: 'declining, but more slowly than Keplerian: the enclosed mass grows more slowly than the radius',
  keplerian: 'declining towards Keplerian: outside most of the mass',
  undetermined: 'undetermined: too few or too uncertain outer points to tell the shape',
};
