/**
 * `whorl inspect`, run in-process: the statistics it reports equal numpy's (fixtures/fits/
 * expected.json, made by make_fixtures.py with astropy and numpy), malformed files exit 2 with a
 * message naming the file, and the other files are still reported.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { main } from '../../src/cli/main.js';
import type { FileReport } from '../../src/cli/commands/inspect.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as Record<string, { index: number; axes?: number[]; stats?: { min: number; max: number; mean: number; median: number; nan: number } }[]>;
const tmp = mkdtempSync(join(tmpdir(), 'whorl-inspect-'));

async function inspect(...args: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = memoryIo();
  const code = await main(['node', 'whorl', 'inspect', ...args], io);
  return { code, out: io.stdout, err: io.stderr };
}

describe('whorl inspect', () => {
  it('--json reports numpy statistics for every image of the astropy fixtures, raw uint16 frame with overscan included', async () => {
    const names = ['raw_frame.fits', 'raw_frame.fits.fz', 'images.fits', 'rice_f32_dither1.fits.fz'];
    const r = await inspect('--json', ...names.map((n) => join(DIR, n)));
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out) as { files: (FileReport & { ok: true })[] };
    doc.files.forEach((f, k) => {
      for (const want of expected[names[k]!]!.filter((h) => h.stats)) {
        const got = f.hdus[want.index]!;
        expect(got.dimensions).toEqual(want.axes);
        const p = got.pixels!;
        // min, max and median are pixel values (exact); the mean is a sum: numpy sums pairwise, whorl in order.
        expect(p.min).toBe(want.stats!.min);
        expect(p.max).toBe(want.stats!.max);
        expect(p.median).toBe(want.stats!.median);
        expect(Math.abs(p.mean - want.stats!.mean)).toBeLessThanOrEqual(1e-12 * Math.abs(want.stats!.mean));
        expect(p.nanOrBlank).toBe(want.stats!.nan);
      }
    });
  });

  it('prints a table with type, EXTNAME, BITPIX, size and statistics, and table columns with format and unit', async () => {
    const r = await inspect(join(DIR, 'raw_frame.fits'), join(DIR, 'tables.fits'), join(DIR, 'rice_u16.fits.fz'));
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/HDU\s+type\s+EXTNAME\s+BITPIX\s+size\s+min\s+max\s+mean\s+median\s+NaN\/BLANK/);
    expect(r.out).toMatch(/0\s+image\s+-\s+16\s+72 x 40\s+991\s+65535\s+1311\.32\s+1297\s+0/);
    expect(r.out).toMatch(/1\s+binary table\s+ROWS\s+8\s+12 columns x 5 rows/);
    expect(r.out).toMatch(/2\s+ascii table\s+ASCII/);
    expect(r.out).toMatch(/SPEED\s+E14\.6\s+km\/s/);
    expect(r.out).toMatch(/1\s+compressed image \(RICE_1\)\s+COMPRESSED_IMAGE\s+16\s+37 x 23/);
  });

  it('a malformed file exits 2 with one line naming it, and the other files are still reported', async () => {
    const bad = join(tmp, 'cut.fits');
    writeFileSync(bad, readFileSync(join(DIR, 'raw_frame.fits')).subarray(0, 4000));
    const r = await inspect(bad, join(DIR, 'raw_frame.fits'));
    expect(r.code).toBe(2);
    expect(r.err).toBe(`whorl: ${bad}, HDU 0, NAXIS2, byte 2880: data unit is shorter than the header says (expected 5760 bytes of data (BITPIX 16, axes 72 x 40), found 1120 bytes left in the file)\n`);
    expect(r.err).not.toMatch(/at .*\.ts:\d+/); // no stack trace
    expect(r.out).toContain('raw_frame.fits: 1 HDU');
  });

  it('a wrong CHECKSUM exits 2; --json records the error with its code and place', async () => {
    const bytes = new Uint8Array(readFileSync(join(DIR, 'header.fits')));
    bytes[2881] ^= 1;
    const bad = join(tmp, 'sum.fits');
    writeFileSync(bad, bytes);
    const r = await inspect('--json', bad);
    expect(r.code).toBe(2);
    const f = (JSON.parse(r.out) as { files: FileReport[] }).files[0]!;
    expect(f.ok).toBe(false);
    if (!f.ok) expect(f.error).toMatchObject({ code: 'fits.datasum', place: { file: bad, hdu: 0, key: 'DATASUM' } });
  });

  it('a directory, an empty file and a missing file each give exit 2 and a message', async () => {
    const empty = join(tmp, 'empty.fits');
    writeFileSync(empty, '');
    const r = await inspect(tmp, empty, join(tmp, 'missing.fits'));
    expect(r.code).toBe(2);
    expect(r.err.split('\n').filter(Boolean)).toEqual([
      `whorl: ${tmp}: is a directory, not a file (expected a FITS file)`,
      `whorl: ${empty}: file is empty (expected a FITS file)`,
      `whorl: ${join(tmp, 'missing.fits')}: no such file (expected an existing FITS file)`,
    ]);
  });
});
