/**
 * The calibrated frame the synthetic tests hand to a stage: `signal` (electrons per pixel) plus
 * seeded Gaussian noise of exactly the variance the frame states (photon noise of the signal and
 * read noise), so that pulls against the injected truth should have unit width.
 */
import { Header } from '../../../src/fits/header.js';
import type { Rng } from '../../../src/kernels/random.js';
import type { CalibratedFrame, ExposureInfo } from '../../../src/products/frame.js';

export interface NoisyFrameOptions {
  readNoiseE: number;
  exptimeS: number;
  /** Where the frame came from; dateObs (UTC) and the path label diagnostics. None by default. */
  exposure?: Omit<ExposureInfo, 'header' | 'exptimeS'>;
  mask?: Uint16Array;
}

export function noisyFrame(signal: Float32Array, width: number, height: number, rng: Rng, o: NoisyFrameOptions): CalibratedFrame {
  const sci = new Float32Array(width * height);
  const variance = new Float32Array(width * height);
  const rn2 = o.readNoiseE * o.readNoiseE;
  for (let i = 0; i < sci.length; i++) {
    const v = Math.max(signal[i]!, 0) + rn2;
    variance[i] = v;
    sci[i] = signal[i]! + rng.normal() * Math.sqrt(v);
  }
  const header = new Header();
  return {
    width,
    height,
    sci,
    var: variance,
    mask: o.mask ?? new Uint16Array(width * height),
    orientation: { transpose: false, flipX: false },
    section: { x0: 0, x1: width, y0: 0, y1: height },
    header,
    exposures: o.exposure ? [{ ...o.exposure, header, exptimeS: o.exptimeS }] : [],
    exptimeS: o.exptimeS,
    gain: 1,
    readNoiseE: o.readNoiseE,
  };
}
