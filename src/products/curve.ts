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
  /** Index into LineTable.bins; rows as there (internal, 0-based, inclusive; yCentre flux-weighted, fractional). */
  bin: number;
  rowStart: number;
  rowEnd: number;
  yCentre: number;
  /** Line-of-sight velocity (km/s), error-weighted over the lines of the bin. */
  vLos: number;
  vLosErr: number;
  /** OR of the LINE_FLAGS bits of the lines used. */
  flags: number;
}

export interface VelocityTable {
  points: VelocityPoint[];
  /** Per measurement (same order as LineTable.measurements): v_los and error. */
  perLine: { vLos: number; vLosErr: number }[];
  barycentric: BarycentricInfo;
  convention: VelocityConvention;
}

/** The geometry used to deproject the velocities (angles in degrees, east of north for PAs). */
export interface Geometry {
  inclinationDeg: number;
  /** 1-sigma inclination error used for err_inclination (0 when none was given). */
  inclinationErrDeg: number;
  /** Where the inclination came from: given, or Hubble (1926) from the axis ratio. */
  inclinationSource: 'given' | 'axis-ratio';
  /** Axis ratio b/a and intrinsic thickness q0 when the inclination came from them. */
  axisRatio?: number;
  intrinsicThickness?: number;
  /** Position angles of the major axis and of the slit (deg, east of north). */
  majorAxisPaDeg: number;
  slitPaDeg: number;
  /** Slit position angle minus major-axis position angle (deg). */
  slitToMajorDeg: number;
  /** Distance (Mpc), plate scale along the slit (arcsec per pixel) and the kpc per arcsec at that distance. */
  distanceMpc: number;
  arcsecPerPixel: number;
  kpcPerArcsec: number;
}

/** Why a point of the position-velocity curve was left out of the fold. */
export type PvExclusion = 'invalid' | 'flagged' | 'centre' | 'minor-axis';

/** One velocity bin along the slit, placed in the disk. */
export interface PvPoint {
  bin: number;
  /** Internal row of the bin centre (0-based, fractional). */
  yCentre: number;
  /** Sky offset along the slit from the kinematic centre, arcsec (positive towards increasing row). */
  offsetArcsec: number;
  /** Line-of-sight velocity (km/s, optical, barycentric) and its error. */
  vLos: number;
  vLosErr: number;
  /** Deprojected radius (arcsec) and azimuth in the disk plane from the receding major axis (deg). */
  radiusArcsec: number;
  azimuthDeg: number;
  /** |sin i cos theta|: the factor that turns rotation into line-of-sight velocity. */
  projection: number;
  /** Rotation speed of this point alone (km/s), NaN when excluded. */
  vRot: number;
  vRotErr: number;
  side: 'approaching' | 'receding';
  flags: number;
  /** Null when the point is used in the fold. */
  exclusion: PvExclusion | null;
}

/** One radial bin of the folded rotation curve. Velocities km/s, radii in the disk plane. */
export interface CurvePoint {
  /** Error-weighted mean in-plane radius of the points in the bin (arcsec, kpc). */
  rArcsec: number;
  rKpc: number;
  /** Error-weighted mean of both sides. */
  vRot: number;
  /** Statistical error of vRot: 1 / sqrt(sum of weights). */
  errStat: number;
  /** Asymmetry and inclination errors in quadrature. */
  errSys: number;
  /** Statistical and systematic errors in quadrature. */
  errTotal: number;
  /** Half the difference between the sides at the same radius (common practice; the slope over the gap between their mean radii removed); 0 when one-sided. */
  errAsymmetry: number;
  /** vRot cot(i) sigma_i (sigma_i in radians). */
  errInclination: number;
  /** Error-weighted mean of each side and its statistical error (NaN when the side is empty). */
  vApproaching: number;
  vApproachingErr: number;
  vReceding: number;
  vRecedingErr: number;
  nApproaching: number;
  nReceding: number;
  /** True when only one side contributes. */
  oneSided: boolean;
  /** True inside two seeing FWHM of the centre, where beam smearing lowers V (common practice). */
  beamSmeared: boolean;
}

/** The continuum along the slit folded about the kinematic centre, on a one-pixel grid. */
export interface LightPoint {
  /** In-plane radius (arcsec, kpc), deprojected like the curve. */
  rArcsec: number;
  rKpc: number;
  /** Folded continuum flux (electrons per pixel per row): mean of the sides, or the one side there is. */
  flux: number;
  /** Each side's flux, NaN where the slit does not reach. */
  fluxApproaching: number;
  fluxReceding: number;
  oneSided: boolean;
}

/** Enclosed mass and slope at one radius of the curve. */
export interface DynamicsPoint {
  rKpc: number;
  /** M(<R) = V^2 R / G (solar masses) and its error from err_total (2 V R sigma_V / G). */
  massMsun: number;
  massErrMsun: number;
  /** d ln V / d ln R from a weighted line through the point and its neighbours; NaN at the ends. */
  logSlope: number;
  logSlopeErr: number;
}

export type CurveShape = 'rising' | 'flat' | 'declining' | 'keplerian' | 'undetermined';

/** How the kinematic centre and the systemic velocity were found. */
export interface SymmetryFit {
  /** Reduced chi-square of the fold about the best centre (near 1 for a symmetric disk). */
  chi2Reduced: number;
  /** Points compared with the mirrored other side. */
  nCompared: number;
  /** Points left out of the centre fit for being more than 5 robust sigmas off their mirror (still folded). */
  nDropped: number;
  /**
   * Error method: parametric bootstrap (Gaussian noise of the stated errors added to every point,
   * the fit repeated; seeded), scaled by sqrt(chi2Reduced) when that exceeds 1.
   */
  errorMethod: 'bootstrap';
  /** Starting row from the continuum peak (internal, fractional). */
  startRow: number;
}

export interface RotationCurve {
  /** Convention and frame of every velocity here, as the velocity stage made them. */
  convention: VelocityConvention;
  velocityFrame: BarycentricInfo['frame'];
  /** Systemic velocity (km/s, in that convention and frame) and its error. */
  vSys: number;
  vSysErr: number;
  /** Kinematic centre, internal row (fractional), and its error (rows). */
  centreRow: number;
  centreRowErr: number;
  centreSource: 'fitted' | 'given';
  vSysSource: 'fitted' | 'given';
  symmetry: SymmetryFit | null;
  /** +1 when the receding side lies towards increasing row, -1 otherwise. */
  recedingSense: 1 | -1;
  geometry: Geometry;
  pv: PvPoint[];
  points: CurvePoint[];
  /** Bin edges used for the fold (in-plane radius, arcsec), and whether they were given or chosen. */
  binEdgesArcsec: number[];
  binSource: 'given' | 'data';
  light: LightPoint[];
  dynamics: DynamicsPoint[];
  shape: CurveShape;
  /** Weighted d ln V / d ln R over the outer half of the curve and its error. */
  outerLogSlope: number;
  outerLogSlopeErr: number;
  /** One sentence on what the shape says about the mass, for the report. */
  shapeSummary: string;
  /** Outer velocity: error-weighted mean of the outermost three points (km/s), and its error. */
  vOuter: number;
  vOuterErr: number;
}
