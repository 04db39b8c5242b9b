/**
 * A quick linear estimate of one line's flux at a known centre and width: the optimal
 * (matched-filter) weighted estimate F = sum w p (d - c) / sum w p^2 with error
 * 1 / sqrt(sum w p^2), p the Gaussian profile per pixel and c the median of the sidebands
 * 4-8 sigma either side. Used to grow bins and to weight rows, not as a measurement.
 */
import { medianOfBuffer } from '../../kernels/robust.js';
import { lowerIndex } from '../../kernels/sorted-search.js';

export interface SpectrumView {
  wave: Float64Array;
  pixelWidth: Float64Array;
  sci: Float64Array | Float32Array;
  var: Float64Array | Float32Array;
  /** 1 where a column is excluded. */
  bad: Uint8Array;
}

const scratch = new Float64Array(512);
const INV_ROOT_2PI = 1 / Math.sqrt(2 * Math.PI);

export function quickFlux(s: SpectrumView, centre: number, sigma: number): { flux: number; err: number; snr: number } {
  const n = s.wave.length;
  const a = lowerIndex(s.wave, centre - 8 * sigma);
  const b = Math.min(n, lowerIndex(s.wave, centre + 8 * sigma));
  let k = 0;
  for (let i = a; i < b && k < scratch.length; i++) {
    const d = Math.abs(s.wave[i]! - centre);
    if (d >= 4 * sigma && !s.bad[i]) scratch[k++] = s.sci[i]!;
  }
  const cont = k > 0 ? medianOfBuffer(scratch, k) : 0;
  let num = 0;
  let den = 0;
  for (let i = a; i < b; i++) {
    const d = s.wave[i]! - centre;
    if (Math.abs(d) >= 3 * sigma || s.bad[i] || !(s.var[i]! > 0)) continue;
    const p = (s.pixelWidth[i]! * INV_ROOT_2PI * Math.exp((-0.5 * d * d) / (sigma * sigma))) / sigma;
    const w = 1 / s.var[i]!;
    num += w * p * (s.sci[i]! - cont);
    den += w * p * p;
  }
  if (!(den > 0)) return { flux: 0, err: Infinity, snr: 0 };
  const flux = num / den;
  const err = 1 / Math.sqrt(den);
  return { flux, err, snr: flux / err };
}
