/** Gzip is recognised by its magic bytes (RFC 1952: 1f 8b), not by the file name. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readFitsFile, readImage } from '../../src/fits/index.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const tmp = mkdtempSync(join(tmpdir(), 'whorl-gz-'));

describe('gzip detection', () => {
  it('reads a gzip stream (Python gzip module) named .fits, and a plain file named .fits.gz', () => {
    const gz = join(tmp, 'looks-plain.fits');
    writeFileSync(gz, readFileSync(join(DIR, 'images.fits.gz')));
    const plain = join(tmp, 'looks-zipped.fits.gz');
    writeFileSync(plain, readFileSync(join(DIR, 'images.fits')));
    const a = readFitsFile(gz);
    const b = readFitsFile(plain);
    expect(a.hdus.length).toBe(8);
    expect(Array.from(readImage(a, 6).data)).toEqual(Array.from(readImage(b, 6).data));
  });
});
