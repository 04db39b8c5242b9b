/**
 * A minimal PNG encoder (8-bit greyscale, PNG specification, W3C 2003) so the report can embed
 * the 2-D spectrum as a data URI without a dependency.
 */
import { deflateSync } from 'node:zlib';
import { bucketSelect } from '../kernels/robust.js';

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 as used by PNG chunks (ISO 3309 / ITU-T V.42 polynomial). */
export function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (let i = 0; i < bytes.length; i++) c = CRC_TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

/** Encode `grey` (width x height, row-major, 0 = black) as a PNG file. */
export function encodeGreyPng(grey: Uint8Array, width: number, height: number): Uint8Array {
  const ihdr = new Uint8Array(13);
  const v = new DataView(ihdr.buffer);
  v.setUint32(0, width);
  v.setUint32(4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 0; // colour type: greyscale
  const raw = new Uint8Array(height * (width + 1));
  for (let y = 0; y < height; y++) raw.set(grey.subarray(y * width, (y + 1) * width), y * (width + 1) + 1); // filter byte 0
  const parts = [
    new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(raw, { level: 6 })),
    chunk('IEND', new Uint8Array(0)),
  ];
  const total = parts.reduce((n, p) => n + p.length, 0);
  const png = new Uint8Array(total);
  let o = 0;
  for (const p of parts) {
    png.set(p, o);
    o += p.length;
  }
  return png;
}

/** Cells of the lookup table from the stretched value t in [0, 1] to a grey level. */
const CELLS = 65536;
/** A cell's level is trusted when the level function at both its ends is this far from a rounding edge. */
const EDGE_MARGIN = 1e-6;

/**
 * Display scaling for an image: asinh stretch between the 1st and 99.5th percentiles of the finite
 * values (a display choice, common practice for emission-line spectra), inverted so lines are dark.
 */
export function stretchToGrey(data: Float32Array): Uint8Array {
  const finite = new Float32Array(data.length);
  let count = 0;
  for (let i = 0; i < data.length; i++) if (Number.isFinite(data[i]!)) finite[count++] = data[i]!;
  const grey = new Uint8Array(data.length);
  if (count === 0) return grey.fill(255);
  // Two order statistics by selection (the values a full sort would put there).
  const hi = bucketSelect(finite, count, Math.floor(0.995 * (count - 1)));
  const lo = bucketSelect(finite, count, Math.floor(0.01 * (count - 1)));
  const span = hi > lo ? hi - lo : 1;
  const soft = 0.05;
  const norm = Math.asinh(1 / soft);
  const scaled = (t: number) => (255 * Math.asinh(t / soft)) / norm;
  const table = levelTable(scaled);
  for (let i = 0; i < data.length; i++) {
    const v = data[i]!;
    const t = Number.isFinite(v) ? Math.min(1, Math.max(0, (v - lo) / span)) : 0;
    const level = table[(t * CELLS) | 0]!;
    grey[i] = 255 - (level >= 0 ? level : Math.round(scaled(t)));
  }
  return grey;
}

/**
 * round(scaled(t)) for every t of a cell [c, c + 1) / CELLS where it is the same at both ends, -1
 * where the caller must compute it (the cells with a rounding edge, under 2 % at this size). Exact:
 * scaled is increasing and computed within a few ulps (< 1e-12 here) of its true value, so when
 * both ends are more than EDGE_MARGIN inside one rounding interval, so is every t between them.
 * Math.asinh per pixel was most of the report's rendering time.
 */
function levelTable(scaled: (t: number) => number): Int16Array {
  const table = new Int16Array(CELLS + 1);
  let right = scaled(0);
  for (let c = 0; c < CELLS; c++) {
    const left = right;
    right = scaled((c + 1) / CELLS);
    const k = Math.round(left);
    const inside = (x: number) => Math.abs(x - k) < 0.5 - EDGE_MARGIN;
    table[c] = inside(left) && inside(right) ? k : -1;
  }
  table[CELLS] = -1; // t = 1 exactly
  return table;
}
