/** The Laplacian cleaning against the normalisation of van Dokkum (2001, PASP 113, 1420, section 2). */
import { describe, expect, it } from 'vitest';
import { laplacianClean } from '../../../src/stages/ccd/laplacian-clean.js';
import { DEFAULT_LAPLACIAN_SETTINGS } from '../../../src/stages/ccd/settings.js';

const W = 41;
const H = 31;
const SKY = 100;
const VAR = 125; // e^2: sky 100 + read noise 5^2
const N = Math.sqrt(VAR);

function frameWithSpike(amplitude: number): { sci: Float32Array; variance: Float32Array } {
  const sci = new Float32Array(W * H).fill(SKY);
  sci[15 * W + 20] += amplitude;
  return { sci, variance: new Float32Array(W * H).fill(VAR) };
}

describe('laplacianClean', () => {
  const plain = { ...DEFAULT_LAPLACIAN_SETTINGS, slitProtection: false };
  it('sees a one-pixel hit at S = L+ / (2N) = A / N: found just above sigma_lim = 4.5 and not just below', () => {
    for (const [sigmas, found] of [[4.6, 1], [4.4, 0]] as const) {
      const { sci, variance } = frameWithSpike(sigmas * N);
      const r = laplacianClean(sci, variance, new Uint16Array(W * H), W, H, plain);
      expect(r.hits.reduce((a, b) => a + b, 0)).toBe(found);
      if (found) expect(r.cleaned[15 * W + 20]).toBe(SKY); // replaced by the median along the slit
    }
  });
  it('with slit protection also asks A > sigma_lim sqrt(1.3) N against the slit neighbours', () => {
    const limit = DEFAULT_LAPLACIAN_SETTINGS.sigmaLim * Math.sqrt(1.3);
    for (const [sigmas, found] of [[limit + 0.1, 1], [limit - 0.1, 0]] as const) {
      const { sci, variance } = frameWithSpike(sigmas * N);
      expect(laplacianClean(sci, variance, new Uint16Array(W * H), W, H, DEFAULT_LAPLACIAN_SETTINGS).hits[15 * W + 20]).toBe(found);
    }
  });
  it('spares a line that is narrow along x and extended along the slit, even when bright', () => {
    const sci = new Float32Array(W * H);
    const variance = new Float32Array(W * H);
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        const v = SKY + 20000 * Math.exp(-0.5 * ((x - 20.3) / 1.2) ** 2);
        sci[y * W + x] = v;
        variance[y * W + x] = v + 25;
      }
    }
    const r = laplacianClean(sci, variance, new Uint16Array(W * H), W, H, DEFAULT_LAPLACIAN_SETTINGS);
    expect(r.hits.reduce((a, b) => a + b, 0)).toBe(0);
  });
  it('never flags nor uses masked pixels (a hot column beside a hit does not hide it)', () => {
    const { sci, variance } = frameWithSpike(50 * N);
    const skip = new Uint16Array(W * H);
    for (let y = 0; y < H; y++) {
      sci[y * W + 21] += 5000;
      skip[y * W + 21] = 2;
    }
    const r = laplacianClean(sci, variance, skip, W, H, DEFAULT_LAPLACIAN_SETTINGS);
    expect(r.hits[15 * W + 20]).toBe(1);
    for (let y = 0; y < H; y++) expect(r.hits[y * W + 21]).toBe(0);
    expect(r.cleaned[3 * W + 21]).toBe(SKY + 5000); // masked values are kept
  });
});
