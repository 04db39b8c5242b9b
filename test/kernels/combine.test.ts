import { describe, expect, it } from 'vitest';
import { clippedMeanStack } from '../../src/kernels/combine.js';
import { reference, frames, maxRelativeDiff } from '../stages/ccd/reference.js';

// Outside reference: astropy.stats.sigma_clip(axis=0, cenfunc='median') then the mean of the kept
// values (fixtures/ccd/make_ccd_fixtures.py); agreement to float32 precision.
describe('clippedMeanStack', () => {
  const s = reference.stack;
  const stack = frames(s.frames, s.count);
  const size = s.width * s.height;
  it("matches astropy sigma_clip with its default scale ('std', population)", () => {
    const out = new Float32Array(size);
    const kept = new Uint8Array(size);
    clippedMeanStack(stack, out, { nSigma: s.nSigma, maxIterations: s.maxIterations }, kept);
    expect(maxRelativeDiff(out, s.meanStd, 1)).toBeLessThan(2e-7);
    expect(Array.from(kept)).toEqual(s.keptStd);
  });
  it('matches astropy sigma_clip with a read-noise sigma (the master-bias rule), rejecting the injected hits', () => {
    const out = new Float32Array(size);
    const kept = new Uint8Array(size);
    const rnAdu = s.readNoiseE / s.gain;
    clippedMeanStack(stack, out, { nSigma: s.nSigma, maxIterations: s.maxIterations, noise: { constant: rnAdu * rnAdu, perSignal: 0 } }, kept);
    expect(maxRelativeDiff(out, s.meanReadNoise, 1)).toBeLessThan(2e-7);
    expect(Array.from(kept)).toEqual(s.keptReadNoise);
    expect(s.keptReadNoise.filter((k) => k < s.count).length).toBeGreaterThanOrEqual(20); // the std rule cannot clip 7 values this way
  });
  it('matches astropy on five frames (the written-out quick test) with a NaN, zeros, a tiny and a huge value', () => {
    const f = reference.stack5;
    const five = frames(f.frames.map((v) => (v === null ? NaN : v)), f.count);
    const out = new Float32Array(size);
    const kept = new Uint8Array(size);
    const rnAdu = s.readNoiseE / s.gain;
    clippedMeanStack(five, out, { nSigma: s.nSigma, maxIterations: s.maxIterations, noise: { constant: rnAdu * rnAdu, perSignal: 0 } }, kept);
    expect(maxRelativeDiff(out, f.meanReadNoise, 1)).toBeLessThan(2e-7);
    expect(Array.from(kept)).toEqual(f.keptReadNoise);
    expect(f.keptReadNoise.filter((k) => k < f.count).length).toBeGreaterThanOrEqual(10);
  });
  it('rejects stacks of different sizes', () => {
    expect(() => clippedMeanStack([new Float32Array(4), new Float32Array(5)], new Float32Array(4), { nSigma: 3, maxIterations: 5 })).toThrow(RangeError);
  });
});
