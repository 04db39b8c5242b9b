/**
 * The detector: slit illumination and pixel sensitivity (multiplying the light), hot columns,
 * shot and read noise, cosmic rays, bias with its row pattern, the overscan strip,
 * digitisation and saturation.
 */
import type { Orientation } from '../products/frame.js';
import { POISSON_NORMAL_THRESHOLD, type Rng } from '../kernels/random.js';
import type { CosmicRayTruth, DetectorTruth } from './truth.js';

/** Fixed per-detector maps, made once per run. */
export interface DetectorMaps {
  /** Relative response of each internal pixel (slit illumination x pixel sensitivity), mean ~1. */
  response: Float32Array;
  /** Bias row pattern, ADU per raw row. */
  rowPatternAdu: Float32Array;
}

/** Slit illumination along the slit (internal row s of H): a gentle bow and ripple (~5%). */
export function slitIllumination(s: number, H: number): number {
  const v = (2 * s) / (H - 1) - 1;
  return 1 - 0.05 * v * v + 0.012 * Math.sin(2 * Math.PI * 1.7 * v + 0.6);
}

export function makeDetectorMaps(rng: Rng, det: DetectorTruth, W: number, H: number): DetectorMaps {
  const response = new Float32Array(W * H);
  for (let s = 0; s < H; s++) {
    const illum = slitIllumination(s, H);
    for (let d = 0; d < W; d++) response[s * W + d] = illum * (1 + det.pixelSensitivityRms * rng.normal());
  }
  const rowPatternAdu = new Float32Array(det.rawHeight);
  const phase = rng.between(0, 2 * Math.PI);
  for (let y = 0; y < det.rawHeight; y++) {
    rowPatternAdu[y] = det.rowPatternAmplitudeAdu * (Math.sin((2 * Math.PI * y) / 97 + phase) + 0.4 * rng.normal());
  }
  return { response, rowPatternAdu };
}

/** Trimmed raw size for an internal W x H frame. */
export function trimmedSize(o: Orientation, W: number, H: number): { width: number; height: number } {
  return o.transpose ? { width: H, height: W } : { width: W, height: H };
}

/** Add the hot-column excess (electrons) of an exposure to a trimmed raw image. */
export function addHotColumns(det: DetectorTruth, exptimeS: number, width: number, height: number, raw: Float32Array): void {
  const excess = det.hotColumnOffsetE + det.hotColumnRateEPerS * exptimeS;
  for (const x of det.hotColumns) for (let y = 0; y < height; y++) raw[y * width + x] += excess;
}

/**
 * Expected electrons (trimmed raw) -> raw counts with overscan. Shot noise is exact Poisson
 * below POISSON_NORMAL_THRESHOLD electrons and normal above (combined with the read noise);
 * cosmic-ray deposits are added after the noise; values are rounded and clipped to
 * [0, saturation].
 */
export function digitise(
  rng: Rng,
  det: DetectorTruth,
  maps: DetectorMaps,
  expected: Float32Array,
  width: number,
  height: number,
  cosmic: CosmicRayTruth,
  biasOffsetAdu: number,
  scratch: Float32Array,
): Uint16Array {
  const rn = det.readNoiseE;
  const rn2 = rn * rn;
  const n = width * height;
  for (let i = 0; i < n; i++) {
    const e = expected[i]!;
    scratch[i] = e >= POISSON_NORMAL_THRESHOLD ? e + Math.sqrt(e + rn2) * rng.normal() : rng.poisson(e) + rn * rng.normal();
  }
  for (let k = 0; k < cosmic.x.length; k++) scratch[cosmic.y[k]! * width + cosmic.x[k]!] += cosmic.electrons[k]!;

  const rawWidth = det.rawWidth;
  const out = new Uint16Array(rawWidth * det.rawHeight);
  const invGain = 1 / det.gainEPerAdu;
  const rnAdu = rn * invGain;
  const sat = det.saturationAdu;
  for (let y = 0; y < height; y++) {
    const bias = det.biasLevelAdu + biasOffsetAdu + maps.rowPatternAdu[y]!;
    const row = y * rawWidth;
    for (let x = 0; x < width; x++) out[row + x] = clampAdu(bias + scratch[y * width + x]! * invGain, sat);
    for (let x = width; x < rawWidth; x++) out[row + x] = clampAdu(bias + rnAdu * rng.normal(), sat);
  }
  return out;
}

function clampAdu(v: number, sat: number): number {
  const r = Math.round(v);
  return r < 0 ? 0 : r > sat ? sat : r;
}
