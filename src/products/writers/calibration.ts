/**
 * The master calibrations of a setup as FITS files for people: bias.fits (ADU, overscan
 * subtracted) and flat.fits (normalised flat, its variance and the flat mask), in the raw
 * orientation of the trimmed data section. A pure formatter: HDU specs, no I/O.
 */
import { Header } from '../../fits/header.js';
import type { WriteHdu } from '../../fits/write-types.js';
import type { CcdCalibration } from '../../stages/ccd/calibration.js';
import { inRawOrientation, maskBitHeader, sectionText } from './spectrum.js';

/** What the writers need of the CCD stage's calibration. */
export type MasterFrames = Pick<
  CcdCalibration,
  'orientation' | 'section' | 'width' | 'height' | 'gain' | 'readNoiseE' | 'masterBias' | 'biasVarianceAdu' | 'masterFlat' | 'flatVariance' | 'flatMask'
>;

export interface CalibrationFits {
  primaryHeader: Header;
  hdus: WriteHdu[];
}

function baseHeader(m: MasterFrames, inputs: readonly string[], history: readonly string[]): Header {
  const h = new Header();
  h.set('RAWSEC', sectionText(m.section), 'section of the raw frames these images cover');
  h.set('GAIN', m.gain, '[e-/ADU] detector gain used');
  h.set('RDNOISE', m.readNoiseE, '[e-] read noise used');
  h.set('NCOMBINE', inputs.length, 'frames combined');
  h.set('ORIGIN', 'whorl', 'software that wrote this file');
  inputs.forEach((f, i) => h.set(`INPUT${i + 1}`.slice(0, 8), f, 'input frame'));
  for (const line of history) h.history(line);
  return h;
}

function raw<T extends Float32Array | Uint16Array>(m: MasterFrames, data: T) {
  return inRawOrientation(data, m.width, m.height, m.orientation);
}

/** bias.fits: the master bias (ADU) in the primary HDU. */
export function masterBiasFits(m: MasterFrames, inputs: readonly string[], history: readonly string[]): CalibrationFits {
  const primaryHeader = baseHeader(m, inputs, history);
  primaryHeader.set('BUNIT', 'adu', 'overscan-subtracted bias level');
  primaryHeader.set('BIASVAR', m.biasVarianceAdu, '[adu**2] variance of one master-bias pixel');
  const img = raw(m, m.masterBias);
  return { primaryHeader, hdus: [{ kind: 'image', bitpix: -32, width: img.width, height: img.height, data: img.data }] };
}

/** flat.fits: FLAT (normalised, unitless), FLATVAR (its variance) and FLATMASK (MASK_BITS). */
export function masterFlatFits(m: MasterFrames, inputs: readonly string[], history: readonly string[]): CalibrationFits {
  const primaryHeader = baseHeader(m, inputs, history);
  const flat = raw(m, m.masterFlat);
  const maskHeader = maskBitHeader();
  const size = { width: flat.width, height: flat.height };
  return {
    primaryHeader,
    hdus: [
      { kind: 'image', name: 'FLAT', bitpix: -32, ...size, data: flat.data, header: new Header().set('BUNIT', '', 'normalised flat field') },
      { kind: 'image', name: 'FLATVAR', bitpix: -32, ...size, data: raw(m, m.flatVariance).data, header: new Header().set('BUNIT', '', 'variance of FLAT') },
      { kind: 'image', name: 'FLATMASK', bitpix: 16, bzero: 32768, ...size, data: raw(m, m.flatMask).data, header: maskHeader },
    ],
  };
}
