/** A simulated frame as the pipeline's reader would give it, and as a FITS file. */
import { Header } from '../fits/header.js';
import { writeFits } from '../fits/write.js';
import type { RawFrame } from '../products/frame.js';
import type { SimFrame } from './simulate.js';

/**
 * The RawFrame the FITS reader would return for this frame (unsigned 16-bit ADU), without a
 * file: path = the frame's relative name, HDU 0; the header holds the frame's own cards only
 * (no structural keywords).
 */
export function simFrameToRaw(frame: SimFrame): RawFrame {
  return { path: frame.name, hdu: 0, header: frame.header.clone(), width: frame.width, height: frame.height, data: frame.adu.slice() };
}

/** The frame as a FITS file: one primary image, BITPIX 16 with BZERO 32768 (unsigned 16-bit), checksums. */
export function simFrameToFits(frame: SimFrame): Uint8Array {
  return writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: frame.width, height: frame.height, data: frame.adu, header: frame.header }], { imageInPrimary: true });
}

/** A noiseless expected image (electrons, trimmed data section, raw orientation) as float32 FITS. */
export function expectedToFits(frameName: string, width: number, height: number, electrons: Float32Array): Uint8Array {
  const h = new Header();
  h.set('BUNIT', 'electron', 'expected electrons per pixel, no noise, no cosmic rays');
  h.set('SIMFRAME', frameName, 'raw frame this is the expectation of');
  h.comment('Trimmed data section (DATASEC) of the raw frame, raw orientation; bias, noise and cosmic rays excluded.');
  return writeFits([{ kind: 'image', bitpix: -32, width, height, data: electrons, header: h }], { imageInPrimary: true });
}
