/**
 * The row-fit data of the report, packed for the page: per group a small JSON header and, in one
 * base64 blob, int16 arrays quantised for display (wavelength in 0.1 mA steps about a straight
 * line through the first and last pixel, data / error / model in steps of 1/30000 of the group's
 * largest value). About a
 * third of the size of the same numbers as JSON text, and read by the page with typed arrays.
 */
import type { BinFit } from '../products/lines.js';

export interface PackedGroup {
  /** Group name. */
  g: string;
  /** Number of pixels. */
  n: number;
  /** Wavelength of pixel i: w0 + i wd + ws q_i (Angstrom), q_i the stored offset. */
  w0: number;
  wd: number;
  ws: number;
  /** Step of the stored data, error and model values (electrons). */
  vs: number;
  /** Offset of this group's arrays in the blob, in int16 units. */
  o: number;
  /** Indices of the pixels left out of the fit. */
  x: number[];
}

export interface PackedFits {
  /** Per panel, its groups. */
  panels: PackedGroup[][];
  /** base64 of the int16 arrays (little-endian), four arrays of n per group: w, d, e, m. */
  blob: string;
}

const WAVE_STEP = 1e-4;
const LEVELS = 30000;

export function packFits(panels: BinFit[][]): PackedFits {
  let total = 0;
  for (const p of panels) for (const f of p) total += 4 * f.wavelength.length;
  const bytes = new Uint8Array(2 * total);
  const view = new DataView(bytes.buffer);
  const put = (index: number, value: number) => view.setInt16(2 * index, value, true);
  let o = 0;
  const out: PackedGroup[][] = panels.map((fits) =>
    fits.map((f) => {
      const n = f.wavelength.length;
      const w0 = Number(f.wavelength[0]!.toFixed(4));
      const wd = n > 1 ? Number(((f.wavelength[n - 1]! - w0) / (n - 1)).toFixed(7)) : 0;
      let vmax = 0;
      for (let i = 0; i < n; i++) vmax = Math.max(vmax, Math.abs(f.data[i]!) || 0, Math.abs(f.model[i]!) || 0, Math.abs(f.error[i]!) || 0);
      const vs = vmax > 0 ? Number((vmax / LEVELS).toPrecision(6)) : 1;
      const x: number[] = [];
      for (let i = 0; i < n; i++) {
        put(o + i, quantise(f.wavelength[i]! - w0 - i * wd, WAVE_STEP));
        put(o + n + i, quantise(f.data[i]!, vs));
        put(o + 2 * n + i, quantise(f.error[i]!, vs));
        put(o + 3 * n + i, quantise(f.model[i]!, vs));
        if (f.excluded[i]) x.push(i);
      }
      const group: PackedGroup = { g: f.group, n, w0, wd, ws: WAVE_STEP, vs, o, x };
      o += 4 * n;
      return group;
    }),
  );
  return { panels: out, blob: Buffer.from(bytes.buffer).toString('base64') };
}

/** Round to a multiple of `step`; NaN (no value) is stored as -32768. */
function quantise(v: number, step: number): number {
  return Number.isFinite(v) ? Math.max(-32767, Math.min(32767, Math.round(v / step))) : -32768;
}
