/**
 * The report's display stretch: the lookup table gives exactly the grey levels of the formula it
 * stands for (255 - round(255 asinh(t / 0.05) / asinh(20)), t the value between the 1st and 99.5th
 * percentiles clipped to [0, 1]), on noise, on a dense ramp over every level edge, and on NaN.
 */
import { describe, expect, it } from 'vitest';
import { stretchToGrey } from '../../src/report/png.js';

/** The formula pixel by pixel, percentiles from a full sort (the order statistics a selection must return). */
function reference(data: Float32Array): Uint8Array {
  const finite = Array.from(data).filter(Number.isFinite).sort((a, b) => a - b);
  const hi = finite[Math.floor(0.995 * (finite.length - 1))]!;
  const lo = finite[Math.floor(0.01 * (finite.length - 1))]!;
  const span = hi > lo ? hi - lo : 1;
  return Uint8Array.from(data, (v) => {
    const t = Number.isFinite(v) ? Math.min(1, Math.max(0, (v - lo) / span)) : 0;
    return 255 - Math.round((255 * Math.asinh(t / 0.05)) / Math.asinh(1 / 0.05));
  });
}

function mismatches(data: Float32Array): number {
  const got = stretchToGrey(data);
  const want = reference(data);
  let n = 0;
  for (let i = 0; i < data.length; i++) if (got[i] !== want[i]) n++;
  return n;
}

describe('stretchToGrey', () => {
  it('matches the formula on sky noise with bright lines and blanks', () => {
    let seed = 12345;
    const uniform = () => ((seed = (seed * 1103515245 + 12345) >>> 0) + 0.5) / 4294967296;
    const data = Float32Array.from({ length: 200000 }, (_, i) => {
      const noise = Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform()) * 12;
      return i % 997 === 0 ? NaN : i % 50 < 2 ? 3000 * uniform() + noise : noise;
    });
    data[7] = Infinity;
    expect(mismatches(data)).toBe(0);
  });

  it('matches the formula on a dense ramp across every level edge', () => {
    const n = 1 << 21;
    const data = Float32Array.from({ length: n }, (_, i) => -3 + (i / n) * 1000);
    expect(mismatches(data)).toBe(0);
    const grey = stretchToGrey(data);
    expect(new Set(grey).size).toBe(256);
  });

  it('is white for no finite value and for a constant image', () => {
    expect(Array.from(stretchToGrey(new Float32Array([NaN, NaN])))).toEqual([255, 255]);
    expect(mismatches(new Float32Array(5000).fill(4))).toBe(0);
  });
});
