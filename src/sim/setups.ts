/** The true optics and detector of each spectral setup. */
import type { Orientation } from '../products/frame.js';
import type { ResolvedSimOptions } from './options.js';
import { Rng, streamSeed } from '../kernels/random.js';
import { SIZES } from './scenario.js';
import type { DetectorTruth, SetupTruth } from './truth.js';
import { trimmedSize } from './detector.js';

/** Setup names, in order of use. */
export const SETUP_NAMES = ['red', 'orange'] as const;

const GRATING_TILT_DEG = [18.25, 17.4];
/** What the manifest states: rounded and a little off, as an observer's notes would be (Angstrom, Angstrom/px). */
const APPROX_OFFSET_ANGSTROM = [-9, 7];
const APPROX_DISPERSION_FACTOR = 1.025;

export function orientationOf(options: ResolvedSimOptions): Orientation {
  return options.variant === 'rotated' ? { transpose: true, flipX: true } : { transpose: false, flipX: false };
}

function section(x1: number, x2: number, y1: number, y2: number): string {
  return `[${x1}:${x2},${y1}:${y2}]`;
}

/** The detector is the same for every setup (same chip, same readout, same mounting). */
export function makeDetector(options: ResolvedSimOptions): DetectorTruth {
  const spec = SIZES[options.size];
  const trimmed = trimmedSize(orientationOf(options), spec.dispersionPx, spec.slitPx);
  const rng = new Rng(streamSeed(options.seed, 'hot-columns'));
  const hot = new Set<number>();
  while (hot.size < spec.hotColumns) hot.add(8 + rng.int(trimmed.width - 16));
  return {
    gainEPerAdu: 1.4,
    readNoiseE: 4.0,
    biasLevelAdu: 1000,
    rowPatternAmplitudeAdu: 1.5,
    saturationAdu: 65535,
    rawWidth: trimmed.width + spec.overscanPx,
    rawHeight: trimmed.height,
    dataSection: section(1, trimmed.width, 1, trimmed.height),
    overscanSection: section(trimmed.width + 1, trimmed.width + spec.overscanPx, 1, trimmed.height),
    hotColumns: [...hot].sort((a, b) => a - b),
    hotColumnOffsetE: 150,
    hotColumnRateEPerS: 2,
    pixelSensitivityRms: 0.01,
  };
}

export function makeSetup(options: ResolvedSimOptions, index: number, detector: DetectorTruth): SetupTruth {
  const spec = SIZES[options.size];
  const W = spec.dispersionPx;
  const H = spec.slitPx;
  const [p2, p3] = spec.nonlinearAngstrom;
  const central = spec.centralAngstrom[index]!;
  const halfRows = (H - 1) / 2;
  return {
    name: SETUP_NAMES[index]!,
    detector,
    orientation: orientationOf(options),
    internalWidth: W,
    internalHeight: H,
    // P2(0) = -1/2, so c0 = central + p2/2 puts `central` at the detector centre.
    dispersion: { kind: 'legendre1d', min: 0, max: W - 1, coeffs: [central + 0.5 * p2, (spec.dispersionAngstromPerPx * (W - 1)) / 2, p2, p3] },
    lineShift: { refRow: halfRows, tiltPxPerRow: spec.tiltOverSlitPx / (H - 1), curvaturePxPerRow2: spec.curvatureOverSlitPx / (halfRows * halfRows) },
    lsf: { centrePx: spec.lsfCentrePx, edgeExtraPx: spec.lsfEdgeExtraPx },
    arcsecPerPixel: spec.arcsecPerPixel,
    grating: 'G1200-R',
    gratingTiltDeg: GRATING_TILT_DEG[index]!,
    approxWavelength: Math.round(central + APPROX_OFFSET_ANGSTROM[index]!),
    approxDispersion: Math.round(spec.dispersionAngstromPerPx * APPROX_DISPERSION_FACTOR * 1000) / 1000,
  };
}
