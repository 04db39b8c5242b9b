/**
 * Adaptive binning: the central bin takes rows alternately above and below the centre row, then
 * each side walks outward, adding rows to a bin until the binning line's quick S/N reaches the
 * target or the bin holds maxBinRows. Each bin is fitted at once and its velocity and width start
 * the next bin on that side (a rotation curve moves the line from bin to bin). A side stops after
 * maxFailedBins bins in a row below the target; bins below S/N 3 are dropped.
 */
import { SPEED_OF_LIGHT_KMS as C } from '../../physics/constants.js';
import type { CalibratedFrame } from '../../products/frame.js';
import type { RowBin } from '../../products/lines.js';
import type { GroupWindow, InstrumentalSigma, VelocityState } from './bin-fits.js';
import { BinSpectrum } from './bin-spectrum.js';
import { quickFlux } from './quick-flux.js';
import type { LineSettings } from './settings.js';

/** Bins below this quick S/N carry no usable line and are dropped (common practice for a detection). */
export const MIN_BIN_SNR = 3;

export interface WalkContext {
  frame: CalibratedFrame;
  wave: Float64Array;
  badBits: number;
  settings: LineSettings;
  /** Rest wavelength of the binning line and where it sits among the groups. */
  binRest: number;
  binGroup: number;
  binMember: number;
  instrumental: InstrumentalSigma;
  fit: (bin: BinSpectrum, state: VelocityState) => (GroupWindow | null)[];
  /** Columns [x0, x1) that hold every fitted line's window at this velocity. */
  columns: (state: VelocityState) => [number, number];
}

export interface BinRecord {
  bin: RowBin;
  quickSnr: number;
  groups: (GroupWindow | null)[];
}

export function binRows(ctx: WalkContext, centreRow: number, start: VelocityState): BinRecord[] {
  const { frame } = ctx;
  const usable = usableRows(ctx);
  const row = new BinSpectrum(frame, ctx.wave, ctx.badBits);
  const bin = new BinSpectrum(frame, ctx.wave, ctx.badBits);
  const records: BinRecord[] = [];

  const central = grow(ctx, bin, row, usable, centralOrder(centreRow, frame.height), start);
  let upState = start;
  let downState = start;
  let lo = centreRow;
  let hi = centreRow;
  if (central) {
    lo = central.bin.rowStart;
    hi = central.bin.rowEnd;
    if (central.quickSnr >= MIN_BIN_SNR) {
      records.push(central);
      upState = downState = nextState(ctx, central, start);
    }
  }
  for (const step of [1, -1]) {
    let state = step > 0 ? upState : downState;
    let y = step > 0 ? hi + 1 : lo - 1;
    let failed = 0;
    while (y >= 0 && y < frame.height && failed < ctx.settings.maxFailedBins) {
      const rec = grow(ctx, bin, row, usable, sideOrder(y, step, frame.height), state);
      if (rec === null) break;
      y = step > 0 ? rec.bin.rowEnd + 1 : rec.bin.rowStart - 1;
      failed = rec.quickSnr >= ctx.settings.snrTarget ? 0 : failed + 1;
      if (rec.quickSnr < MIN_BIN_SNR) continue;
      records.push(rec);
      state = nextState(ctx, rec, state);
    }
  }
  return records;
}

function usableRows(ctx: WalkContext): Uint8Array {
  const { width, height, mask } = ctx.frame;
  const out = new Uint8Array(height);
  for (let y = 0; y < height; y++) {
    let good = 0;
    for (let x = 0; x < width; x++) if ((mask[y * width + x]! & ctx.badBits) === 0) good++;
    out[y] = good >= width / 2 ? 1 : 0;
  }
  return out;
}

function* centralOrder(c: number, height: number): Generator<number> {
  yield c;
  for (let k = 1; k < height; k++) {
    if (c + k < height) yield c + k;
    if (c - k >= 0) yield c - k;
    if (c + k >= height && c - k < 0) return;
  }
}

function* sideOrder(y: number, step: number, height: number): Generator<number> {
  for (let r = y; r >= 0 && r < height; r += step) yield r;
}

/** Fill `bin` from `rows` until the target S/N or maxBinRows; fit it. Null when no usable row was left. */
function grow(ctx: WalkContext, bin: BinSpectrum, row: BinSpectrum, usable: Uint8Array, rows: Iterable<number>, state: VelocityState): BinRecord | null {
  const { settings } = ctx;
  const centre = ctx.binRest * (1 + state.vKms / C);
  const [x0, x1] = ctx.columns(state);
  bin.reset(x0, x1);
  let snr = 0;
  let sigma = NaN;
  for (const y of rows) {
    if (!usable[y]) {
      if (bin.nRows === 0) continue;
      break;
    }
    row.reset(x0, x1);
    row.addRow(y, 1);
    if (sigma !== sigma) sigma = Math.max((state.sigmaKms / C) * centre, ctx.instrumental(row.columnOf(centre), y));
    const one = quickFlux(row, centre, sigma);
    // Wavelengths of the bin are weighted by each row's line flux (at least its 1-sigma error).
    bin.addRow(y, Math.max(one.flux, one.err, 1e-6));
    snr = quickFlux(bin, centre, sigma).snr;
    if (snr >= settings.snrTarget || bin.nRows >= settings.maxBinRows) break;
  }
  if (bin.nRows === 0) return null;
  const rec: BinRecord = { bin: { rowStart: bin.rowStart, rowEnd: bin.rowEnd, yCentre: bin.yCentre }, quickSnr: snr, groups: [] };
  if (snr >= MIN_BIN_SNR) rec.groups = ctx.fit(bin, state);
  return rec;
}

/** The next bin starts from this bin's binning-group fit when that fit is sound. */
function nextState(ctx: WalkContext, rec: BinRecord, previous: VelocityState): VelocityState {
  const g = rec.groups[ctx.binGroup];
  if (!g) return previous;
  const f = g.fit;
  const k = ctx.binMember;
  const snr = f.fluxErr[k]! > 0 ? f.flux[k]! / f.fluxErr[k]! : 0;
  if (!f.converged || f.shapeAtBound || snr < MIN_BIN_SNR) return previous;
  return { vKms: C * (f.centre / g.spec.rest[0]! - 1), sigmaKms: (C * f.sigma) / f.centre };
}
