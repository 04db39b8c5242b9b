/** Loading a raw CCD frame: the first HDU holding a 2-D image, in physical ADU (Uint16Array or Float32Array). */
import { InputError } from '../errors.js';
import type { RawFrame } from '../products/frame.js';
import { Header } from './header.js';
import { readImage, readUnsigned16 } from './image.js';
import { readFitsFileTransient } from './read-file.js';
import type { FitsFile, Hdu } from './types.js';

const STRUCTURAL = /^(SIMPLE|XTENSION|BITPIX|NAXIS\d*|EXTEND|PCOUNT|GCOUNT|GROUPS|BZERO|BSCALE|BLANK|CHECKSUM|DATASUM|EXTNAME|EXTVER|INHERIT|END)$/;

/** 2-D: two axes, or more with every axis beyond the second of length 1. */
function isFrame(hdu: Hdu): boolean {
  if (hdu.kind !== 'image' && hdu.kind !== 'compressed-image') return false;
  const naxis = hdu.header.getNumber('NAXIS') ?? 0;
  if (naxis < 2) return false;
  for (let i = 1; i <= naxis; i++) {
    const len = hdu.header.getNumber(`NAXIS${i}`) ?? 0;
    if (len === 0 || (i > 2 && len !== 1)) return false;
  }
  return true;
}

/**
 * The header of an extension with the primary header's cards it lacks appended, as the INHERIT
 * convention (registered FITS convention) describes; INHERIT = F turns it off.
 */
export function inheritedHeader(file: FitsFile, hdu: Hdu): Header {
  const own = hdu.header.clone();
  if (hdu.index === 0 || own.getBoolean('INHERIT') === false) return own;
  for (const c of file.hdus[0]!.header.cards) {
    if (STRUCTURAL.test(c.key)) continue;
    if (c.value === undefined || !own.has(c.key)) own.cards.push({ ...c });
  }
  return own;
}

/**
 * The first 2-D image of a file as a RawFrame: unsigned 16-bit pixels (the usual raw frame) as a
 * Uint16Array, any other image as a Float32Array. Soft problems (a CHECKSUM mismatch, an unreadable
 * card value) are appended to `warnings` when given, so the caller can turn them into diagnostics.
 */
export function loadRawFrame(path: string, warnings?: string[]): RawFrame {
  const file = readFitsFileTransient(path);
  warnings?.push(...file.warnings);
  const hdu = file.hdus.find(isFrame);
  if (!hdu) {
    throw new InputError('fits.no-frame', 'no HDU holds a 2-D image', { file: path }, { expected: 'an image HDU with NAXIS = 2', actual: file.hdus.map((h) => h.kind).join(', ') });
  }
  const img = readUnsigned16(file, hdu.index) ?? readImage(file, hdu.index, { float32: true });
  return { path, hdu: hdu.index, header: inheritedHeader(file, hdu), width: img.width, height: img.height, data: img.data as Uint16Array | Float32Array };
}
