/**
 * Several exposures of one target combined pixel by pixel, with cosmic rays rejected against the
 * noise model rather than the scatter of a few values:
 *   1. reference rate = a low order statistic of the rates v_i / t_i (the minimum for up to four
 *      exposures), so that a pixel hit in two of three exposures still starts from a clean value;
 *   2. exposure i is rejected when v_i - r t_i > crSigma sigma_i, with
 *      sigma_i^2 = k0 / F^2 + r t_i / F + (crRelativeScatter r t_i)^2 (read noise and bias
 *      through the flat F, Poisson, and a fractional term for seeing and transparency);
 *   3. r = sum_kept v_i / sum_kept t_i, and 2 repeats until the kept set holds (values may return);
 *   4. each rejection is grown by crGrow pixels in its own exposure.
 * Bright line cores are in every exposure, so they sit on the reference and are kept.
 * Output: electrons scaled to the total exposure time T, sci = T sum_kept v / sum_kept t.
 */
import { MASK_BITS } from '../../products/frame.js';
import type { CalibratedExposure, ExposureCalibration } from './exposure.js';
import type { CcdSettings } from './settings.js';

export const MAX_EXPOSURES = 30;
const MAX_ROUNDS = 5;

export interface CombinedExposures {
  sci: Float32Array;
  var: Float32Array;
  mask: Uint16Array;
  /** Per pixel, the number of exposures left out as cosmic rays. */
  rejected: Uint8Array;
  /** Total exposure time, seconds. */
  exptimeS: number;
  /** Exposure-pixels rejected before and after growing. */
  hits: number;
  grown: number;
}

export function combineExposures(exposures: CalibratedExposure[], exptimesS: number[], cal: ExposureCalibration, settings: CcdSettings): CombinedExposures {
  const nExp = exposures.length;
  if (nExp < 1 || nExp > MAX_EXPOSURES) throw new RangeError(`combineExposures: ${nExp} exposures (1 to ${MAX_EXPOSURES})`);
  const { width, height } = cal;
  const n = width * height;
  const total = exptimesS.reduce((a, b) => a + b, 0);
  const k0 = cal.readNoiseE * cal.readNoiseE + cal.gain * cal.gain * cal.biasVarianceAdu;
  const rel2 = settings.crRelativeScatter * settings.crRelativeScatter;
  const threshold = settings.crSigma;
  const startRank = Math.max(0, Math.floor((nExp - 1) / 2) - 1);
  const rejectBits = new Uint32Array(n);
  const rates = new Float64Array(nExp);
  let hits = 0;
  if (nExp > 1) {
    for (let p = 0; p < n; p++) {
      for (let i = 0; i < nExp; i++) rates[i] = exposures[i]!.sci[p]! / exptimesS[i]!;
      let rate = orderStatistic(rates, nExp, startRank);
      const f = cal.masterFlat[p]!;
      const constant = k0 / (f * f);
      let bits = 0;
      for (let round = 0; round < MAX_ROUNDS; round++) {
        let next = 0;
        let sumV = 0;
        let sumT = 0;
        for (let i = 0; i < nExp; i++) {
          const e = rate * exptimesS[i]!;
          const ep = e > 0 ? e : 0;
          const sigma = Math.sqrt(constant + ep / f + rel2 * ep * ep);
          const v = exposures[i]!.sci[p]!;
          if (v - e > threshold * sigma) next |= 1 << i;
          else {
            sumV += v;
            sumT += exptimesS[i]!;
          }
        }
        if (next === bits && round > 0) break;
        bits = next;
        if (sumT > 0) rate = sumV / sumT;
      }
      if (bits) {
        rejectBits[p] = bits;
        hits += popcount(bits);
      }
    }
  }
  const grownBits = settings.crGrow > 0 && hits > 0 ? grow(rejectBits, width, height, settings.crGrow) : rejectBits;

  const sci = new Float32Array(n);
  const variance = new Float32Array(n);
  const mask = new Uint16Array(n);
  const rejected = new Uint8Array(n);
  const all = (1 << nExp) - 1;
  let grown = 0;
  for (let p = 0; p < n; p++) {
    let out = grownBits[p]! & all;
    let flags = 0;
    if (out === all) {
      // Every exposure rejected: keep the one with the lowest rate, flagged.
      let best = 0;
      for (let i = 1; i < nExp; i++) if (exposures[i]!.sci[p]! / exptimesS[i]! < exposures[best]!.sci[p]! / exptimesS[best]!) best = i;
      out = all & ~(1 << best);
      flags |= MASK_BITS.cosmicRay;
    }
    let sumV = 0;
    let sumVar = 0;
    let sumT = 0;
    for (let i = 0; i < nExp; i++) {
      const m = exposures[i]!.mask[p]!;
      flags |= m & MASK_BITS.saturated;
      if (out & (1 << i)) continue;
      flags |= m;
      sumV += exposures[i]!.sci[p]!;
      sumVar += exposures[i]!.var[p]!;
      sumT += exptimesS[i]!;
    }
    sci[p] = (total * sumV) / sumT;
    variance[p] = (total * total * sumVar) / (sumT * sumT);
    mask[p] = flags;
    const count = popcount(out);
    rejected[p] = count;
    grown += count;
  }
  return { sci, var: variance, mask, rejected, exptimeS: total, hits, grown };
}

/** k-th smallest of a[0..n) by insertion sort of a copy (n is a handful). */
const sorted = new Float64Array(MAX_EXPOSURES);
function orderStatistic(a: Float64Array, n: number, k: number): number {
  for (let i = 0; i < n; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j >= 0 && sorted[j]! > v) {
      sorted[j + 1] = sorted[j]!;
      j--;
    }
    sorted[j + 1] = v;
  }
  return sorted[k]!;
}

function popcount(v: number): number {
  let c = 0;
  for (let b = v >>> 0; b; b &= b - 1) c++;
  return c;
}

/** OR of the bits within `radius` (square window): rejections spread to neighbours in their exposure. */
function grow(bits: Uint32Array, width: number, height: number, radius: number): Uint32Array {
  const out = bits.slice();
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const b = bits[y * width + x]!;
      if (!b) continue;
      for (let yy = Math.max(0, y - radius); yy <= Math.min(height - 1, y + radius); yy++) {
        for (let xx = Math.max(0, x - radius); xx <= Math.min(width - 1, x + radius); xx++) out[yy * width + xx] = out[yy * width + xx]! | b;
      }
    }
  }
  return out;
}
