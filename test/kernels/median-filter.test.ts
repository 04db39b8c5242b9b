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
