/**
 * Cosmic-ray hits: short tracks of a few pixels at a ground-level rate.
 * Rate ~2.5 events per cm^2 per minute on 15-micron pixels (common practice for ground-based
 * CCDs, from memory); deposits of several hundred to a few thousand electrons per pixel.
 */
import type { Rng } from '../kernels/random.js';
import type { CosmicRayTruth } from './truth.js';

/** Events per pixel per second: 2.5 / cm^2 / min x (15e-4 cm)^2. */
export const COSMIC_EVENTS_PER_PX_PER_S = (2.5 / 60) * (15e-4) ** 2;
/** Readout time during which the detector still collects hits, seconds. */
export const READOUT_S = 40;
/** Smallest deposit in a hit pixel, electrons (so that hits stand out of the noise). */
export const MIN_DEPOSIT_E = 600;
const MEAN_EXTRA_DEPOSIT_E = 1400;
const MAX_TRACK_PX = 8;

/** Append one track of `lengthPx` pixels starting at (x0, y0) (trimmed raw pixels) to `hits`. */
export function addTrack(rng: Rng, hits: CosmicRayTruth, width: number, height: number, x0: number, y0: number, lengthPx: number): void {
  const angle = rng.between(0, 2 * Math.PI);
  const dx = Math.cos(angle);
  const dy = Math.sin(angle);
  let lastX = -1;
  let lastY = -1;
  let count = 0;
  // Half-pixel steps so that diagonal tracks stay connected.
  for (let k = 0; count < lengthPx && k < 4 * lengthPx; k++) {
    const x = Math.round(x0 + 0.5 * k * dx);
    const y = Math.round(y0 + 0.5 * k * dy);
    if (x === lastX && y === lastY) continue;
    if (x < 0 || y < 0 || x >= width || y >= height) break;
    hits.x.push(x);
    hits.y.push(y);
    hits.electrons.push(Math.round(MIN_DEPOSIT_E + rng.exponential(MEAN_EXTRA_DEPOSIT_E)));
    lastX = x;
    lastY = y;
    count++;
  }
}

/** Random hits over a frame of width x height exposed for exposureS (plus readout). */
export function randomCosmicRays(rng: Rng, width: number, height: number, exposureS: number): CosmicRayTruth {
  const hits: CosmicRayTruth = { x: [], y: [], electrons: [] };
  const mean = COSMIC_EVENTS_PER_PX_PER_S * width * height * (exposureS + READOUT_S);
  const events = rng.poisson(mean);
  for (let e = 0; e < events; e++) {
    const length = Math.min(MAX_TRACK_PX, 1 + Math.floor(rng.exponential(1.5)));
    addTrack(rng, hits, width, height, rng.between(0, width - 1), rng.between(0, height - 1), length);
  }
  return hits;
}
