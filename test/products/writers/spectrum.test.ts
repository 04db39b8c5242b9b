import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { Header } from '../../../src/fits/header.js';
import { writeFits } from '../../../src/fits/write.js';
import type { CalibratedFrame, Orientation } from '../../../src/products/frame.js';
import { toInternal } from '../../../src/products/orientation.js';
import type { WavelengthSolution } from '../../../src/products/wavelength.js';
import { masterBiasFits, masterFlatFits } from '../../../src/products/writers/calibration.js';
import { spectrumFits } from '../../../src/products/writers/spectrum.js';
import { astropyJson, fitsverify, hasAstropy, hasFitsverify } from '../../fits/outside-tools.js';

/** A trimmed raw image whose value says where it is: R(x, y) = 1000 y + x. */
const RAW_W = 7;
const RAW_H = 5;
function rawImage<T extends Float32Array | Float64Array | Uint16Array>(make: new (n: number) => T, scale = 1): T {
  const a = new make(RAW_W * RAW_H);
  for (let y = 0; y < RAW_H; y++) for (let x = 0; x < RAW_W; x++) a[y * RAW_W + x] = (1000 * y + x) * scale;
  return a;
}

function frameIn(o: Orientation): { frame: CalibratedFrame; solution: WavelengthSolution } {
  const sci = toInternal(rawImage(Float32Array), RAW_W, RAW_H, o);
  const mask = rawImage(Uint16Array);
  mask[RAW_W * RAW_H - 1] = 65535; // every bit set survives the unsigned 16-bit storage
  const header = new Header().set('OBJECT', 'Test Disk').set('DATE-OBS', '2020-01-01T00:00:00');
  const frame: CalibratedFrame = {
    width: sci.width,
    height: sci.height,
    sci: sci.data,
    var: toInternal(rawImage(Float32Array, 2), RAW_W, RAW_H, o).data,
    mask: toInternal(mask, RAW_W, RAW_H, o).data,
    orientation: o,
    section: { x0: 10, x1: 10 + RAW_W, y0: 2, y1: 2 + RAW_H },
    header,
    exposures: [{ path: 'raw/sci_001.fits', header, dateObs: '2020-01-01T00:00:00', exptimeS: 600 }],
    exptimeS: 600,
    gain: 1.4,
    readNoiseE: 4,
  };
  const wave = toInternal(rawImage(Float64Array, 0.5), RAW_W, RAW_H, o).data;
  const legendre = { kind: 'legendre2d' as const, xOrder: 0, yOrder: 0, xMin: 0, xMax: 1, yMin: 0, yMax: 1, coeffs: [0] };
  const solution: WavelengthSolution = { width: sci.width, height: sci.height, wave, model: legendre, lsfSigmaPx: legendre, flipX: o.flipX, lines: [], rmsAngstrom: 0.01, rmsPx: 0.01, rmsKms: 0.5, identifiedRange: [6000, 7000], flexure: null };
  return { frame, solution };
}

const READ_BACK = `
import sys, json
from astropy.io import fits
with fits.open(sys.argv[1]) as h:
    out = {e.name: {'data': e.data.tolist() if e.data is not None else None, 'dtype': str(e.data.dtype) if e.data is not None else None,
                    'bunit': e.header.get('BUNIT'), 'btype': e.header.get('BTYPE')} for e in h}
    out['HISTORY'] = [str(c) for c in h[0].header.get('HISTORY', [])]
    out['RAWSEC'] = h[0].header.get('RAWSEC')
print(json.dumps(out))
`;

type ReadBack = Record<string, { data: number[][]; dtype: string; bunit?: string; btype?: string }> & { HISTORY: string[]; RAWSEC: string };

describe('spectrumFits', () => {
  for (const o of [
    { transpose: false, flipX: false },
    { transpose: false, flipX: true },
    { transpose: true, flipX: false },
    { transpose: true, flipX: true },
  ]) {
    it.skipIf(!hasAstropy)(`writes SCI/VAR/MASK/WAVE in the raw orientation (transpose ${o.transpose}, flipX ${o.flipX}), read back by astropy`, () => {
      const { frame, solution } = frameIn(o);
      const fits = spectrumFits(frame, solution, ['step one', 'step two']);
      const path = join(mkdtempSync(join(tmpdir(), 'whorl-spectrum-')), 'spectrum.fits');
      writeFileSync(path, writeFits(fits.hdus, { primaryHeader: fits.primaryHeader }));
      const back = astropyJson<ReadBack>(READ_BACK, path);
      // numpy's [row][column] of the raw frame is R(x, y) = 1000 y + x whatever the internal orientation was.
      expect(back['SCI']!.data[3]![5]).toBe(3005);
      expect(back['SCI']!.data.length).toBe(RAW_H);
      expect(back['SCI']!.data[0]!.length).toBe(RAW_W);
      expect(back['VAR']!.data[4]![6]).toBe(8012);
      expect(back['WAVE']!.data[1]![2]).toBeCloseTo(501, 12);
      expect(back['MASK']!.dtype).toBe('uint16');
      expect(back['MASK']!.data[2]![1]).toBe(2001);
      expect(back['MASK']!.data[RAW_H - 1]![RAW_W - 1]).toBe(65535);
      expect(back['SCI']!.bunit).toBe('electron');
      expect(back['WAVE']!.bunit).toBe('Angstrom');
      expect(back['WAVE']!.btype).toBe('AWAV'); // WCS Paper III code for air wavelength
      expect(back.HISTORY).toEqual(['step one', 'step two']);
      expect(back.RAWSEC).toBe('[11:17,3:7]');
    });
  }

  it.skipIf(!hasFitsverify)('passes fitsverify, and so do the master bias and flat', () => {
    const { frame, solution } = frameIn({ transpose: true, flipX: true });
    const dir = mkdtempSync(join(tmpdir(), 'whorl-spectrum-'));
    const masters = {
      orientation: frame.orientation,
      section: frame.section,
      width: frame.width,
      height: frame.height,
      gain: 1.4,
      readNoiseE: 4,
      masterBias: frame.sci,
      biasVarianceAdu: 0.5,
      masterFlat: frame.var,
      flatVariance: frame.var,
      flatMask: frame.mask,
    };
    for (const [name, f] of [
      ['spectrum.fits', spectrumFits(frame, solution, ['a'])],
      ['bias.fits', masterBiasFits(masters, ['raw/bias_001.fits'], ['b'])],
      ['flat.fits', masterFlatFits(masters, ['raw/flat_001.fits'], ['c'])],
    ] as const) {
      const path = join(dir, name);
      writeFileSync(path, writeFits(f.hdus, { primaryHeader: f.primaryHeader }));
      const v = fitsverify(path);
      expect(v.errors, `${name}: ${v.text}`).toBe(0);
      expect(v.warnings, `${name}: ${v.text}`).toBe(0);
    }
  });

  it('refuses a solution of another size', () => {
    const { frame, solution } = frameIn({ transpose: false, flipX: false });
    expect(() => spectrumFits(frame, { ...solution, width: 3 }, [])).toThrow(RangeError);
  });
});
