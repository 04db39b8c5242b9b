/** Arc spectra of row bands: the mean over the good rows of each band, per column. */
import { MASK_BITS, type CalibratedFrame } from '../../products/frame.js';

export interface BandSpectra {
  width: number;
  nBands: number;
  /** First row (inclusive) and last row (exclusive) of each band, internal 0-based. */
  rowStart: Int32Array;
  rowEnd: Int32Array;
  /** Centre of each band, internal row (fractional). */
  yCentre: Float64Array;
  /** Mean electrons per pixel over the good rows, band-major (band * width + x); NaN where no row is good. */
  flux: Float64Array;
  /** Variance of that mean, electrons squared. */
  variance: Float64Array;
  /** 1 where any pixel of the band column is flagged saturated. */
  saturated: Uint8Array;
}

/** Bands of `rowBand` rows from the bottom; the last band takes the leftover rows when they are fewer than half a band. */
export function extractBands(frame: CalibratedFrame, rowBand: number): BandSpectra {
  // The frame's arrays in locals: the pixel loop then does not reload them from the frame.
  const { width, height, mask, sci } = frame;
  const variance = frame.var;
  const size = Math.max(1, Math.min(Math.round(rowBand), height));
  let nBands = Math.floor(height / size);
  if (height - nBands * size >= size / 2 || nBands === 0) nBands++;
  const rowStart = new Int32Array(nBands);
  const rowEnd = new Int32Array(nBands);
  const yCentre = new Float64Array(nBands);
  for (let b = 0; b < nBands; b++) {
    rowStart[b] = b * size;
    rowEnd[b] = b === nBands - 1 ? height : (b + 1) * size;
    yCentre[b] = (rowStart[b]! + rowEnd[b]! - 1) / 2;
  }
  const flux = new Float64Array(nBands * width);
  const meanVar = new Float64Array(nBands * width);
  const saturated = new Uint8Array(nBands * width);
  const count = new Float64Array(width);
  const notUsable = MASK_BITS.badColumn | MASK_BITS.cosmicRay | MASK_BITS.zeroFlat | MASK_BITS.outsideData;
  for (let b = 0; b < nBands; b++) {
    const off = b * width;
    count.fill(0);
    for (let y = rowStart[b]!; y < rowEnd[b]!; y++) {
      const row = y * width;
      for (let x = 0; x < width; x++) {
        const m = mask[row + x]!;
        if (m & MASK_BITS.saturated) saturated[off + x] = 1;
        if (m & notUsable) continue;
        const v = sci[row + x]!;
        const e = variance[row + x]!;
        if (!(v === v) || !(e === e)) continue;
        flux[off + x] += v;
        meanVar[off + x] += e;
        count[x]++;
      }
    }
    for (let x = 0; x < width; x++) {
      const n = count[x]!;
      if (n > 0) {
        flux[off + x] /= n;
        meanVar[off + x] /= n * n;
      } else {
        flux[off + x] = NaN;
        meanVar[off + x] = NaN;
      }
    }
  }
  return { width, nBands, rowStart, rowEnd, yCentre, flux, variance: meanVar, saturated };
}
