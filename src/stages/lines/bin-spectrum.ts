/**
 * The spectrum of a bin of rows: pixels of the same column summed over the bin's rows (data and
 * variance), each column given the weighted mean wavelength of its pixels, weights being each
 * row's line flux. For one row this is the row itself on its native pixels; for several it equals
 * a joint fit to their native pixels to first order in the line tilt across the bin (the sum of
 * slightly shifted Gaussians is centred on the weighted mean shift). Nothing is interpolated.
 * A column with a masked pixel in any row of the bin is excluded. Only the columns [x0, x1) set at
 * reset are summed (the span of the fitted lines), so a bin costs its lines' width, not the frame's.
 */
import type { CalibratedFrame } from '../../products/frame.js';

export class BinSpectrum {
  rowStart = 0;
  rowEnd = -1;
  /** Summed columns, [x0, x1). */
  x0 = 0;
  x1 = 0;
  /** Weighted centre row. */
  yCentre = NaN;
  readonly wave: Float64Array;
  readonly pixelWidth: Float64Array;
  readonly sci: Float64Array;
  readonly var: Float64Array;
  readonly bad: Uint8Array;
  private readonly waveSum: Float64Array;
  private weightSum = 0;
  private rowSum = 0;
  private rows = 0;

  constructor(
    readonly frame: CalibratedFrame,
    readonly frameWave: Float64Array,
    /** Mask bits that exclude a pixel. */
    readonly badBits: number,
  ) {
    const w = frame.width;
    this.wave = new Float64Array(w);
    this.pixelWidth = new Float64Array(w);
    this.sci = new Float64Array(w);
    this.var = new Float64Array(w);
    this.bad = new Uint8Array(w);
    this.waveSum = new Float64Array(w);
    // Outside the summed columns the central row's wavelengths keep `wave` increasing for searches.
    const mid = Math.floor(frame.height / 2) * w;
    this.wave.set(frameWave.subarray(mid, mid + w));
    this.x1 = w;
  }

  get nRows(): number {
    return this.rows;
  }

  /** Empty the bin and sum columns [x0, x1) from now on (default: all). */
  reset(x0 = 0, x1 = this.frame.width): void {
    this.x0 = Math.max(0, x0);
    this.x1 = Math.min(this.frame.width, x1);
    this.sci.fill(0, this.x0, this.x1);
    this.var.fill(0, this.x0, this.x1);
    this.bad.fill(1);
    this.bad.fill(0, this.x0, this.x1);
    this.waveSum.fill(0, this.x0, this.x1);
    this.weightSum = 0;
    this.rowSum = 0;
    this.rows = 0;
    this.rowStart = 0;
    this.rowEnd = -1;
  }

  /** Add row y with wavelength weight `weight` (> 0; the row's line flux, or 1). */
  addRow(y: number, weight: number): void {
    addPixels(this.frame, this.frameWave, this.badBits, y, weight, this.x0, this.x1, this.sci, this.var, this.bad, this.waveSum);
    this.weightSum += weight;
    this.rowSum += weight * y;
    // Both bounds computed on every row: a first-row-only path would deoptimise this method
    // the first time a second row arrives.
    const first = this.rows === 0;
    const lo = Math.min(this.rowStart, y);
    const hi = Math.max(this.rowEnd, y);
    this.rowStart = first ? y : lo;
    this.rowEnd = first ? y : hi;
    this.rows++;
    meanWave(this.waveSum, this.weightSum, this.x0, this.x1, this.wave);
    pixelWidths(this.wave, this.x0, this.x1, this.pixelWidth);
    this.yCentre = this.rowSum / this.weightSum;
  }

  /** Fractional column of wavelength lambda (linear between column centres), clamped to the frame. */
  columnOf(lambda: number): number {
    const w = this.wave;
    let lo = 0;
    let hi = w.length - 1;
    if (lambda <= w[0]!) return 0;
    if (lambda >= w[hi]!) return hi;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (w[mid]! <= lambda) lo = mid;
      else hi = mid;
    }
    return lo + (lambda - w[lo]!) / (w[hi]! - w[lo]!);
  }
}

// The pixel loops are functions of their own: code after a long loop in the same function was
// compiled on the stack mid-loop without feedback, and deoptimised when first reached.

/** Sum row y's good pixels of columns [x0, x1) into sci and var (marking bad columns), its weighted wavelengths into waveSum. */
function addPixels(frame: CalibratedFrame, frameWave: Float64Array, badBits: number, y: number, weight: number, x0: number, x1: number, sciSum: Float64Array, varSum: Float64Array, bad: Uint8Array, waveSum: Float64Array): void {
  const { width, sci, var: variance, mask } = frame;
  const row = y * width;
  for (let x = x0; x < x1; x++) {
    const i = row + x;
    const v = variance[i]!;
    if ((mask[i]! & badBits) !== 0 || !(v > 0) || !Number.isFinite(sci[i]!)) bad[x] = 1;
    else {
      sciSum[x] += sci[i]!;
      varSum[x] += v;
    }
    waveSum[x] += weight * frameWave[i]!;
  }
}

function meanWave(waveSum: Float64Array, weightSum: number, x0: number, x1: number, wave: Float64Array): void {
  for (let x = x0; x < x1; x++) wave[x] = waveSum[x]! / weightSum;
}

/** Width of each column: half the distance between its neighbours (one-sided at the ends). */
function pixelWidths(wave: Float64Array, x0: number, x1: number, pixelWidth: Float64Array): void {
  for (let x = x0; x < x1; x++) {
    const lo = wave[Math.max(x0, x - 1)]!;
    const hi = wave[Math.min(x1 - 1, x + 1)]!;
    pixelWidth[x] = (hi - lo) / (x === x0 || x === x1 - 1 ? 1 : 2);
  }
}
