/** A simulated frame as the pipeline's reader would give it, and as a FITS file. */
import type { RawFrame } from '../products/frame.js';
import type { SimFrame } from './simulate.js';

/** The RawFrame the FITS reader would return for this frame (physical ADU as Float32), without a file. */
export function simFrameToRaw(frame: SimFrame): RawFrame {
  const data = new Float32Array(frame.adu.length);
  for (let i = 0; i < data.length; i++) data[i] = frame.adu[i]!;
  return { path: frame.name, hdu: 0, header: frame.header.clone(), width: frame.width, height: frame.height, data };
}
