/**
 * Property: mutating a valid FITS file (bytes changed, cards rewritten, truncated) gives either a
 * complete read or an InputError, never another exception and never a hang. Seeded, 300 runs.
 * The valid files come from astropy, fpack and whorl's writer.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { parseFits, readImage, readTable, writeFits } from '../../src/fits/index.js';

const DIR = join(import.meta.dirname, '../../fixtures/fits');
const sources: Uint8Array[] = [
  ...['images.fits', 'tables.fits', 'header.fits', 'rice_i32_tiles.fits.fz', 'gzip2_i16.fits.fz', 'rice_f32_dither1.fits.fz', 'gzip1_f32_lossless.fits.fz', 'images.fits.gz'].map(
    (n) => new Uint8Array(readFileSync(join(DIR, n))),
  ),
  writeFits([{ kind: 'image', bitpix: 16, bzero: 32768, width: 20, height: 10, data: new Array(200).fill(7) }], { imageInPrimary: true }),
];

/** Read everything in the file, as inspect would. */
function readAll(bytes: Uint8Array): void {
  const file = parseFits(bytes, 'fuzz.fits');
  for (const hdu of file.hdus) {
    if ((hdu.kind === 'image' && hdu.dataLength > 0) || hdu.kind === 'compressed-image') readImage(file, hdu.index);
    if (hdu.kind === 'bintable' || hdu.kind === 'table') {
      const t = readTable(file, hdu.index);
      for (const c of t.columns) if (!/P|Q/.test(c.format)) t.column(c.name);
    }
  }
}

/** Digits and signs that keep a card parseable but change its meaning. */
const cardChars = fc.constantFrom(...'0123456789-+ .ETF\'/');

const mutation = fc.oneof(
  fc.record({ kind: fc.constant('bytes' as const), edits: fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }) }),
  fc.record({ kind: fc.constant('value' as const), card: fc.nat(), chars: fc.array(fc.tuple(fc.integer({ min: 10, max: 30 }), cardChars), { minLength: 1, maxLength: 6 }) }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
);

function pick(m: { kind: 'bytes'; edits: [number, number][] } | { kind: 'value'; card: number; chars: [number, string][] } | { kind: 'truncate'; at: number }) {
  return (src: Uint8Array): Uint8Array => {
    if (m.kind === 'truncate') return src.subarray(0, m.at % src.length);
    const out = new Uint8Array(src);
    if (m.kind === 'bytes') for (const [at, v] of m.edits) out[at % out.length] = v;
    else {
      // Rewrite value columns of a card in the first headers (most structural keywords live there).
      const card = m.card % Math.min(out.length / 80, 200);
      for (const [col, ch] of m.chars) out[card * 80 + col] = ch.charCodeAt(0);
    }
    return out;
  };
}

describe('fuzzing the reader', () => {
  it('mutated files give a correct read or an InputError, nothing else (300 seeded runs)', () => {
    fc.assert(
      fc.property(fc.nat({ max: sources.length - 1 }), mutation, (which, m) => {
        const bytes = pick(m)(sources[which]!);
        try {
          readAll(bytes);
        } catch (e) {
          if (!(e instanceof InputError)) throw e;
          expect(e.place.file).toBe('fuzz.fits');
        }
      }),
      { numRuns: 300, seed: 20261202 },
    );
  });

  it('unmutated sources read without error', () => {
    for (const s of sources) expect(() => readAll(s)).not.toThrow();
  });
});
