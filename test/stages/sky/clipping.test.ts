/**
 * The sky spline's clipping rounds (clipIterations): a pixel far from the previous model (an
 * outlier the mask missed) is dropped, so it does not pull the sky at its wavelength. Injection
 * and recovery on a flat sky of known level with Gaussian noise.
 */
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/kernels/random.js';
import { evaluateRow, fitSkySpline } from '../../../src/stages/sky/sky-spline.js';

const W = 200;
const H = 40;
const SKY = 100; // e per pixel
const OUTLIER = { x: 100, y: 20, height: 400 }; // 40 noise sigmas

function fitWithClipping(iterations: number): { model: number; used: number } {
  const rng = new Rng(5);
  const sci = new Float32Array(W * H);
  const variance = new Float32Array(W * H).fill(SKY);
  const wave = new Float64Array(W * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
    sci[y * W + x] = SKY + Math.sqrt(SKY) * rng.normal();
    wave[y * W + x] = 6500 + x; // 1 Angstrom per pixel, no tilt
  }
  sci[OUTLIER.y * W + OUTLIER.x] += OUTLIER.height;
  const use = new Uint8Array(W * H).fill(1);
  const fit = fitSkySpline({ width: W, height: H, sci, var: variance, wave, use }, 0, 1, 4, iterations)!;
  const value = new Float64Array(W);
  evaluateRow(fit, wave, OUTLIER.y * W, W, OUTLIER.y, value, null);
  return { model: value[OUTLIER.x]!, used: use[OUTLIER.y * W + OUTLIER.x]! };
}

describe('sky spline clipping', () => {
  it('drops an outlier 40 sigmas high and keeps the sky at its wavelength within the noise; with no rounds it is pulled', () => {
    // Noise of the model at one knot: about sqrt(SKY / H) per knot-sized column (~1.6 e).
    const clipped = fitWithClipping(2);
    const unclipped = fitWithClipping(0);
    expect(clipped.used).toBe(0);
    expect(Math.abs(clipped.model - SKY)).toBeLessThan(3 * Math.sqrt(SKY / H) * 1.5);
    expect(unclipped.used).toBe(1);
    expect(unclipped.model - SKY).toBeGreaterThan(5);
  });
});
