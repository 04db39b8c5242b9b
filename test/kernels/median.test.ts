import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bucketSelect, median, medianOfBuffer } from '../../src/kernels/robust.js';

interface MedianCase {
  name: string;
  values: number[];
  median: number;
}
// Outside reference: numpy.median (Debian python3-numpy) of seeded arrays, fixtures/kernels/make_median_cases.py.
const cases = JSON.parse(readFileSync(new URL('../../fixtures/kernels/median-cases.json', import.meta.url), 'utf8')) as MedianCase[];

describe('median of large buffers (bucket selection)', () => {
  for (const c of cases) {
    it(`equals numpy.median exactly: ${c.name}`, () => {
      expect(c.values.length).toBeGreaterThanOrEqual(512);
      expect(medianOfBuffer(Float64Array.from(c.values), c.values.length)).toBe(c.median);
      expect(median(c.values)).toBe(c.median);
    });
  }
  it('every rank of a noisy buffer is the value a sort puts there (seeded)', () => {
    let s = 7;
    const next = () => ((s = (s * 1103515245 + 12345) >>> 0), s / 4294967296);
    const values = Float64Array.from({ length: 1500 }, () => (next() < 0.01 ? 1e5 * next() : next() + next()));
    const sorted = Float64Array.from(values).sort();
    for (const k of [0, 1, 700, 749, 750, 1498, 1499]) expect(bucketSelect(Float64Array.from(values), values.length, k)).toBe(sorted[k]);
  });
});
