/**
 * The geometry stage: kinematic centre and systemic velocity by symmetry, deprojection, fold,
 * light profile, and the dynamics of the folded curve.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { StageError } from '../../errors.js';
import { kpcPerArcsec } from '../../physics/index.js';
import type { StageResult } from '../../products/frame.js';
import type { LineTable } from '../../products/lines.js';
import type { Geometry, RotationCurve, VelocityTable } from '../../products/curve.js';
import { computeDynamics } from '../dynamics/index.js';
import { binEdgesFromData } from './bins.js';
import { continuumPeakRow } from './continuum-peak.js';
import { foldCurve } from './fold.js';
import { resolveInclination } from './inclination.js';
import { foldLight } from './light.js';
import { placePoints, recedingSense, usable } from './place.js';
import { resolveGeometrySettings, type GeometryInput } from './settings.js';
import { pvSamples } from './mirror.js';
import { fitSymmetry, OUTLIER_SIGMA } from './symmetry.js';
import { outerVelocity } from './outer-velocity.js';

export function buildRotationCurve(
  velocities: VelocityTable,
  lines: LineTable,
  given: GeometryInput,
): StageResult<RotationCurve> {
  const settings = resolveGeometrySettings(given);
  const log = new DiagnosticLog('geometry');
  const inc = resolveInclination(settings);
  if (inc.inclinationErrDeg === 0) log.info('no-inclination-error', 'no inclination error was given: err_inclination is zero', { expected: 'inclinationErrDeg > 0' });
  if (inc.inclinationDeg < 30) log.warn('low-inclination', `inclination ${inc.inclinationDeg.toFixed(1)} deg: 1/sin(i) magnifies the errors and the inclination error dominates`);
  const geometry: Geometry = {
    inclinationDeg: inc.inclinationDeg,
    inclinationErrDeg: inc.inclinationErrDeg,
    inclinationSource: inc.source,
    ...(inc.source === 'axis-ratio' ? { axisRatio: settings.axisRatio!, intrinsicThickness: settings.intrinsicThickness } : {}),
    majorAxisPaDeg: settings.majorAxisPaDeg,
    slitPaDeg: settings.slitPaDeg,
    slitToMajorDeg: settings.slitPaDeg - settings.majorAxisPaDeg,
    distanceMpc: settings.distanceMpc,
    arcsecPerPixel: settings.arcsecPerPixel,
    kpcPerArcsec: kpcPerArcsec(settings.distanceMpc),
  };

  const good = velocities.points.filter((p) => usable(p, settings.rejectFlags)).sort((a, b) => a.yCentre - b.yCentre);
  if (good.length < 6) {
    const total = velocities.points.length;
    const flagged = velocities.points.filter((p) => Number.isFinite(p.vLos) && (p.flags & settings.rejectFlags) !== 0).length;
    const why = total === 0 ? 'no row bin was measured' : `of ${total} row bins, ${flagged} carry flags that keep them out and ${total - flagged - good.length} have no velocity`;
    throw new StageError(
      'geometry',
      'too-few-points',
      `${good.length} usable velocity points (${why}); at least 6 are needed to fold a curve. Check that the target's frames are science exposures of an emission-line galaxy; if they are, a lower snr_target in the manifest gives more, smaller bins`,
    );
  }
  const samples = pvSamples(
    Float64Array.from(good, (p) => p.yCentre),
    Float64Array.from(good, (p) => p.vLos),
    Float64Array.from(good, (p) => p.vLosErr),
  );
  let startRow = continuumPeakRow(lines.continuumProfile);
  if (startRow === null || startRow < samples.y[0]! || startRow > samples.y[samples.y.length - 1]!) {
    log.warn('no-continuum-peak', 'no continuum peak inside the velocity points: the centre search starts at their middle row');
    startRow = (samples.y[0]! + samples.y[samples.y.length - 1]!) / 2;
  }
  const sym = fitSymmetry(samples, {
    startRow: settings.centreRow ?? startRow,
    searchRows: settings.centreSearchRows,
    ...(settings.centreRow !== undefined ? { fixedCentreRow: settings.centreRow } : {}),
    ...(settings.systemicVelocityKms !== undefined ? { fixedVSysKms: settings.systemicVelocityKms } : {}),
  });
  if (sym === null) throw new StageError('geometry', 'no-symmetric-part', 'fewer than 6 points on both sides of the centre to compare the sides of the curve; the search starts at the continuum peak: fix the centre (centre_row in the manifest) if that is not the kinematic centre');
  if (sym.atSearchEdge) {
    log.warn('centre-at-search-edge', `the most symmetric centre lies at the edge of the search, ${settings.centreSearchRows} rows from the continuum peak`, {
      place: { row: Math.round(sym.centreRow) },
    });
  }
  if (sym.nDropped > 0) log.info('asymmetric-points', `${sym.nDropped} velocity points are more than ${OUTLIER_SIGMA} robust sigmas off their mirror and were left out of the centre fit (they are still folded)`);
  if (sym.chi2Reduced > 3) {
    log.warn('asymmetric', `the two sides of the curve differ by more than their errors (reduced chi-square ${sym.chi2Reduced.toFixed(2)} of the fold)`, {
      expected: 'about 1',
      actual: sym.chi2Reduced.toFixed(2),
    });
  }

  const sense = recedingSense(velocities.points, sym.centreRow, sym.vSysKms, settings.rejectFlags);
  const pv = placePoints(velocities.points, sense, {
    centreRow: sym.centreRow,
    vSysKms: sym.vSysKms,
    geometry,
    minCosTheta: settings.minCosTheta,
    rejectFlags: settings.rejectFlags,
  });
  const minor = pv.filter((p) => p.exclusion === 'minor-axis').length;
  if (minor > 0) log.warn('near-minor-axis', `${minor} points lie within the minor-axis wedge (|cos theta| < ${settings.minCosTheta}) and are left out`);
  const edges = settings.radialBinsArcsec ? [...settings.radialBinsArcsec] : binEdgesFromData(pv);
  const points = foldCurve(pv, edges, geometry, settings.seeingFwhmArcsec);
  if (points.length === 0) throw new StageError('geometry', 'empty-curve', 'no velocity point falls into a radial bin');
  const oneSided = points.filter((p) => p.oneSided).length;
  if (oneSided > 0) log.info('one-sided', `${oneSided} of ${points.length} radial bins have one side only`);

  const dyn = computeDynamics(points);
  const outer = outerVelocity(points);
  return {
    product: {
      convention: velocities.convention,
      velocityFrame: velocities.barycentric.frame,
      vSys: sym.vSysKms,
      vSysErr: sym.vSysErrKms,
      centreRow: sym.centreRow,
      centreRowErr: sym.centreRowErr,
      centreSource: settings.centreRow !== undefined ? 'given' : 'fitted',
      vSysSource: settings.systemicVelocityKms !== undefined ? 'given' : 'fitted',
      symmetry: { chi2Reduced: sym.chi2Reduced, nCompared: sym.nCompared, nDropped: sym.nDropped, errorMethod: 'bootstrap', startRow },
      recedingSense: sense,
      geometry,
      pv,
      points,
      binEdgesArcsec: edges,
      binSource: settings.radialBinsArcsec ? 'given' : 'data',
      light: foldLight(lines.continuumProfile, sym.centreRow, sense, geometry),
      dynamics: dyn.dynamics,
      shape: dyn.shape,
      outerLogSlope: dyn.outerLogSlope,
      outerLogSlopeErr: dyn.outerLogSlopeErr,
      shapeSummary: dyn.shapeSummary,
      vOuter: outer.v,
      vOuterErr: outer.err,
    },
    diagnostics: [...log.items, ...dyn.diagnostics],
  };
}
