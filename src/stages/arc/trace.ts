/**
 * Tracing identified lines along the slit: from the central band outwards, each band's nearest
 * clean peak to the position predicted from the previous bands (position plus the last slope)
 * continues the trace; it stops at the third band in a row without a peak within the tolerance.
 */

export interface TracePeak {
  /** Oriented x (wavelength increasing), pixels. */
  x: number;
  xErr: number;
  sigma: number;
}

export interface TracedPoint {
  /** Index of the traced line (in the order given). */
  line: number;
  band: number;
  x: number;
  xErr: number;
  sigma: number;
}

const MAX_MISSES = 2;

function nearest(peaks: TracePeak[], x: number): number {
  let lo = 0;
  let hi = peaks.length - 1;
  if (hi < 0) return -1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (peaks[mid]!.x < x) lo = mid;
    else hi = mid;
  }
  return Math.abs(peaks[lo]!.x - x) <= Math.abs(peaks[hi]!.x - x) ? lo : hi;
}

/**
 * @param bandPeaks clean peaks per band, each list sorted by x.
 * @param start the lines' peaks in the central band.
 */
export function traceLines(bandPeaks: TracePeak[][], centralBand: number, start: TracePeak[], tolerancePx: number): TracedPoint[] {
  const out: TracedPoint[] = [];
  start.forEach((p, line) => {
    out.push({ line, band: centralBand, x: p.x, xErr: p.xErr, sigma: p.sigma });
    for (const dir of [1, -1]) {
      let lastX = p.x;
      let lastBand = centralBand;
      let slope = 0;
      for (let b = centralBand + dir; b >= 0 && b < bandPeaks.length; b += dir) {
        const predicted = lastX + slope * (b - lastBand);
        const list = bandPeaks[b]!;
        const k = nearest(list, predicted);
        if (k >= 0 && Math.abs(list[k]!.x - predicted) <= tolerancePx) {
          const q = list[k]!;
          slope = (q.x - lastX) / (b - lastBand);
          lastX = q.x;
          lastBand = b;
          out.push({ line, band: b, x: q.x, xErr: q.xErr, sigma: q.sigma });
        } else if (Math.abs(b - lastBand) > MAX_MISSES) break;
      }
    }
  });
  return out;
}
