/**
 * Sky coordinates, observatory site and exposure times as written in FITS headers.
 * Angles come back in degrees. Sexagesimal strings use ':', spaces or unit letters (12h34m56s,
 * -5d06m07s) between fields.
 */
import { InputError, type ErrorPlace } from '../errors.js';
import type { Header } from '../fits/header.js';
import { geodeticFromGeocentric } from './geodetic.js';

const SEXAGESIMAL = /^([+-])?\s*(\d{1,3})(?::|\s+)(\d{1,2})(?:(?::|\s+)(\d{1,2}(?:\.\d*)?))?$/;
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parse `d:m[:s]` or `d m [s]` into { sign, value } with value = d + m/60 + s/3600 (unsigned).
 * Returns undefined when the text is not sexagesimal.
 */
function parseSexagesimal(text: string): { negative: boolean; value: number; whole: number; minutes: number; seconds: number } | undefined {
  // Unit letters as separators: 12h34m56.7s, -12d34m56.7s.
  const m = SEXAGESIMAL.exec(text.trim().replace(/^([+-]?\s*\d+)[hd](\d+)m(\d+(?:\.\d*)?)s?$/i, '$1:$2:$3'));
  if (!m) return undefined;
  const whole = Number(m[2]);
  const minutes = Number(m[3]);
  const seconds = m[4] === undefined ? 0 : Number(m[4]);
  return { negative: m[1] === '-', value: whole + minutes / 60 + seconds / 3600, whole, minutes, seconds };
}

function badAngle(what: string, value: string | number, expected: string, place: ErrorPlace): InputError {
  return new InputError('coordinates.invalid', `cannot read the ${what}`, place, { expected, actual: JSON.stringify(value) });
}

/**
 * Right ascension in degrees [0, 360). Strings with ':' or spaces are hours (`12:34:56.7`,
 * `12 34 56.7`); a number or a plain decimal string is degrees.
 */
export function parseRightAscension(value: string | number, place: ErrorPlace = {}): number {
  const expected = "hours as 'hh:mm:ss.s' or 'hh mm ss.s', or degrees in [0, 360)";
  let deg: number;
  if (typeof value === 'number') deg = value;
  else if (DECIMAL.test(value.trim())) deg = Number(value.trim());
  else {
    const s = parseSexagesimal(value);
    if (!s || s.negative || s.whole >= 24 || s.minutes >= 60 || s.seconds >= 60) throw badAngle('right ascension', value, expected, place);
    deg = s.value * 15;
  }
  if (!Number.isFinite(deg) || deg < 0 || deg >= 360) throw badAngle('right ascension', value, expected, place);
  return deg;
}

/** Declination in degrees [-90, 90]: `-05:06:07.8`, `-05 06 07.8`, a number or a decimal string of degrees. */
export function parseDeclination(value: string | number, place: ErrorPlace = {}): number {
  const expected = "degrees as '+dd:mm:ss.s' or '+dd mm ss.s', or a number in [-90, 90]";
  let deg: number;
  if (typeof value === 'number') deg = value;
  else if (DECIMAL.test(value.trim())) deg = Number(value.trim());
  else {
    const s = parseSexagesimal(value);
    if (!s || s.minutes >= 60 || s.seconds >= 60) throw badAngle('declination', value, expected, place);
    // The sign is read from the text so that '-00:30:00' stays negative.
    deg = s.negative ? -s.value : s.value;
  }
  if (!Number.isFinite(deg) || deg < -90 || deg > 90) throw badAngle('declination', value, expected, place);
  return deg;
}

/** An observatory on the Earth: geodetic latitude and longitude (east positive), height above the ellipsoid. */
export interface Site {
  latitudeDeg: number;
  longitudeDeg: number;
  heightM: number;
}

function headerNumber(header: Header, key: string, place: ErrorPlace): number | undefined {
  const v = header.get(key);
  if (v === undefined) return undefined;
  const n = typeof v === 'number' ? v : typeof v === 'bigint' ? Number(v) : typeof v === 'string' && DECIMAL.test(v.trim()) ? Number(v.trim()) : NaN;
  if (!Number.isFinite(n)) throw new InputError('header.invalid-number', `${key} is not a number`, { ...place, key }, { expected: 'a number', actual: JSON.stringify(typeof v === 'bigint' ? v.toString() : v) });
  return n;
}

/** The site from geocentric OBSGEO-X/Y/Z (m), all three or none. */
function siteFromGeocentric(header: Header, place: ErrorPlace): Site | undefined {
  const xyz = (['OBSGEO-X', 'OBSGEO-Y', 'OBSGEO-Z'] as const).map((k) => headerNumber(header, k, place));
  if (xyz.every((v) => v === undefined)) return undefined;
  const missing = ['OBSGEO-X', 'OBSGEO-Y', 'OBSGEO-Z'].find((_, i) => xyz[i] === undefined);
  if (missing !== undefined) throw new InputError('header.missing-key', `${missing} is missing while other OBSGEO-X/Y/Z cards are given`, { ...place, key: missing });
  const [x, y, z] = xyz as [number, number, number];
  const r = Math.hypot(x, y, z);
  if (r < 6.3e6 || r > 6.5e6) throw new InputError('header.out-of-range', 'OBSGEO-X/Y/Z is not a point on the Earth', { ...place, key: 'OBSGEO-X' }, { expected: 'geocentric metres, 6.3e6 to 6.5e6 m from the centre', actual: `${r.toFixed(0)} m` });
  return geodeticFromGeocentric(x, y, z);
}

/**
 * The site from OBSGEO-B (latitude, deg), OBSGEO-L (longitude, deg east) and OBSGEO-H (m), or
 * else from geocentric OBSGEO-X/Y/Z (m, WGS84) (WCS Paper III, Greisen et al. 2006). Undefined
 * when none is present; B without L (or part of X/Y/Z) is an InputError. A missing OBSGEO-H
 * counts as 0 m: 1 km of height changes the rotation velocity by 7e-5 km/s.
 */
export function siteFromHeader(header: Header, place: ErrorPlace = {}): Site | undefined {
  const lat = headerNumber(header, 'OBSGEO-B', place);
  const lon = headerNumber(header, 'OBSGEO-L', place);
  const height = headerNumber(header, 'OBSGEO-H', place) ?? 0;
  if (lat === undefined && lon === undefined) return siteFromGeocentric(header, place);
  if (lat === undefined || lon === undefined) {
    const missing = lat === undefined ? 'OBSGEO-B' : 'OBSGEO-L';
    throw new InputError('header.missing-key', `${missing} is missing while the other of OBSGEO-B/OBSGEO-L is given`, { ...place, key: missing });
  }
  if (lat < -90 || lat > 90) throw new InputError('header.out-of-range', 'OBSGEO-B is not a latitude', { ...place, key: 'OBSGEO-B' }, { expected: 'degrees in [-90, 90]', actual: String(lat) });
  if (height < -1000 || height > 100000) throw new InputError('header.out-of-range', 'OBSGEO-H is not a plausible height', { ...place, key: 'OBSGEO-H' }, { expected: 'metres in [-1000, 100000]', actual: String(height) });
  return { latitudeDeg: lat, longitudeDeg: foldLongitude(lon), heightM: height };
}

/** A longitude folded into (-180, 180] deg; values already there are returned unchanged (no rounding). */
function foldLongitude(lon: number): number {
  if (lon > -180 && lon <= 180) return lon;
  const folded = ((((lon + 180) % 360) + 360) % 360) - 180;
  return folded === -180 ? 180 : folded;
}

const ISO_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2}):(\d{2}(?:\.\d*)?)Z?$/;

/**
 * Mid-exposure instant: DATE-OBS (UTC, `YYYY-MM-DDThh:mm:ss[.s]`, a space instead of `T` also read)
 * plus half the exposure time. A date without a time of day is refused: the Earth's rotation alone
 * changes the correction by up to 0.47 km/s over a day.
 */
export function midExposure(dateObs: string, exptimeS: number, place: ErrorPlace = {}): Date {
  const at = { ...place, key: place.key ?? 'DATE-OBS' };
  const m = ISO_DATE_TIME.exec(dateObs.trim());
  const expected = "UTC date and time 'YYYY-MM-DDThh:mm:ss[.sss]'";
  if (!m) throw new InputError('header.invalid-date', 'cannot read the start of the exposure', at, { expected, actual: JSON.stringify(dateObs) });
  const [year, month, day, hour, minute] = [1, 2, 3, 4, 5].map((i) => Number(m[i]));
  const second = Number(m[6]);
  if (month! < 1 || month! > 12 || day! < 1 || day! > 31 || hour! > 23 || minute! > 59 || second >= 61) {
    throw new InputError('header.invalid-date', 'date or time field out of range', at, { expected, actual: JSON.stringify(dateObs) });
  }
  const startMs = Date.UTC(year!, month! - 1, day!, hour!, minute!, 0) + second * 1000;
  const check = new Date(Date.UTC(year!, month! - 1, day!));
  if (check.getUTCDate() !== day) throw new InputError('header.invalid-date', 'no such day in that month', at, { expected, actual: JSON.stringify(dateObs) });
  if (!(exptimeS >= 0) || !Number.isFinite(exptimeS)) {
    throw new InputError('header.invalid-number', 'exposure time must be a non-negative number of seconds', { ...place, key: 'EXPTIME' }, { expected: 'seconds >= 0', actual: String(exptimeS) });
  }
  return new Date(startMs + exptimeS * 500);
}
