import { describe, expect, it } from 'vitest';
import { combineFlats, normaliseFlat } from '../../../src/stages/ccd/flat.js';
import { flatsFromArrays, flatsFromRaw } from '../../../src/stages/ccd/flat-source.js';
import { Header } from '../../../src/fits/header.js';
import type { RawFrame } from '../../../src/products/frame.js';
import { DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { MASK_BITS } from '../../../src/products/frame.js';
import { reference, frames, maxRelativeDiff } from './reference.js';

// Outside reference: numpy medians, astropy.stats.sigma_clip with the Poisson + read-noise sigma,
// numpy.polynomial.legendre.legfit per row (fixtures/ccd/make_ccd_fixtures.py); float32 precision.
describe('master flat', () => {
  const f = reference.flat;
  const settings = { ...DEFAULT_CCD_SETTINGS, flatOrder: f.order };
  const combined = combineFlats(flatsFromArrays(frames(f.frames, f.count), f.width, f.height), f.gain, f.readNoiseE, settings);

  it('scales the flats to the mean of their medians and combines them as astropy sigma_clip does, rejecting the hit', () => {
    expect(combined.levelAdu).toBeCloseTo(f.levelAdu, 6);
    expect(maxRelativeDiff(combined.data, f.combined, 1)).toBeLessThan(2e-7);
    expect(f.kept[4 * f.width + 20]).toBe(2);
  });

  it('takes the flats from raw frames (trimmed and taken off the bias a block of lines at a time) with the same result', () => {
    // The fixture's flats one column in from the raw edge, no overscan, a zero bias; compared with
    // the fixture's astropy sigma_clip combination (fixtures/ccd/make_ccd_fixtures.py, Debian python3-astropy).
    const rawWidth = f.width + 3;
    const raw: RawFrame[] = frames(f.frames, f.count).map((image, i) => {
      const data = new Float32Array(rawWidth * f.height).fill(-1);
      for (let y = 0; y < f.height; y++) data.set(image.subarray(y * f.width, (y + 1) * f.width), y * rawWidth + 1);
      return { path: `flat${i}`, hdu: 0, header: new Header(), width: rawWidth, height: f.height, data };
    });
    const det = { gain: f.gain, readNoiseE: f.readNoiseE, saturationAdu: 65535, overscan: null, data: { x0: 1, x1: 1 + f.width, y0: 0, y1: f.height }, binning: '1 1' };
    const none = { along: null, values: new Float64Array(0), model: null, rms: NaN };
    const fromRaw = combineFlats(flatsFromRaw(raw, det, raw.map(() => none), new Float32Array(f.width * f.height)), f.gain, f.readNoiseE, settings);
    expect(fromRaw.levelAdu).toBeCloseTo(f.levelAdu, 6);
    expect(maxRelativeDiff(fromRaw.data, f.combined, 1)).toBeLessThan(2e-7);
  });

  it('divides each row by a clipped Legendre fit along the dispersion, as numpy legfit does', () => {
    const out = normaliseFlat(combined.data, f.width, f.height, new Uint16Array(f.width * f.height), { gain: f.gain, readNoiseE: f.readNoiseE, biasVarianceAdu: 0, count: f.count }, settings);
    expect(maxRelativeDiff(out.flat, f.normalised, 1)).toBeLessThan(1e-6);
    expect(out.mask.every((m) => m === 0)).toBe(true);
    // Variance of a normalised pixel: (C/g + (RN/g)^2)/n / model^2 ~ flat^2 / (g C n) (Poisson on the flat counts).
    const i = 5 * f.width + 30;
    const c = combined.data[i]!;
    expect(out.variance[i]! / (out.flat[i]! ** 2 / (f.gain * c * f.count))).toBeCloseTo(1, 2);
  });

  it('fits rows of an odd width through several clipping rounds as numpy legfit with the same rule does', () => {
    const o = reference.flatOdd;
    expect(Math.min(...o.rounds)).toBeGreaterThanOrEqual(2);
    const out = normaliseFlat(Float32Array.from(o.combined), o.width, o.height, new Uint16Array(o.width * o.height), { gain: 1, readNoiseE: 0, biasVarianceAdu: 0, count: 1 }, { ...DEFAULT_CCD_SETTINGS, flatOrder: o.order });
    expect(maxRelativeDiff(out.model, o.model, 1)).toBeLessThan(1e-6);
  });

  it('masks near-zero flat values (zeroFlat) and unlit pixels (outsideData), and does not divide by them', () => {
    const data = Float32Array.from(f.combined);
    data[2 * f.width + 10] = 0.05 * data[2 * f.width + 10]!; // a dead pixel: lit neighbourhood, 5% response
    for (let x = 0; x < f.width; x++) data[(f.height - 1) * f.width + x] = 3; // an unlit last row
    const out = normaliseFlat(data, f.width, f.height, new Uint16Array(f.width * f.height), { gain: f.gain, readNoiseE: f.readNoiseE, biasVarianceAdu: 0, count: f.count }, settings);
    expect(out.mask[2 * f.width + 10]).toBe(MASK_BITS.zeroFlat);
    expect(out.flat[2 * f.width + 10]).toBe(1);
    expect(out.mask[(f.height - 1) * f.width + 5]).toBe(MASK_BITS.outsideData);
    expect(out.unfitRows).toEqual([f.height - 1]);
  });

  it('keeps the slit illumination when asked: rows keep their relative level, normalised to a mean of 1', () => {
    const out = normaliseFlat(combined.data, f.width, f.height, new Uint16Array(f.width * f.height), { gain: f.gain, readNoiseE: f.readNoiseE, biasVarianceAdu: 0, count: f.count }, { ...settings, flatKeepsIllumination: true });
    const rowMean = (y: number): number => out.flat.subarray(y * f.width, (y + 1) * f.width).reduce((a, b) => a + b, 0) / f.width;
    // The fixture's illumination is 1 - 0.05 v^2 along the slit: edges 5% below the centre.
    expect(rowMean(0) / rowMean(6)).toBeCloseTo(0.95 / (1 - 0.05 * (1 / 11) ** 2), 2);
    const all = out.flat.reduce((a, b) => a + b, 0) / out.flat.length;
    expect(all).toBeCloseTo(1, 3);
  });
});
