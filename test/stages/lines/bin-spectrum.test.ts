import { describe, expect, it } from 'vitest';
import type { CalibratedFrame } from '../../../src/products/frame.js';
import { BinSpectrum } from '../../../src/stages/lines/bin-spectrum.js';

// 3 rows x 5 columns; row 1, column 2 masked; wavelengths shift by 0.1 A per row.
const wave = Float64Array.of(6500, 6500.3, 6500.7, 6501.2, 6501.5, 6500.1, 6500.4, 6500.8, 6501.3, 6501.6, 6500.2, 6500.5, 6500.9, 6501.4, 6501.7);
const frame = {
  width: 5,
  height: 3,
  sci: Float32Array.from({ length: 15 }, (_, i) => 10 + i),
  var: Float32Array.from({ length: 15 }, (_, i) => 1 + i),
  mask: Uint16Array.from({ length: 15 }, (_, i) => (i === 7 ? 1 : 0)),
} as unknown as CalibratedFrame;

describe('BinSpectrum', () => {
  it('sums rows added out of order (as the central bin adds them) over the reset columns, as numpy does', () => {
    const bin = new BinSpectrum(frame, wave, 1);
    bin.reset(1, 4);
    bin.addRow(1, 1);
    bin.addRow(2, 3);
    bin.addRow(0, 2);
    expect([bin.rowStart, bin.rowEnd, bin.nRows]).toEqual([0, 2, 3]);
    // numpy.average(rows, weights=[2, 1, 3]) of the wavelengths and of the row numbers.
    expect(bin.yCentre).toBeCloseTo(1.1666666666666667, 14);
    const expectedWave = [6500.416666666667, 6500.816666666666, 6501.316666666666];
    // numpy.gradient of those: central differences, one-sided at the ends of the columns.
    const expectedWidth = [0.3999999999987267, 0.44999999999936335, 0.5];
    for (let k = 0; k < 3; k++) {
      expect(bin.wave[1 + k]).toBeCloseTo(expectedWave[k]!, 9);
      expect(bin.pixelWidth[1 + k]).toBeCloseTo(expectedWidth[k]!, 9);
    }
    // The masked pixel (row 1, column 2) is left out of the sums and marks its column bad.
    expect(Array.from(bin.sci.subarray(1, 4))).toEqual([11 + 16 + 21, 12 + 22, 13 + 18 + 23]);
    expect(Array.from(bin.var.subarray(1, 4))).toEqual([2 + 7 + 12, 3 + 13, 4 + 9 + 14]);
    expect(Array.from(bin.bad)).toEqual([1, 0, 1, 0, 1]);
  });

  it('starts again from nothing after reset, and one row is that row on its native pixels', () => {
    const bin = new BinSpectrum(frame, wave, 1);
    bin.reset(1, 4);
    bin.addRow(0, 2);
    bin.addRow(1, 1);
    bin.reset(0, 5);
    bin.addRow(2, 5);
    expect([bin.rowStart, bin.rowEnd, bin.nRows, bin.yCentre]).toEqual([2, 2, 1, 2]);
    expect(Array.from(bin.wave)).toEqual(Array.from(wave.subarray(10, 15)));
    expect(Array.from(bin.sci)).toEqual([20, 21, 22, 23, 24]);
    expect(Array.from(bin.bad)).toEqual([0, 0, 0, 0, 0]);
  });
});
