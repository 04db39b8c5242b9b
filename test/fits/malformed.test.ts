/**
 * Every malformed input of issue 2 gives an InputError that names the file, the HDU, the keyword or
 * byte offset, and what was expected (FITS Standard 4.0 sections 3.3, 4.1, 4.4.1 say what is valid).
 */
import { mkdtempSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { parseFits, readFitsFile, readImage, writeFits } from '../../src/fits/index.js';
import { inputError } from '../helpers/input-error.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const tmp = mkdtempSync(join(tmpdir(), 'whorl-bad-'));

const good = writeFits([{ kind: 'image', name: 'SCI', bitpix: -32, width: 40, height: 30, data: new Float32Array(1200).fill(1) }]);

/** A copy of `bytes` with the card of `key` (first occurrence at or after `from`) replaced by `card`. */
function withCard(bytes: Uint8Array, key: string, card: string, from = 0): Uint8Array {
  const copy = new Uint8Array(bytes);
  const text = Buffer.from(copy).toString('latin1');
  let at = from;
  while ((at = text.indexOf(key.padEnd(8), at)) % 80 !== 0) at++;
  for (let i = 0; i < 80; i++) copy[at + i] = (card.padEnd(80).charCodeAt(i));
  return copy;
}

describe('malformed FITS input', () => {
  it('an empty file', () => {
    const path = join(tmp, 'empty.fits');
    writeFileSync(path, '');
    const e = inputError(() => readFitsFile(path));
    expect(e.code).toBe('fits.empty');
    expect(e.message).toContain(path);
  });

  it('a directory and a missing file', () => {
    const dir = join(tmp, 'adir.fits');
    mkdirSync(dir);
    expect(inputError(() => readFitsFile(dir)).code).toBe('fits.directory');
    expect(inputError(() => readFitsFile(join(tmp, 'nope.fits'))).message).toMatch(/nope\.fits: no such file/);
  });

  it('a file that is not FITS', () => {
    const e = inputError(() => parseFits(new TextEncoder().encode('hello world'.repeat(300)), 'notes.txt'));
    expect(e.code).toBe('fits.not-fits');
    expect(e.message).toMatch(/^notes\.txt, byte 0: not a FITS file \(expected a file starting with 'SIMPLE  ='/);
  });

  it('truncated data: names the HDU, NAXISn, the bytes expected and found', () => {
    const cut = good.subarray(0, good.length - 4000);
    const e = inputError(() => parseFits(cut, 'cut.fits'));
    expect(e.code).toBe('fits.truncated');
    expect(e.place).toMatchObject({ file: 'cut.fits', hdu: 1, key: 'NAXIS2' });
    expect(e.message).toMatch(/expected 4800 bytes of data .* found 1760 bytes left in the file/);
  });

  it('a header without END', () => {
    const header = new TextEncoder().encode(['SIMPLE  =                    T', 'BITPIX  =                    8', 'NAXIS   =                    0'].map((c) => c.padEnd(80)).join('').padEnd(2880));
    const e = inputError(() => parseFits(header, 'noend.fits'));
    expect(e.code).toBe('fits.no-end');
    expect(e.place).toMatchObject({ file: 'noend.fits', hdu: 0, offset: 0 });
  });

  it('a header without END followed by its data says END is missing, not that the data bytes are not ASCII', () => {
    // FITS 4.0 section 4.4.1: the header ends with END; here the int16 data (big-endian 1000 = 0x03 0xe8) follows at once.
    const header = ['SIMPLE  =                    T', 'BITPIX  =                   16', 'NAXIS   =                    1', 'NAXIS1  =                    4'].map((c) => c.padEnd(80)).join('').padEnd(2880);
    const bytes = new Uint8Array(5760);
    bytes.set(new TextEncoder().encode(header));
    for (let k = 0; k < 4; k++) bytes.set([0x03, 0xe8], 2880 + 2 * k);
    const e = inputError(() => parseFits(bytes, 'noend-data.fits'));
    expect(e.code).toBe('fits.no-end');
    expect(e.place).toMatchObject({ file: 'noend-data.fits', hdu: 0, offset: 0 });
    expect(e.message).toMatch(/no END card .*found 36 cards, then bytes that are not ASCII text \(data\?\) at byte 2880/);
  });

  it('a PCOUNT (heap size) larger than the file names PCOUNT, not the axes', () => {
    const table = writeFits([{ kind: 'bintable', name: 'ROWS', columns: [{ name: 'A', format: 'J', values: new Int32Array([1, 2, 3]) }] }]);
    const bad = withCard(table, 'PCOUNT', 'PCOUNT  =           4000000000', 2880);
    const e = inputError(() => parseFits(bad, 'heap.fits', { checksum: 'skip' }));
    expect(e.code).toBe('fits.truncated');
    expect(e.place).toMatchObject({ file: 'heap.fits', hdu: 1, key: 'PCOUNT' });
    expect(e.message).toMatch(/expected 4000000012 bytes of data \(BITPIX 8, axes 4 x 3, PCOUNT 4000000000\)/);
  });

  it('an invalid BITPIX', () => {
    const bad = withCard(good, 'BITPIX', 'BITPIX  =                   17', 2880);
    const e = inputError(() => parseFits(bad, 'bitpix.fits', { checksum: 'skip' }));
    expect(e.code).toBe('fits.bad-bitpix');
    expect(e.message).toBe('bitpix.fits, HDU 1, BITPIX: invalid BITPIX (expected one of 8, 16, 32, 64, -32, -64, found 17)');
  });

  it('NAXISn claiming more data than the file holds fails before anything is allocated', () => {
    const bad = withCard(good, 'NAXIS1', 'NAXIS1  =           4000000000', 2880);
    const before = process.memoryUsage().arrayBuffers;
    const e = inputError(() => parseFits(bad, 'huge.fits', { checksum: 'skip' }));
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(1 << 20);
    expect(e.code).toBe('fits.truncated');
    expect(e.message).toMatch(/huge\.fits, HDU 1, NAXIS2.*expected 480000000000 bytes/);
  });

  it('non-ASCII bytes in a header name the byte offset', () => {
    const bad = new Uint8Array(good);
    bad[2880 + 85] = 0xe9;
    const e = inputError(() => parseFits(bad, 'accent.fits'));
    expect(e.code).toBe('fits.non-ascii-header');
    expect(e.place).toMatchObject({ file: 'accent.fits', hdu: 1, offset: 2965 });
    expect(e.message).toContain('found byte 0xe9');
  });

  it('a wrong CHECKSUM is an InputError in strict mode and a warning otherwise', () => {
    const bad = new Uint8Array(good);
    bad[bad.length - 1] ^= 0xff; // padding byte: DATASUM covers the padding too
    expect(parseFits(bad, 'sum.fits').warnings.join('\n')).toMatch(/HDU 1: DATASUM does not match/);
    expect(inputError(() => parseFits(bad, 'sum.fits', { checksum: 'error' })).place).toMatchObject({ file: 'sum.fits', hdu: 1, key: 'DATASUM' });
  });

  it('a damaged gzip stream', () => {
    const gz = gzipSync(good);
    const e = inputError(() => parseFits(gz.subarray(0, gz.length >> 1), 'half.fits.gz'));
    expect(e.code).toBe('fits.gzip');
    expect(e.message).toContain('half.fits.gz');
  });

  it('a truncated Rice tile names the HDU and the problem', () => {
    const bytes = new Uint8Array(readFileSync(join(DIR, 'rice_u16.fits.fz')));
    const file = parseFits(bytes, 'rice.fz', { checksum: 'skip' });
    const hdu = file.hdus[1]!;
    // Point every tile's descriptor at 4 bytes: too few for 37 pixels.
    const rowBytes = hdu.tableHeader!.getNumber('NAXIS1')!;
    const view = new DataView(bytes.buffer, bytes.byteOffset + hdu.dataOffset);
    for (let r = 0; r < hdu.tableHeader!.getNumber('NAXIS2')!; r++) view.setUint32(r * rowBytes, 4);
    const e = inputError(() => readImage(file, 1));
    expect(e.code).toBe('fits.bad-tile');
    expect(e.message).toMatch(/^rice\.fz, HDU 1: Rice stream ends/);
  });

  it('lower-case keywords, mandatory keywords out of order and SIMPLE = F are read with warnings (FITS 4.0 sections 4.1.2.1, 4.4.1)', () => {
    const header = (cards: string[]) => new TextEncoder().encode([...cards, 'END'].map((c) => c.padEnd(80)).join('').padEnd(2880));
    const clean = parseFits(header(['SIMPLE  =                    T', 'BITPIX  =                    8', 'NAXIS   =                    0']), 'ok.fits');
    expect(clean.warnings).toEqual([]);
    const odd = parseFits(header(['SIMPLE  =                    F', 'NAXIS   =                    0', 'bitpix  =                    8']), 'odd.fits');
    expect(odd.hdus[0]!.header.get('BITPIX')).toBe(8);
    expect(odd.warnings).toEqual([
      "odd.fits, HDU 0: keyword 'bitpix' is not upper case (FITS 4.0 section 4.1.2.1); read as BITPIX",
      'odd.fits, HDU 0: mandatory keywords out of order (FITS 4.0 section 4.4.1): expected SIMPLE, BITPIX, NAXIS, found SIMPLE, NAXIS, BITPIX',
      'odd.fits, HDU 0: SIMPLE is not T: the file says it does not conform to the FITS standard',
    ]);
  });

  it('extra bytes after the last HDU are a warning, not an error', () => {
    const longer = new Uint8Array(good.length + 100);
    longer.set(good);
    longer.fill(0x41, good.length);
    expect(parseFits(longer, 'tail.fits').warnings.join()).toMatch(/100 bytes after the last HDU/);
  });

  it('a missing padding of the last data unit is a warning', () => {
    const short = good.subarray(0, good.length - 10);
    expect(parseFits(short, 'pad.fits', { checksum: 'skip' }).warnings.join()).toMatch(/lacks 10 bytes of padding/);
  });
});
