/** The inclination used to deproject: given, or from the axis ratio by Hubble's (1926) formula. */
import { inclinationFromAxisRatio } from '../../physics/index.js';
import type { GeometrySettings } from './settings.js';

export interface ResolvedInclination {
  inclinationDeg: number;
  /** 1-sigma error (deg): the given one, or the axis-ratio error carried through Hubble's formula. */
  inclinationErrDeg: number;
  source: 'given' | 'axis-ratio';
}

export function resolveInclination(s: GeometrySettings): ResolvedInclination {
  if (s.inclinationDeg !== undefined) return { inclinationDeg: s.inclinationDeg, inclinationErrDeg: s.inclinationErrDeg, source: 'given' };
  const q = s.axisRatio!;
  const q0 = s.intrinsicThickness;
  const inclinationDeg = inclinationFromAxisRatio(q, q0);
  let fromQ = 0;
  if (s.axisRatioErr !== undefined && s.axisRatioErr > 0) {
    // Half the spread over q +- sigma_q (the formula is clamped at q0 and at 1, so no derivative there).
    const dq = s.axisRatioErr;
    const hi = inclinationFromAxisRatio(Math.max(1e-9, Math.min(1, q - dq)), q0);
    const lo = inclinationFromAxisRatio(Math.min(1, q + dq), q0);
    fromQ = (hi - lo) / 2;
  }
  return { inclinationDeg, inclinationErrDeg: Math.hypot(s.inclinationErrDeg, fromQ), source: 'axis-ratio' };
}
