/**
 * clippedMeanStack on stacks of 3 and 5 whose spread often exceeds the quick test's band from the
 * minimum but not the band about the median (keepsAllAboutMedian in combine.ts), against astropy's
 * sigma_clip (axis 0, cenfunc median, the noise-model sigma as stdfunc) and the mean of the kept
 * values. Where every value is a float32 in the window the sum is exact, so the result must be
 * astropy's bit for bit.
 */
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { clippedMeanStack } from '../../src/kernels/combine.js';
import { Rng } from '../../src/kernels/random.js';
import { hasAstropy, PYTHON } from '../fits/outside-tools.js';

const SCRIPT = `
import json, sys
import numpy as np
from astropy.stats import sigma_clip
q = json.load(sys.stdin)
data = np.array(q['values'], dtype=np.float32).reshape(q['n'], -1).astype(np.float64)
c, k = q['constant'], q['perSignal']
std = lambda d, axis=None: np.sqrt(c + k * np.maximum(np.nanmedian(d, axis=axis), 0))
clipped = sigma_clip(data, sigma=q['nSigma'], maxiters=q['maxIterations'], cenfunc='median', stdfunc=std, axis=0)
kept = (~np.ma.getmaskarray(clipped)).sum(axis=0)
mean = np.ma.mean(clipped, axis=0).astype(np.float32)
print(json.dumps({'mean': [float(v) for v in mean], 'kept': [int(v) for v in kept]}))
`;

function astropyClip(values: Float32Array, n: number, options: { nSigma: number; maxIterations: number; noise: { constant: number; perSignal: number } }) {
  const input = JSON.stringify({ values: Array.from(values), n, nSigma: options.nSigma, maxIterations: options.maxIterations, ...options.noise });
  const r = spawnSync(PYTHON, ['-c', SCRIPT], { input, encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.status !== 0) throw new Error(`python failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as { mean: number[]; kept: number[] };
}

/** n frames of `size` pixels: level + sigma * normal, with hits and a few values outside the window. */
function stack(n: number, size: number, level: number, sigma: number, seed: number): { frames: Float32Array[]; flat: Float32Array } {
  const rng = new Rng(seed);
  const flat = new Float32Array(n * size);
  for (let i = 0; i < n * size; i++) {
    let v = level + sigma * rng.normal();
    const u = rng.uniform();
    if (u < 0.02) v += 60 * sigma; // a hit
    else if (u < 0.022) v = 3e6 * (1 + rng.uniform()); // above the window
    else if (u < 0.024) v = 1e-4 * rng.uniform(); // below it
    flat[i] = v;
  }
  return { frames: Array.from({ length: n }, (_, i) => flat.subarray(i * size, (i + 1) * size)), flat };
}

describe.skipIf(!hasAstropy)('clippedMeanStack: the test about the median on stacks of 3 and 5', () => {
  const size = 4000;
  const cases = [
    { name: 'five bias frames (read-noise sigma)', n: 5, level: 0.5, sigma: 4, noise: { constant: 16, perSignal: 0 } },
    { name: 'three flats (Poisson and read noise)', n: 3, level: 9000, sigma: 67, noise: { constant: 6.25, perSignal: 0.5 } },
  ];
  for (const c of cases) {
    it(`matches astropy, bit for bit where the values are in the window: ${c.name}`, () => {
      const { frames, flat } = stack(c.n, size, c.level, c.sigma, 11 + c.n);
      const options = { nSigma: 3, maxIterations: 5, noise: c.noise };
      const out = new Float32Array(size);
      const kept = new Uint8Array(size);
      clippedMeanStack(frames, out, options, kept);
      const ref = astropyClip(flat, c.n, options);
      expect(Array.from(kept)).toEqual(ref.kept);
      let wrong = 0;
      let wide = 0;
      for (let p = 0; p < size; p++) {
        const values = frames.map((f) => f[p]!);
        const inWindow = values.every((v) => Math.abs(v) < 2 ** 20 && Math.abs(v) >= 2 ** -8);
        const lo = Math.min(...values);
        if (inWindow && Math.max(...values) - lo > c.noise.constant ** 0.5 * 3 && ref.kept[p] === c.n) wide++;
        if (inWindow ? out[p] !== ref.mean[p] : Math.abs(out[p]! - ref.mean[p]!) > 2e-7 * Math.abs(ref.mean[p]!)) wrong++;
      }
      expect(wrong).toBe(0);
      expect(wide).toBeGreaterThan(size / 20); // the new path is taken often
    });
  }
});
