/** The FITS checksum convention, checked against the HEASARC worked values (REFERENCE.md) and astropy. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { addSums, complement, encodeChecksum, onesComplementSum } from '../../src/fits/checksum.js';
import { parseFits, writeFits } from '../../src/fits/index.js';
import { InputError } from '../../src/errors.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');

describe('FITS checksum convention', () => {
  it('encodes the complement of sum 868229149 as hcHjjc9ghcEghc9g (HEASARC example)', () => {
    expect(encodeChecksum(complement(868229149))).toBe('hcHjjc9ghcEghc9g');
  });

  it('gives DATASUM 262150 and CHECKSUM hcaGibYGhbaGhbWG for the int16 [[1,2],[3,4]] primary HDU (HEASARC example)', () => {
    const bytes = writeFits([{ kind: 'image', bitpix: 16, width: 2, height: 2, data: [1, 2, 3, 4] }], { imageInPrimary: true });
    const header = parseFits(bytes, 'mem').hdus[0]!.header;
    expect(header.getString('DATASUM')).toBe('262150');
    expect(header.getString('CHECKSUM')).toBe('hcaGibYGhbaGhbWG');
  });

  it('folds carries end-around: 0xffffffff + 1 is 1 in ones-complement arithmetic', () => {
    expect(addSums(0xffffffff, 1)).toBe(1);
    const words = new Uint8Array([0xff, 0xff, 0xff, 0xff, 0, 0, 0, 2]);
    expect(onesComplementSum(words, 0, 8)).toBe(2);
  });

  it('accepts the CHECKSUM and DATASUM astropy wrote', () => {
    const file = parseFits(readFileSync(join(DIR, 'tables.fits')), 'tables.fits', { checksum: 'error' });
    expect(file.warnings).toEqual([]);
    expect(file.hdus.every((h) => h.header.has('CHECKSUM'))).toBe(true);
  });

  it('warns on a changed data byte, or throws naming file, HDU and DATASUM when asked to', () => {
    const bytes = new Uint8Array(readFileSync(join(DIR, 'header.fits')));
    bytes[2880] ^= 0x01; // first data byte
    expect(parseFits(bytes, 'header.fits').warnings.join('\n')).toMatch(/HDU 0: DATASUM does not match/);
    try {
      parseFits(bytes, 'header.fits', { checksum: 'error' });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe('fits.datasum');
      expect((e as InputError).message).toMatch(/^header\.fits, HDU 0, DATASUM: /);
    }
  });

  it('warns on a changed header card even when the data sum still matches', () => {
    const bytes = new Uint8Array(readFileSync(join(DIR, 'header.fits')));
    const text = Buffer.from(bytes.subarray(0, 2880)).toString('latin1');
    bytes[text.indexOf('-42')] = 0x2b; // '-' -> '+'
    expect(parseFits(bytes, 'header.fits').warnings.join('\n')).toMatch(/CHECKSUM does not match/);
  });
});
