/**
 * The known answer of a simulated run, written as truth.json. Plain JSON: every field is a
 * number, string, boolean, array or object. Conventions: internal pixels (d along the dispersion,
 * wavelength increasing; s along the slit) are 0-based centres in the trimmed data section, as in
 * src/products/frame.ts; wavelengths Angstrom in standard air; velocities km/s, optical cz,
 * barycentric unless a field says otherwise.
 */
import { evalLegendre1D, type Legendre1D } from '../kernels/legendre.js';
import { SPEED_OF_LIGHT_KMS } from '../physics/constants.js';
import { diskCoordinates } from '../physics/disk.js';
import type { Orientation } from '../products/frame.js';

export interface DetectorTruth {
  /** Electrons per ADU. */
  gainEPerAdu: number;
  /** Read noise, electrons RMS per pixel. */
  readNoiseE: number;
  /** Mean bias level, ADU (each frame adds its own `biasOffsetAdu`). */
  biasLevelAdu: number;
  /** Amplitude of the fixed row pattern of the bias (raw rows), ADU; the same in every frame. */
  rowPatternAmplitudeAdu: number;
  /** Largest raw value the converter writes, ADU; pixels at this value are saturated. */
  saturationAdu: number;
  /** Whole raw frame (data + overscan), pixels. */
  rawWidth: number;
  rawHeight: number;
  /** FITS sections as written in DATASEC / BIASSEC (1-based, inclusive, `[x1:x2,y1:y2]`). */
  dataSection: string;
  overscanSection: string;
  /** Hot columns: 0-based x in the trimmed data section (raw orientation). */
  hotColumns: number[];
  /** Extra electrons a hot-column pixel collects: offset + rate x exposure time. */
  hotColumnOffsetE: number;
  hotColumnRateEPerS: number;
  /** RMS of the pixel-to-pixel sensitivity (fraction, ~0.01); the map itself is in the flats. */
  pixelSensitivityRms: number;
}

export interface SetupTruth {
  name: string;
  detector: DetectorTruth;
  /** Internal -> raw trimmed mapping, exactly as src/products/frame.ts `Orientation`. */
  orientation: Orientation;
  /** Internal frame size: along the dispersion (d) and along the slit (s). */
  internalWidth: number;
  internalHeight: number;
  /**
   * Wavelength (air, Angstrom) at undistorted dispersion coordinate p: a Legendre series over
   * [0, internalWidth - 1]. At internal pixel (d, s), p = d - lineShiftPx(s): see trueWavelength.
   */
  dispersion: Legendre1D;
  /**
   * Tilt and curvature of lines of constant wavelength along the slit: a line sits at
   * d = p + tiltPxPerRow (s - refRow) + curvaturePxPerRow2 (s - refRow)^2.
   */
  lineShift: { refRow: number; tiltPxPerRow: number; curvaturePxPerRow2: number };
  /** Gaussian LSF sigma (pixels along d): centrePx + edgeExtraPx u^2, u = d normalised to [-1, 1]. */
  lsf: { centrePx: number; edgeExtraPx: number };
  /** Plate scale along the slit, arcsec per pixel. */
  arcsecPerPixel: number;
  /** GRATING and GRTILT keywords written in the headers (deg). */
  grating: string;
  gratingTiltDeg: number;
  /** What run.yaml says (deliberately a little off the truth). */
  approxWavelength: number;
  approxDispersion: number;
}

export interface RotationCurveTruth {
  /** V(R) = vmaxKms (1 - exp(-R / turnoverArcsec)) (1 + (R / declineArcsec)^2)^(-1/4); no decline when declineArcsec is null. */
  vmaxKms: number;
  turnoverArcsec: number;
  declineArcsec: number | null;
}

export interface ExposureTruth {
  frame: string;
  /** Start of exposure as written in DATE-OBS (UTC). */
  dateObs: string;
  exptimeS: number;
  /** Mid-exposure instant, UTC ISO 8601. */
  midExposureUtc: string;
  /** Barycentric correction at mid-exposure, km/s: cz_bary = cz_obs + v + cz_obs v / c. */
  barycentricCorrectionKms: number;
}

export interface TargetTruth {
  /** Name in run.yaml (the galaxy's name, with the setup appended for a second setup). */
  name: string;
  /** OBJECT keyword of its frames. */
  object: string;
  setup: string;
  /** Sky position (J2000): degrees and the sexagesimal strings of the headers. */
  raDeg: number;
  decDeg: number;
  ra: string;
  dec: string;
  /** Systemic velocity, km/s barycentric optical. */
  vSysKms: number;
  inclinationDeg: number;
  majorAxisPaDeg: number;
  slitPaDeg: number;
  distanceMpc: number;
  kpcPerArcsec: number;
  /** Kinematic centre, internal row (fractional, 0-based centre convention). */
  centreRow: number;
  /** Arcsec per internal row; sky offset along the slit = (s - centreRow) x arcsecPerPixel. */
  arcsecPerPixel: number;
  /** Gas velocity dispersion (km/s), added in quadrature to the LSF. */
  gasDispersionKms: number;
  curve: RotationCurveTruth;
  /** Emission: H-alpha electrons per second per row at the centre, exponential scale (in-plane arcsec), clumps along the slit. */
  emission: {
    halphaCentreEPerS: number;
    scaleArcsec: number;
    clumps: { offsetArcsec: number; widthArcsec: number; relative: number }[];
    /** Flux of each line relative to H-alpha (names as in run.yaml). */
    ratios: Record<string, number>;
  };
  /** Stellar continuum: electrons per second per pixel at the centre, exponential scale (arcsec). */
  continuum: { centreEPerSPerPx: number; scaleArcsec: number };
  exposures: ExposureTruth[];
  /** True v_los (km/s barycentric) at each internal row centre 0..internalHeight-1. */
  vLosKms: number[];
  /** The true rotation curve on a grid of in-plane radii. */
  curveGrid: { radiusArcsec: number[]; vRotKms: number[] };
}

export interface CosmicRayTruth {
  /** Hit pixels, 0-based in the trimmed data section, raw orientation; electrons deposited. */
  x: number[];
  y: number[];
  electrons: number[];
}

export interface FrameTruth {
  kind: 'bias' | 'flat' | 'arc' | 'science';
  setup: string;
  target?: string;
  dateObs: string;
  exptimeS: number;
  /** This frame's bias level offset from detector.biasLevelAdu, ADU (the overscan follows it). */
  biasOffsetAdu: number;
  cosmicRays: CosmicRayTruth;
}

export interface RunTruth {
  format: 'whorl-sim-truth';
  version: 1;
  seed: number;
  size: 'small' | 'full';
  variant: string;
  site: { name: string; latitudeDeg: number; longitudeDeg: number; heightM: number };
  telescope: string;
  instrument: string;
  setups: Record<string, SetupTruth>;
  targets: TargetTruth[];
  /** By frame name (`raw/...`). */
  frames: Record<string, FrameTruth>;
}

/** Undistorted dispersion coordinate shift (pixels) of row s. */
export function lineShiftPx(setup: SetupTruth, s: number): number {
  const ds = s - setup.lineShift.refRow;
  return setup.lineShift.tiltPxPerRow * ds + setup.lineShift.curvaturePxPerRow2 * ds * ds;
}

/** Air wavelength (Angstrom) at internal pixel (d, s), 0-based centres in the trimmed section. */
export function trueWavelength(truth: RunTruth, setup: string, d: number, s: number): number {
  const st = truth.setups[setup];
  if (!st) throw new RangeError(`trueWavelength: no setup '${setup}'`);
  return evalLegendre1D(st.dispersion, d - lineShiftPx(st, s));
}

/** Gaussian LSF sigma (pixels) at internal pixel (d, s). */
export function trueLsfSigmaPx(setup: SetupTruth, d: number): number {
  const u = (2 * d) / (setup.internalWidth - 1) - 1;
  return setup.lsf.centrePx + setup.lsf.edgeExtraPx * u * u;
}

/** The true rotation speed (km/s) at in-plane radius R (arcsec). */
export function trueRotation(truth: TargetTruth, radiusArcsec: number): number {
  const c = truth.curve;
  const r = Math.abs(radiusArcsec);
  const rise = c.vmaxKms * (1 - Math.exp(-r / c.turnoverArcsec));
  return c.declineArcsec === null ? rise : rise * Math.pow(1 + (r / c.declineArcsec) ** 2, -0.25);
}

/** Sky offset along the slit (arcsec) of internal row s. */
export function slitOffsetArcsec(truth: TargetTruth, s: number): number {
  return (s - truth.centreRow) * truth.arcsecPerPixel;
}

/**
 * True v_los (km/s barycentric optical) at internal slit row s: the thin-disk projection
 * V(R) sin i cos(theta), measured in the galaxy's rest frame, compounded with the systemic
 * redshift: (1 + z) = (1 + z_sys)(1 + V sin i cos(theta) / c), i.e.
 * v_los = v_sys + V sin i cos(theta) (1 + v_sys / c). So c (z - z_sys) / (1 + z_sys)
 * (REFERENCE.md, "Velocities") gives back V sin i cos(theta) exactly.
 */
export function trueVlos(truth: TargetTruth, s: number): number {
  const p = diskCoordinates(slitOffsetArcsec(truth, s), truth.slitPaDeg - truth.majorAxisPaDeg, truth.inclinationDeg);
  return truth.vSysKms + trueRotation(truth, p.radiusArcsec) * p.projection * (1 + truth.vSysKms / SPEED_OF_LIGHT_KMS);
}
