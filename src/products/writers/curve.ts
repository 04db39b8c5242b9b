/**
 * curve.csv, curve.json and curve.fits: the folded rotation curve, one line per radial bin, from
 * one column list so the three files agree. Radii are in-plane (deprojected); velocities km/s in
 * the curve's convention and frame (optical, barycentric unless it says otherwise). Pure
 * formatters: text, a JSON object and a binary-table HDU spec; no I/O, no timestamps.
 */
import { Header } from '../../fits/header.js';
import type { TableHduSpec } from '../../fits/write-types.js';
import type { CurvePoint, DynamicsPoint, RotationCurve } from '../curve.js';
import { csvText, exponent, fixed, jsonNumber } from './text-table.js';

interface CurveColumn {
  name: string;
  unit: string;
  /** Decimals in CSV; 'exp' for exponent form with 4 decimals. */
  digits: number | 'exp';
  kind: 'number' | 'count' | 'flag';
  get: (p: CurvePoint, d: DynamicsPoint | undefined) => number | boolean;
}

const COLUMNS: CurveColumn[] = [
  { name: 'r_arcsec', unit: 'arcsec', digits: 3, kind: 'number', get: (p) => p.rArcsec },
  { name: 'r_kpc', unit: 'kpc', digits: 4, kind: 'number', get: (p) => p.rKpc },
  { name: 'v_rot', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.vRot },
  { name: 'err_stat', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.errStat },
  { name: 'err_sys', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.errSys },
  { name: 'err_total', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.errTotal },
  { name: 'n_approaching', unit: '', digits: 0, kind: 'count', get: (p) => p.nApproaching },
  { name: 'n_receding', unit: '', digits: 0, kind: 'count', get: (p) => p.nReceding },
  { name: 'v_approaching', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.vApproaching },
  { name: 'v_approaching_err', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.vApproachingErr },
  { name: 'v_receding', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.vReceding },
  { name: 'v_receding_err', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.vRecedingErr },
  { name: 'err_asymmetry', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.errAsymmetry },
  { name: 'err_inclination', unit: 'km/s', digits: 2, kind: 'number', get: (p) => p.errInclination },
  { name: 'one_sided', unit: '', digits: 0, kind: 'flag', get: (p) => p.oneSided },
  { name: 'beam_smeared', unit: '', digits: 0, kind: 'flag', get: (p) => p.beamSmeared },
  { name: 'mass_msun', unit: 'solMass', digits: 'exp', kind: 'number', get: (_p, d) => d?.massMsun ?? NaN },
  { name: 'mass_err_msun', unit: 'solMass', digits: 'exp', kind: 'number', get: (_p, d) => d?.massErrMsun ?? NaN },
  { name: 'log_slope', unit: '', digits: 3, kind: 'number', get: (_p, d) => d?.logSlope ?? NaN },
];

/** The dynamics point at each curve point's radius (computeDynamics keeps one per point). */
function dynamicsFor(curve: RotationCurve): (DynamicsPoint | undefined)[] {
  return curve.points.map((p) => curve.dynamics.find((d) => d.rKpc === p.rKpc));
}

function describe(curve: RotationCurve): string[] {
  const g = curve.geometry;
  return [
    `whorl folded rotation curve: one line per radial bin; radii in the disk plane (deprojected)`,
    `velocities: km/s, ${curve.convention} convention, ${curve.velocityFrame}; v_rot = (v_los - v_sys)_rel / |sin i cos theta|`,
    `v_sys ${fixed(curve.vSys, 2)} +- ${fixed(curve.vSysErr, 2)} km/s (${curve.vSysSource}); kinematic centre at row ${fixed(curve.centreRow + 1, 2)} +- ${fixed(curve.centreRowErr, 2)} (1-based, ${curve.centreSource})`,
    `inclination ${fixed(g.inclinationDeg, 2)} +- ${fixed(g.inclinationErrDeg, 2)} deg (${g.inclinationSource === 'given' ? 'given' : `Hubble 1926 from b/a = ${g.axisRatio}, q0 = ${g.intrinsicThickness}`}); major axis PA ${fixed(g.majorAxisPaDeg, 2)} deg, slit PA ${fixed(g.slitPaDeg, 2)} deg`,
    `distance ${fixed(g.distanceMpc, 3)} Mpc (${fixed(g.kpcPerArcsec, 6)} kpc/arcsec); plate scale ${fixed(g.arcsecPerPixel, 4)} arcsec/pixel`,
    `errors: err_stat = 1/sqrt(sum of weights); err_asymmetry = half the difference of the sides at the same radius (common practice; 0 when one-sided); err_inclination = v_rot cot(i) sigma_i; err_sys = asymmetry and inclination in quadrature; err_total = stat and sys in quadrature`,
    `mass_msun = v_rot^2 r / G (spherical); log_slope = d ln V / d ln R; shape: ${curve.shapeSummary}`,
  ];
}

export function curveCsv(curve: RotationCurve): string {
  const dyn = dynamicsFor(curve);
  return csvText(
    describe(curve),
    COLUMNS.map((c) => ({
      name: c.name,
      unit: c.unit,
      cells: curve.points.map((p, k) => {
        const v = c.get(p, dyn[k]);
        if (typeof v === 'boolean') return v ? '1' : '0';
        return c.digits === 'exp' ? exponent(v, 4) : fixed(v, c.digits);
      }),
    })),
  );
}

/** curve.json: the curve, its geometry and v_sys, with a units block naming every column's unit. */
export function curveJson(curve: RotationCurve, extra: Record<string, unknown> = {}): object {
  const dyn = dynamicsFor(curve);
  const g = curve.geometry;
  return {
    ...extra,
    units: Object.fromEntries([...COLUMNS.map((c) => [c.name, c.unit]), ['v_sys', 'km/s'], ['centre_row', 'pixel (1-based)'], ['angles', 'deg'], ['distance', 'Mpc']]),
    convention: curve.convention,
    velocity_frame: curve.velocityFrame,
    v_sys: jsonNumber(curve.vSys),
    v_sys_err: jsonNumber(curve.vSysErr),
    v_sys_source: curve.vSysSource,
    centre_row: jsonNumber(curve.centreRow + 1),
    centre_row_err: jsonNumber(curve.centreRowErr),
    centre_source: curve.centreSource,
    symmetry: curve.symmetry && { chi2_reduced: jsonNumber(curve.symmetry.chi2Reduced), n_compared: curve.symmetry.nCompared, n_dropped: curve.symmetry.nDropped, error_method: curve.symmetry.errorMethod },
    geometry: {
      inclination: g.inclinationDeg,
      inclination_err: g.inclinationErrDeg,
      inclination_source: g.inclinationSource,
      ...(g.axisRatio !== undefined ? { axis_ratio: g.axisRatio, intrinsic_thickness: g.intrinsicThickness } : {}),
      major_axis_pa: g.majorAxisPaDeg,
      slit_pa: g.slitPaDeg,
      distance: g.distanceMpc,
      kpc_per_arcsec: g.kpcPerArcsec,
      arcsec_per_pixel: g.arcsecPerPixel,
    },
    asymmetry_convention: 'half the difference of the two sides (common practice)',
    bin_edges_arcsec: curve.binEdgesArcsec,
    bin_source: curve.binSource,
    shape: curve.shape,
    shape_summary: curve.shapeSummary,
    outer_log_slope: jsonNumber(curve.outerLogSlope),
    outer_log_slope_err: jsonNumber(curve.outerLogSlopeErr),
    v_outer: jsonNumber(curve.vOuter),
    v_outer_err: jsonNumber(curve.vOuterErr),
    points: curve.points.map((p, k) =>
      Object.fromEntries(COLUMNS.map((c) => {
        const v = c.get(p, dyn[k]);
        return [c.name, typeof v === 'boolean' ? v : jsonNumber(v)];
      })),
    ),
  };
}

/** curve.fits: a CURVE binary table (TUNITn per column), geometry, distance and v_sys in header cards. */
export function curveTableHdu(curve: RotationCurve): TableHduSpec {
  const dyn = dynamicsFor(curve);
  const g = curve.geometry;
  const h = new Header();
  // FITS cards cannot hold NaN: a value that is not finite is left out.
  const num = (key: string, v: number, comment: string): Header => (Number.isFinite(v) ? h.set(key, v, comment) : h);
  num('VSYS', curve.vSys, '[km/s] systemic velocity');
  num('VSYSERR', curve.vSysErr, '[km/s] error of VSYS');
  num('CENTROW', curve.centreRow + 1, '[pixel] kinematic centre, 1-based row');
  num('CENTERR', curve.centreRowErr, '[pixel] error of CENTROW');
  num('VOUTER', curve.vOuter, '[km/s] mean of the outermost 3 points');
  h
    .set('VSYSSRC', curve.vSysSource, 'VSYS fitted by symmetry or given')
    .set('VELCONV', curve.convention, 'velocity convention (optical: cz)')
    .set('SPECSYS', curve.velocityFrame === 'barycentric' ? 'BARYCENT' : 'HELIOCEN', 'velocity frame (WCS Paper III)')
    .set('INCLIN', g.inclinationDeg, '[deg] inclination')
    .set('INCLERR', g.inclinationErrDeg, '[deg] inclination error used')
    .set('INCLSRC', g.inclinationSource, 'given, or Hubble (1926) from the axis ratio')
    .set('MAJPA', g.majorAxisPaDeg, '[deg] major-axis position angle')
    .set('SLITPA', g.slitPaDeg, '[deg] slit position angle')
    .set('DISTMPC', g.distanceMpc, '[Mpc] distance')
    .set('KPCASEC', g.kpcPerArcsec, '[kpc/arcsec] scale at DISTMPC')
    .set('PIXSCALE', g.arcsecPerPixel, '[arcsec/pixel] along the slit')
    .set('SHAPE', curve.shape, 'shape of the outer curve');
  if (g.axisRatio !== undefined) h.set('AXRATIO', g.axisRatio, 'b/a behind INCLIN').set('THICK', g.intrinsicThickness ?? 0.2, 'intrinsic thickness q0');
  h.comment('Radii in the disk plane; err_asymmetry is half the difference of the sides (common practice).');
  return {
    kind: 'bintable',
    name: 'CURVE',
    header: h,
    columns: COLUMNS.map((c) => {
      const values = curve.points.map((p, k) => c.get(p, dyn[k]));
      if (c.kind === 'flag') return { name: c.name, format: 'L' as const, values: values as boolean[] };
      return { name: c.name, format: c.kind === 'count' ? ('J' as const) : ('D' as const), ...(c.unit !== '' ? { unit: c.unit } : {}), values: Float64Array.from(values as number[]) };
    }),
  };
}
