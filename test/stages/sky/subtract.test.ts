import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { MASK_BITS } from '../../../src/products/frame.js';
import { DEFAULT_SKY_SETTINGS, subtractSky } from '../../../src/stages/sky/index.js';
import { makeSyntheticFrame } from './synthetic-frame.js';

// Checks by injection and recovery: frames made with a known sky, galaxy and noise
// (Gaussian with the Poisson + read-noise variance); the subtracted frame must leave the galaxy
// within the noise the stage quotes.

function pulls(sub: Float32Array, variance: Float32Array, truth: Float32Array, width: number, rows: [number, number]): { mean: number; std: number } {
  let s = 0;
  let s2 = 0;
  let n = 0;
  for (let y = rows[0]; y <= rows[1]; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      const p = (sub[i]! - truth[i]!) / Math.sqrt(variance[i]!);
      s += p;
      s2 += p * p;
      n++;
    }
  }
  const mean = s / n;
  return { mean, std: Math.sqrt(s2 / n - mean * mean) };
}

describe('subtractSky', () => {
  const synthetic = makeSyntheticFrame({ seed: 3 });
  const { frame, solution, galaxy } = synthetic;
  const result = subtractSky(frame, solution, DEFAULT_SKY_SETTINGS);
  const out = result.product.frame;

  it('finds the galaxy around its true centre row and keeps it out of the sky rows', () => {
    const [lo, hi] = result.product.sky.galaxyRegion;
    expect(lo).toBeLessThan(synthetic.options.centreRow - 20);
    expect(hi).toBeGreaterThan(synthetic.options.centreRow + 20);
    for (const [a, b] of result.product.sky.skyRegions) expect(b < lo || a > hi).toBe(true);
  });

  it('leaves the galaxy rows equal to the true galaxy within the quoted noise, across tilted sky lines (pulls of unit width)', () => {
    const p = pulls(out.sci, out.var, galaxy, frame.width, [40, 80]);
    expect(Math.abs(p.mean)).toBeLessThan(0.03);
    expect(p.std).toBeGreaterThan(0.97);
    expect(p.std).toBeLessThan(1.03);
  });

  for (const tiltPx of [0, 0.4, 4]) {
    it(`leaves no sky-line residual beyond the quoted errors in 31-row column sums, tilt ${tiltPx} px`, () => {
      // The model error is common to all rows of a column: sum it coherently, the data noise in quadrature.
      const s = makeSyntheticFrame({ seed: 5, tiltPx });
      const r = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS);
      const W = s.frame.width;
      let sumsq = 0;
      for (let x = 5; x < W - 5; x++) {
        let m = 0;
        let v = 0;
        let sm = 0;
        for (let y = 45; y <= 75; y++) {
          const i = y * W + x;
          m += r.product.frame.sci[i]! - s.galaxy[i]!;
          v += s.frame.var[i]!;
          sm += Math.sqrt(r.product.frame.var[i]! - s.frame.var[i]!);
        }
        sumsq += (m * m) / (v + sm * sm);
      }
      const zRms = Math.sqrt(sumsq / (W - 10));
      expect(zRms).toBeGreaterThan(0.85);
      expect(zRms).toBeLessThan(1.12);
    });
  }

  it('on a tall slit (first sky fit on a row in four) finds the faint outer emission and leaves the galaxy within the quoted noise', () => {
    // Emission to 32 rows from the centre, down to 3000 exp(-32 / 14) ~ 300 e a row in H-alpha.
    const tall = makeSyntheticFrame({ seed: 9, height: 1300, centreRow: 650 });
    const r = subtractSky(tall.frame, tall.solution, DEFAULT_SKY_SETTINGS);
    const [lo, hi] = r.product.sky.galaxyRegion;
    expect(lo).toBeLessThanOrEqual(650 - 30);
    expect(hi).toBeGreaterThanOrEqual(650 + 30);
    expect(hi - lo).toBeLessThan(120);
    for (const [a, b] of r.product.sky.skyRegions) expect(b < lo || a > hi).toBe(true);
    const p = pulls(r.product.frame.sci, r.product.frame.var, tall.galaxy, tall.frame.width, [610, 690]);
    expect(Math.abs(p.mean)).toBeLessThan(0.03);
    expect(p.std).toBeGreaterThan(0.97);
    expect(p.std).toBeLessThan(1.03);
  });

  it('leaves sky rows at their noise level per column (normalised residual RMS near 1)', () => {
    const rms = result.product.sky.residualNormRms;
    let worst = 0;
    for (let x = 5; x < frame.width - 5; x++) worst = Math.max(worst, rms[x]!);
    expect(worst).toBeLessThan(1.5);
  });

  it('recovers the slit gradient of the sky', () => {
    const g = result.product.sky.slitFactor;
    const slope = (g[frame.height - 10]! - g[10]!) / (frame.height - 20);
    expect(slope * frame.height).toBeCloseTo(synthetic.options.skyGradient, 2);
  });

  it('adds the sky model variance to the frame variance', () => {
    for (const i of [100, 5000, 30000]) expect(out.var[i]!).toBeGreaterThan(frame.var[i]!);
  });

  it('uses the sky rows a user gives and warns when they are few', () => {
    const r = subtractSky(frame, solution, { ...DEFAULT_SKY_SETTINGS, regions: [[5, 14]] });
    expect(r.product.sky.skyRegions).toEqual([[5, 14]]);
    expect(r.diagnostics.map((d) => d.rule)).toContain('sky.little-sky');
    expect(r.diagnostics.map((d) => d.rule)).toContain('sky.one-sided-sky');
  });

  it('refuses a sky region outside the frame with an InputError naming it', () => {
    expect(() => subtractSky(frame, solution, { ...DEFAULT_SKY_SETTINGS, regions: [[100, 130]] })).toThrow(InputError);
  });

  it('ignores masked pixels (cosmic rays) in the sky fit', () => {
    const hit = makeSyntheticFrame({ seed: 3 });
    for (let y = 10; y < 30; y++) {
      const i = y * hit.frame.width + 200;
      hit.frame.sci[i] = hit.frame.sci[i]! + 5e4;
      hit.frame.mask[i] = MASK_BITS.cosmicRay;
    }
    const r = subtractSky(hit.frame, hit.solution, DEFAULT_SKY_SETTINGS);
    const i = 60 * hit.frame.width + 200;
    expect(Math.abs(r.product.frame.sci[i]! - out.sci[i]!)).toBeLessThan(0.5 * Math.sqrt(out.var[i]!));
  });
});

describe('subtractSky settings', () => {
  it('refuses an impossible slit order or knot spacing with an InputError naming the setting', () => {
    const { frame, solution } = makeSyntheticFrame({ seed: 4, height: 60, centreRow: 30 });
    expect(() => subtractSky(frame, solution, { ...DEFAULT_SKY_SETTINGS, order: -1 })).toThrow(/sky setting order/);
    expect(() => subtractSky(frame, solution, { ...DEFAULT_SKY_SETTINGS, knotSpacingPx: 0 })).toThrow(InputError);
    expect(() => subtractSky(frame, solution, { ...DEFAULT_SKY_SETTINGS, detectSigma: 0 })).toThrow(/sky setting detectSigma/);
  });
});

describe('subtractSky with a spare variance buffer', () => {
  // The spare path must give the very products of the plain one: the same pixels, bit for bit,
  // whatever the spare held before, and the other inputs untouched.
  const { frame, solution } = makeSyntheticFrame({ seed: 7 });
  const plain = subtractSky(frame, solution, DEFAULT_SKY_SETTINGS).product;
  const copy = (f: typeof frame) => ({ ...f, sci: f.sci.slice(), var: f.var.slice(), mask: f.mask.slice() });

  it('writes the same variance into a spare full of garbage, overwriting every pixel', () => {
    const spare = new Float32Array(frame.width * frame.height).fill(NaN);
    const input = copy(frame);
    const r = subtractSky(input, solution, DEFAULT_SKY_SETTINGS, spare).product;
    expect(r.frame.var).toBe(spare);
    expect(Buffer.from(spare.buffer).equals(Buffer.from(plain.frame.var.buffer))).toBe(true);
    expect(Buffer.from(r.frame.sci.buffer).equals(Buffer.from(plain.frame.sci.buffer))).toBe(true);
    for (const k of ['sci', 'var', 'mask'] as const) expect(Buffer.from(input[k].buffer).equals(Buffer.from(frame[k].buffer))).toBe(true);
  });

  it('may take the frame\'s own variance, in place, with the same products and SCI and MASK untouched', () => {
    const input = copy(frame);
    const r = subtractSky(input, solution, DEFAULT_SKY_SETTINGS, input.var).product;
    expect(r.frame.var).toBe(input.var);
    expect(Buffer.from(r.frame.var.buffer).equals(Buffer.from(plain.frame.var.buffer))).toBe(true);
    expect(Buffer.from(r.frame.sci.buffer).equals(Buffer.from(plain.frame.sci.buffer))).toBe(true);
    expect(r.frame.sci.buffer).not.toBe(input.sci.buffer);
    expect(Buffer.from(input.sci.buffer).equals(Buffer.from(frame.sci.buffer))).toBe(true);
    expect(Buffer.from(input.mask.buffer).equals(Buffer.from(frame.mask.buffer))).toBe(true);
    expect(r.sky).toEqual(plain.sky);
  });

  it('refuses a spare of the wrong size or one sharing the frame\'s SCI', () => {
    expect(() => subtractSky(copy(frame), solution, DEFAULT_SKY_SETTINGS, new Float32Array(3))).toThrow(RangeError);
    const input = copy(frame);
    expect(() => subtractSky(input, solution, DEFAULT_SKY_SETTINGS, input.sci)).toThrow(RangeError);
  });
});
