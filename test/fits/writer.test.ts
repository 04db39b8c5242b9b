/**
 * Files whorl writes conform to FITS 4.0: fitsverify (HEASARC, Debian package) finds no errors and
 * no warnings, astropy reads back the same values, and whorl's own reader agrees.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { Header, parseFits, readImage, readTable, writeFits, type WriteHdu } from '../../src/fits/index.js';
import { writeFitsPieces } from '../../src/fits/write.js';
import { astropyJson, fitsverify, hasAstropy, hasFitsverify } from './outside-tools.js';

const tmp = mkdtempSync(join(tmpdir(), 'whorl-fits-'));

/** Seeded generator (mulberry32) so the values are the same on every run. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const W = 11;
const H = 6;
const rand = rng(7);
const sci = Float32Array.from({ length: W * H }, () => 1000 * rand() - 200);
sci[5] = NaN;
const variance = Float64Array.from({ length: W * H }, () => rand() * 1e-200);
const mask = Array.from({ length: W * H }, (_, i) => (i % 7 === 0 ? 4 : 0));
const raw = Array.from({ length: W * H }, (_, i) => (i === 0 ? 0 : i === 1 ? 65535 : Math.round(rand() * 65535)));
const int32 = Array.from({ length: W * H }, (_, i) => (i === 0 ? -2147483648 : Math.round((rand() - 0.5) * 4e9)));

const extra = new Header()
  .set('OBJECT', "Galaxy 'Tirrin'", 'fictional target')
  .set('EXPTIME', 1200.5, 'seconds')
  .set('AIRMASS', 1.0000000000000002)
  .set('TINY', -1.5e-300)
  .set('FLAG', false)
  .set('COUNT', 12345678901234567n)
  .set('CPLX', { re: 1.5, im: -0.25 })
  .set('NOTE', 'A long note about the fictional Vessel Peak spectrograph that needs more than one card: it is written with CONTINUE cards and read back whole.')
  .set('WHORL ARC LAMPS', 'Ne+Ar')
  .history('reduced by whorl in a test')
  .comment('a comment that is long enough to need two commentary cards, because each one holds 72 characters only');

const hdus: WriteHdu[] = [
  { kind: 'image', name: 'SCI', bitpix: -32, width: W, height: H, data: sci, header: extra },
  { kind: 'image', name: 'VAR', bitpix: -64, width: W, height: H, data: variance },
  { kind: 'image', name: 'MASK', bitpix: 16, width: W, height: H, data: mask },
  { kind: 'image', name: 'RAW', bitpix: 16, bzero: 32768, width: W, height: H, data: raw },
  { kind: 'image', name: 'I32', bitpix: 32, width: W, height: H, data: int32 },
  {
    kind: 'bintable',
    name: 'CURVE',
    columns: [
      { name: 'RADIUS', format: 'D', unit: 'arcsec', values: [0.5, 1.5, 2.5] },
      { name: 'VROT', format: 'E', unit: 'km/s', values: [50.25, 120.5, NaN] },
      { name: 'NBIN', format: 'J', values: [3, -4, 2147483647] },
      { name: 'ID', format: 'K', values: [1n, -9007199254740993n, 9223372036854775807n] },
      { name: 'GOOD', format: 'L', values: [true, false, true] },
      { name: 'SIDE', format: 'A', values: ['east', 'west', 'both sides'] },
    ],
  },
];
const primaryHeader = new Header().set('TELESCOP', 'Vessel Peak 1.8m').set('ORIGIN', 'whorl test');
const bytes = writeFits(hdus, { primaryHeader });
const path = join(tmp, 'products.fits');
writeFileSync(path, bytes);

describe('writeFits', () => {
  it('writes whole 2880-byte blocks, an empty primary HDU and one extension per spec', () => {
    expect(bytes.length % 2880).toBe(0);
    const file = parseFits(bytes, 'mem', { checksum: 'error' });
    expect(file.hdus.map((h) => h.kind)).toEqual(['image', 'image', 'image', 'image', 'image', 'image', 'bintable']);
    expect(file.hdus.map((h) => h.name)).toEqual([undefined, 'SCI', 'VAR', 'MASK', 'RAW', 'I32', 'CURVE']);
    expect(file.hdus[0]!.header.getNumber('NAXIS')).toBe(0);
    expect(file.hdus[0]!.header.getString('TELESCOP')).toBe('Vessel Peak 1.8m');
  });

  it('writeFitsPieces covers the file once with whole-block pieces, the very bytes fitsverify and astropy check below', () => {
    const pieces: [number, Buffer][] = [];
    const length = writeFitsPieces(hdus, { primaryHeader }, (b, position) => void pieces.push([position, Buffer.from(b)]));
    expect(length).toBe(bytes.length);
    pieces.sort((a, b) => a[0] - b[0]);
    let at = 0;
    for (const [position, b] of pieces) {
      expect([position, position % 2880, b.length % 2880]).toEqual([at, 0, 0]);
      at += b.length;
    }
    expect(Buffer.concat(pieces.map((p) => p[1])).equals(Buffer.from(bytes))).toBe(true);
  });

  it('reads back its own values exactly (whorl reader)', () => {
    const file = parseFits(bytes, 'mem');
    expect(Array.from(readImage(file, 1).data)).toEqual(Array.from(sci));
    expect(Array.from(readImage(file, 2).data)).toEqual(Array.from(variance));
    expect(Array.from(readImage(file, 3).data)).toEqual(mask);
    expect(Array.from(readImage(file, 4).data)).toEqual(raw);
    expect(Array.from(readImage(file, 5).data)).toEqual(int32);
    const h = file.hdus[1]!.header;
    for (const c of extra.cards.filter((c) => c.value !== undefined)) expect(h.get(c.key), c.key).toEqual(c.value);
    expect(h.commentary('COMMENT')).toEqual(['a comment that is long enough to need two commentary cards, because each', ' one holds 72 characters only']);
    const t = readTable(file, 6);
    expect(Array.from(t.column('vrot') as Float32Array)).toEqual([50.25, 120.5, NaN]);
    expect(t.column('ID')).toEqual([1n, -9007199254740993n, 9223372036854775807n]);
    expect(t.column('SIDE')).toEqual(['east', 'west', 'both sides']);
    expect(t.columns.map((c) => c.unit)).toEqual(['arcsec', 'km/s', undefined, undefined, undefined, undefined]);
  });

  it('rounds and clips integer images: unsigned 16-bit keeps 0..65535', () => {
    const b = writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: 4, height: 1, data: [-5, 0.4, 65535.6, 70000] }]);
    expect(Array.from(readImage(parseFits(b, 'mem'), 1).data)).toEqual([0, 0, 65535, 65535]);
  });

  it('writes NaN in integer images as BLANK, the lowest stored value, and clips other values above it', () => {
    const b = writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: 3, height: 1, data: [0, 7, NaN] }]);
    const file = parseFits(b, 'mem');
    expect(file.hdus[1]!.header.getNumber('BLANK')).toBe(-32768);
    const img = readImage(file, 1);
    expect(Array.from(img.data)).toEqual([1, 7, NaN]);
    expect(img.blankCount).toBe(1);
  });

  it.skipIf(!hasFitsverify)('passes fitsverify with no errors and no warnings', () => {
    const r = fitsverify(path);
    expect(r.errors, r.text).toBe(0);
    expect(r.warnings, r.text).toBe(0);
    const single = join(tmp, 'raw.fits');
    writeFileSync(single, writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: W, height: H, data: raw, header: extra }], { imageInPrimary: true }));
    const s = fitsverify(single);
    expect(s.errors, s.text).toBe(0);
    expect(s.warnings, s.text).toBe(0);
  });

  it.skipIf(!hasAstropy)('astropy reads images larger than one ~4 MB piece with their checksums intact', () => {
    const n = 1100 * 1000;
    const f32 = Float32Array.from({ length: n }, () => 1000 * rand() - 200);
    f32[3] = NaN;
    f32[n - 1] = -0;
    const f64 = Float64Array.from({ length: n }, () => rand() * 1e-200);
    const u16 = Uint16Array.from({ length: 2 * n }, () => Math.floor(rand() * 65536));
    const big = join(tmp, 'big.fits');
    writeFileSync(big, writeFits([
      { kind: 'image', name: 'F32', bitpix: -32, width: 1100, height: 1000, data: f32 },
      { kind: 'image', name: 'F64', bitpix: -64, width: 1100, height: 1000, data: f64 },
      { kind: 'image', name: 'U16', bitpix: 16, bzero: 32768, width: 2200, height: 1000, data: u16 },
    ]));
    const got = astropyJson<Record<string, string>>(
      `
import sys, json, hashlib, warnings
from astropy.io import fits
warnings.simplefilter('error')  # a checksum warning fails the test
f = fits.open(sys.argv[1], checksum=True)
dt = {'F32': '<f4', 'F64': '<f8', 'U16': '<u2'}
print(json.dumps({k: hashlib.sha256(f[k].data.astype(v).tobytes()).hexdigest() for k, v in dt.items()}))
`,
      big,
    );
    const sha = (a: ArrayBufferView) => createHash('sha256').update(new Uint8Array(a.buffer, a.byteOffset, a.byteLength)).digest('hex');
    expect(got).toEqual({ F32: sha(f32), F64: sha(f64), U16: sha(u16) });
  });

  it.skipIf(!hasAstropy)('astropy reads back the same pixels, cards, columns and checksums', () => {
    const got = astropyJson<{ hdus: { name: string; data: (number | null)[] | null }[]; cards: Record<string, unknown>; table: Record<string, unknown[]>; units: string[]; ok: boolean }>(
      `
import sys, json, math, warnings
import numpy as np
from astropy.io import fits
warnings.simplefilter('error')  # a checksum or format warning fails the test
f = fits.open(sys.argv[1], checksum=True)
def num(x):
    x = float(x)
    return None if math.isnan(x) else x
h = f['SCI'].header
cards = {k: (v if not isinstance(v, complex) else {'re': v.real, 'im': v.imag}) for k, v in h.items() if k in ('OBJECT','EXPTIME','AIRMASS','TINY','FLAG','NOTE','WHORL ARC LAMPS','CPLX')}
cards['COUNT'] = str(h['COUNT'])
t = f['CURVE'].data
table = {'RADIUS': [num(x) for x in t['RADIUS']], 'VROT': [num(x) for x in t['VROT']], 'NBIN': [int(x) for x in t['NBIN']],
         'ID': [str(x) for x in t['ID']], 'GOOD': [bool(x) for x in t['GOOD']], 'SIDE': [str(x) for x in t['SIDE']]}
print(json.dumps({'hdus': [{'name': x.name, 'data': None if x.data is None else [num(v) for v in x.data.ravel()]} for x in f[:6]],
                  'cards': cards, 'table': table, 'units': [c.unit for c in f['CURVE'].columns], 'ok': True}))
`,
      path,
    );
    expect(got.hdus.map((h) => h.name)).toEqual(['PRIMARY', 'SCI', 'VAR', 'MASK', 'RAW', 'I32']);
    const nan = (a: ArrayLike<number>) => Array.from(a, (v) => (Number.isNaN(v) ? null : v));
    expect(got.hdus[1]!.data).toEqual(nan(sci));
    expect(got.hdus[2]!.data).toEqual(nan(variance));
    expect(got.hdus[3]!.data).toEqual(mask);
    expect(got.hdus[4]!.data).toEqual(raw);
    expect(got.hdus[5]!.data).toEqual(int32);
    expect(got.cards).toEqual({
      OBJECT: "Galaxy 'Tirrin'", EXPTIME: 1200.5, AIRMASS: 1.0000000000000002, TINY: -1.5e-300, FLAG: false,
      COUNT: '12345678901234567', CPLX: { re: 1.5, im: -0.25 }, NOTE: extra.getString('NOTE'), 'WHORL ARC LAMPS': 'Ne+Ar',
    });
    expect(got.table).toEqual({
      RADIUS: [0.5, 1.5, 2.5], VROT: [50.25, 120.5, null], NBIN: [3, -4, 2147483647],
      ID: ['1', '-9007199254740993', '9223372036854775807'], GOOD: [true, false, true], SIDE: ['east', 'west', 'both sides'],
    });
    expect(got.units).toEqual(['arcsec', 'km/s', null, null, null, null]);
  });
});
