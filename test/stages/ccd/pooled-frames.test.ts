/** The CCD stages with dead frames in the pool (frame-pool.ts): same products, no memory shared with a product. */
import { afterEach, describe, expect, it } from 'vitest';
import { emptyPool, giveBack, takeFloat32, takeUint16 } from '../../../src/kernels/frame-pool.js';
import { buildCalibration } from '../../../src/stages/ccd/build-calibration.js';
import { calibrateScience } from '../../../src/stages/ccd/calibrate-science.js';
import { DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { arcSignal, syntheticFrame } from './synthetic.js';

const settings = { ...DEFAULT_CCD_SETTINGS, cleanSingleExposure: false };
// 2^20 pixels: large enough for the pool to keep.
const size = { width: 1024, height: 1024 };
const n = size.width * size.height;

afterEach(() => emptyPool());

function bitsEqual(a: Float32Array | Uint16Array | Uint8Array, b: Float32Array | Uint16Array | Uint8Array): boolean {
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  return x.length === y.length && x.every((v, i) => v === y[i]);
}

describe('CCD stages on pooled dead frames', () => {
  const calFrames = () => ({
    bias: [syntheticFrame('raw/b.fits', () => 0, size)],
    flat: [syntheticFrame('raw/f.fits', () => 8000, size)],
    arc: [syntheticFrame('raw/a1.fits', arcSignal, size), syntheticFrame('raw/a2.fits', arcSignal, size)],
  });

  it('buildCalibration pools only arrays that no product holds', () => {
    const cal = buildCalibration(calFrames(), settings).product;
    const products = [cal.masterBias, cal.masterFlat, cal.flatVariance, cal.flatMask, cal.arc.sci, cal.arc.var, cal.arc.mask].map((a) => a.buffer);
    const taken = [takeFloat32(n), takeFloat32(n), takeFloat32(n), takeUint16(n), takeUint16(n)];
    for (const t of taken) expect(products.includes(t.buffer)).toBe(false);
    // The second arc exposure was pooled (a new array would be all zeros).
    expect(taken.slice(0, 3).some((t) => t.some((v) => v !== 0))).toBe(true);
  });

  it('calibrateScience overwrites dirty pooled frames in full: the same bits as on new arrays, the answer of the noise-free frames', () => {
    const cal = buildCalibration(calFrames(), settings).product;
    emptyPool();
    // A hit in one of three equal exposures: 200 ADU at gain 2 through a flat of 1, 3 x 400 e- (the
    // CCD equation, Howell, Handbook of CCD Astronomy, ch. 4).
    const science = [0, 1, 2].map((k) => syntheticFrame(`raw/s${k}.fits`, (x, y) => (k === 1 && x === 20 && y === 10 ? 3000 : 200), size));
    const before = science.map((f) => f.data.slice());
    const fresh = calibrateScience(science, cal, settings).product;
    for (let k = 0; k < 6; k++) giveBack(new Float32Array(n).fill(NaN), new Uint16Array(n).fill(0xffff));
    const pooled = calibrateScience(science, cal, settings).product;
    expect(bitsEqual(pooled.sci, fresh.sci) && bitsEqual(pooled.var, fresh.var) && bitsEqual(pooled.mask, fresh.mask) && bitsEqual(pooled.rejected!, fresh.rejected!)).toBe(true);
    science.forEach((f, k) => expect(bitsEqual(f.data as Float32Array, before[k]!)).toBe(true));
    let off = 0;
    for (let i = 0; i < n; i++) if (Math.abs(pooled.sci[i]! - 1200) > 1e-2 || pooled.mask[i] !== 0 || !(pooled.var[i]! > 0)) off++;
    expect(off).toBe(0);
    expect(pooled.rejected![10 * size.width + 20]).toBe(1);
    const buffers = [pooled.sci, pooled.var, pooled.mask, cal.masterBias, cal.masterFlat, cal.flatVariance, cal.flatMask].map((a) => a.buffer);
    expect(new Set(buffers).size).toBe(buffers.length);
  });
});
