/** Noise-free frames with an analytic answer: overscan, orientation, exposure-time scaling. */
import { describe, expect, it } from 'vitest';
import { buildCalibration } from '../../../src/stages/ccd/build-calibration.js';
import { calibrateScience } from '../../../src/stages/ccd/calibrate-science.js';
import { trimFrame } from '../../../src/stages/ccd/overscan.js';
import { calibrateExposure } from '../../../src/stages/ccd/exposure.js';
import { resolveDetector } from '../../../src/stages/ccd/detector.js';
import { DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { MASK_BITS, type RawFrame } from '../../../src/products/frame.js';
import { arcSignal, syntheticFrame } from './synthetic.js';

const settings = { ...DEFAULT_CCD_SETTINGS, cleanSingleExposure: false };

/** The same frame with x and y exchanged (dispersion along raw y). */
function transposed(f: RawFrame, width: number, height: number): RawFrame {
  const header = f.header.clone();
  header.set('DATASEC', `[1:${height},1:${width}]`);
  header.set('BIASSEC', `[1:${height},${width + 1}:${f.width}]`);
  const data = new Float32Array(f.data.length);
  for (let y = 0; y < f.height; y++) for (let x = 0; x < f.width; x++) data[x * f.height + y] = f.data[y * f.width + x]!;
  return { ...f, header, width: f.height, height: f.width, data };
}

describe('overscan', () => {
  it('removes a bias level that drifts along the readout (a cubic fit reproduces a ramp exactly)', () => {
    const frame = syntheticFrame('raw/s.fits', (x, y) => x + 100 * y, { biasLevel: 412.5, biasSlope: 0.37 });
    const t = trimFrame(frame, resolveDetector(frame, settings), 3);
    expect([t.width, t.height, t.overscanAlong]).toEqual([40, 30, 'y']);
    for (const [x, y] of [[0, 0], [39, 29], [17, 11]] as const) expect(t.data[y * 40 + x]).toBeCloseTo(x + 100 * y, 2);
  });
  it('follows a strip of rows along raw x, and flags raw values at the saturation level', () => {
    const frame = syntheticFrame('raw/s.fits', (x) => (x === 5 ? 70000 : 10), { biasLevel: 200 });
    const rows = transposed(frame, 40, 30);
    const t = trimFrame(rows, resolveDetector(rows, { ...settings, saturationAdu: 65535 }), 3);
    expect(t.overscanAlong).toBe('x');
    expect(t.data[0]).toBeCloseTo(10, 3);
    expect(t.mask[5 * t.width + 0]).toBe(MASK_BITS.saturated);
    expect(t.mask[4 * t.width + 0]).toBe(0);
  });
});

describe('buffers handed to the trimming and the exposure', () => {
  it('are overwritten in full: values left from another frame do not show (a ramp again, masks only where saturated)', () => {
    const frame = syntheticFrame('raw/s.fits', (x, y) => (x === 3 && y === 4 ? 70000 : x + 100 * y), { biasLevel: 412.5, biasSlope: 0.37 });
    const det = resolveDetector(frame, { ...settings, saturationAdu: 65535 });
    const t = trimFrame(frame, det, 3, true, { data: new Float32Array(40 * 30).fill(NaN), mask: new Uint16Array(40 * 30).fill(0xffff) });
    for (const [x, y] of [[0, 0], [39, 29], [17, 11]] as const) expect(t.data[y * 40 + x]).toBeCloseTo(x + 100 * y, 2);
    expect(t.mask[4 * 40 + 3]).toBe(MASK_BITS.saturated);
    expect(t.mask.reduce((a, m) => a + m, 0)).toBe(MASK_BITS.saturated);
    expect(() => trimFrame(frame, det, 3, true, { data: new Float32Array(10) })).toThrow(RangeError);
  });
  it('variance of one exposure: g max(raw - bias, 0) + RN^2 over F^2, electrons^2 (Poisson counts plus read noise as in the CCD equation, Howell, Handbook of CCD Astronomy, ch. 4; through the flat as 1 / F^2)', () => {
    const frame = syntheticFrame('raw/s.fits', (x) => (x < 20 ? 50 * x : -3), { biasLevel: 300 });
    const n = 40 * 30;
    const cal = {
      orientation: { transpose: false, flipX: false }, width: 40, height: 30, gain: 2, readNoiseE: 5, biasVarianceAdu: 0,
      masterBias: new Float32Array(n), masterFlat: new Float32Array(n).fill(0.5), flatVariance: new Float32Array(n), flatMask: new Uint16Array(n),
    };
    const e = calibrateExposure(trimFrame(frame, resolveDetector(frame, settings), 3), cal, new Float32Array(n).fill(NaN));
    for (const x of [0, 7, 19, 20, 39]) {
      const adu = x < 20 ? 50 * x : -3;
      expect(e.sci[5 * 40 + x]).toBeCloseTo((2 * adu) / 0.5, 2);
      expect(e.var[5 * 40 + x]).toBeCloseTo((2 * Math.max(adu, 0) + 25) / 0.25, 1);
    }
  });
});

describe('orientation from the arc', () => {
  const frames = (transpose: boolean) => {
    const make = (path: string, signal: (x: number, y: number) => number) => {
      const f = syntheticFrame(path, signal);
      return transpose ? transposed(f, 40, 30) : f;
    };
    return { bias: [make('raw/b.fits', () => 0)], flat: [make('raw/f.fits', () => 5000)], arc: [make('raw/a.fits', arcSignal)] };
  };
  it('keeps x when the lines are narrow along raw x, transposes when they are narrow along raw y', () => {
    const asIs = buildCalibration(frames(false), settings).product;
    expect(asIs.orientation).toEqual({ transpose: false, flipX: false });
    expect([asIs.width, asIs.height]).toEqual([40, 30]);
    const turned = buildCalibration(frames(true), settings);
    expect(turned.product.orientation).toEqual({ transpose: true, flipX: false });
    expect([turned.product.width, turned.product.height]).toEqual([40, 30]);
    // The calibrated arc is the same image either way: lines along internal x.
    expect(Array.from(turned.product.arc.sci)).toEqual(Array.from(asIs.arc.sci));
  });
  it('warns when dispersion_axis contradicts the arc', () => {
    const r = buildCalibration(frames(true), { ...settings, dispersionAxis: 'x' });
    expect(r.product.orientation.transpose).toBe(false);
    expect(r.diagnostics.map((d) => d.rule)).toContain('ccd.axis-disagrees');
  });
});

describe('science combination', () => {
  const cal = buildCalibration({ bias: [syntheticFrame('raw/b.fits', () => 0)], flat: [syntheticFrame('raw/f.fits', () => 8000)], arc: [syntheticFrame('raw/a.fits', arcSignal)] }, settings).product;
  it('scales to the total exposure time: rates r over 100 s and 300 s give 400 r electrons', () => {
    // gain 2 e-/ADU: 0.5 ADU/s is 1 e-/s.
    const rate = (x: number) => 1 + x / 10;
    const a = syntheticFrame('raw/s1.fits', (x) => (rate(x) * 100) / 2, { exptime: 100 });
    const b = syntheticFrame('raw/s2.fits', (x) => (rate(x) * 300) / 2, { exptime: 300 });
    const r = calibrateScience([a, b], cal, settings).product;
    expect(r.exptimeS).toBe(400);
    for (const x of [0, 13, 39]) expect(r.sci[7 * 40 + x]).toBeCloseTo(rate(x) * 400, 2);
    expect(r.exposures.map((e) => e.exptimeS)).toEqual([100, 300]);
    expect(r.rejected!.every((v) => v === 0)).toBe(true);
  });
  it('with a hit in one of three equal exposures, returns the mean of the other two scaled to the total', () => {
    const frames = [0, 1, 2].map((k) => syntheticFrame(`raw/s${k}.fits`, (x, y) => (k === 1 && x === 20 && y === 10 ? 3000 : 200)));
    const r = calibrateScience(frames, cal, settings).product;
    expect(r.sci[10 * 40 + 20]).toBeCloseTo(3 * 400, 2);
    expect(r.rejected![10 * 40 + 20]).toBe(1);
    expect(r.rejected![11 * 40 + 21]).toBe(1); // grown by one pixel in the same exposure
    expect(r.rejected![12 * 40 + 22]).toBe(0);
    expect(r.mask[10 * 40 + 20]).toBe(0);
  });
});
