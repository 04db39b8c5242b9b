/** Small raw frames with known content, built in the test (no simulator): arcs, flats, biases, science. */
import { Header } from '../../../src/fits/header.js';
import type { RawFrame } from '../../../src/products/frame.js';

export interface SyntheticOptions {
  /** Data area (pixels) and overscan columns to its right. */
  width?: number;
  height?: number;
  overscan?: number;
  gain?: number | null;
  readNoise?: number;
  /** Bias level (ADU) = level + slope * raw row. */
  biasLevel?: number;
  biasSlope?: number;
  exptime?: number;
  binning?: string;
  datasec?: string;
}

/** A frame whose data pixels hold bias + signal(x, y) ADU and whose overscan holds the bias alone (no noise). */
export function syntheticFrame(path: string, signal: (x: number, y: number) => number, o: SyntheticOptions = {}): RawFrame {
  const width = o.width ?? 40;
  const height = o.height ?? 30;
  const overscan = o.overscan ?? 8;
  const rawWidth = width + overscan;
  const header = new Header();
  if (o.gain !== null) header.set('GAIN', o.gain ?? 2);
  header.set('RDNOISE', o.readNoise ?? 5);
  header.set('DATASEC', o.datasec ?? `[1:${width},1:${height}]`);
  header.set('BIASSEC', `[${width + 1}:${rawWidth},1:${height}]`);
  header.set('EXPTIME', o.exptime ?? 100);
  header.set('DATE-OBS', '2019-04-13T01:00:00.000');
  header.set('CCDSUM', o.binning ?? '1 1');
  const data = new Float32Array(rawWidth * height);
  for (let y = 0; y < height; y++) {
    const bias = (o.biasLevel ?? 300) + (o.biasSlope ?? 0) * y;
    for (let x = 0; x < rawWidth; x++) data[y * rawWidth + x] = bias + (x < width ? signal(x, y) : 0);
  }
  return { path, hdu: 0, header, width: rawWidth, height, data };
}

/** Arc lines: narrow in x (every 7 pixels, Gaussian sigma 1), uniform along y. */
export const arcSignal = (x: number): number => 2000 * Math.exp(-0.5 * (((x % 7) - 3) / 1) ** 2);
export const flatSignal = (x: number, y: number): number => 10000 * (1 + 0.3 * Math.sin(x / 9)) * (1 + 0.01 * Math.cos(3 * x + 7 * y));
