/** FITS headers of the simulated frames, with the keywords an observatory writes. */
import { Header } from '../fits/header.js';
import { INSTRUMENT, SITE, TELESCOPE } from './scenario.js';
import { dateObsText, type FramePlan } from './schedule.js';
import type { SetupTruth, TargetTruth } from './truth.js';

const IMAGETYP: Record<FramePlan['kind'], string> = { bias: 'bias', flat: 'flat', arc: 'arc', science: 'object' };

/** Header of one frame; `target` for science frames; `pointing` for calibrations taken at a target's position. */
export function frameHeader(plan: FramePlan, setup: SetupTruth, target: TargetTruth | undefined, pointing: { ra: string; dec: string }): Header {
  const det = setup.detector;
  const h = new Header();
  h.set('OBJECT', target ? target.name : plan.kind === 'arc' ? 'Ne+Ar lamp' : plan.kind === 'flat' ? 'quartz lamp flat' : 'bias', 'name of the object observed');
  h.set('IMAGETYP', IMAGETYP[plan.kind], 'type of exposure');
  h.set('EXPTIME', plan.exptimeS, '[s] exposure time');
  h.set('DATE-OBS', dateObsText(plan.startMs), 'UTC start of exposure');
  h.set('RA', pointing.ra, 'right ascension (hh:mm:ss) of the pointing');
  h.set('DEC', pointing.dec, 'declination (dd:mm:ss) of the pointing');
  h.set('EQUINOX', 2000.0, 'equinox of RA and DEC');
  h.set('RADESYS', 'FK5', 'frame of RA and DEC');
  h.set('OBSERVAT', SITE.name, 'observatory');
  h.set('OBSGEO-B', SITE.latitudeDeg, '[deg] geodetic latitude of the site');
  h.set('OBSGEO-L', SITE.longitudeDeg, '[deg] longitude of the site, east positive');
  h.set('OBSGEO-H', SITE.heightM, '[m] height of the site above the ellipsoid');
  h.set('TELESCOP', TELESCOPE, 'telescope');
  h.set('INSTRUME', INSTRUMENT, 'instrument');
  h.set('GRATING', setup.grating, 'grating in the beam');
  h.set('GRTILT', setup.gratingTiltDeg, '[deg] grating tilt');
  h.set('SLITWID', 1.5, '[arcsec] slit width');
  h.set('CCDSUM', '1 1', 'binning along x and y');
  if (plan.kind === 'arc') h.set('LAMPS', 'Ne,Ar', 'calibration lamps on');
  if (plan.kind === 'flat') h.set('LAMPS', 'quartz', 'calibration lamps on');
  h.set('GAIN', det.gainEPerAdu, '[e-/ADU] detector gain');
  h.set('RDNOISE', det.readNoiseE, '[e-] read noise');
  h.set('SATURATE', det.saturationAdu, '[ADU] saturation level');
  h.set('DATASEC', det.dataSection, 'illuminated data section');
  h.set('BIASSEC', det.overscanSection, 'overscan section');
  return h;
}
