import { describe, expect, it } from 'vitest';
import { positiveLaplacian } from '../../src/kernels/laplacian.js';
import { reference, maxRelativeDiff } from '../stages/ccd/reference.js';

describe('positiveLaplacian', () => {
  it('equals van Dokkum (2001) done literally with numpy/scipy: 2x2 subsampling, Laplacian kernel, clip, block mean', () => {
    const { width, height } = reference.laplacian;
    const out = positiveLaplacian(Float32Array.from(reference.median.image), width, height);
    expect(maxRelativeDiff(out, reference.laplacian.lplus, 1)).toBeLessThan(1e-6);
  });
  it('gives 2A for a lone spike of height A on a flat background (van Dokkum 2001, so that S = L+/(2N) = A/N)', () => {
    const img = new Float32Array(7 * 7).fill(10);
    img[3 * 7 + 3] = 110;
    expect(positiveLaplacian(img, 7, 7)[3 * 7 + 3]).toBeCloseTo(200, 4);
  });
});
