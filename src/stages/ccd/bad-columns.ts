/**
 * Hot and bad detector columns (raw orientation): a column whose median stands out from the
 * medians of its neighbouring columns, in the master bias (hot: extra charge) or in the combined
 * flat (low or high response). Threshold: badColumnSigma robust sigmas of that difference over
 * all columns, and at least one read-noise sigma (bias) or 5% (flat) (common practice).
 */
import { madSigma, medianOfBuffer } from '../../kernels/robust.js';

/** Columns compared with a running median over this many columns each side. */
const NEIGHBOURS = 7;
/** Smallest flat departure that counts, fraction (common practice). */
const FLAT_FLOOR = 0.05;

export interface BadColumnSearch {
  /** 0-based x in the trimmed raw frame. */
  columns: number[];
  /** Why each column was flagged, in the same order. */
  reasons: ('bias' | 'flat')[];
  /** The flat's column medians (trimmed raw orientation), null without a flat: normaliseFlat can reuse them. */
  flatColumnMedians: Float64Array | null;
}

export function findBadColumns(
  bias: Float32Array | null,
  flat: Float32Array | null,
  width: number,
  height: number,
  readNoiseAdu: number,
  sigma: number,
): BadColumnSearch {
  const flagged = new Map<number, 'bias' | 'flat'>();
  if (bias) {
    const dev = departures(columnMedians(bias, width, height), false);
    const limit = Math.max(sigma * madSigma(dev), readNoiseAdu);
    for (let x = 0; x < width; x++) if (Math.abs(dev[x]!) > limit) flagged.set(x, 'bias');
  }
  const flatColumnMedians = flat ? columnMedians(flat, width, height) : null;
  if (flatColumnMedians) {
    const dev = departures(flatColumnMedians, true);
    const limit = Math.max(sigma * madSigma(dev), FLAT_FLOOR);
    for (let x = 0; x < width; x++) if (Math.abs(dev[x]!) > limit && !flagged.has(x)) flagged.set(x, 'flat');
  }
  const columns = [...flagged.keys()].sort((a, b) => a - b);
  return { columns, reasons: columns.map((x) => flagged.get(x)!), flatColumnMedians };
}

/** Columns copied out together: one pass down the image per block instead of one strided pass per column. */
const COLUMN_BLOCK = 32;

/**
 * The median of each column of a width x height image (NaN ignored). Each column's finite values
 * are copied out in order of y, as median() would copy them, and searched in place.
 */
export function columnMedians(image: Float32Array, width: number, height: number): Float64Array {
  const out = new Float64Array(width);
  const block = new Float64Array(COLUMN_BLOCK * height);
  const counts = new Int32Array(COLUMN_BLOCK);
  for (let x0 = 0; x0 < width; x0 += COLUMN_BLOCK) {
    const nb = Math.min(COLUMN_BLOCK, width - x0);
    // A block without NaN (the usual case) is copied without the per-column counters.
    if (copyBlock(image, width, height, x0, nb, block)) counts.fill(height);
    else copyFiniteBlock(image, width, height, x0, nb, block, counts);
    for (let c = 0; c < nb; c++) out[x0 + c] = medianOfBuffer(block.subarray(c * height, (c + 1) * height), counts[c]!);
  }
  return out;
}

/** Columns x0 .. x0 + nb - 1 into block (column c at c * height, in order of y); false when any value is NaN. */
function copyBlock(image: Float32Array, width: number, height: number, x0: number, nb: number, block: Float64Array): boolean {
  let finite = 1;
  for (let y = 0; y < height; y++) {
    const from = y * width + x0;
    for (let c = 0; c < nb; c++) {
      const v = image[from + c]!;
      block[c * height + y] = v;
      finite &= +(v === v);
    }
  }
  return finite === 1;
}

/** As copyBlock, only the finite values of each column (their number into counts). */
function copyFiniteBlock(image: Float32Array, width: number, height: number, x0: number, nb: number, block: Float64Array, counts: Int32Array): void {
  counts.fill(0);
  for (let y = 0; y < height; y++) {
    const from = y * width + x0;
    for (let c = 0; c < nb; c++) {
      const v = image[from + c]!;
      if (v === v) block[c * height + counts[c]!++] = v;
    }
  }
}

/** Each value minus (or over, when `ratio`) the median of its neighbours within NEIGHBOURS, itself left out. */
function departures(values: Float64Array, ratio: boolean): Float64Array {
  const n = values.length;
  const out = new Float64Array(n);
  const window = new Float64Array(2 * NEIGHBOURS);
  for (let x = 0; x < n; x++) {
    let k = 0;
    for (let j = Math.max(0, x - NEIGHBOURS); j <= Math.min(n - 1, x + NEIGHBOURS); j++) if (j !== x) window[k++] = values[j]!;
    const ref = k > 0 ? medianOfBuffer(window, k) : values[x]!;
    out[x] = ratio ? (ref !== 0 ? values[x]! / ref - 1 : 0) : values[x]! - ref;
  }
  return out;
}
