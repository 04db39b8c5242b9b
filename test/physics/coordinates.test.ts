import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { Header } from '../../src/fits/header.js';
import { midExposure, parseDeclination, parseRightAscension, siteFromHeader } from '../../src/physics/coordinates.js';
import { geodeticFromGeocentric } from '../../src/physics/geodetic.js';
import { inputError } from '../helpers/input-error.js';

// Outside reference: Debian python3-astropy Angle and EarthLocation (WGS84), fixtures/physics/make_coordinates.py.
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/physics/coordinates.json', import.meta.url), 'utf8')) as {
  sites: { x: number; y: number; z: number; latitudeDeg: number; longitudeDeg: number; heightM: number }[];
  rightAscension: { text: string; deg: number }[];
  declination: { text: string; deg: number }[];
};

describe('parseRightAscension (sexagesimal hours, 15 deg per hour)', () => {
  it("reads '12:34:56.7' and '12 34 56.7' as 188.73625 deg", () => {
    expect(parseRightAscension('12:34:56.7')).toBeCloseTo(188.73625, 10);
    expect(parseRightAscension('12 34 56.7')).toBeCloseTo(188.73625, 10);
  });

  it('reads hours and minutes without seconds, numbers and decimal strings as degrees', () => {
    expect(parseRightAscension('06:30')).toBeCloseTo(97.5, 10);
    expect(parseRightAscension(201.5)).toBe(201.5);
    expect(parseRightAscension(' 201.5 ')).toBe(201.5);
  });

  it('refuses bad strings with an InputError naming the key', () => {
    for (const bad of ['24:00:00', '12:60:00', '12:30:61', 'noon', '-01:00:00', '', '12:3x:00']) {
      const e = inputError(() => parseRightAscension(bad, { file: 'a.fits', key: 'RA' }));
      expect(e.code).toBe('coordinates.invalid');
      expect(e.place.key).toBe('RA');
      expect(e.message).toContain('RA');
    }
    expect(() => parseRightAscension(360)).toThrow(InputError);
  });
});

describe('parseDeclination', () => {
  it("reads '-05:06:07.8' as -5.10217 deg and keeps the sign of '-00:30:00'", () => {
    expect(parseDeclination('-05:06:07.8')).toBeCloseTo(-(5 + 6 / 60 + 7.8 / 3600), 10);
    expect(parseDeclination('-00:30:00')).toBeCloseTo(-0.5, 12);
    expect(parseDeclination('+45 00 36')).toBeCloseTo(45.01, 12);
    expect(parseDeclination(-12.25)).toBe(-12.25);
  });

  it('refuses declinations beyond the poles and malformed text, naming the key', () => {
    for (const bad of ['91:00:00', '+10:75:00', 'north']) {
      const e = inputError(() => parseDeclination(bad, { key: 'DEC' }));
      expect(e.place.key).toBe('DEC');
    }
  });
});

describe('siteFromHeader (OBSGEO-B/L/H, WCS Paper III)', () => {
  it('reads latitude, east longitude and height', () => {
    const h = new Header().set('OBSGEO-B', -24.6).set('OBSGEO-L', -70.4).set('OBSGEO-H', 2635);
    expect(siteFromHeader(h)).toEqual({ latitudeDeg: -24.6, longitudeDeg: -70.4, heightM: 2635 });
  });

  it('folds longitudes into (-180, 180] and takes a missing height as 0 m', () => {
    const h = new Header().set('OBSGEO-B', 10).set('OBSGEO-L', 290);
    expect(siteFromHeader(h)).toEqual({ latitudeDeg: 10, longitudeDeg: -70, heightM: 0 });
  });

  it('is undefined without OBSGEO keys and an InputError naming the missing half', () => {
    expect(siteFromHeader(new Header())).toBeUndefined();
    const e = inputError(() => siteFromHeader(new Header().set('OBSGEO-B', 10), { file: 'sci1.fits' }));
    expect(e.place).toMatchObject({ file: 'sci1.fits', key: 'OBSGEO-L' });
  });

  it('refuses a latitude beyond 90 deg and a non-numeric value', () => {
    expect(() => siteFromHeader(new Header().set('OBSGEO-B', 95).set('OBSGEO-L', 0))).toThrow(InputError);
    expect(inputError(() => siteFromHeader(new Header().set('OBSGEO-B', 'high').set('OBSGEO-L', 0))).place.key).toBe('OBSGEO-B');
  });
});

describe('midExposure (DATE-OBS, UTC, ISO 8601 as in FITS 4.0 section 4.4.2.1)', () => {
  it('adds half the exposure time to the start', () => {
    expect(midExposure('2019-03-21T04:00:00', 1200).toISOString()).toBe('2019-03-21T04:10:00.000Z');
    expect(midExposure('2019-03-21 04:00:00.5', 1).toISOString()).toBe('2019-03-21T04:00:01.000Z');
    expect(midExposure('2020-02-29T23:59:59Z', 2).toISOString()).toBe('2020-03-01T00:00:00.000Z');
  });

  it('refuses a date without time, impossible dates and negative exposure times, naming the key', () => {
    expect(inputError(() => midExposure('2019-03-21', 10, { file: 's.fits' })).place).toMatchObject({ file: 's.fits', key: 'DATE-OBS' });
    expect(() => midExposure('2019-02-30T00:00:00', 10)).toThrow(InputError);
    expect(() => midExposure('21/03/19', 10)).toThrow(InputError);
    expect(inputError(() => midExposure('2019-03-21T00:00:00', -1)).place.key).toBe('EXPTIME');
  });
});

describe('sexagesimal parsing against astropy Angle', () => {
  it('reads right ascensions as astropy does (hourangle) to 1e-9 deg', () => {
    for (const r of fixture.rightAscension) expect(parseRightAscension(r.text)).toBeCloseTo(r.deg, 9);
  });

  it('reads declinations as astropy does to 1e-9 deg', () => {
    for (const d of fixture.declination) expect(parseDeclination(d.text)).toBeCloseTo(d.deg, 9);
  });
});

describe('geocentric OBSGEO-X/Y/Z to geodetic (WGS84) against astropy EarthLocation', () => {
  it('agrees within 1e-9 deg and 1 mm, poles included', () => {
    for (const s of fixture.sites) {
      const g = geodeticFromGeocentric(s.x, s.y, s.z);
      expect(g.latitudeDeg).toBeCloseTo(s.latitudeDeg, 9);
      expect(g.longitudeDeg).toBeCloseTo(s.longitudeDeg, 9);
      expect(Math.abs(g.heightM - s.heightM)).toBeLessThan(1e-3);
    }
  });

  it('is used by siteFromHeader when OBSGEO-B/L are absent, and part of X/Y/Z is an InputError', () => {
    const s = fixture.sites[1]!;
    const site = siteFromHeader(new Header().set('OBSGEO-X', s.x).set('OBSGEO-Y', s.y).set('OBSGEO-Z', s.z))!;
    expect(site.latitudeDeg).toBeCloseTo(s.latitudeDeg, 9);
    expect(Math.abs(site.heightM - s.heightM)).toBeLessThan(1e-3);
    expect(inputError(() => siteFromHeader(new Header().set('OBSGEO-X', s.x).set('OBSGEO-Z', s.z))).place.key).toBe('OBSGEO-Y');
    expect(inputError(() => siteFromHeader(new Header().set('OBSGEO-X', 1).set('OBSGEO-Y', 2).set('OBSGEO-Z', 3))).code).toBe('header.out-of-range');
  });
});
