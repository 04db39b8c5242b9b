/**
 * The barycentric (or heliocentric) correction of a combined frame: one per exposure at its
 * mid-exposure instant, then their exposure-time-weighted mean (common practice; flux weighting
 * would need the count rate of each exposure).
 */
import { InputError, type ErrorPlace } from '../../errors.js';
import type { Header } from '../../fits/header.js';
import { radialVelocityCorrection, type Pointing } from '../../physics/barycentric.js';
import { midExposure, parseDeclination, parseRightAscension, siteFromHeader, type Site } from '../../physics/coordinates.js';
import type { CalibratedFrame, ExposureInfo } from '../../products/frame.js';
import type { BarycentricInfo } from '../../products/curve.js';
import type { VelocitySettings } from './settings.js';

/** Above this spread between the exposures' corrections (km/s) the stage records a warning. */
export const SPREAD_WARNING_KMS = 0.1;

function headerAngle(header: Header, key: 'RA' | 'DEC', place: ErrorPlace): number {
  const value = header.get(key);
  const at = { ...place, key };
  if (value === undefined) {
    throw new InputError('velocity.coordinates-missing', `no ${key} card for the barycentric correction`, at, {
      expected: `${key} in the header, or the manifest key \`coordinates\` of the target`,
    });
  }
  const v = typeof value === 'bigint' ? Number(value) : value;
  if (typeof v !== 'string' && typeof v !== 'number') {
    throw new InputError('coordinates.invalid', `${key} is neither a number nor text`, at, { expected: 'sexagesimal text or degrees', actual: JSON.stringify(v) });
  }
  return key === 'RA' ? parseRightAscension(v, at) : parseDeclination(v, at);
}

/**
 * Pointing from RA/DEC/EQUINOX. Without EQUINOX the frame follows WCS Paper II (Calabretta &
 * Greisen 2002): RADESYS FK4 means 1950, anything else 2000; ICRS is taken as J2000.
 */
export function pointingFromHeader(header: Header, place: ErrorPlace): Pointing {
  const raDeg = headerAngle(header, 'RA', place);
  const decDeg = headerAngle(header, 'DEC', place);
  const radesys = header.getString('RADESYS')?.trim().toUpperCase();
  const equinoxCard = header.getNumber('EQUINOX');
  const equinox = radesys === 'ICRS' ? 2000 : (equinoxCard ?? (radesys === 'FK4' ? 1950 : 2000));
  if (!(equinox > 1800 && equinox < 2200)) {
    throw new InputError('header.out-of-range', 'EQUINOX is not a plausible year', { ...place, key: 'EQUINOX' }, { expected: 'a Julian year such as 2000', actual: String(equinox) });
  }
  return { raDeg, decDeg, equinox };
}

function siteOf(exposure: ExposureInfo, settings: VelocitySettings, place: ErrorPlace): Site {
  if (settings.site) return settings.site;
  const site = siteFromHeader(exposure.header, place);
  if (site === undefined) {
    throw new InputError('velocity.site-missing', 'no observatory site for the barycentric correction', { ...place, key: 'OBSGEO-B' }, {
      expected: 'OBSGEO-B/-L/-H in the header, or the manifest key `site` of the setup',
    });
  }
  return site;
}

/** Correction per exposure and the exposure-weighted mean (InputError when time, site or pointing is missing). */
export function frameCorrection(frame: CalibratedFrame, settings: VelocitySettings): BarycentricInfo {
  const exposures = frame.exposures.map((e) => {
    const place: ErrorPlace = { file: e.path };
    const mid = midExposure(e.dateObs, e.exptimeS, { ...place, key: 'DATE-OBS' });
    const pointing = settings.pointing ?? pointingFromHeader(e.header, place);
    const correctionKms = radialVelocityCorrection(mid, pointing, siteOf(e, settings, place), settings.frame);
    return { path: e.path, midTimeUtc: mid.toISOString(), correctionKms, exptimeS: e.exptimeS };
  });
  if (exposures.length === 0) throw new InputError('velocity.no-exposures', 'the frame lists no science exposure to take times from', {}, { expected: 'at least one exposure' });
  const total = exposures.reduce((s, e) => s + e.exptimeS, 0);
  // Zero-length exposures all round: equal weights.
  const weight = (e: { exptimeS: number }) => (total > 0 ? e.exptimeS / total : 1 / exposures.length);
  const correctionKms = exposures.reduce((s, e) => s + weight(e) * e.correctionKms, 0);
  const values = exposures.map((e) => e.correctionKms);
  return { correctionKms, exposures, spreadKms: Math.max(...values) - Math.min(...values), frame: settings.frame };
}
