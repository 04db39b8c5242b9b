/**
 * The fictional scenario: an invented site, telescope, instrument and galaxies, and the numbers
 * of each setup and size. Everything here is a choice of ours, not a measurement of anything real.
 */
import type { SimSize, SimVariant } from './options.js';

export const SITE = { name: 'Greyfell Ridge Observatory', latitudeDeg: -27.431, longitudeDeg: -68.826, heightM: 3950 };
export const TELESCOPE = 'Greyfell 2.3m';
export const INSTRUMENT = 'Skein long-slit spectrograph';

/**
 * Invented galaxy names (no catalogue designations) and sky positions, in the order they are
 * observed: each right ascension is near the local sidereal time of its block in the night, so
 * every target is observed close to the meridian.
 */
export const GALAXIES = [
  { name: 'Halden Spiral', ra: '10:08:41.20', dec: '-18:44:07.0' },
  { name: 'Orrin Disk', ra: '11:19:15.62', dec: '-31:10:52.4' },
  { name: 'Maelis Galaxy', ra: '12:30:03.05', dec: '-07:25:30.9' },
  { name: 'Serrat Wheel', ra: '13:41:57.81', dec: '-42:03:11.6' },
  { name: 'Vantor Spiral', ra: '14:52:29.44', dec: '-22:47:45.2' },
  { name: 'Quillon Disk', ra: '16:03:48.90', dec: '-12:58:03.3' },
  { name: 'Emberly Galaxy', ra: '17:14:36.17', dec: '-35:36:20.8' },
  { name: 'Tamsin Spiral', ra: '18:25:12.73', dec: '-26:14:59.1' },
] as const;

/** Start of the night's first calibration (UTC); April 2019 at the site's longitude. */
export const NIGHT_START_UTC = Date.UTC(2019, 3, 12, 23, 20, 0);

/** Detector and optics of one size. */
export interface SizeSpec {
  /** Internal frame: along the dispersion and along the slit. */
  dispersionPx: number;
  slitPx: number;
  overscanPx: number;
  arcsecPerPixel: number;
  /** Per setup: central wavelength at the detector centre (A) and mean dispersion (A/px). */
  centralAngstrom: [number, number];
  dispersionAngstromPerPx: number;
  /** Legendre P2, P3 coefficients of the dispersion, A (the non-linearity). */
  nonlinearAngstrom: [number, number];
  /** Line tilt and curvature over the whole slit, pixels. */
  tiltOverSlitPx: number;
  curvatureOverSlitPx: number;
  lsfCentrePx: number;
  lsfEdgeExtraPx: number;
  hotColumns: number;
  /** Electrons per second per pixel of the sky continuum, per row. */
  skyContinuumEPerSPerPx: number;
  /** Electrons per second per row of a sky line of catalogue intensity 100. */
  skyLineEPerSPer100: number;
  /** Electrons per second per row of the H-alpha line at the galaxy centre (standard variant). */
  halphaCentreEPerS: number;
  /** Stellar continuum at the galaxy centre, electrons per second per pixel. */
  continuumCentreEPerSPerPx: number;
  /** Galaxy distance (Mpc) and its angular scales (arcsec): emission scale, continuum scale. */
  distanceMpc: number;
  emissionScaleArcsec: number;
  continuumScaleArcsec: number;
  turnoverArcsec: number;
  declineArcsec: number;
}

export const SIZES: Record<SimSize, SizeSpec> = {
  small: {
    dispersionPx: 1024,
    slitPx: 300,
    overscanPx: 32,
    arcsecPerPixel: 0.4,
    centralAngstrom: [6650.0, 6452.0],
    dispersionAngstromPerPx: 1.1,
    nonlinearAngstrom: [-2.6, 0.9],
    tiltOverSlitPx: 3.0,
    curvatureOverSlitPx: 1.5,
    lsfCentrePx: 1.3,
    lsfEdgeExtraPx: 0.15,
    hotColumns: 3,
    skyContinuumEPerSPerPx: 0.022,
    skyLineEPerSPer100: 1.1,
    halphaCentreEPerS: 13,
    continuumCentreEPerSPerPx: 0.04,
    distanceMpc: 31,
    emissionScaleArcsec: 7.6,
    continuumScaleArcsec: 9,
    turnoverArcsec: 6,
    declineArcsec: 22,
  },
  full: {
    dispersionPx: 4096,
    slitPx: 2048,
    overscanPx: 32,
    arcsecPerPixel: 0.1,
    centralAngstrom: [6650.0, 6452.0],
    dispersionAngstromPerPx: 0.3,
    nonlinearAngstrom: [-2.8, 1.0],
    tiltOverSlitPx: 8.0,
    curvatureOverSlitPx: 4.0,
    lsfCentrePx: 1.4,
    lsfEdgeExtraPx: 0.15,
    hotColumns: 8,
    skyContinuumEPerSPerPx: 0.012,
    skyLineEPerSPer100: 0.5,
    halphaCentreEPerS: 6,
    continuumCentreEPerSPerPx: 0.03,
    distanceMpc: 12,
    emissionScaleArcsec: 16,
    continuumScaleArcsec: 20,
    turnoverArcsec: 12,
    declineArcsec: 45,
  },
};

/** Galaxy geometry and kinematics of each variant (before the per-target spread). */
export interface GalaxySpec {
  vSysKms: number;
  inclinationDeg: number;
  majorAxisPaDeg: number;
  /** Slit PA minus major-axis PA, deg. */
  slitToMajorDeg: number;
  vmaxKms: number;
  falling: boolean;
  gasDispersionKms: number;
  /** Multiplies line and continuum brightness. */
  brightness: number;
}

export function galaxySpec(variant: SimVariant): GalaxySpec {
  const base: GalaxySpec = {
    vSysKms: 2153.4,
    inclinationDeg: 58,
    majorAxisPaDeg: 35,
    slitToMajorDeg: 0,
    vmaxKms: 205,
    falling: false,
    gasDispersionKms: 14,
    brightness: 1,
  };
  if (variant === 'offset') return { ...base, slitToMajorDeg: 20 };
  if (variant === 'falling') return { ...base, falling: true, vmaxKms: 230 };
  if (variant === 'faint') return { ...base, brightness: 0.25 };
  return base;
}

/** Line fluxes relative to H-alpha ([N II] 6548 is a third of 6583, atomic physics, REFERENCE.md). */
export const LINE_RATIOS: Record<string, number> = {
  Halpha: 1,
  NII6583: 0.36,
  NII6548: 0.12,
  SII6716: 0.22,
  SII6731: 0.16,
};

/** Exposure times, seconds. */
export const EXPOSURE_S = { bias: 0, flat: 8, arc: 30, science: 1200 } as const;
export const FRAME_COUNTS = { bias: 5, flat: 3, arc: 2, science: 3 } as const;
/** Readout plus overhead between exposures, seconds. */
export const OVERHEAD_S = 75;
