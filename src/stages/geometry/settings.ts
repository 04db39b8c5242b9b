/**
 * Settings of the geometry stage (kinematic centre, deprojection, fold). Angles in degrees,
 * position angles east of north; velocities km/s (optical, barycentric); rows internal 0-based.
 */
import { InputError } from '../../errors.js';
import { LINE_FLAGS } from '../../products/lines.js';

export interface GeometrySettings {
  /** Plate scale along the slit, arcsec per (unbinned internal) row. Required, > 0. */
  arcsecPerPixel: number;
  /** Distance of the galaxy, Mpc. Required, > 0. */
  distanceMpc: number;
  /** Inclination (deg, 0 face-on, 90 edge-on). Either this or `axisRatio` must be given. */
  inclinationDeg?: number;
  /** Apparent axis ratio b/a (0..1]; the inclination then follows from Hubble (1926). */
  axisRatio?: number;
  /** 1-sigma error of `axisRatio`, propagated into the inclination error when given. */
  axisRatioErr?: number;
  /** Intrinsic thickness q0 of the disk for Hubble's formula. Default 0.2 (common practice). */
  intrinsicThickness: number;
  /**
   * 1-sigma inclination error (deg) behind err_inclination. Default 0: whorl does not invent an
   * uncertainty for an inclination the user gave; a diagnostic says when it is zero.
   */
  inclinationErrDeg: number;
  majorAxisPaDeg: number;
  slitPaDeg: number;
  /** Fixes the systemic velocity (km/s, optical, barycentric) instead of fitting it. */
  systemicVelocityKms?: number;
  /** Fixes the kinematic centre (internal 0-based row, fractional) instead of fitting it. */
  centreRow?: number;
  /**
   * Points with |cos theta| below this (theta: in-plane azimuth from the major axis) are left out.
   * Default 0.3, about 17 deg either side of the minor axis, where 1/cos theta > 3.3 magnifies the
   * errors and any non-circular motion (common practice: an exclusion wedge about the minor axis).
   */
  minCosTheta: number;
  /** Edges of the radial bins (in-plane radius, arcsec), increasing. Default: chosen from the data (see bins.ts). */
  radialBinsArcsec?: number[];
  /** Seeing FWHM (arcsec): points inside two FWHM are flagged as beam-smeared (common practice). */
  seeingFwhmArcsec?: number;
  /** How far (rows) from the continuum peak the symmetry search for the centre goes. Default 8. */
  centreSearchRows: number;
  /** Line flags (LINE_FLAGS bits) that leave a velocity point out of the fit and fold. Default notConverged. */
  rejectFlags: number;
}

export const DEFAULT_GEOMETRY_SETTINGS = {
  intrinsicThickness: 0.2,
  inclinationErrDeg: 0,
  minCosTheta: 0.3,
  centreSearchRows: 8,
  rejectFlags: LINE_FLAGS.notConverged,
} satisfies Partial<GeometrySettings>;

/** What a caller must give: the four required fields; the rest default (DEFAULT_GEOMETRY_SETTINGS). */
export type GeometryInput = Pick<GeometrySettings, 'arcsecPerPixel' | 'distanceMpc' | 'majorAxisPaDeg' | 'slitPaDeg'> & Partial<GeometrySettings>;

/** Fill defaults into what the user gave and check every field; throws InputError naming the setting. */
export function resolveGeometrySettings(given: GeometryInput): Readonly<GeometrySettings> {
  const s: GeometrySettings = { ...DEFAULT_GEOMETRY_SETTINGS, ...given };
  positive('arcsecPerPixel', s.arcsecPerPixel);
  positive('distanceMpc', s.distanceMpc);
  finite('majorAxisPaDeg', s.majorAxisPaDeg);
  finite('slitPaDeg', s.slitPaDeg);
  if (s.inclinationDeg === undefined && s.axisRatio === undefined) {
    throw new InputError('settings.missing', 'the inclination is needed to deproject the velocities', { key: 'inclinationDeg' }, {
      expected: 'inclinationDeg (deg) or axisRatio (b/a)',
    });
  }
  if (s.inclinationDeg !== undefined && !(s.inclinationDeg > 0 && s.inclinationDeg <= 90)) bad('inclinationDeg', 'a number in (0, 90]', s.inclinationDeg);
  if (s.axisRatio !== undefined && !(s.axisRatio > 0 && s.axisRatio <= 1)) bad('axisRatio', 'a number in (0, 1]', s.axisRatio);
  if (s.axisRatioErr !== undefined && !(s.axisRatioErr >= 0)) bad('axisRatioErr', 'a number >= 0', s.axisRatioErr);
  if (!(s.intrinsicThickness >= 0 && s.intrinsicThickness < 1)) bad('intrinsicThickness', 'a number in [0, 1)', s.intrinsicThickness);
  if (!(s.inclinationErrDeg >= 0 && s.inclinationErrDeg < 90)) bad('inclinationErrDeg', 'a number in [0, 90)', s.inclinationErrDeg);
  if (s.systemicVelocityKms !== undefined) finite('systemicVelocityKms', s.systemicVelocityKms);
  if (s.centreRow !== undefined) finite('centreRow', s.centreRow);
  if (!(s.minCosTheta >= 0 && s.minCosTheta < 1)) bad('minCosTheta', 'a number in [0, 1)', s.minCosTheta);
  if (s.seeingFwhmArcsec !== undefined && !(s.seeingFwhmArcsec >= 0)) bad('seeingFwhmArcsec', 'a number >= 0', s.seeingFwhmArcsec);
  positive('centreSearchRows', s.centreSearchRows);
  if (!Number.isInteger(s.rejectFlags) || s.rejectFlags < 0) bad('rejectFlags', 'a non-negative integer bit mask', s.rejectFlags);
  if (s.radialBinsArcsec !== undefined) {
    const e = s.radialBinsArcsec;
    const ok = e.length >= 2 && e.every((x, k) => Number.isFinite(x) && x >= 0 && (k === 0 || x > e[k - 1]!));
    if (!ok) bad('radialBinsArcsec', 'at least two increasing, non-negative edges (arcsec)', JSON.stringify(e));
  }
  return Object.freeze(s);
}

function bad(key: string, expected: string, actual: unknown): never {
  throw new InputError('settings.invalid', `invalid geometry setting ${key}`, { key }, { expected, actual: String(actual) });
}
function positive(key: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) bad(key, 'a positive number', v);
}
function finite(key: string, v: number): void {
  if (!Number.isFinite(v)) bad(key, 'a finite number', v);
}
