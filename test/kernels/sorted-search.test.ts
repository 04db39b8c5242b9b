import { describe, expect, it } from 'vitest';
import { lowerIndex, nearestIndex } from '../../src/kernels/sorted-search.js';

// Reference: numpy.searchsorted(a, x, side='left') (Debian python3-numpy), checked with /usr/bin/python3 numpy
// for the array below: [1, 2, 2, 4] -> 0.5: 0, 1: 0, 2: 1, 3: 3, 4: 3, 9: 4.
const a = Float64Array.from([1, 2, 2, 4]);

describe('lowerIndex', () => {
  it("agrees with numpy.searchsorted side='left', ties and both ends included", () => {
    expect([0.5, 1, 2, 3, 4, 9].map((x) => lowerIndex(a, x))).toEqual([0, 0, 1, 3, 3, 4]);
    expect(lowerIndex(new Float64Array(0), 1)).toBe(0);
  });
});

describe('nearestIndex', () => {
  it('finds the nearest value, the lower one on a tie, the ends outside the range, -1 when empty', () => {
    expect([0, 1.4, 2.9, 3, 3.1, 7].map((x) => nearestIndex(a, x))).toEqual([0, 0, 2, 2, 3, 3]);
    expect(nearestIndex(new Float64Array(0), 1)).toBe(-1);
  });
});
