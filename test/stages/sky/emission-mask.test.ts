import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/kernels/random.js';
import { maskCoherentEmission } from '../../../src/stages/sky/emission-mask.js';

// Injection and recovery: a line too faint to see in one row (peak 2 sigma per pixel) but
// coherent along 30 sky rows, in unit-variance Gaussian noise.
describe('maskCoherentEmission', () => {
  const width = 300;
  const height = 60;
  const rng = new Rng(9);
  const residual = new Float32Array(width * height);
  const variance = new Float32Array(width * height).fill(1);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const line = y < 30 ? 2 * Math.exp(-((x - 150) ** 2) / (2 * 1.3 ** 2)) : 0;
      residual[y * width + x] = line + rng.normal();
    }
  }
  const skyRows = new Uint8Array(height).fill(1);
  const use = new Uint8Array(width * height).fill(1);
  const emission = new Uint8Array(width * height);
  const removed = maskCoherentEmission(width, height, residual, variance, use, emission, skyRows, 4);

  it('masks the line core in the rows that hold it', () => {
    let core = 0;
    for (let y = 5; y < 25; y++) core += emission[y * width + 150]!;
    expect(core).toBe(20);
  });

  it('leaves pure noise almost untouched (block z > 4 by chance)', () => {
    let noise = 0;
    for (let y = 0; y < height; y++) for (let x = 0; x < 140; x++) noise += emission[y * width + x]!;
    expect(noise / (140 * height)).toBeLessThan(2e-3);
    expect(removed).toBeGreaterThan(20);
    for (let i = 0; i < use.length; i++) if (emission[i]) expect(use[i]).toBe(0);
  });
});
