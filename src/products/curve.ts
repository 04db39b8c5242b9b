/** Velocities, geometry and the folded rotation curve. Velocities: km/s, optical cz, barycentric. */

export type VelocityConvention = 'optical' | 'relativistic';

export interface BarycentricInfo {
  /** Exposure-weighted correction applied (km/s), combined multiplicatively with the redshift. */
  correctionKms: number;
  /** Per exposure: path, mid-exposure time (UTC ISO), correction. */
  exposures: { path: string; midTimeUtc: string; correctionKms: number; exptimeS: number }[];
  /** Largest minus smallest correction among the exposures (km/s). */
  spreadKms: number;
  frame: 'barycentric' | 'heliocentric';
}

export interface VelocityPoint {
  bin: number;
  rowStart: number;
  rowEnd: number;
  yCentre: number;
  /** Line-of-sight velocity (km/s), error-weighted over the lines of the bin. */
  vLos: number;
  vLosErr: number;
  flags: number;
}

export interface VelocityTable {
  points: VelocityPoint[];
  /** Per measurement (same order as LineTable.measurements): v_los and error. */
  perLine: { vLos: number; vLosErr: number }[];
  barycentric: BarycentricInfo;
  convention: VelocityConvention;
}

export interface Geometry {
  inclinationDeg: number;
  inclinationErrDeg: number;
  /** Where the inclination came from: given, or Hubble (1926) from the axis ratio. */
  inclinationSource: 'given' | 'axis-ratio';
  majorAxisPaDeg: number;
  slitPaDeg: number;
  distanceMpc: number;
  arcsecPerPixel: number;
  kpcPerArcsec: number;
}

export interface PvPoint {
  bin: number;
  /** Sky offset along the slit from the kinematic centre, arcsec (positive towards increasing row). */
  offsetArcsec: number;
  vLos: number;
  vLosErr: number;
  /** Deprojected radius (arcsec) and azimuth in the disk plane (deg). */
  radiusArcsec: number;
  azimuthDeg: number;
  /** Rotation speed of this point alone, or NaN when excluded. */
  vRot: number;
  vRotErr: number;
  side: 'approaching' | 'receding';
  excluded: boolean;
}

export interface CurvePoint {
  rArcsec: number;
  rKpc: number;
  vRot: number;
  errStat: number;
  /** Asymmetry between the sides and the inclination error, in quadrature. */
  errSys: number;
  errTotal: number;
  errAsymmetry: number;
  errInclination: number;
  vApproaching: number;
  vReceding: number;
  nApproaching: number;
  nReceding: number;
  /** True when only one side contributes. */
  oneSided: boolean;
}

export interface LightPoint {
  rArcsec: number;
  rKpc: number;
  /** Folded continuum flux (electrons per pixel per row), mean of the sides. */
  flux: number;
  fluxApproaching: number;
  fluxReceding: number;
}

export interface DynamicsPoint {
  rKpc: number;
  massMsun: number;
  massErrMsun: number;
  /** d ln V / d ln R; NaN at the ends. */
  logSlope: number;
}

export type CurveShape = 'rising' | 'flat' | 'declining' | 'keplerian' | 'undetermined';

export interface RotationCurve {
  vSys: number;
  vSysErr: number;
  /** Kinematic centre, internal row (fractional), and its error. */
  centreRow: number;
  centreRowErr: number;
  centreSource: 'fitted' | 'given';
  vSysSource: 'fitted' | 'given';
  geometry: Geometry;
  pv: PvPoint[];
  points: CurvePoint[];
  light: LightPoint[];
  dynamics: DynamicsPoint[];
  shape: CurveShape;
  /** Outer velocity: error-weighted mean of the outermost points (km/s). */
  vOuter: number;
}
