/** Classifying frames from headers built in memory, with the built-in rules and a user's rules file. */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { Header } from '../../../src/fits/header.js';
import { classifyFrame, startMsOf } from '../../../src/run/inventory/classify.js';
import { DEFAULT_RULES, parseRulesYaml } from '../../../src/run/inventory/rules.js';

function frame(cards: Record<string, string | number>) {
  const h = new Header().set('NAXIS', 2).set('NAXIS1', 100).set('NAXIS2', 50);
  for (const [k, v] of Object.entries(cards)) h.set(k, v);
  return { path: 'raw/x.fits', hdu: 0, header: h };
}
const kind = (cards: Record<string, string | number>, rules = DEFAULT_RULES) => classifyFrame(frame(cards), rules).kind;

describe('classifyFrame', () => {
  it('reads IMAGETYP and OBSTYPE values, ignoring case, spaces, - and _', () => {
    expect(kind({ IMAGETYP: 'BIAS' })).toBe('bias');
    expect(kind({ IMAGETYP: 'zero' })).toBe('bias');
    expect(kind({ OBSTYPE: 'Dome Flat' })).toBe('flat');
    expect(kind({ IMAGETYP: 'lamp_flat' })).toBe('flat');
    expect(kind({ IMAGETYP: 'COMP' })).toBe('arc');
    expect(kind({ OBSTYPE: 'object' })).toBe('science');
    expect(kind({ IMAGETYP: 'Science' })).toBe('science');
  });

  it('says which card decided', () => {
    expect(classifyFrame(frame({ IMAGETYP: 'object' }), DEFAULT_RULES).reason).toBe("IMAGETYP = 'object'");
  });

  it('lets the lamps decide what a "lamp" exposure is', () => {
    expect(kind({ IMAGETYP: 'lamp', LAMPS: 'quartz' })).toBe('flat');
    expect(kind({ IMAGETYP: 'lamp', LAMPS: 'Ne,Ar' })).toBe('arc');
    expect(kind({ IMAGETYP: 'flat', LAMPS: 'He+Ne+Ar' })).toBe('arc');
  });

  it('falls back on lamps, then on a zero exposure time, when no type card is known', () => {
    expect(kind({ LAMPS: 'Hg Ar' })).toBe('arc');
    expect(kind({ LAMPS: 'halogen' })).toBe('flat');
    expect(kind({ EXPTIME: 0 })).toBe('bias');
    const f = classifyFrame(frame({ IMAGETYP: 'focus', EXPTIME: 5 }), DEFAULT_RULES);
    expect(f.kind).toBe('unknown');
    expect(f.reason).toBe("IMAGETYP = 'focus' is not a known exposure type");
  });

  it('collects shape, detector and spectral keywords, OBJECT, time and lamps', () => {
    const f = classifyFrame(frame({ IMAGETYP: 'arc', OBJECT: ' Ne+Ar lamp ', CCDSUM: '2 2', GRATING: 'G600', GRTILT: 18.25, 'DATE-OBS': '2019-04-12T23:30:24.000', EXPTIME: 10, LAMPS: 'Ne,Ar' }), DEFAULT_RULES);
    expect(f).toMatchObject({ width: 100, height: 50, detector: { CCDSUM: '2 2' }, spectral: { GRATING: 'G600', GRTILT: '18.25' }, object: 'Ne+Ar lamp', exptimeS: 10, lamps: ['Ne', 'Ar'] });
    expect(f.startMs).toBe(Date.UTC(2019, 3, 12, 23, 30, 24));
  });

  it('joins DATE-OBS holding a date with TIME-OBS (older FITS usage)', () => {
    expect(startMsOf(new Header().set('DATE-OBS', '2019-04-13').set('TIME-OBS', '01:02:03.5'))).toBe(Date.UTC(2019, 3, 13, 1, 2, 3, 500));
    expect(startMsOf(new Header().set('DATE-OBS', 'last night'))).toBeUndefined();
  });
});

describe('rules file', () => {
  it('extends the built-in lists', () => {
    const rules = parseRulesYaml('types:\n  flat: [twilight flat]\n  science: [target]\ntype_keywords: [exptype]\n', 'rules.yaml');
    expect(kind({ EXPTYPE: 'Twilight-Flat' }, rules)).toBe('flat');
    expect(kind({ IMAGETYP: 'TARGET' }, rules)).toBe('science');
    expect(kind({ IMAGETYP: 'bias' }, rules)).toBe('bias');
  });

  it('replaces them with replace: true', () => {
    const rules = parseRulesYaml('replace: true\ntypes:\n  bias: [dark0]\n', 'rules.yaml');
    expect(rules.types.bias).toEqual(['dark0']);
    expect(kind({ IMAGETYP: 'zero' }, rules)).toBe('unknown');
    expect(rules.types.flat).toEqual(DEFAULT_RULES.types.flat);
  });

  it('names the file and key path of a mistake', () => {
    const e = (() => {
      try {
        parseRulesYaml('types:\n  flats: [x]\n', 'my-rules.yaml');
      } catch (err) {
        return err as InputError;
      }
      throw new Error('no error');
    })();
    expect(e).toBeInstanceOf(InputError);
    expect(e.message).toMatch(/^my-rules\.yaml, types: /);
    expect(() => parseRulesYaml('arc_block_minutes: [', 'bad.yaml')).toThrow(/bad\.yaml, line 1/);
  });
});
