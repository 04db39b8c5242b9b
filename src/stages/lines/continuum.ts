/** Continuum per row: the median over good pixels away from the emission lines (electrons per pixel). */
import { medianOfBuffer } from '../../kernels/robust.js';
import type { CalibratedFrame } from '../../products/frame.js';

/** `exclude`: wavelength intervals (Angstrom) to leave out, e.g. each line +- its velocity range. */
export function continuumProfile(frame: CalibratedFrame, wave: Float64Array, exclude: [number, number][], badBits: number): Float64Array {
  const { width, height, sci, mask } = frame;
  const out = new Float64Array(height);
  const buf = new Float64Array(width);
  for (let y = 0; y < height; y++) {
    let n = 0;
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if ((mask[i]! & badBits) !== 0 || !Number.isFinite(sci[i]!)) continue;
      const l = wave[i]!;
      let inLine = false;
      for (const [a, b] of exclude) if (l >= a && l <= b) inLine = true;
      if (!inLine) buf[n++] = sci[i]!;
    }
    out[y] = medianOfBuffer(buf, n);
  }
  return out;
}
