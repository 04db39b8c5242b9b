/**
 * Images read back as stored: astropy's files (fixtures/fits/images.fits, expected.json made by
 * astropy.io.fits) give the values astropy reads, and whorl's own float32 images come back bit for
 * bit, -0 and NaN payloads included, which readImage's BZERO + BSCALE x stored does not promise.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseFits, readFitsFile, writeFits } from '../../src/fits/index.js';
import { storedFloat32, storedUint16 } from '../../src/fits/stored-image.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as Record<string, { extname: string | null; data?: (number | null)[] }[]>;

describe('storedFloat32 and storedUint16', () => {
  const file = readFitsFile(join(DIR, 'images.fits'));
  const index = (name: string) => file.hdus.findIndex((h) => h.name === name);
  const want = (name: string) => expected['images.fits']!.find((h) => h.extname === name)!.data!;

  it("read astropy's U16 (BZERO 32768) and F32 images as astropy does", () => {
    const u16 = storedUint16(file, index('U16'));
    expect([u16.width, u16.height]).toEqual([13, 7]);
    expect(Array.from(u16.data)).toEqual(want('U16'));
    const f32 = storedFloat32(file, index('F32'));
    want('F32').forEach((w, i) => (w === null ? expect(f32.data[i]).toBeNaN() : expect(f32.data[i]).toBe(Math.fround(w))));
  });

  it('keep every bit of the float32 values whorl wrote', () => {
    const data = new Float32Array([-0, 0, 1.5, -3e38, 1e-45, Infinity, -Infinity, NaN]);
    new Uint32Array(data.buffer)[7] = 0x7fc12345; // a NaN with a payload
    const back = storedFloat32(parseFits(writeFits([{ kind: 'image', bitpix: -32, width: 4, height: 2, data }]), 'mem'), 1);
    expect(Array.from(new Uint32Array(back.data.buffer))).toEqual(Array.from(new Uint32Array(data.buffer)));
  });

  it('refuse an image stored otherwise (the caller then recomputes)', () => {
    expect(() => storedFloat32(file, index('I16'))).toThrow(/not stored as expected/);
    expect(() => storedUint16(file, index('I16'))).toThrow(/not stored as expected/);
    expect(() => storedUint16(file, 99)).toThrow(/no HDU 99/);
  });
});
