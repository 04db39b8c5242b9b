/**
 * A small, fast seeded random generator (simulator, bootstrap errors, tests): xoshiro128** (Blackman & Vigna 2018)
 * seeded through splitmix32, with uniform, normal (ziggurat) and Poisson draws.
 * Every frame gets its own stream (`streamSeed`), so a frame does not depend on the order in
 * which the others were made.
 */

/** Mean above which a Poisson count is drawn from its normal approximation (common practice). */
export const POISSON_NORMAL_THRESHOLD = 40;

export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;

  constructor(seed: number) {
    // splitmix32 spreads any integer seed over the 128-bit state (never all zero).
    let s = seed >>> 0;
    const next = (): number => {
      s = (s + 0x9e3779b9) | 0;
      let z = s;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.a = next();
    this.b = next();
    this.c = next();
    this.d = next() | 1;
  }

  /** Next 32-bit unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.b, 5), 7), 9) >>> 0;
    const t = this.b << 9;
    this.c ^= this.a;
    this.d ^= this.b;
    this.b ^= this.c;
    this.a ^= this.d;
    this.c ^= t;
    this.d = rotl(this.d, 11);
    return result;
  }

  /** Uniform in the open interval (0, 1). */
  uniform(): number {
    return (this.nextUint32() + 0.5) / 4294967296;
  }

  /** Uniform in [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.uniform();
  }

  /** Integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.uniform() * n);
  }

  /**
   * Standard normal deviate by the ziggurat method of Marsaglia & Tsang (2000, J. Stat. Softw. 5, 8),
   * 128 layers: one 32-bit draw and a comparison for ~99% of the deviates.
   */
  normal(): number {
    const hz = this.nextUint32() | 0;
    const iz = hz & 127;
    if (Math.abs(hz) < KN[iz]!) return hz * WN[iz]!;
    return this.normalTail(hz, iz);
  }

  /** The slow path of the ziggurat: wedges and the tail beyond ZIGGURAT_R. */
  private normalTail(hz: number, iz: number): number {
    for (;;) {
      if (iz === 0) {
        let x: number;
        let y: number;
        do {
          x = -Math.log(this.uniform()) / ZIGGURAT_R;
          y = -Math.log(this.uniform());
        } while (y + y < x * x);
        return hz > 0 ? ZIGGURAT_R + x : -ZIGGURAT_R - x;
      }
      const x = hz * WN[iz]!;
      if (FN[iz]! + this.uniform() * (FN[iz - 1]! - FN[iz]!) < Math.exp(-0.5 * x * x)) return x;
      hz = this.nextUint32() | 0;
      iz = hz & 127;
      if (Math.abs(hz) < KN[iz]!) return hz * WN[iz]!;
    }
  }

  /** Exponential deviate with the given mean. */
  exponential(mean: number): number {
    return -mean * Math.log(this.uniform());
  }

  /**
   * Poisson count with mean `lambda`: exact by inversion of the cumulative distribution below
   * POISSON_NORMAL_THRESHOLD, the rounded normal approximation above (mean and variance exact to
   * 1/12 from the rounding).
   */
  poisson(lambda: number): number {
    if (!(lambda > 0)) return 0;
    if (lambda >= POISSON_NORMAL_THRESHOLD) {
      const k = Math.round(lambda + Math.sqrt(lambda) * this.normal());
      return k < 0 ? 0 : k;
    }
    let p = Math.exp(-lambda);
    let cdf = p;
    const u = this.uniform();
    let k = 0;
    while (u > cdf && k < 1000) {
      k++;
      p *= lambda / k;
      cdf += p;
    }
    return k;
  }
}

/** Ziggurat tables (Marsaglia & Tsang 2000): layer edges KN, widths WN and densities FN. */
const ZIGGURAT_R = 3.442619855899;
const ZIGGURAT_V = 9.91256303526217e-3;
const KN = new Float64Array(128);
const WN = new Float64Array(128);
const FN = new Float64Array(128);
{
  const m1 = 2147483648;
  let dn = ZIGGURAT_R;
  let tn = dn;
  const q = ZIGGURAT_V / Math.exp(-0.5 * dn * dn);
  KN[0] = (dn / q) * m1;
  KN[1] = 0;
  WN[0] = q / m1;
  WN[127] = dn / m1;
  FN[0] = 1;
  FN[127] = Math.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * Math.log(ZIGGURAT_V / dn + Math.exp(-0.5 * dn * dn)));
    KN[i + 1] = (dn / tn) * m1;
    tn = dn;
    FN[i] = Math.exp(-0.5 * dn * dn);
    WN[i] = dn / m1;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** A seed for an independent stream, from the run seed and a stream label (FNV-1a hash). */
export function streamSeed(runSeed: number, label: string): number {
  let h = (0x811c9dc5 ^ (runSeed >>> 0)) >>> 0;
  h = Math.imul(h ^ (runSeed >>> 16), 0x01000193) >>> 0;
  for (let i = 0; i < label.length; i++) h = Math.imul(h ^ label.charCodeAt(i), 0x01000193) >>> 0;
  return h;
}
