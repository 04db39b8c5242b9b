/**
 * spectrum.fits: the calibrated 2-D spectrum as four image extensions, SCI (electrons), VAR
 * (electrons squared), MASK (bits of MASK_BITS) and WAVE (air wavelength of every pixel centre,
 * Angstrom), all covering the trimmed data section in the orientation of the raw frame (the
 * internal orientation undone once, here, with toRaw). A pure formatter: HDU specs, no I/O.
 */
import { basename } from 'node:path';
import { Header } from '../../fits/header.js';
import type { WriteHdu } from '../../fits/write-types.js';
import { MASK_BIT_DESCRIPTIONS, MASK_BITS, type CalibratedFrame, type Orientation } from '../frame.js';
import { toRaw, type OrientedImage } from '../orientation.js';
import type { WavelengthSolution } from '../wavelength.js';

/** Cards copied from the first science header into the primary header, when present. */
const KEPT_CARDS = ['OBJECT', 'TELESCOP', 'INSTRUME', 'OBSERVER', 'DATE-OBS', 'RA', 'DEC', 'EQUINOX', 'OBSGEO-B', 'OBSGEO-L', 'OBSGEO-H'];

export interface SpectrumFits {
  primaryHeader: Header;
  hdus: WriteHdu[];
}

/**
 * An internal image in the raw orientation for writing: toRaw, or the same array when the
 * orientation is the identity (the writer only reads it, and a full-size copy costs time).
 */
export function inRawOrientation<T extends Float32Array | Float64Array | Uint16Array>(data: T, width: number, height: number, o: Orientation): OrientedImage<T> {
  return o.transpose || o.flipX ? toRaw(data, width, height, o) : { data, width, height };
}

/** The header of a MASK extension: one MASKBITn card per bit of MASK_BITS, naming and describing it. */
export function maskBitHeader(): Header {
  const h = new Header().set('BUNIT', '', 'bit mask; 0 is a good pixel');
  for (const [name, value] of Object.entries(MASK_BITS)) {
    h.set(`MASKBIT${Math.log2(value)}`, name, `${value}: ${MASK_BIT_DESCRIPTIONS[name as keyof typeof MASK_BITS]}`);
  }
  return h;
}

/** 1-based inclusive FITS section text of a 0-based end-exclusive section. */
export function sectionText(s: CalibratedFrame['section']): string {
  return `[${s.x0 + 1}:${s.x1},${s.y0 + 1}:${s.y1}]`;
}

/**
 * The HDUs of spectrum.fits. `history` lines become HISTORY cards of the primary header (what
 * was done, in order); they should hold no times so that reruns give identical bytes.
 */
export function spectrumFits(frame: CalibratedFrame, solution: WavelengthSolution, history: readonly string[]): SpectrumFits {
  if (solution.width !== frame.width || solution.height !== frame.height) {
    throw new RangeError(`solution ${solution.width}x${solution.height} does not match frame ${frame.width}x${frame.height}`);
  }
  const o = frame.orientation;
  const primaryHeader = new Header();
  for (const key of KEPT_CARDS) {
    const card = frame.header.cards.find((c) => c.key === key);
    if (card?.value !== undefined) primaryHeader.set(key, card.value, card.comment);
  }
  primaryHeader.set('EXPTIME', frame.exptimeS, '[s] total exposure time of the combined frames');
  primaryHeader.set('NCOMBINE', frame.exposures.length, 'science exposures combined');
  primaryHeader.set('RAWSEC', sectionText(frame.section), 'section of the raw frames these images cover');
  primaryHeader.set('ORIGIN', 'whorl', 'software that wrote this file');
  primaryHeader.comment('Extensions SCI, VAR, MASK and WAVE cover RAWSEC in the orientation of the raw frames.');
  frame.exposures.forEach((e, i) => primaryHeader.set(`EXPFIL${i + 1}`.slice(0, 8), basename(e.path), 'science exposure'));
  for (const line of history) primaryHeader.history(line);

  const image = <T extends Float32Array | Float64Array | Uint16Array>(data: T) => inRawOrientation(data, frame.width, frame.height, o);
  const sci = image(frame.sci);
  const sciHeader = new Header().set('BUNIT', 'electron', 'detected electrons per pixel in EXPTIME');
  const varHeader = new Header().set('BUNIT', 'electron**2', 'variance of SCI');
  const maskHeader = maskBitHeader();
  const waveHeader = new Header()
    .set('BUNIT', 'Angstrom', 'wavelength of each pixel centre')
    .set('BTYPE', 'AWAV', 'air wavelength (type code of WCS Paper III)');
  waveHeader.comment('Pixel values are wavelengths in standard air, Angstrom, flexure shift included.');
  if (solution.flexure) waveHeader.set('FLEXURE', solution.flexure.shiftAngstrom, '[Angstrom] sky-line shift added to the arc solution');
  waveHeader.set('WAVERMS', solution.rmsAngstrom, '[Angstrom] RMS of the arc-line residuals');

  return {
    primaryHeader,
    hdus: [
      { kind: 'image', name: 'SCI', bitpix: -32, width: sci.width, height: sci.height, data: sci.data, header: sciHeader },
      { kind: 'image', name: 'VAR', bitpix: -32, width: sci.width, height: sci.height, data: image(frame.var).data, header: varHeader },
      // Unsigned 16-bit (BZERO 32768, FITS 4.0 section 5.2.5) so every Uint16 bit survives.
      { kind: 'image', name: 'MASK', bitpix: 16, bzero: 32768, width: sci.width, height: sci.height, data: image(frame.mask).data, header: maskHeader },
      { kind: 'image', name: 'WAVE', bitpix: -64, width: sci.width, height: sci.height, data: image(solution.wave).data, header: waveHeader },
    ],
  };
}
