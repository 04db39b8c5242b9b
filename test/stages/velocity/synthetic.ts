/**
 * In-memory inputs for the velocity-stage tests: a frame whose exposures carry the headers of an
 * astropy fixture sequence, and a LineTable whose wavelengths come from known velocities through
 * the published formulas written out here (not through whorl's own inverse functions).
 */
import { readFileSync } from 'node:fs';
import { Header } from '../../../src/fits/header.js';
import type { CalibratedFrame } from '../../../src/products/frame.js';
import type { LineMeasurement, LineTable, RowBin } from '../../../src/products/lines.js';

export const C_KMS = 299792.458; // exact (SI)

export interface FixtureExposure { dateObs: string; exptimeS: number; barycentricKms: number; heliocentricKms: number }
export interface FixtureSequence {
  name: string;
  ra: string;
  dec: string;
  raDeg: number;
  decDeg: number;
  site: { latitudeDeg: number; longitudeDeg: number; heightM: number };
  exposures: FixtureExposure[];
}

/** Sequences made by fixtures/physics/make_barycentric.py with Debian's python3-astropy. */
export const SEQUENCES = (JSON.parse(readFileSync(new URL('../../../fixtures/physics/barycentric.json', import.meta.url), 'utf8')) as { sequences: FixtureSequence[] }).sequences;

export function sequence(name: string): FixtureSequence {
  const s = SEQUENCES.find((q) => q.name === name);
  if (!s) throw new Error(`no fixture sequence ${name}`);
  return s;
}

/** Header cards as a telescope would write them (RA/DEC sexagesimal text, OBSGEO in degrees and metres). */
export function exposureHeader(seq: FixtureSequence, e: FixtureExposure): Header {
  return new Header()
    .set('DATE-OBS', e.dateObs)
    .set('EXPTIME', e.exptimeS)
    .set('RA', seq.ra)
    .set('DEC', seq.dec)
    .set('EQUINOX', 2000.0)
    .set('RADESYS', 'ICRS')
    .set('OBSGEO-B', seq.site.latitudeDeg)
    .set('OBSGEO-L', seq.site.longitudeDeg)
    .set('OBSGEO-H', seq.site.heightM);
}

/** A tiny calibrated frame whose exposures are those of `seq` (pixels are not used by the stage). */
export function frameFor(seq: FixtureSequence, edit: (h: Header, i: number) => void = () => {}): CalibratedFrame {
  const exposures = seq.exposures.map((e, i) => {
    const header = exposureHeader(seq, e);
    edit(header, i);
    return { path: `sci${i + 1}.fits`, header, dateObs: e.dateObs, exptimeS: e.exptimeS };
  });
  const n = 4 * 4;
  return {
    width: 4,
    height: 4,
    sci: new Float32Array(n),
    var: new Float32Array(n).fill(1),
    mask: new Uint16Array(n),
    orientation: { transpose: false, flipX: false },
    section: { x0: 0, x1: 4, y0: 0, y1: 4 },
    header: exposures[0]!.header,
    exposures,
    exptimeS: exposures.reduce((s, e) => s + e.exptimeS, 0),
    gain: 1,
    readNoiseE: 3,
  };
}

/** Exposure-weighted astropy correction of a sequence (km/s). */
export function weightedCorrection(seq: FixtureSequence, kind: 'barycentricKms' | 'heliocentricKms'): number {
  const total = seq.exposures.reduce((s, e) => s + e.exptimeS, 0);
  return seq.exposures.reduce((s, e) => s + (e.exptimeS / total) * e[kind], 0);
}

/**
 * Observed air wavelength of a line of rest air wavelength `rest` from a source at true velocity
 * `vTrue` (convention as given), seen by an observer whose frame correction is `corrKms`:
 * (1 + z_obs) = (1 + z_true) / (1 + corr/c) (Wright & Eastman 2014, PASP 126, 838);
 * optical 1 + z = 1 + v/c; relativistic 1 + z = sqrt((1 + b)/(1 - b)) (e.g. WCS Paper III).
 */
export function observedWavelength(rest: number, vTrue: number, corrKms: number, convention: 'optical' | 'relativistic'): number {
  const b = vTrue / C_KMS;
  const onePlusZ = convention === 'optical' ? 1 + b : Math.sqrt((1 + b) / (1 - b));
  return (rest * onePlusZ) / (1 + corrKms / C_KMS);
}

/** A measurement with only the fields the velocity stage reads filled meaningfully. */
export function measurement(bin: number, line: string, group: string, restAir: number, wavelength: number, wavelengthErr: number, flags = 0): LineMeasurement {
  return {
    bin, line, group, restAir, centerPx: 0, wavelength, wavelengthErr,
    sigmaObsAngstrom: 1, sigmaInstrAngstrom: 0.8, sigmaKms: 30, sigmaKmsErr: 3,
    flux: 1000, fluxErr: 30, snr: 30, chi2Reduced: 1, flags,
  };
}

export function lineTable(bins: RowBin[], measurements: LineMeasurement[]): LineTable {
  return {
    bins,
    measurements,
    fits: [],
    continuumProfile: new Float64Array(bins.length),
    sky: {
      skyRegions: [],
      galaxyRegion: [0, 0],
      skySpectrum: new Float32Array(0),
      residualNormRms: new Float32Array(0),
      slitFactor: new Float32Array(0),
      emissionProfile: new Float64Array(0),
    },
  };
}

export function bins(n: number): RowBin[] {
  return Array.from({ length: n }, (_, i) => ({ rowStart: 2 * i, rowEnd: 2 * i + 1, yCentre: 2 * i + 0.5 }));
}
