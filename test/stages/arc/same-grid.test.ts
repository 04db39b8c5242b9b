import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import type { CalibratedFrame } from '../../../src/products/frame.js';
import type { WavelengthSolution } from '../../../src/products/wavelength.js';
import { requireSameGrid } from '../../../src/stages/arc/same-grid.js';
import { DEFAULT_SKY_SETTINGS, subtractSky } from '../../../src/stages/sky/index.js';

const frame = { width: 40, height: 20, exposures: [{ path: 'raw/science-7.fits' }] } as unknown as CalibratedFrame;
const binned = { width: 20, height: 20 } as unknown as WavelengthSolution;

describe('requireSameGrid', () => {
  it('an arc of another binning is an InputError naming the science file, both sizes and what to do', () => {
    let caught: unknown;
    try {
      requireSameGrid(frame, binned);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InputError);
    const e = caught as InputError;
    expect(e.code).toBe('solution.size-mismatch');
    expect(e.place.file).toBe('raw/science-7.fits');
    expect([e.expected, e.actual]).toEqual(['20 x 20 px, as the arc', '40 x 20 px']);
    expect(e.message).toMatch(/same detector window and binning/);
  });

  it('passes a solution of the same size, and the sky stage makes the check before anything else', () => {
    expect(() => requireSameGrid(frame, { width: 40, height: 20 } as unknown as WavelengthSolution)).not.toThrow();
    expect(() => subtractSky(frame, binned, DEFAULT_SKY_SETTINGS)).toThrow(InputError);
  });
});
