/** loadRawFrame: the first 2-D image of a file, in physical ADU; fixtures written by astropy and fpack. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { Header, loadRawFrame, parseFits, readFitsFile, readImage, writeFits } from '../../src/fits/index.js';
import { readUnsigned16 } from '../../src/fits/image.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const tmp = mkdtempSync(join(tmpdir(), 'whorl-raw-'));
/** What astropy.io.fits reads from each fixture (made by fixtures/fits/make_fixtures.py). */
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as Record<string, { extname: string | null; data?: (number | null)[] }[]>;

describe('loadRawFrame', () => {
  it('reads the astropy uint16 frame with overscan into a Uint16Array of the ADU astropy reads, header included', () => {
    const f = loadRawFrame(join(DIR, 'raw_frame.fits'));
    expect(f).toMatchObject({ hdu: 0, width: 72, height: 40 });
    expect(f.data).toBeInstanceOf(Uint16Array);
    expect(Array.from(f.data)).toEqual(expected['raw_frame.fits']![0]!.data);
    expect(f.data[10 * 72 + 20]).toBe(65535); // the saturated pixel make_fixtures.py set
    expect(f.header.getString('BIASSEC')).toBe('[65:72,1:40]');
  });

  it('keeps 16-bit data with BLANK pixels, or scaled otherwise, in a Float32Array of physical values (FITS Standard 4.0, 4.4.2.5 and 5.3)', () => {
    const values = [7, 1, 32767, 32768, NaN, 65535];
    const blanked = join(tmp, 'blank.fits');
    writeFileSync(blanked, writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: 3, height: 2, data: values }], { imageInPrimary: true }));
    const b = loadRawFrame(blanked);
    expect(b.data).toBeInstanceOf(Float32Array);
    expect(Array.from(b.data)).toEqual(values);
    const scaled = join(tmp, 'scaled.fits');
    writeFileSync(scaled, writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, bscale: 2, width: 3, height: 1, data: [2, 4, 65534] }], { imageInPrimary: true }));
    const s = loadRawFrame(scaled);
    expect(s.data).toBeInstanceOf(Float32Array);
    expect(Array.from(s.data)).toEqual([2, 4, 65534]);
  });

  it('keeps nothing of the read buffer it reuses: a frame is unchanged after later, larger and smaller, frames are read', () => {
    const write = (name: string, w: number, h: number, value: number, object: string) => {
      const path = join(tmp, name);
      writeFileSync(path, writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: w, height: h, data: new Array(w * h).fill(value), header: new Header().set('OBJECT', object) }], { imageInPrimary: true }));
      return path;
    };
    const first = loadRawFrame(write('first.fits', 60, 50, 1000, 'first'));
    loadRawFrame(write('larger.fits', 300, 200, 2000, 'larger'));
    const smaller = loadRawFrame(write('smaller.fits', 10, 8, 3000, 'smaller'));
    expect(new Set(first.data)).toEqual(new Set([1000]));
    expect(first.header.getString('OBJECT')).toBe('first');
    expect(new Set(smaller.data)).toEqual(new Set([3000]));
    expect(smaller.header.getString('OBJECT')).toBe('smaller');
  });

  it('finds the image inside an fpack file (HDU 1) with the same pixels and cards', () => {
    const plain = loadRawFrame(join(DIR, 'raw_frame.fits'));
    const packed = loadRawFrame(join(DIR, 'raw_frame.fits.fz'));
    expect(packed.hdu).toBe(1);
    expect(Array.from(packed.data)).toEqual(Array.from(plain.data));
    expect(packed.header.getString('IMAGETYP')).toBe('object');
    expect(packed.header.getNumber('BITPIX')).toBe(16);
    expect(packed.header.has('ZCMPTYPE')).toBe(false);
  });

  it('gives an extension the primary cards it lacks (INHERIT convention), its own cards winning', () => {
    const primaryHeader = new Header().set('EXPTIME', 300).set('IMAGETYP', 'flat').set('OBSERVER', 'nobody');
    const bytes = writeFits([{ kind: 'image', name: 'SCI', bitpix: 16, bzero: 32768, width: 4, height: 3, data: new Array(12).fill(5), header: new Header().set('IMAGETYP', 'object') }], { primaryHeader });
    const path = join(tmp, 'mef.fits');
    writeFileSync(path, bytes);
    const f = loadRawFrame(path);
    expect(f.hdu).toBe(1);
    expect(f.header.getString('IMAGETYP')).toBe('object');
    expect(f.header.getNumber('EXPTIME')).toBe(300);
    expect(f.header.getNumber('NAXIS1')).toBe(4);
  });

  it('hands soft problems such as a DATASUM mismatch to the caller', () => {
    const bytes = writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: 4, height: 3, data: new Array(12).fill(5) }], { imageInPrimary: true });
    bytes[2880] ^= 1;
    const path = join(tmp, 'sum.fits');
    writeFileSync(path, bytes);
    const warnings: string[] = [];
    loadRawFrame(path, warnings);
    expect(warnings.join()).toMatch(/sum\.fits, HDU 0: DATASUM does not match the data/);
  });

  it('a file with no 2-D image is an InputError naming the file', () => {
    const path = join(tmp, 'table.fits');
    writeFileSync(path, writeFits([{ kind: 'bintable', name: 'T', columns: [{ name: 'A', format: 'J', values: [1] }] }]));
    expect(() => loadRawFrame(path)).toThrow(InputError);
    expect(() => loadRawFrame(path)).toThrow(/table\.fits: no HDU holds a 2-D image/);
  });
});

describe('readUnsigned16', () => {
  it("gives astropy's values of the BZERO 32768 image (91 pixels: an odd count) and nothing for any other image", () => {
    const file = readFitsFile(join(DIR, 'images.fits'));
    const want = expected['images.fits']!;
    for (let i = 0; i < file.hdus.length; i++) {
      const got = readUnsigned16(file, i);
      if (file.hdus[i]!.name !== 'U16') {
        expect(got, file.hdus[i]!.name).toBeUndefined();
        continue;
      }
      expect([got!.width, got!.height]).toEqual([13, 7]);
      expect(Array.from(got!.data)).toEqual(want.find((h) => h.extname === 'U16')!.data);
      expect(Array.from(got!.data)).toEqual(Array.from(readImage(file, i).data));
    }
  });
});

describe('unknown extensions', () => {
  it('are listed as unknown and skipped; the HDUs after them are read (section 3.4.1)', () => {
    const bytes = writeFits([
      { kind: 'image', name: 'A', bitpix: 8, width: 2, height: 2, data: [1, 2, 3, 4] },
      { kind: 'image', name: 'B', bitpix: 8, width: 2, height: 2, data: [5, 6, 7, 8] },
    ]);
    const text = Buffer.from(bytes).toString('latin1');
    const at = text.indexOf("XTENSION= 'IMAGE   '") + 11;
    bytes.set(new TextEncoder().encode('FOREIGN '), at);
    const file = parseFits(bytes, 'mem', { checksum: 'skip' });
    expect(file.hdus.map((h) => h.kind)).toEqual(['image', 'unknown', 'image']);
    expect(Array.from(readImage(file, 2).data)).toEqual([5, 6, 7, 8]);
  });
});
