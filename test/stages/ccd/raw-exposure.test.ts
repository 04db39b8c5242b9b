/** calibrateRawExposure: trimming and calibration in one pass, against the CCD equation and the two-pass path. */
import { describe, expect, it } from 'vitest';
import { resolveDetector } from '../../../src/stages/ccd/detector.js';
import { calibrateExposure, type ExposureCalibration } from '../../../src/stages/ccd/exposure.js';
import { overscanLevel, trimFrame } from '../../../src/stages/ccd/overscan.js';
import { calibrateRawExposure } from '../../../src/stages/ccd/raw-exposure.js';
import { DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { MASK_BITS, type RawFrame } from '../../../src/products/frame.js';
import { syntheticFrame } from './synthetic.js';

const settings = { ...DEFAULT_CCD_SETTINGS, saturationAdu: 60000 };

/** A calibration of width x height with uneven bias, flat (some values tiny) and mask bits. */
function calibration(width: number, height: number): ExposureCalibration {
  const n = width * height;
  const cal = {
    orientation: { transpose: false, flipX: false }, width, height, gain: 2.3, readNoiseE: 4.1, biasVarianceAdu: 0.2,
    masterBias: new Float32Array(n), masterFlat: new Float32Array(n), flatVariance: new Float32Array(n), flatMask: new Uint16Array(n),
  };
  for (let i = 0; i < n; i++) {
    cal.masterBias[i] = 0.37 * Math.sin(i);
    cal.masterFlat[i] = i % 97 === 0 ? 1e-6 : 0.8 + 0.4 * Math.cos(3 * i);
    cal.flatMask[i] = i % 41 === 0 ? MASK_BITS.badColumn : 0;
  }
  return cal;
}

/** Raw signal with dark pixels (below the bias), bright ones and one at saturation. */
const signal = (x: number, y: number): number => (x === 7 && y === 3 ? 65000 : ((x * 37 + y * 11) % 50) * 13.7 - 40);

/** The same frame with a strip of overscan rows below the data instead of columns beside it (the level along raw x). */
function rowStrip(f: RawFrame, width: number, height: number): RawFrame {
  const header = f.header.clone();
  header.set('BIASSEC', `[1:${width},${height + 1}:${height + 8}]`);
  const data = new Float32Array(width * (height + 8));
  for (let y = 0; y < height + 8; y++) for (let x = 0; x < width; x++) data[y * width + x] = 300 + 0.5 * x + (y < height ? f.data[y * f.width + x]! - 300 : 0);
  return { ...f, header, width, height: height + 8, data };
}

function noOverscan(f: RawFrame): RawFrame {
  const header = f.header.clone();
  header.delete('BIASSEC');
  return { ...f, header };
}

function asUint16(f: RawFrame): RawFrame {
  return { ...f, data: Uint16Array.from(f.data, (v) => Math.max(0, Math.round(v))) };
}

function sameBits(a: Float32Array | Uint16Array, b: Float32Array | Uint16Array): boolean {
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  return x.length === y.length && x.every((v, i) => v === y[i]);
}

describe('calibrateRawExposure', () => {
  const base = syntheticFrame('raw/s.fits', signal, { biasLevel: 300, biasSlope: 0.37 });
  const frames: [string, RawFrame][] = [
    ['overscan columns (level along raw y)', base],
    ['overscan rows (level along raw x)', rowStrip(base, 40, 30)],
    ['no overscan', noOverscan(base)],
    ['unsigned 16-bit raw pixels', asUint16(base)],
  ];
  for (const [name, frame] of frames) {
    it(`gives the bits of trimFrame then calibrateExposure, into dirty buffers: ${name}`, () => {
      const det = resolveDetector(frame, settings);
      const cal = calibration(40, 30);
      const n = 40 * 30;
      const into = { sci: new Float32Array(n).fill(NaN), var: new Float32Array(n).fill(-1), mask: new Uint16Array(n).fill(0xffff) };
      const one = calibrateRawExposure(frame, det, overscanLevel(frame, det, 3), cal, into);
      const two = calibrateExposure(trimFrame(frame, det, 3), cal, new Float32Array(n));
      expect(one.sci === into.sci && one.var === into.var && one.mask === into.mask).toBe(true);
      expect(sameBits(one.sci, two.sci) && sameBits(one.var, two.var) && sameBits(one.mask, two.mask)).toBe(true);
    });
  }

  it('is the CCD equation: sci = g (raw - overscan - bias) / F, var = (g max(., 0) + RN^2) / F^2 (Howell, Handbook of CCD Astronomy, ch. 4), saturation and calibration bits in the mask', () => {
    const det = resolveDetector(base, settings);
    const cal = calibration(40, 30);
    const n = 40 * 30;
    const e = calibrateRawExposure(base, det, overscanLevel(base, det, 3), cal, { sci: new Float32Array(n), var: new Float32Array(n), mask: new Uint16Array(n) });
    for (const [x, y] of [[0, 0], [13, 7], [39, 29], [2, 20]] as const) {
      const i = y * 40 + x;
      const detected = 2.3 * (signal(x, y) - cal.masterBias[i]!);
      expect(e.sci[i]! / (detected / cal.masterFlat[i]!)).toBeCloseTo(1, 5);
      expect(e.var[i]! / ((2.3 * Math.max(detected / 2.3, 0) + 4.1 ** 2) / cal.masterFlat[i]! ** 2)).toBeCloseTo(1, 4);
    }
    expect(e.mask[3 * 40 + 7]).toBe(MASK_BITS.saturated);
    expect(e.mask[41]).toBe(MASK_BITS.badColumn);
    expect(e.mask[1]).toBe(0);
  });

  it('refuses a calibration that reorients the frame, and buffers of the wrong size', () => {
    const det = resolveDetector(base, settings);
    const cal = calibration(40, 30);
    const n = 40 * 30;
    const level = overscanLevel(base, det, 3);
    const into = () => ({ sci: new Float32Array(n), var: new Float32Array(n), mask: new Uint16Array(n) });
    expect(() => calibrateRawExposure(base, det, level, { ...cal, orientation: { transpose: true, flipX: false } }, into())).toThrow(RangeError);
    expect(() => calibrateRawExposure(base, det, level, cal, { ...into(), var: new Float32Array(n - 1) })).toThrow(RangeError);
  });
});
