import { describe, expect, it } from 'vitest';
import { medianAt, medianFilter } from '../../src/kernels/median-filter.js';
import { reference } from '../stages/ccd/reference.js';

// Outside reference: scipy.ndimage.median_filter(mode='reflect') (fixtures/ccd/make_ccd_fixtures.py).
describe('medianFilter', () => {
  const { width, height } = reference.median;
  const image = Float32Array.from(reference.median.image);
  for (const [radius, key] of [[1, 'size3'], [2, 'size5'], [3, 'size7']] as const) {
    it(`matches scipy.ndimage.median_filter size ${2 * radius + 1} with mirrored edges exactly`, () => {
      const out = medianFilter(image, width, height, radius);
      expect(Array.from(out)).toEqual(reference.median[key]);
    });
    it(`medianAt agrees with the full filter at every pixel (radius ${radius})`, () => {
      const full = medianFilter(image, width, height, radius);
      const scratch = new Float32Array((2 * radius + 1) ** 2);
      for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) expect(medianAt(image, width, height, x, y, radius, scratch)).toBe(full[y * width + x]);
    });
  }
  it('rejects a size that does not match the image and an output aliasing the input', () => {
    expect(() => medianFilter(image, width + 1, height, 1)).toThrow(RangeError);
    expect(() => medianFilter(image, width, height, 1, image)).toThrow(RangeError);
  });
});

describe('medianFilter on larger images with many ties and spikes', () => {
  it('equals the quickselect median of every window (radius 2 and 3, seeded)', () => {
    const width = 61;
    const height = 37;
    const image = new Float32Array(width * height);
    let state = 12345;
    const next = (): number => {
      state = (Math.imul(state, 1103515245) + 12345) >>> 0;
      return state / 4294967296;
    };
    for (let i = 0; i < image.length; i++) image[i] = next() < 0.05 ? 5000 * next() : Math.round(20 * next()) / 2 + (i % width > 40 ? 100 : 0);
    for (const radius of [2, 3]) {
      const full = medianFilter(image, width, height, radius);
      const scratch = new Float32Array((2 * radius + 1) ** 2);
      let mismatches = 0;
      for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) if (medianAt(image, width, height, x, y, radius, scratch) !== full[y * width + x]) mismatches++;
      expect(mismatches).toBe(0);
    }
  });
});
