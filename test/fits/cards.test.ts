/**
 * Header cards (FITS Standard 4.0 section 4): value formats, CONTINUE long strings and HIERARCH,
 * written by whorl and read back by whorl; astropy's reading of the same cards is checked in
 * writer.test.ts, astropy's writing in fixtures.test.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatCard } from '../../src/fits/card-format.js';
import { parseCard } from '../../src/fits/card-parse.js';
import { ditherSequence } from '../../src/fits/dither.js';
import { Header, parseFits, writeFits } from '../../src/fits/index.js';

const noWarn = (m: string): never => {
  throw new Error(m);
};

function roundTrip(header: Header): Header {
  return parseFits(writeFits([], { primaryHeader: header }), 'mem', { checksum: 'error' }).hdus[0]!.header;
}

describe('card values', () => {
  it('right-justifies fixed-format numbers and logicals to column 30 (section 4.2)', () => {
    expect(formatCard({ key: 'EXPTIME', value: 300 })[0]).toBe('EXPTIME =                  300');
    expect(formatCard({ key: 'FLAG', value: true })[0]!.indexOf('T')).toBe(29);
    expect(formatCard({ key: 'TINY', value: 1e-7, comment: 'small' })[0]).toBe('TINY    =                 1E-7 / small');
  });

  it('doubles quotes inside strings and keeps leading spaces, drops trailing ones (section 4.2.1)', () => {
    expect(formatCard({ key: 'OBJECT', value: "O'Neil " })[0]).toBe("OBJECT  = 'O''Neil '");
    const c = parseCard("OBJECT  = '  O''Neil   ' / who", noWarn);
    expect(c).toEqual({ key: 'OBJECT', value: "  O'Neil", comment: 'who' });
  });

  it('reads D exponents, complex values, undefined values and cards without a value indicator', () => {
    expect(parseCard('X       =             -1.25D-3', noWarn)).toEqual({ key: 'X', value: -0.00125 });
    expect(parseCard('Z       = (1.5, -2E1)', noWarn)).toEqual({ key: 'Z', value: { re: 1.5, im: -20 } });
    expect(parseCard('U       =                      / nothing', noWarn)).toEqual({ key: 'U', comment: 'nothing' });
    expect(parseCard('NOTAVAL  this is text', noWarn)).toEqual({ key: 'NOTAVAL', comment: ' this is text' });
  });

  it('keeps an unreadable value as a value-less card and warns', () => {
    const warnings: string[] = [];
    expect(parseCard('BAD     = 12 34', (m) => warnings.push(m))).toEqual({ key: 'BAD', comment: '12 34' });
    expect(warnings[0]).toMatch(/BAD: unreadable value/);
  });

  it('splits long strings with CONTINUE without breaking a doubled quote, and reads them back whole', () => {
    const text = `${"'".repeat(70)}${'x'.repeat(100)}'`;
    const lines = formatCard({ key: 'NOTE', value: text, comment: 'long' });
    expect(lines.length).toBeGreaterThan(2);
    expect(lines.slice(1).every((l) => l.startsWith("CONTINUE  '"))).toBe(true);
    expect(lines.every((l) => l.length <= 80)).toBe(true);
    const back = roundTrip(new Header().set('NOTE', text, 'long'));
    expect(back.getString('NOTE')).toBe(text);
    expect(back.getString('LONGSTRN')).toBe('OGIP 1.0');
  });

  it('writes keys that are not 1-8 characters of A-Z 0-9 - _ as HIERARCH cards', () => {
    expect(formatCard({ key: 'WHORL SLIT WIDTH', value: 1.5 })[0]).toBe('HIERARCH WHORL SLIT WIDTH = 1.5');
    expect(roundTrip(new Header().set('WHORL SLIT WIDTH', 1.5)).getNumber('whorl slit width')).toBe(1.5);
  });

  it('round-trips arbitrary headers (property, 200 seeded runs)', () => {
    const key = fc.stringMatching(/^[A-Z][A-Z0-9_-]{0,7}$/).filter((k) => !/^(SIMPLE|BITPIX|NAXIS\d*|EXTEND|END|CHECKSUM|DATASUM|BZERO|BSCALE|BLANK|PCOUNT|GCOUNT|XTENSION|GROUPS|CONTINUE|COMMENT|HISTORY|LONGSTRN|THEAP|TFIELDS)$/.test(k) && !/^T(TYPE|FORM|UNIT|SCAL|ZERO|NULL|DIM|BCOL|DISP)\d+$/.test(k));
    const value = fc.oneof(
      fc.string({ unit: fc.constantFrom(...' abcXYZ019\'&/=-'), maxLength: 150 }).map((s) => s.trimEnd()),
      fc.boolean(),
      fc.integer(),
      fc.double({ noNaN: true, noDefaultInfinity: true }),
      fc.bigInt({ min: -(2n ** 63n), max: 2n ** 63n - 1n }).filter((b) => b > BigInt(Number.MAX_SAFE_INTEGER) || b < -BigInt(Number.MAX_SAFE_INTEGER)),
    );
    fc.assert(
      fc.property(fc.uniqueArray(fc.tuple(key, value), { selector: (t) => t[0], maxLength: 12 }), (cards) => {
        const h = new Header();
        for (const [k, v] of cards) h.set(k, v);
        const back = roundTrip(h);
        for (const [k, v] of cards) expect(back.get(k), k).toEqual(Object.is(v, -0) ? 0 : v);
      }),
      { numRuns: 200, seed: 7 },
    );
  });
});

describe('dither sequence of the tiled-image convention', () => {
  it('ends with seed 1043618065 after 10000 draws (value stated in the convention [memory]; fpack-made tiles decode exactly in fixtures.test.ts)', () => {
    expect(ditherSequence().lastSeed).toBe(1043618065);
  });
});
