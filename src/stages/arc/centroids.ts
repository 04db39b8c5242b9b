/**
 * Sub-pixel centroids and widths of arc peaks by Gaussian fits (src/kernels/gaussian-fit.ts),
 * with blends and saturated lines marked so that the solution leaves them out.
 * Widths are those of a Gaussian sampled at pixel centres, the same model the line fitter uses.
 */
import { fitGaussianLine } from '../../kernels/gaussian-fit.js';

export interface ArcPeak {
  /** Fitted centre, internal x pixel (0-based centre, unflipped frame). */
  x: number;
  /** 1-sigma error of x from the fit covariance (VAR-based weights), pixels. */
  xErr: number;
  /** Gaussian sigma, pixels. */
  sigma: number;
  /** Peak height above the local continuum, electrons per pixel (band mean). */
  amplitude: number;
  /** amplitude over the noise at the peak. */
  snr: number;
  /** A neighbour within blendSigma sigmas, or a width far above the band's typical width. */
  blended: boolean;
  /** A pixel of the fit window is flagged saturated. */
  saturated: boolean;
  /** The fit converged and its centre stayed inside the window. */
  converged: boolean;
}

/** Widths above this many times the band median are blends or artefacts (common practice). */
const WIDE_FACTOR = 1.6;

/** Rough sigma from the half-maximum crossings around an integer peak column (pixels). */
function halfMaxSigma(flux: Float64Array, offset: number, width: number, x: number, base: number): number {
  const half = (flux[offset + x]! - base) / 2;
  let left = x;
  while (left > 0 && x - left < 20 && flux[offset + left]! - base > half) left--;
  let right = x;
  while (right < width - 1 && right - x < 20 && flux[offset + right]! - base > half) right++;
  return Math.min(Math.max((right - left) / 2.3548, 0.6), 8);
}

/** Fit every detected peak of one band spectrum (flux, variance and saturation at `offset`). */
export function measurePeaks(
  flux: Float64Array,
  variance: Float64Array,
  saturated: Uint8Array,
  offset: number,
  width: number,
  background: Float64Array,
  peakColumns: number[],
  blendSigma: number,
): ArcPeak[] {
  // Typed copies: the bands' column lists (integers) and widths (integers at the clamps, else
  // fractions) come in arrays of different element kinds, each of which had V8 compile this
  // function again.
  const columns = Float64Array.from(peakColumns);
  const nPeaks = columns.length;
  const guesses = new Float64Array(nPeaks);
  for (let k = 0; k < nPeaks; k++) guesses[k] = halfMaxSigma(flux, offset, width, columns[k]!, background[columns[k]!]!);
  const out: ArcPeak[] = [];
  for (let k = 0; k < nPeaks; k++) {
    const xp = columns[k]!;
    const s0 = guesses[k]!;
    const half = Math.max(3, Math.ceil(2.5 * s0));
    // stop the window half-way to a neighbour so that its wing does not pull the centroid
    const prev = k > 0 ? columns[k - 1]! : -Infinity;
    const next = k < nPeaks - 1 ? columns[k + 1]! : Infinity;
    const x0 = Math.max(0, xp - half, Math.floor((prev + xp) / 2) + 1);
    const x1 = Math.min(width - 1, xp + half, Math.ceil((xp + next) / 2) - 1);
    const n = x1 - x0 + 1;
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    const ws = new Float64Array(n);
    let sat = false;
    for (let i = 0; i < n; i++) {
      const x = x0 + i;
      xs[i] = x;
      const v = flux[offset + x]!;
      const e = variance[offset + x]!;
      ys[i] = v === v ? v : 0;
      ws[i] = v === v && e > 0 ? 1 / e : 0;
      if (saturated[offset + x]) sat = true;
    }
    const height = flux[offset + xp]! - background[xp]!;
    const neighbourBlend = [k - 1, k + 1].some((j) => {
      if (j < 0 || j >= nPeaks) return false;
      const sep = Math.abs(columns[j]! - xp);
      const hj = flux[offset + columns[j]!]! - background[columns[j]!]!;
      return sep < blendSigma * Math.max(s0, guesses[j]!) && hj > 0.1 * height;
    });
    if (n < 5) {
      out.push({ x: xp, xErr: NaN, sigma: s0, amplitude: height, snr: 0, blended: true, saturated: sat, converged: false });
      continue;
    }
    const fit = fitGaussianLine(xs, ys, ws, { amplitude: height, centre: xp, sigma: s0, c0: background[xp]! }, { centreRange: [xp - 1.5, xp + 1.5] });
    const noise = Math.sqrt(variance[offset + xp]!);
    out.push({
      x: fit.centre,
      xErr: fit.errors.centre,
      sigma: fit.sigma,
      amplitude: fit.amplitude,
      snr: fit.amplitude / noise,
      blended: neighbourBlend,
      saturated: sat,
      converged: fit.converged && !fit.atBound && fit.amplitude > 0 && Number.isFinite(fit.errors.centre),
    });
  }
  markWide(out);
  return out;
}

function markWide(peaks: ArcPeak[]): void {
  const sig = peaks.filter((p) => p.converged && !p.blended && !p.saturated).map((p) => p.sigma).sort((a, b) => a - b);
  if (sig.length < 3) return;
  const med = sig[sig.length >> 1]!;
  for (const p of peaks) if (p.sigma > WIDE_FACTOR * med) p.blended = true;
}

/** A peak the solution may use. */
export function isClean(p: ArcPeak): boolean {
  return p.converged && !p.blended && !p.saturated;
}
