/** Truth of a simulated run in the internal orientation: expected electrons, cosmic-ray hits, line cores. */
import type { SimulatedRun } from '../../../src/sim/index.js';
import { toInternal } from '../../../src/products/orientation.js';
import type { CcdCalibration } from '../../../src/stages/ccd/calibration.js';

/** Sum of the noiseless expected electrons of these frames, internal orientation (detected, before any flat). */
export function expectedSum(run: SimulatedRun, names: string[], cal: CcdCalibration): Float32Array {
  const tw = cal.orientation.transpose ? cal.height : cal.width;
  const th = cal.orientation.transpose ? cal.width : cal.height;
  const sum = new Float32Array(cal.width * cal.height);
  for (const name of names) {
    const e = toInternal(run.expected!.get(name)!, tw, th, cal.orientation).data;
    for (let i = 0; i < e.length; i++) sum[i] += e[i]!;
  }
  return sum;
}

/** Internal pixel indices hit by cosmic rays in one frame (the simulator lists them in raw trimmed pixels). */
export function hitPixels(run: SimulatedRun, name: string, cal: CcdCalibration): Set<number> {
  const hits = run.truth.frames[name]!.cosmicRays;
  const tw = cal.orientation.transpose ? cal.height : cal.width;
  const th = cal.orientation.transpose ? cal.width : cal.height;
  const raw = new Uint16Array(tw * th);
  for (let k = 0; k < hits.x.length; k++) raw[hits.y[k]! * tw + hits.x[k]!] = 1;
  const internal = toInternal(raw, tw, th, cal.orientation).data;
  const out = new Set<number>();
  for (let i = 0; i < internal.length; i++) if (internal[i]) out.add(i);
  return out;
}

/**
 * Bright line cores from the truth alone (galaxy and sky lines alike): local maxima along the
 * dispersion standing more than `contrast` noise sigmas above the truth 6 pixels away on both
 * sides, with their neighbours along x.
 */
export function lineCorePixels(truth: Float32Array, width: number, height: number, readNoiseE: number, contrast = 10): Set<number> {
  const out = new Set<number>();
  for (let y = 0; y < height; y++) {
    for (let x = 7; x < width - 7; x++) {
      const i = y * width + x;
      const v = truth[i]!;
      if (!(v >= truth[i - 1]! && v > truth[i + 1]!)) continue;
      const base = Math.max(truth[i - 6]!, truth[i + 6]!);
      if (v - base > contrast * Math.sqrt(v + readNoiseE * readNoiseE)) for (const dx of [-1, 0, 1]) out.add(i + dx);
    }
  }
  return out;
}

/** The set grown by one pixel (8-neighbours). */
export function grownSet(pixels: Set<number>, width: number, height: number): Set<number> {
  const out = new Set<number>();
  for (const p of pixels) {
    const x = p % width;
    const y = (p - x) / width;
    for (let yy = Math.max(0, y - 1); yy <= Math.min(height - 1, y + 1); yy++) for (let xx = Math.max(0, x - 1); xx <= Math.min(width - 1, x + 1); xx++) out.add(yy * width + xx);
  }
  return out;
}
