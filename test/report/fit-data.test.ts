import { describe, expect, it } from 'vitest';
import { packFits } from '../../src/report/fit-data.js';
import type { BinFit } from '../../src/products/lines.js';

function fit(n: number, w0: number, step: number): BinFit {
  const wavelength = Float64Array.from({ length: n }, (_, i) => w0 + i * step + 1e-3 * Math.sin(i));
  const model = Float32Array.from(wavelength, (w) => 5 + 400 * Math.exp(-0.5 * ((w - wavelength[n >> 1]!) / 1.3) ** 2));
  const data = Float32Array.from(model, (m, i) => m + ((i * 37) % 11) - 5);
  const error = new Float32Array(n).fill(3.2);
  data[3] = NaN;
  const excluded = new Uint8Array(n);
  excluded[3] = 1;
  return { bin: 0, group: 'Halpha+NII', wavelength, data, error, model, excluded };
}

/** Decode as the page script does (int16 little-endian, -32768 = no value). */
function decode(blob: string, g: { n: number; o: number }, k: number, offset: number, scale: number, slope = 0): (number | null)[] {
  const bytes = Buffer.from(blob, 'base64');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return Array.from({ length: g.n }, (_, i) => {
    const q = view.getInt16(2 * (g.o + k * g.n + i), true);
    return q === -32768 ? null : offset + i * slope + q * scale;
  });
}

describe('packFits (report row-fit data)', () => {
  it('keeps wavelengths to 0.1 mA and values to 1/30000 of the largest, NaN as no value', () => {
    const fits = [[fit(150, 6582.59, 0.3)], [fit(40, 6716.1, 1.1), fit(30, 6560.2, 1.1)]];
    const packed = packFits(fits);
    packed.panels.forEach((groups, p) =>
      groups.forEach((g, k) => {
        const f = fits[p]![k]!;
        const w = decode(packed.blob, g, 0, g.w0, g.ws, g.wd);
        const d = decode(packed.blob, g, 1, 0, g.vs);
        const m = decode(packed.blob, g, 3, 0, g.vs);
        for (let i = 0; i < g.n; i++) {
          expect(Math.abs(w[i]! - f.wavelength[i]!)).toBeLessThan(1e-4);
          expect(Math.abs(m[i]! - f.model[i]!)).toBeLessThanOrEqual(g.vs);
          if (Number.isNaN(f.data[i]!)) expect(d[i]).toBeNull();
          else expect(Math.abs(d[i]! - f.data[i]!)).toBeLessThanOrEqual(g.vs);
        }
        expect(g.x).toEqual([3]);
      }),
    );
  });

  it('is several times smaller than the same numbers as JSON text', () => {
    const fits = Array.from({ length: 50 }, () => [fit(150, 6582.59, 0.3)]);
    const asJson = JSON.stringify(fits.map((p) => p.map((f) => ({ w: Array.from(f.wavelength), d: Array.from(f.data), e: Array.from(f.error), m: Array.from(f.model) }))));
    expect(JSON.stringify(packFits(fits)).length).toBeLessThan(asJson.length / 3);
  });
});
