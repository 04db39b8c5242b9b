/**
 * Cosmic-ray hits placed on purpose in science exposures, to test the hard cases: the same
 * pixels hit in two of three exposures (a median of three cannot reject them all alone), and
 * hits on the cores of the emission lines (which a cosmic-ray finder must not confuse with lines).
 */
import { GALAXY_LINES } from '../physics/catalogues.js';
import { SPEED_OF_LIGHT_KMS } from '../physics/constants.js';
import type { Orientation } from '../products/frame.js';
import { pixelOfWavelength } from './optics.js';
import type { Rng } from '../kernels/random.js';
import type { CosmicRayTruth, ExposureTruth, SetupTruth, TargetTruth } from './truth.js';

/** Electrons of a deliberate hit: well above the line core's noise. */
const CORE_HIT_E = 4000;
const SHARED_PIXELS = 4;
const CORE_HITS_PER_EXPOSURE = 3;

/** Trimmed raw pixel of internal pixel (d, s) (the forward Orientation mapping). */
export function internalToRawPixel(o: Orientation, W: number, d: number, s: number): { x: number; y: number } {
  const tx = o.flipX ? W - 1 - d : d;
  return o.transpose ? { x: s, y: tx } : { x: tx, y: s };
}

/** Pixels (trimmed raw) that are hit in both of two exposures of a target. */
export function sharedHitPixels(rng: Rng, rawWidth: number, rawHeight: number): { x: number; y: number }[] {
  const out: { x: number; y: number }[] = [];
  for (let k = 0; k < SHARED_PIXELS; k++) out.push({ x: 10 + rng.int(rawWidth - 20), y: 10 + rng.int(rawHeight - 20) });
  return out;
}

/** Add deliberate hits on the H-alpha core of rows near the galaxy centre in one exposure. */
export function addCoreHits(rng: Rng, setup: SetupTruth, target: TargetTruth, exposure: ExposureTruth, hits: CosmicRayTruth): void {
  const W = setup.internalWidth;
  const vB = exposure.barycentricCorrectionKms;
  const rest = GALAXY_LINES['Halpha']!.air;
  const span = Math.max(8, Math.round(setup.internalHeight / 10));
  for (let k = 0; k < CORE_HITS_PER_EXPOSURE; k++) {
    const s = Math.round(target.centreRow + rng.between(-span, span));
    if (s < 0 || s >= setup.internalHeight) continue;
    const lambda = (rest * (1 + target.vLosKms[s]! / SPEED_OF_LIGHT_KMS)) / (1 + vB / SPEED_OF_LIGHT_KMS);
    const d = Math.round(pixelOfWavelength(setup, lambda, s));
    if (d < 0 || d >= W) continue;
    const p = internalToRawPixel(setup.orientation, W, d, s);
    addHit(hits, p.x, p.y, CORE_HIT_E + Math.round(rng.exponential(1000)));
  }
}

export function addHit(hits: CosmicRayTruth, x: number, y: number, electrons: number): void {
  hits.x.push(x);
  hits.y.push(y);
  hits.electrons.push(electrons);
}
