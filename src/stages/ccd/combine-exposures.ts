/**
 * Several exposures of one target combined pixel by pixel, with cosmic rays rejected against the
 * noise model rather than the scatter of a few values:
 *   0. a pixel whose exposures each pass step 2 against all the others keeps them all (most pixels);
 *   1. otherwise the reference rate starts from a low order statistic of the rates v_i / t_i (the
 *      minimum for up to four exposures), so a pixel hit in two of three exposures starts clean;
 *   2. exposure i is kept when v_i - r_i t_i <= crSigma sigma_i, r_i the rate of the other kept
 *      exposures (leave-one-out; the starting exposures in the first round), with
 *      sigma_i^2 = s^2(r_i t_i) + t_i^2 sum_j s^2(r_i t_j) / (sum_j t_j)^2 (the reference's own
 *      noise) and s^2(e) = k0 / F^2 + e / F + (crRelativeScatter e)^2 (read noise and bias through
 *      the flat F, Poisson, and a fractional term for seeing and transparency);
 *   3. 2 repeats until the kept set holds (values may return);
 *   4. each rejection is grown by crGrow pixels in its own exposure.
 * Bright line cores are in every exposure, so they sit on the reference and are kept.
 * Output: electrons scaled to the total exposure time T, sci = T sum_kept v / sum_kept t, with
 *   var = (T / sum_kept t)^2 sum_kept var_i + (T n_kept / sum_kept t)^2 g^2 var(bias) / F^2 + sci^2 var(F) / F^2,
 * the master bias and flat errors entering once, since every exposure shares them.
 */
import { MASK_BITS } from '../../products/frame.js';
import type { CalibratedExposure, ExposureCalibration } from './exposure.js';
import { MAX_EXPOSURES, searchKept, type KeptTest } from './leave-one-out.js';
import { grow, popcount, type BitPlanes } from './rejection-bits.js';
import type { CcdSettings } from './settings.js';

export { MAX_EXPOSURES } from './leave-one-out.js';

export interface CombinedExposures {
  sci: Float32Array;
  var: Float32Array;
  mask: Uint16Array;
  /** Per pixel, the number of exposures left out as cosmic rays (empty for a single exposure). */
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
  const biasE2 = cal.gain * cal.gain * cal.biasVarianceAdu;
  const k0 = cal.readNoiseE * cal.readNoiseE + biasE2;
  const rel2 = settings.crRelativeScatter * settings.crRelativeScatter;
  const threshold = settings.crSigma;
  const startRank = Math.max(0, Math.floor((nExp - 1) / 2) - 1);
  const all = (1 << nExp) - 1;
  const rejectBits: BitPlanes = nExp === 1 ? new Uint8Array(0) : nExp <= 8 ? new Uint8Array(n) : nExp <= 16 ? new Uint16Array(n) : new Uint32Array(n);
  const scis = exposures.map((e) => e.sci);
  const t = Float64Array.from(exptimesS);
  const hits = nExp > 1 ? markRejections({ scis, t, flat: cal.masterFlat, k0, rel2, threshold, startRank, bits: rejectBits }) : 0;
  const grownBits = settings.crGrow > 0 && hits > 0 ? grow(rejectBits, width, height, settings.crGrow) : rejectBits;

  const vars = exposures.map((e) => e.var);
  const masks = exposures.map((e) => e.mask);
  // The first exposure's arrays become the product (the exposures are consumed): pixel p is
  // written only after every exposure's values at p are read, so nothing is overwritten too early.
  const out: SumInput = {
    scis,
    vars,
    masks,
    t,
    total,
    biasE2,
    masterFlat: cal.masterFlat,
    flatVariance: cal.flatVariance,
    sci: scis[0]!,
    variance: vars[0]!,
    mask: masks[0]!,
    rejected: new Uint8Array(nExp === 1 ? 0 : n),
  };
  const grown = nExp === 1 ? sumAll(out, 0, n) : sumKept(out, grownBits, all);
  return { sci: out.sci, var: out.variance, mask: out.mask, rejected: out.rejected, exptimeS: total, hits, grown };
}

interface RejectionInput {
  scis: Float32Array[];
  t: Float64Array;
  flat: Float32Array;
  k0: number;
  rel2: number;
  threshold: number;
  startRank: number;
  bits: BitPlanes;
}

/**
 * Steps 0-3 at every pixel: the rejected exposures' bits into `bits`; returns their number.
 * A function of its own (one pixel loop), so V8 compiles it once; the rare search is another.
 */
function markRejections(c: RejectionInput): number {
  const { scis, t, flat, k0, rel2, threshold, startRank, bits: rejectBits } = c;
  const nExp = scis.length;
  const n = rejectBits.length;
  const all = (1 << nExp) - 1;
  const values = new Float64Array(nExp);
  const test: KeptTest = { values, t, nExp, constant: 0, flat: 1, rel2, threshold };
  // keptAgainstOthers(test, all) written out for the loop, with its pixel-independent sums
  // taken once (the same expressions in the same order, so the same decisions).
  let sumTAll = 0;
  let sumT2All = 0;
  for (let j = 0; j < nExp; j++) {
    sumTAll += t[j]!;
    sumT2All += t[j]! * t[j]!;
  }
  const othersT = new Float64Array(nExp);
  const othersT2 = new Float64Array(nExp);
  for (let i = 0; i < nExp; i++) {
    othersT[i] = sumTAll - t[i]!;
    othersT2[i] = sumT2All - t[i]! * t[i]!;
  }
  // Sizes under which every term of the variance below is finite and >= 0 (see `floor`).
  const bounded = threshold < Infinity && k0 >= 0 && k0 < 1e50 && t.every((x) => x >= 1e-20 && x <= 1e20);
  let hits = 0;
  // Up to three exposures read from locals, as in sumAll.
  const few = nExp <= 3;
  const [s0, s1, s2] = [scis[0]!, scis[Math.min(1, nExp - 1)]!, scis[Math.min(2, nExp - 1)]!];
  for (let p = 0; p < n; p++) {
    let sumV = 0;
    if (few) {
      const a = s0[p]!;
      values[0] = a;
      sumV += a;
      const b = s1[p]!;
      values[1] = b;
      sumV += b;
      if (nExp > 2) {
        const c = s2[p]!;
        values[2] = c;
        sumV += c;
      }
    } else {
      for (let i = 0; i < nExp; i++) {
        const v = scis[i]![p]!;
        values[i] = v;
        sumV += v;
      }
    }
    const f = flat[p]!;
    const constant = k0 / (f * f);
    // The variance is `constant` plus terms >= 0, so (rounding being monotonic) never below it:
    // an exposure within threshold * sqrt(constant) of its reference passes without the rest
    // (the same decision; one square root per pixel instead of one per exposure). Only where
    // the rate, flat and times are of sizes that keep every term finite.
    const sane = bounded && f > 1e-10 && f < 1e10;
    const floor = sane ? threshold * Math.sqrt(constant) : -Infinity;
    // Most pixels: every exposure agrees with the others; otherwise search from a low order statistic.
    let kept = all;
    for (let i = 0; i < nExp; i++) {
      const ti = t[i]!;
      const oT = othersT[i]!;
      const rate = (sumV - values[i]!) / oT;
      if (sane && values[i]! - rate * ti <= floor && Math.abs(rate) < 1e50) continue;
      const rp = rate > 0 ? rate : 0;
      const refVar = (nExp - 1) * constant + (rp * oT) / f + rel2 * rp * rp * othersT2[i]!;
      const e = rp * ti;
      const variance = constant + e / f + rel2 * e * e + (refVar * ti * ti) / (oT * oT);
      if (!(values[i]! - rate * ti <= threshold * Math.sqrt(variance))) kept &= ~(1 << i);
    }
    if (kept !== all) {
      test.constant = constant;
      test.flat = f;
      kept = searchKept(test, startRank);
    }
    const bits = all & ~kept;
    if (bits) {
      rejectBits[p] = bits;
      hits += popcount(bits);
    }
  }
  return hits;
}

interface SumInput {
  scis: Float32Array[];
  vars: Float32Array[];
  masks: Uint16Array[];
  t: Float64Array;
  total: number;
  biasE2: number;
  masterFlat: Float32Array;
  flatVariance: Float32Array;
  sci: Float32Array;
  variance: Float32Array;
  mask: Uint16Array;
  rejected: Uint8Array;
}

/**
 * The output at every pixel from the exposures that `grownBits` does not leave out; returns the
 * exposure-pixels left out. Pixels that keep every exposure (most) go to sumAll in runs, the
 * others to sumSome, so each loop is a small function V8 compiles once.
 */
function sumKept(c: SumInput, grownBits: BitPlanes, all: number): number {
  const n = c.sci.length;
  let grown = 0;
  let p = 0;
  while (p < n) {
    let end = p;
    while (end < n && (grownBits[end]! & all) === 0) end++;
    if (end > p) sumAll(c, p, end);
    if (end < n) grown += sumSome(c, end, grownBits[end]! & all, all);
    p = end + 1;
  }
  return grown;
}

/** Pixels [from, to) from every exposure (the usual pixel; its constant sums taken once). */
function sumAll(c: SumInput, from: number, to: number): number {
  const { scis, vars, masks, t, total, biasE2, masterFlat, flatVariance, sci, variance, mask } = c;
  const nExp = scis.length;
  let sumTAll = 0;
  for (let i = 0; i < nExp; i++) sumTAll += t[i]!;
  const totalSq = total * total;
  const sumTAllSq = sumTAll * sumTAll;
  const biasScaleAll = (total * nExp) / sumTAll;
  const biasTermAll = biasScaleAll * biasScaleAll * biasE2;
  // Up to three exposures (the usual arc and science sets) read from locals, not through the
  // lists of arrays; the same sums in the same order.
  const few = nExp <= 3;
  const [s0, s1, s2] = [scis[0]!, scis[Math.min(1, nExp - 1)]!, scis[Math.min(2, nExp - 1)]!];
  const [v0, v1, v2] = [vars[0]!, vars[Math.min(1, nExp - 1)]!, vars[Math.min(2, nExp - 1)]!];
  const [m0, m1, m2] = [masks[0]!, masks[Math.min(1, nExp - 1)]!, masks[Math.min(2, nExp - 1)]!];
  for (let p = from; p < to; p++) {
    let flagsAll = 0;
    let sumVAll = 0;
    let sumVarAll = 0;
    if (few) {
      flagsAll |= m0[p]!;
      sumVAll += s0[p]!;
      sumVarAll += v0[p]!;
      if (nExp > 1) {
        flagsAll |= m1[p]!;
        sumVAll += s1[p]!;
        sumVarAll += v1[p]!;
      }
      if (nExp > 2) {
        flagsAll |= m2[p]!;
        sumVAll += s2[p]!;
        sumVarAll += v2[p]!;
      }
    } else {
      for (let i = 0; i < nExp; i++) {
        flagsAll |= masks[i]![p]!;
        sumVAll += scis[i]![p]!;
        sumVarAll += vars[i]![p]!;
      }
    }
    const value = (total * sumVAll) / sumTAll;
    const f = masterFlat[p]!;
    sci[p] = value;
    variance[p] = (totalSq * sumVarAll) / sumTAllSq + biasTermAll / (f * f) + (value * value * flatVariance[p]!) / (f * f);
    mask[p] = flagsAll;
  }
  return 0;
}

/** Pixel p without the exposures of `out` (non-zero); returns how many were left out. */
function sumSome(c: SumInput, p: number, out: number, all: number): number {
  const { scis, vars, masks, t, total, biasE2 } = c;
  const nExp = scis.length;
  let flags = 0;
  if (out === all) {
    // Every exposure rejected: keep the one with the lowest rate, flagged.
    let best = 0;
    for (let i = 1; i < nExp; i++) if (scis[i]![p]! / t[i]! < scis[best]![p]! / t[best]!) best = i;
    out = all & ~(1 << best);
    flags |= MASK_BITS.cosmicRay;
  }
  let sumV = 0;
  let sumVar = 0;
  let sumT = 0;
  let used = 0;
  for (let i = 0; i < nExp; i++) {
    const m = masks[i]![p]!;
    flags |= m & MASK_BITS.saturated;
    if (out & (1 << i)) continue;
    flags |= m;
    sumV += scis[i]![p]!;
    sumVar += vars[i]![p]!;
    sumT += t[i]!;
    used++;
  }
  const value = (total * sumV) / sumT;
  const f = c.masterFlat[p]!;
  const biasScale = (total * used) / sumT;
  c.sci[p] = value;
  c.variance[p] = (total * total * sumVar) / (sumT * sumT) + (biasScale * biasScale * biasE2) / (f * f) + (value * value * c.flatVariance[p]!) / (f * f);
  c.mask[p] = flags;
  const count = nExp - used;
  c.rejected[p] = count;
  return count;
}
