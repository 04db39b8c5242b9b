/**
 * Detector properties of a raw frame: gain, read noise, saturation, overscan and data sections,
 * from the settings or else the header; and the check that a frame matches the calibrations.
 */
import { InputError } from '../../errors.js';
import type { RawFrame, Section } from '../../products/frame.js';
import type { CcdSettings } from './settings.js';
import { formatSection, parseSection, sectionsOverlap } from './section.js';

export interface Detector {
  /** e-/ADU. */
  gain: number;
  /** e- rms. */
  readNoiseE: number;
  /** Raw ADU at and above which a pixel is saturated. */
  saturationAdu: number;
  /** Overscan strip, raw 0-based end-exclusive; null when there is none. */
  overscan: Section | null;
  /** Data area, raw 0-based end-exclusive. */
  data: Section;
  /** Binning as written in the header ('1 1' when absent). */
  binning: string;
}

/** Common practice for 16-bit converters when neither settings nor header say. */
const DEFAULT_SATURATION_ADU = 65535;

export function resolveDetector(frame: RawFrame, settings: CcdSettings): Detector {
  const gain = settings.gain ?? frame.header.getNumber('GAIN');
  if (gain === undefined) {
    throw new InputError('ccd.gain-missing', 'no gain: the header has no GAIN and the manifest sets no `gain`', { file: frame.path, hdu: frame.hdu, key: 'GAIN' }, { expected: 'header keyword GAIN or manifest key `gain` (e-/ADU)' });
  }
  if (!(gain > 0)) throw new InputError('ccd.gain-invalid', `gain ${gain} is not positive`, { file: frame.path, hdu: frame.hdu, key: settings.gain !== undefined ? 'gain' : 'GAIN' }, { expected: 'e-/ADU > 0' });
  const readNoiseE = settings.readNoise ?? frame.header.getNumber('RDNOISE');
  if (readNoiseE === undefined) {
    throw new InputError('ccd.read-noise-missing', 'no read noise: the header has no RDNOISE and the manifest sets no `read_noise`', { file: frame.path, hdu: frame.hdu, key: 'RDNOISE' }, { expected: 'header keyword RDNOISE or manifest key `read_noise` (e-)' });
  }
  if (!(readNoiseE >= 0)) throw new InputError('ccd.read-noise-invalid', `read noise ${readNoiseE} is negative`, { file: frame.path, hdu: frame.hdu, key: 'RDNOISE' }, { expected: 'e- >= 0' });
  const saturationAdu = settings.saturationAdu ?? frame.header.getNumber('SATURATE') ?? DEFAULT_SATURATION_ADU;

  const dataText = settings.dataSection ?? frame.header.getString('DATASEC');
  const data = dataText === undefined
    ? { x0: 0, x1: frame.width, y0: 0, y1: frame.height }
    : parseSection(dataText, frame.width, frame.height, { file: frame.path, hdu: frame.hdu, key: settings.dataSection !== undefined ? 'datasec' : 'DATASEC' });
  const biasText = settings.biasSection ?? frame.header.getString('BIASSEC');
  const overscan = biasText === undefined
    ? null
    : parseSection(biasText, frame.width, frame.height, { file: frame.path, hdu: frame.hdu, key: settings.biasSection !== undefined ? 'biassec' : 'BIASSEC' });
  if (overscan && sectionsOverlap(overscan, data)) {
    throw new InputError('ccd.section-overlap', `overscan ${formatSection(overscan)} overlaps the data section ${formatSection(data)}`, { file: frame.path, hdu: frame.hdu, key: settings.biasSection !== undefined ? 'biassec' : 'BIASSEC' }, { expected: 'separate overscan and data sections' });
  }
  return { gain, readNoiseE, saturationAdu, overscan, data, binning: binningOf(frame) };
}

function binningOf(frame: RawFrame): string {
  const ccdsum = frame.header.getString('CCDSUM');
  if (ccdsum !== undefined) return ccdsum.trim().replace(/\s+/g, ' ');
  const bx = frame.header.getNumber('XBINNING') ?? 1;
  const by = frame.header.getNumber('YBINNING') ?? 1;
  return `${bx} ${by}`;
}

/** The frame every other is compared with (the first calibration frame). */
export interface ReferenceFrame {
  path: string;
  width: number;
  height: number;
  detector: Detector;
}

/** Throws when `frame` differs in shape, binning or data section from the reference frame. */
export function checkSameDetector(frame: RawFrame, det: Detector, reference: ReferenceFrame): void {
  const refDet = reference.detector;
  const place = { file: frame.path, hdu: frame.hdu };
  if (frame.width !== reference.width || frame.height !== reference.height) {
    throw new InputError('ccd.shape-mismatch', `frame is ${frame.width} x ${frame.height} but ${reference.path} is ${reference.width} x ${reference.height}`, place, { expected: `${reference.width} x ${reference.height}`, actual: `${frame.width} x ${frame.height}` });
  }
  if (det.binning !== refDet.binning) {
    throw new InputError('ccd.binning-mismatch', `binning '${det.binning}' differs from '${refDet.binning}' of ${reference.path}`, { ...place, key: 'CCDSUM' }, { expected: refDet.binning, actual: det.binning });
  }
  const same = (a: Section, b: Section): boolean => a.x0 === b.x0 && a.x1 === b.x1 && a.y0 === b.y0 && a.y1 === b.y1;
  if (!same(det.data, refDet.data)) {
    throw new InputError('ccd.section-mismatch', `data section ${formatSection(det.data)} differs from ${formatSection(refDet.data)} of ${reference.path}`, { ...place, key: 'DATASEC' }, { expected: formatSection(refDet.data), actual: formatSection(det.data) });
  }
}
