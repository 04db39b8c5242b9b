/**
 * Master flat. The lamp flats (bias subtracted) are scaled to a common level and combined with
 * clipping against the noise model; the combination is then divided, row by row along the
 * dispersion, by a smooth Legendre fit, so that only the pixel-to-pixel sensitivity remains (or,
 * with flatKeepsIllumination, by one fitted spectral shape for all rows, which keeps the slit
 * illumination). Pixels too dark to divide by are masked and given the value 1.
 */
import { clippedMeanStack } from '../../kernels/combine.js';
import { fitLegendre1D } from '../../kernels/legendre-fit.js';
import { evalLegendre1D } from '../../kernels/legendre.js';
import { median } from '../../kernels/robust.js';
import { MASK_BITS } from '../../products/frame.js';
import { columnMedians } from './bad-columns.js';
import type { FlatSource } from './flat-source.js';
import { sampledMedian } from './level.js';
import { RowLegendreFitter } from './row-fit.js';
import type { CcdSettings } from './settings.js';

export interface CombinedFlat {
  /** ADU above bias at the common level, trimmed raw orientation. */
  data: Float32Array;
  /** The common level (mean of the frames' sampled medians), ADU. */
  levelAdu: number;
  count: number;
}

/** Lines combined at a time (small buffers instead of whole scaled frames). */
const BLOCK_LINES = 64;

/**
 * The flats of `source` (bias-subtracted, ADU), each scaled by levelAdu / its own sampled
 * median (the product rounded to float32, as a scaled frame holds it) and combined with
 * clipping, a block of lines at a time.
 */
export function combineFlats(source: FlatSource, gain: number, readNoiseE: number, settings: CcdSettings): CombinedFlat {
  const { width, height, count } = source;
  const n = width * height;
  const levels = Array.from({ length: count }, (_, i) => sampledMedian(n, (p) => source.valueAt(i, p)));
  const levelAdu = levels.reduce((a, b) => a + b, 0) / levels.length;
  const scales = levels.map((l) => levelAdu / l);
  const data = new Float32Array(n);
  const rnAdu = readNoiseE / gain;
  const options = { nSigma: settings.combineSigma, maxIterations: settings.combineIterations, noise: { constant: rnAdu * rnAdu, perSignal: 1 / gain } };
  const blocks = levels.map(() => new Float32Array(BLOCK_LINES * width));
  for (let y0 = 0; y0 < height; y0 += BLOCK_LINES) {
    const y1 = Math.min(height, y0 + BLOCK_LINES);
    const lines = blocks.map((b, i) => {
      const block = b.subarray(0, (y1 - y0) * width);
      source.lines(i, y0, y1, block);
      scaleBlock(block, scales[i]!);
      return block;
    });
    clippedMeanStack(lines, data.subarray(y0 * width, y1 * width), options);
  }
  return { data, levelAdu, count };
}

function scaleBlock(block: Float32Array, k: number): void {
  for (let p = 0; p < block.length; p++) block[p] = block[p]! * k;
}

export interface NormalisedFlat {
  /** Normalised flat, internal orientation; 1 where masked. */
  flat: Float32Array;
  /** Variance of each value of `flat` from the counts of the combination. */
  variance: Float32Array;
  /** zeroFlat and outsideData bits (and the excluded bits passed in). */
  mask: Uint16Array;
  /** The smooth model the combination was divided by, ADU, for the report. */
  model: Float32Array;
  /** Rows (internal) without enough illuminated pixels to fit; wholly outsideData. */
  unfitRows: number[];
}

/**
 * `combined`: the combined flat in the internal orientation (ADU). `exclude`: pixels left out
 * of the fits (bad columns), kept in the mask. Variance of the combination per pixel, ADU^2:
 * (C / g + (RN / g)^2 + var(bias)) / nFlats. `knownColumnMedians`: the column medians of
 * `combined` when already at hand (they are not computed again).
 */
export function normaliseFlat(
  combined: Float32Array,
  width: number,
  height: number,
  exclude: Uint16Array,
  noise: { gain: number; readNoiseE: number; biasVarianceAdu: number; count: number },
  settings: CcdSettings,
  knownColumnMedians?: Float64Array,
): NormalisedFlat {
  const n = width * height;
  const mask = exclude.slice();
  markUnlit(combined, width, height, settings.illuminationMinimum, mask, knownColumnMedians);
  const model = new Float32Array(n);
  const flat = new Float32Array(n);
  const variance = new Float32Array(n);
  const unfitRows: number[] = [];
  const order = settings.flatOrder;
  const fitOptions = { clipSigma: 3, maxIterations: 3 };
  if (settings.flatKeepsIllumination) {
    // One spectral shape: column medians over the illuminated rows, fitted along x.
    const xs = new Float64Array(width);
    for (let x = 0; x < width; x++) xs[x] = x;
    const weights = new Float64Array(width);
    const shape = new Float64Array(width);
    const column = new Float64Array(height);
    for (let x = 0; x < width; x++) {
      let k = 0;
      for (let y = 0; y < height; y++) if (!(mask[y * width + x]! & MASK_BITS.outsideData)) column[k++] = combined[y * width + x]!;
      shape[x] = k > 0 ? median(column.subarray(0, k)) : NaN;
      weights[x] = k > 0 ? 1 : 0;
    }
    const fit = fitLegendre1D(xs, shape.map((v) => (v === v ? v : 0)), weights, order, { min: 0, max: width - 1 }, fitOptions);
    const values = new Float64Array(width);
    for (let x = 0; x < width; x++) values[x] = evalLegendre1D(fit.model, x);
    let sum = 0;
    let count = 0;
    for (let i = 0; i < n; i++) {
      if (!mask[i]) {
        sum += combined[i]! / values[i % width]!;
        count++;
      }
    }
    const mean = count > 0 ? sum / count : 1; // normalise the illumination to a mean of 1
    for (let i = 0; i < n; i++) model[i] = values[i % width]! * mean;
    divideByModel(combined, model, mask, noise, settings.flatMinimum, flat, variance, 0, n);
  } else {
    const fitter = new RowLegendreFitter(width, order);
    const usable = new Uint8Array(width);
    for (let y = 0; y < height; y++) {
      const row = combined.subarray(y * width, (y + 1) * width);
      const rowModel = model.subarray(y * width, (y + 1) * width);
      // Bad columns stay out of the fit, unless they are the whole row (a transposed frame).
      const fitted =
        (rowUsable(mask, y, width, MASK_BITS.outsideData | MASK_BITS.badColumn, usable) >= 2 * (order + 1) && fitter.fit(row, usable, rowModel, fitOptions)) ||
        (rowUsable(mask, y, width, MASK_BITS.outsideData, usable) >= 2 * (order + 1) && fitter.fit(row, usable, rowModel, fitOptions));
      if (!fitted) {
        unfitRows.push(y);
        for (let x = 0; x < width; x++) {
          mask[y * width + x] = mask[y * width + x]! | MASK_BITS.outsideData;
          model[y * width + x] = 1;
        }
      }
      // Each row divided while its values are still in cache.
      divideByModel(combined, model, mask, noise, settings.flatMinimum, flat, variance, y * width, (y + 1) * width);
    }
  }
  return { flat, variance, mask, model, unfitRows };
}

/**
 * flat = combined / model and its variance at pixels from .. to - 1, or 1 and 0 (zeroFlat unless
 * outsideData) where the pixel is outsideData or below `minimum`. A function of one loop, so V8
 * compiles it once.
 */
function divideByModel(
  combined: Float32Array,
  model: Float32Array,
  mask: Uint16Array,
  noise: { gain: number; readNoiseE: number; biasVarianceAdu: number; count: number },
  minimum: number,
  flat: Float32Array,
  variance: Float32Array,
  from: number,
  to: number,
): void {
  const g = noise.gain;
  const rnAdu2 = (noise.readNoiseE / g) ** 2;
  const { biasVarianceAdu, count } = noise;
  for (let i = from; i < to; i++) {
    const c = combined[i]!;
    const value = c / model[i]!;
    if (mask[i]! & MASK_BITS.outsideData || !(value >= minimum)) {
      if (!(mask[i]! & MASK_BITS.outsideData)) mask[i] = mask[i]! | MASK_BITS.zeroFlat;
      flat[i] = 1;
      variance[i] = 0;
      continue;
    }
    flat[i] = value;
    variance[i] = (c / g + rnAdu2 + biasVarianceAdu) / count / (model[i]! * model[i]!);
  }
}

/** usable[x] = 0 where the row's mask has any of `bits`, else 1; returns the count of ones. */
function rowUsable(mask: Uint16Array, y: number, width: number, bits: number, usable: Uint8Array): number {
  let count = 0;
  for (let x = 0; x < width; x++) {
    usable[x] = mask[y * width + x]! & bits ? 0 : 1;
    count += usable[x]!;
  }
  return count;
}

/**
 * outsideData for whole rows (slit ends) and whole columns (ends of the lamp's range) whose median
 * is below `fraction` of the median of all rows' (columns') medians; single dark pixels inside the
 * lit area are left to the zeroFlat test.
 */
function markUnlit(combined: Float32Array, width: number, height: number, fraction: number, mask: Uint16Array, knownColumnMedians?: Float64Array): void {
  const rows = new Float64Array(height);
  const scratch = new Float64Array(width);
  for (let y = 0; y < height; y++) rows[y] = median(combined.subarray(y * width, (y + 1) * width), scratch);
  const cols = knownColumnMedians ?? columnMedians(combined, width, height);
  const rowLimit = fraction * median(rows);
  const colLimit = fraction * median(cols);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      if (!(rows[y]! >= rowLimit) || !(cols[x]! >= colLimit)) mask[y * width + x] = mask[y * width + x]! | MASK_BITS.outsideData;
    }
  }
}
