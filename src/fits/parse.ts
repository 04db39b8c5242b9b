/**
 * Splitting a FITS file into HDUs (FITS Standard 4.0, sections 3-4 and 7): mandatory keywords
 * checked, data sizes checked against the file before anything is allocated, checksums verified.
 */
import { gunzipSync } from 'node:zlib';
import { InputError, type ErrorPlace } from '../errors.js';
import { BLOCK_BYTES, parseHeader } from './card-parse.js';
import { addSums, onesComplementSum } from './checksum.js';
import type { Header } from './header.js';
import { imageHeaderOf, isCompressedImage } from './tiled-header.js';
import type { FitsFile, Hdu, HduKind, ParseOptions } from './types.js';

const BITPIX_VALUES = new Set([8, 16, 32, 64, -32, -64]);

/** Structural numbers of one HDU. */
export interface Structure {
  bitpix: number;
  axes: number[];
  pcount: number;
  gcount: number;
}

function integerKey(header: Header, key: string, place: ErrorPlace, min: number, max: number, fallback?: number): number {
  const v = header.get(key);
  if (v === undefined && fallback !== undefined) return fallback;
  if (typeof v !== 'number' || !Number.isInteger(v) || v < min || v > max) {
    throw new InputError('fits.bad-keyword', `${key} is missing or invalid`, { ...place, key }, {
      expected: `an integer from ${min} to ${max}`,
      actual: v === undefined ? 'no such card' : String(v),
    });
  }
  return v;
}

/** BITPIX, NAXISn, PCOUNT, GCOUNT of a header, each checked (sections 4.4.1.1-4.4.1.2). */
export function readStructure(header: Header, place: ErrorPlace, primary: boolean): Structure {
  const bitpix = header.get('BITPIX');
  if (typeof bitpix !== 'number' || !BITPIX_VALUES.has(bitpix)) {
    throw new InputError('fits.bad-bitpix', 'invalid BITPIX', { ...place, key: 'BITPIX' }, {
      expected: 'one of 8, 16, 32, 64, -32, -64',
      actual: bitpix === undefined ? 'no BITPIX card' : String(bitpix),
    });
  }
  const naxis = integerKey(header, 'NAXIS', place, 0, 999);
  const axes: number[] = [];
  for (let i = 1; i <= naxis; i++) axes.push(integerKey(header, `NAXIS${i}`, place, 0, Number.MAX_SAFE_INTEGER));
  const pcount = primary ? 0 : integerKey(header, 'PCOUNT', place, 0, Number.MAX_SAFE_INTEGER, 0);
  const gcount = primary ? 1 : integerKey(header, 'GCOUNT', place, 0, Number.MAX_SAFE_INTEGER, 1);
  return { bitpix, axes, pcount, gcount };
}

/** Bytes of the data unit without padding (section 4.4.1.1 eq. 1 and 7.2 eq. 2); random groups skip NAXIS1. */
export function dataBytes(s: Structure, randomGroups: boolean): number {
  if (s.axes.length === 0) return 0;
  let n = 1;
  for (let i = randomGroups ? 1 : 0; i < s.axes.length; i++) n *= s.axes[i]!;
  return (Math.abs(s.bitpix) / 8) * s.gcount * (s.pcount + n);
}

function kindOf(header: Header, primary: boolean, place: ErrorPlace): HduKind {
  if (primary) return header.getBoolean('GROUPS') === true ? 'unknown' : 'image';
  const x = header.get('XTENSION');
  if (typeof x !== 'string') {
    throw new InputError('fits.bad-keyword', 'extension header does not start with XTENSION', { ...place, key: 'XTENSION' }, { expected: "XTENSION = 'IMAGE', 'BINTABLE' or 'TABLE'" });
  }
  const t = x.trim().toUpperCase();
  if (t === 'IMAGE' || t === 'IUEIMAGE') return 'image';
  if (t === 'BINTABLE' || t === 'A3DTABLE') return isCompressedImage(header) ? 'compressed-image' : 'bintable';
  if (t === 'TABLE') return 'table';
  return 'unknown';
}

function verifyChecksums(bytes: Uint8Array, hdu: Hdu, dataEnd: number, report: (code: string, m: string, expected: string, actual: string) => void): void {
  const header = hdu.tableHeader ?? hdu.header;
  const checksum = header.getString('CHECKSUM');
  const datasum = header.get('DATASUM');
  if (checksum === undefined && datasum === undefined) return;
  const dataSum = onesComplementSum(bytes, hdu.dataOffset, dataEnd);
  if (typeof datasum === 'string' && /^\d+$/.test(datasum.trim()) && Number(datasum.trim()) !== dataSum) {
    report('fits.datasum', 'DATASUM does not match the data', datasum.trim(), String(dataSum));
  }
  if (checksum !== undefined) {
    const total = addSums(onesComplementSum(bytes, hdu.headerOffset, hdu.dataOffset), dataSum);
    // The HDU must sum to -0 (all ones); +0 only for an HDU of zeros, which cannot carry a card.
    if (total !== 0xffffffff) report('fits.checksum', 'CHECKSUM does not match the HDU', 'the HDU to sum to -0 (0xffffffff)', `0x${total.toString(16)}`);
  }
}

function isBlankOrZero(bytes: Uint8Array, from: number): boolean {
  for (let i = from; i < bytes.length; i++) if (bytes[i] !== 0 && bytes[i] !== 0x20) return false;
  return true;
}

function gunzip(bytes: Uint8Array, source: string): Uint8Array {
  try {
    return gunzipSync(bytes);
  } catch (e) {
    throw new InputError('fits.gzip', `cannot gunzip: ${(e as Error).message}`, { file: source }, { expected: 'a complete gzip stream' });
  }
}

/**
 * FITS 4.0 section 4.4.1: SIMPLE (or XTENSION), BITPIX, NAXIS, NAXIS1..n come first, in that order,
 * and SIMPLE = T. Readers may still make sense of other files, so these are warnings.
 */
function warnOnMandatoryCards(header: Header, primary: boolean, warn: (m: string) => void): void {
  const naxis = header.getNumber('NAXIS');
  const want = [primary ? 'SIMPLE' : 'XTENSION', 'BITPIX', 'NAXIS'];
  for (let i = 1; Number.isSafeInteger(naxis) && i <= naxis! && i <= 999; i++) want.push(`NAXIS${i}`);
  const found = header.cards.slice(0, want.length).map((c) => c.key);
  if (found.some((k, i) => k !== want[i])) warn(`mandatory keywords out of order (FITS 4.0 section 4.4.1): expected ${want.join(', ')}, found ${found.join(', ')}`);
  if (primary && header.get('SIMPLE') !== true) warn('SIMPLE is not T: the file says it does not conform to the FITS standard');
}

/** Parse a FITS file held in memory; gzip streams (magic bytes 1f 8b) are gunzipped first. */
export function parseFits(input: Uint8Array, source: string, options: ParseOptions = {}): FitsFile {
  if (input.length === 0) throw new InputError('fits.empty', 'file is empty', { file: source }, { expected: 'a FITS file' });
  const bytes = input[0] === 0x1f && input[1] === 0x8b ? gunzip(input, source) : input;
  const start = String.fromCharCode(...bytes.subarray(0, 9));
  if (start !== 'SIMPLE  =') {
    throw new InputError('fits.not-fits', 'not a FITS file', { file: source, offset: 0 }, { expected: "a file starting with 'SIMPLE  ='", actual: JSON.stringify(start.replace(/[^\x20-\x7e]/g, '?')) });
  }
  const warnings: string[] = [];
  const hdus: Hdu[] = [];
  const mode = options.checksum ?? 'warn';
  let offset = 0;
  while (offset < bytes.length) {
    const index = hdus.length;
    const place: ErrorPlace = { file: source, hdu: index };
    if (index > 0 && String.fromCharCode(...bytes.subarray(offset, offset + 8)) !== 'XTENSION') {
      if (!isBlankOrZero(bytes, offset)) warnings.push(`${source}: ${bytes.length - offset} bytes after the last HDU are not an extension, ignored (byte ${offset})`);
      break;
    }
    const warn = (m: string): void => void warnings.push(`${source}, HDU ${index}: ${m}`);
    const { header, end } = parseHeader(bytes, offset, place, warn);
    const primary = index === 0;
    warnOnMandatoryCards(header, primary, warn);
    const structure = readStructure(header, place, primary);
    const kind = kindOf(header, primary, place);
    const length = dataBytes(structure, kind === 'unknown' && primary);
    const available = bytes.length - Math.min(end, bytes.length);
    if (length > available) {
      // Name PCOUNT when the heap alone would not fit: the axes are then not what is wrong.
      const heapBytes = (Math.abs(structure.bitpix) / 8) * structure.gcount * structure.pcount;
      const key = heapBytes > available ? 'PCOUNT' : `NAXIS${structure.axes.length}`;
      throw new InputError('fits.truncated', 'data unit is shorter than the header says', { ...place, key, offset: end }, {
        expected: `${length} bytes of data (BITPIX ${structure.bitpix}, axes ${structure.axes.join(' x ')}${structure.pcount > 0 ? `, PCOUNT ${structure.pcount}` : ''})`,
        actual: `${available} bytes left in the file`,
      });
    }
    const hdu: Hdu = { index, kind, header, headerOffset: offset, dataOffset: end, dataLength: length };
    if (kind === 'compressed-image') {
      hdu.tableHeader = header;
      hdu.header = imageHeaderOf(header);
    }
    const name = header.getString('EXTNAME');
    if (name !== undefined) hdu.name = name;
    const padded = Math.ceil(length / BLOCK_BYTES) * BLOCK_BYTES;
    const dataEnd = Math.min(end + padded, bytes.length);
    if (end + padded > bytes.length) warn(`data unit lacks ${end + padded - bytes.length} bytes of padding to a 2880-byte block`);
    if (mode !== 'skip') {
      verifyChecksums(bytes, hdu, dataEnd, (code, m, expected, actual) => {
        if (mode === 'error') throw new InputError(code, m, { ...place, key: code === 'fits.datasum' ? 'DATASUM' : 'CHECKSUM' }, { expected, actual });
        warn(`${m} (expected ${expected}, found ${actual})`);
      });
    }
    hdus.push(hdu);
    offset = end + padded;
  }
  return { source, hdus, warnings, bytes };
}
