/**
 * A tied group of Gaussian lines on a linear continuum, in wavelength, on native pixels:
 *   m_i = dl_i sum_k F_k / (sqrt(2 pi) s_k) exp(-(l_i - mu_k)^2 / (2 s_k^2)) + c0 + c1 (l_i - lRef)
 * with one velocity (mu_k = mu q_k, q_k = rest_k / rest_0) and one velocity width (s_k = s q_k),
 * dl_i the pixel's width in Angstrom, so F_k is the line flux in electrons. Fluxes of members with
 * a fixed ratio follow the group's reference member (members[0]).
 * Parameters: [mu, s?, F_free..., c0, c1]; s is absent when the width is held.
 */
import type { LmModel } from '../../kernels/levenberg-marquardt.js';

export interface GroupSpec {
  name: string;
  members: string[];
  /** Rest air wavelengths (Angstrom), same order as members. */
  rest: number[];
  /** Per member: index of its free flux parameter (among the free fluxes) and the factor on it. */
  fluxIndex: number[];
  fluxFactor: number[];
  nFree: number;
}

const INV_ROOT_2PI = 1 / Math.sqrt(2 * Math.PI);

export class GroupModel implements LmModel {
  readonly nParams: number;
  /** Where F_free starts, and c0. */
  readonly fluxStart: number;
  readonly c0Index: number;
  private readonly q: Float64Array;
  /** Whether the width is fitted, and the held width (0 when fitted): always a number, so the
   * field keeps one representation and a held fit does not deoptimise evaluate. */
  private readonly free: boolean;
  private readonly held: number;

  constructor(
    readonly spec: GroupSpec,
    /** Pixel widths (Angstrom) of the window's pixels. */
    readonly pixelWidth: Float64Array,
    readonly lambdaRef: number,
    /** Held observed sigma of member 0 (Angstrom), or undefined to fit it. */
    readonly fixedSigma: number | undefined,
  ) {
    // A loop: Float64Array.from with a mapping function takes V8's slow iterator path.
    const q = new Float64Array(spec.rest.length);
    for (let k = 0; k < q.length; k++) q[k] = spec.rest[k]! / spec.rest[0]!;
    this.q = q;
    this.free = fixedSigma === undefined;
    this.held = fixedSigma ?? 0;
    this.fluxStart = fixedSigma === undefined ? 2 : 1;
    this.c0Index = this.fluxStart + spec.nFree;
    this.nParams = this.c0Index + 2;
  }

  evaluate(p: Float64Array, x: Float64Array, model: Float64Array, jac: Float64Array): void {
    const n = this.nParams;
    const free = this.free;
    const mu = p[0]!;
    const held = this.held;
    const s = free ? p[1]! : held;
    const { fluxIndex, fluxFactor } = this.spec;
    const members = fluxIndex.length;
    const c0 = p[this.c0Index]!;
    const c1 = p[this.c0Index + 1]!;
    const q = this.q;
    const pixelWidth = this.pixelWidth;
    const fluxStart = this.fluxStart;
    const lambdaRef = this.lambdaRef;
    for (let i = 0; i < x.length; i++) {
      const row = i * n;
      for (let k = 0; k < n; k++) jac[row + k] = 0;
      const l = x[i]!;
      const dl = pixelWidth[i]!;
      let m = c0 + c1 * (l - lambdaRef);
      // The centre and width derivatives sum in locals (from 0, in the same order as in the row).
      let dMu = 0;
      let dS = 0;
      for (let k = 0; k < members; k++) {
        const qk = q[k]!;
        const sk = s * qk;
        const d = l - mu * qk;
        // Beyond 7 sigma a line adds less than 3e-11 of its peak: skip the exponential.
        if (d * d > 49 * sk * sk) continue;
        const shape = dl * INV_ROOT_2PI * Math.exp((-0.5 * d * d) / (sk * sk)) / sk;
        const fi = fluxStart + fluxIndex[k]!;
        const flux = fluxFactor[k]! * p[fi]!;
        const g = flux * shape;
        m += g;
        dMu += ((g * d) / (sk * sk)) * qk;
        if (free) dS += g * ((d * d) / (sk * sk * sk) - 1 / sk) * qk;
        jac[row + fi] += fluxFactor[k]! * shape;
      }
      model[i] = m;
      jac[row] = dMu;
      if (free) jac[row + 1] = dS;
      jac[row + this.c0Index] = 1;
      jac[row + this.c0Index + 1] = l - lambdaRef;
    }
  }
}
