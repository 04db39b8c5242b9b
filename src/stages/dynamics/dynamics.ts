/**
 * Dynamical diagnostics of a folded curve: enclosed mass M(<R) = V^2 R / G with its error
 * 2 V R sigma_V / G (sigma_V = err_total), local d ln V / d ln R (weighted line through each point
 * and its two neighbours; NaN at the ends), and the shape from the outer slope.
 */
import { G_KPC_KMS2_PER_MSUN, enclosedMassMsun } from '../../physics/index.js';
import type { CurvePoint, DynamicsPoint, RotationCurve } from '../../products/curve.js';
import { DiagnosticLog, type Diagnostic } from '../../diagnostics.js';
import { DEFAULT_DYNAMICS_SETTINGS, type DynamicsSettings } from './settings.js';
import { fitLogSlope } from './log-slope.js';
import { SHAPE_SENTENCES, classifyShape } from './shape.js';

/** The curve's dynamics fields as the RotationCurve product holds them, and the diagnostics. */
export interface DynamicsResult extends Pick<RotationCurve, 'dynamics' | 'shape' | 'outerLogSlope' | 'outerLogSlopeErr' | 'shapeSummary'> {
  diagnostics: Diagnostic[];
}

/** Error for slopes: statistical and asymmetry only, as the inclination error scales all V alike. */
function slopeErr(p: CurvePoint): number {
  return Math.hypot(p.errStat, p.errAsymmetry);
}

export function computeDynamics(points: CurvePoint[], settings: DynamicsSettings = DEFAULT_DYNAMICS_SETTINGS): DynamicsResult {
  const log = new DiagnosticLog('dynamics');
  const sorted = [...points].sort((a, b) => a.rKpc - b.rKpc);
  const dynamics = sorted.map((p, k): DynamicsPoint => {
    const massMsun = enclosedMassMsun(p.vRot, p.rKpc);
    const massErrMsun = (2 * Math.abs(p.vRot) * p.errTotal * p.rKpc) / G_KPC_KMS2_PER_MSUN;
    let local = { slope: NaN, slopeErr: NaN };
    if (k > 0 && k < sorted.length - 1) {
      const three = sorted.slice(k - 1, k + 2);
      local = fitLogSlope(three.map((q) => q.rKpc), three.map((q) => q.vRot), three.map(slopeErr));
    }
    return { rKpc: p.rKpc, massMsun, massErrMsun, logSlope: local.slope, logSlopeErr: local.slopeErr };
  });
  const rMax = sorted.length > 0 ? sorted[sorted.length - 1]!.rKpc : 0;
  let outer = sorted.filter((p) => p.rKpc >= settings.outerFraction * rMax && !p.beamSmeared);
  if (outer.length < 3) outer = sorted.filter((p) => !p.beamSmeared).slice(-3);
  const fit = outer.length >= 3 ? fitLogSlope(outer.map((p) => p.rKpc), outer.map((p) => p.vRot), outer.map(slopeErr)) : { slope: NaN, slopeErr: NaN };
  const shape = classifyShape(fit, settings);
  if (shape === 'undetermined') {
    log.info('shape-undetermined', `the outer slope is not determined well enough to classify the curve (${outer.length} outer points)`, {
      expected: `slope error <= ${settings.maxSlopeErr}`,
      actual: Number.isFinite(fit.slopeErr) ? fit.slopeErr.toFixed(3) : 'no fit',
    });
  }
  return { dynamics, shape, outerLogSlope: fit.slope, outerLogSlopeErr: fit.slopeErr, shapeSummary: SHAPE_SENTENCES[shape], diagnostics: log.items };
}
