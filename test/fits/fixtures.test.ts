/**
 * whorl reads exactly what an independent implementation wrote: the files in fixtures/fits were
 * written by astropy.io.fits and fpack (cfitsio), and expected.json holds what astropy reads back
 * from each (fixtures/fits/make_fixtures.py).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readFitsFile, readImage, readTable } from '../../src/fits/index.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');

interface ExpectedHdu {
  index: number;
  class: string;
  extname: string | null;
  axes?: number[];
  bitpix?: number;
  data?: (number | null)[];
  rows?: number;
  columns?: Record<string, { format: string; unit: string | null; values: (number | string | boolean | null)[] }>;
  cards?: Record<string, unknown>;
  commentary?: Record<string, string[]>;
}
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as Record<string, ExpectedHdu[]>;

/** Compare pixel by pixel; NaN in whorl is null in the JSON. Float32 images compared in float32. */
function expectPixels(actual: Float32Array | Float64Array, want: (number | null)[], label: string): void {
  expect(actual.length, label).toBe(want.length);
  const round = actual instanceof Float32Array ? Math.fround : (x: number) => x;
  for (let i = 0; i < want.length; i++) {
    const w = want[i];
    if (w === null) expect(Number.isNaN(actual[i]), `${label} pixel ${i}`).toBe(true);
    else if (actual[i] !== round(w)) expect(actual[i], `${label} pixel ${i}`).toBe(round(w));
  }
}

describe('images written by astropy and fpack', () => {
  for (const [name, hdus] of Object.entries(expected)) {
    const images = hdus.filter((h) => h.data !== undefined);
    if (images.length === 0) continue;
    it(`${name}: every image HDU has astropy's shape, BITPIX, EXTNAME and physical values`, () => {
      const file = readFitsFile(join(DIR, name));
      expect(file.warnings).toEqual([]);
      expect(file.hdus.length).toBe(hdus.length);
      for (const h of images) {
        const hdu = file.hdus[h.index]!;
        expect(hdu.kind).toBe(h.class === 'CompImageHDU' ? 'compressed-image' : 'image');
        if (h.extname !== null && h.class !== 'CompImageHDU') expect(hdu.name).toBe(h.extname);
        expect(hdu.header.getNumber('BITPIX')).toBe(h.bitpix);
        const img = readImage(file, h.index);
        expect(img.axes).toEqual(h.axes);
        expectPixels(img.data, h.data!, `${name}[${h.index}]`);
      }
    });
  }

  it('images.fits: BLANK pixels become NaN and are counted, stored NaN are counted apart', () => {
    const file = readFitsFile(join(DIR, 'images.fits'));
    const i16 = readImage(file, file.hdus.findIndex((h) => h.name === 'I16'));
    expect(i16.blankCount).toBe(1);
    expect(i16.nanCount).toBe(0);
    const f32 = readImage(file, file.hdus.findIndex((h) => h.name === 'F32'));
    expect(f32.blankCount).toBe(0);
    expect(f32.nanCount).toBe(2);
    expect(f32.data).toBeInstanceOf(Float32Array);
  });

  it('raw_frame.fits.fz holds the same uint16 pixels as raw_frame.fits', () => {
    const a = readImage(readFitsFile(join(DIR, 'raw_frame.fits')), 0).data;
    const b = readImage(readFitsFile(join(DIR, 'raw_frame.fits.fz')), 1).data;
    expect(Array.from(b)).toEqual(Array.from(a));
  });
});

describe('header cards written by astropy', () => {
  const want = expected['header.fits']![0]!;
  const header = readFitsFile(join(DIR, 'header.fits')).hdus[0]!.header;

  it('reads every valued card as astropy does (strings, doubled quotes, CONTINUE, HIERARCH, logicals, D exponents, complex, big integers)', () => {
    for (const [key, value] of Object.entries(want.cards!)) {
      const got = header.get(key);
      if (key === 'BIGINT') expect(got).toBe(BigInt(value as string));
      else if (value === null) expect(got, key).toBeUndefined();
      else expect(got, key).toEqual(value);
    }
  });

  it('keeps COMMENT, HISTORY and blank-keyword cards in order', () => {
    expect(header.commentary('COMMENT')).toEqual(want.commentary!['COMMENT']);
    expect(header.commentary('HISTORY')).toEqual(want.commentary!['HISTORY']);
    expect(header.cards.filter((c) => c.key === '').map((c) => c.comment)).toEqual(want.commentary!['']);
  });

  it('keeps the comment of a card', () => {
    expect(header.cards.find((c) => c.key === 'WITHCOM')?.comment).toBe('an integer with a comment');
  });
});

describe('tables written by astropy', () => {
  const hdus = expected['tables.fits']!;
  const file = readFitsFile(join(DIR, 'tables.fits'));
  for (const h of hdus.filter((x) => x.columns)) {
    it(`${h.extname}: every column has astropy's values, format and unit`, () => {
      expect(file.hdus[h.index]!.kind).toBe(h.class === 'TableHDU' ? 'table' : 'bintable');
      const t = readTable(file, h.index);
      expect(t.rows).toBe(h.rows);
      for (const [name, col] of Object.entries(h.columns!)) {
        const meta = t.columns.find((c) => c.name === name)!;
        expect(meta.unit ?? null, name).toBe(col.unit === '' ? null : col.unit);
        const got = Array.from(t.column(name) as ArrayLike<unknown>);
        expect(got.length, name).toBe(col.values.length);
        col.values.forEach((w, i) => {
          const g = got[i];
          if (w === null) expect(Number.isNaN(g as number), `${name}[${i}]`).toBe(true);
          else if (typeof g === 'bigint') expect(g, `${name}[${i}]`).toBe(BigInt(w as number | string));
          // astropy reads ASCII-table Ew.d fields as float32; whorl keeps the double the text says
          else if (typeof w === 'number' && h.class === 'TableHDU') expect(Math.fround(g as number), `${name}[${i}]`).toBe(Math.fround(w));
          else if (typeof w === 'number' && /E|C/.test(meta.format)) expect(g, `${name}[${i}]`).toBe(Math.fround(w));
          else expect(g, `${name}[${i}]`).toEqual(w);
        });
      }
    });
  }
});
