/**
 * Writing FITS files (FITS Standard 4.0): an empty primary HDU or an image in it, then IMAGE and
 * BINTABLE extensions, each with DATASUM and CHECKSUM (checksum convention). The output is sized
 * first, then written in pieces at known positions (writeFitsPieces): image data through one
 * reused buffer, so a file of hundreds of MB needs neither that much memory nor fresh pages.
 */
import { InputError } from '../errors.js';
import { BLOCK_BYTES } from './card-parse.js';
import { formatHeader } from './card-format.js';
import { addSums, complement, encodeChecksum, onesComplementSum } from './checksum.js';
import type { Card, Header } from './header.js';
import { blankFor, encodeImage, encodeTable, tableLayout } from './write-data.js';
import type { ImageHduSpec, TableHduSpec, WriteHdu, WriteOptions } from './write-types.js';

/** Keywords the writer sets itself; copies in user headers are dropped. */
const RESERVED =
  /^(SIMPLE|XTENSION|BITPIX|NAXIS\d*|EXTEND|PCOUNT|GCOUNT|GROUPS|END|CHECKSUM|DATASUM|BZERO|BSCALE|BLANK|TFIELDS|THEAP|T(TYPE|FORM|UNIT|SCAL|ZERO|NULL|DIM|BCOL|DISP)\d+|Z(IMAGE|SIMPLE|TENSION|BITPIX|NAXIS\d*|TILE\d+|CMPTYPE|NAME\d+|VAL\d+|QUANTIZ|DITHER0|PCOUNT|GCOUNT|HECKSUM|DATASUM|BLANK|SCALE|ZERO|EXTEND|BLOCKED))$/;

interface PlannedHdu {
  cards: Card[];
  dataBytes: number;
  /** Image data, encoded piece by piece. */
  image?: { spec: ImageHduSpec; blank: number | undefined };
  /** Table data, encoded whole. */
  encode?(out: Uint8Array, offset: number): void;
}

function userCards(headers: (Header | undefined)[], skipExtname: boolean): Card[] {
  const out: Card[] = [];
  for (const h of headers) for (const c of h?.cards ?? []) if (!RESERVED.test(c.key) && !(skipExtname && c.key === 'EXTNAME')) out.push({ ...c });
  return out;
}

function planImage(spec: ImageHduSpec, primary: boolean, extensions: boolean, extra: (Header | undefined)[]): PlannedHdu {
  if (!Number.isInteger(spec.width) || !Number.isInteger(spec.height) || spec.width < 0 || spec.height < 0 || spec.width * spec.height !== spec.data.length) {
    throw new InputError('fits.write-invalid', 'image data do not match its size', { key: spec.name ?? 'image' }, { expected: `${spec.width} x ${spec.height} values`, actual: `${spec.data.length}` });
  }
  const cards: Card[] = primary ? [{ key: 'SIMPLE', value: true }] : [{ key: 'XTENSION', value: 'IMAGE' }];
  cards.push({ key: 'BITPIX', value: spec.bitpix }, { key: 'NAXIS', value: 2 }, { key: 'NAXIS1', value: spec.width }, { key: 'NAXIS2', value: spec.height });
  if (primary && extensions) cards.push({ key: 'EXTEND', value: true });
  if (!primary) cards.push({ key: 'PCOUNT', value: 0 }, { key: 'GCOUNT', value: 1 });
  if (spec.name !== undefined) cards.push({ key: 'EXTNAME', value: spec.name });
  const integer = spec.bitpix > 0;
  if (integer && spec.bzero !== undefined) cards.push({ key: 'BZERO', value: spec.bzero });
  if (integer && spec.bscale !== undefined) cards.push({ key: 'BSCALE', value: spec.bscale });
  const blank = blankFor(spec);
  if (blank !== undefined) cards.push({ key: 'BLANK', value: blank, comment: 'stored value of NaN pixels' });
  cards.push(...userCards([...extra, spec.header], spec.name !== undefined));
  return { cards, dataBytes: spec.width * spec.height * (Math.abs(spec.bitpix) / 8), image: { spec, blank } };
}

function planTable(spec: TableHduSpec): PlannedHdu {
  const layout = tableLayout(spec);
  const cards: Card[] = [
    { key: 'XTENSION', value: 'BINTABLE' },
    { key: 'BITPIX', value: 8 },
    { key: 'NAXIS', value: 2 },
    { key: 'NAXIS1', value: layout.rowBytes },
    { key: 'NAXIS2', value: layout.rows },
    { key: 'PCOUNT', value: 0 },
    { key: 'GCOUNT', value: 1 },
    { key: 'TFIELDS', value: spec.columns.length },
  ];
  spec.columns.forEach((c, i) => {
    cards.push({ key: `TTYPE${i + 1}`, value: c.name }, { key: `TFORM${i + 1}`, value: layout.columns[i]!.form });
    if (c.unit !== undefined && c.unit !== '') cards.push({ key: `TUNIT${i + 1}`, value: c.unit });
  });
  cards.push({ key: 'EXTNAME', value: spec.name }, ...userCards([spec.header], true));
  return { cards, dataBytes: layout.rows * layout.rowBytes, encode: (out, offset) => encodeTable(spec, layout, out, offset) };
}

function plan(hdus: WriteHdu[], options: WriteOptions): PlannedHdu[] {
  const planned: PlannedHdu[] = [];
  let rest = hdus;
  if (options.imageInPrimary) {
    const first = hdus[0];
    if (!first || first.kind !== 'image') {
      throw new InputError('fits.write-invalid', 'imageInPrimary needs an image as the first HDU', {}, { expected: 'an image spec first', actual: first?.kind ?? 'no HDU' });
    }
    planned.push(planImage(first, true, hdus.length > 1, [options.primaryHeader]));
    rest = hdus.slice(1);
  } else {
    const cards: Card[] = [{ key: 'SIMPLE', value: true }, { key: 'BITPIX', value: 8 }, { key: 'NAXIS', value: 0 }];
    if (hdus.length > 0) cards.push({ key: 'EXTEND', value: true });
    cards.push(...userCards([options.primaryHeader], false));
    planned.push({ cards, dataBytes: 0 });
  }
  for (const spec of rest) planned.push(spec.kind === 'image' ? planImage(spec, false, false, []) : planTable(spec));
  return planned;
}

function putAscii(out: Uint8Array, offset: number, text: string): void {
  for (let i = 0; i < text.length; i++) out[offset + i] = text.charCodeAt(i);
}

interface SizedHdu {
  hdu: PlannedHdu;
  headerBytes: number;
  paddedData: number;
}

function sizedHdus(hdus: WriteHdu[], options: WriteOptions): SizedHdu[] {
  const planned = plan(hdus, options);
  if (options.checksum ?? true) for (const p of planned) p.cards.push({ key: 'CHECKSUM', value: '0000000000000000' }, { key: 'DATASUM', value: '0' });
  return planned.map((hdu) => ({ hdu, headerBytes: formatHeader(hdu.cards).length, paddedData: Math.ceil(hdu.dataBytes / BLOCK_BYTES) * BLOCK_BYTES }));
}

/**
 * Bytes of image data encoded at once: whole values of every BITPIX (a multiple of 8) and of
 * 2880-byte blocks, about 4 MB, so the reused buffer stays small.
 */
const PIECE_BYTES = BLOCK_BYTES * 8 * 182;
let pieceBuffer: Uint8Array | undefined;

/**
 * Where writeFitsPieces sends its bytes: `bytes` belong at `position` of the file and are only
 * valid during the call (the buffer is reused), so a sink must not write another FITS file itself.
 */
export type PieceSink = (bytes: Uint8Array, position: number) => void;

/** Data then header of one HDU starting at `offset`; returns the offset after it. */
function writeHdu(s: SizedHdu, checksum: boolean, offset: number, put: PieceSink): number {
  const p = s.hdu;
  const dataOffset = offset + s.headerBytes;
  const end = dataOffset + s.paddedData;
  let dataSum = 0;
  const image = p.image;
  if (image && s.paddedData > 0) {
    // The padding (zeros, under 2880 bytes) goes out with the last piece.
    const buffer = (pieceBuffer ??= new Uint8Array(PIECE_BYTES + BLOCK_BYTES));
    const bytesPerValue = Math.abs(image.spec.bitpix) / 8;
    const n = image.spec.width * image.spec.height;
    const perPiece = PIECE_BYTES / bytesPerValue;
    for (let first = 0; first < n; first += perPiece) {
      const count = Math.min(perPiece, n - first);
      encodeImage(image.spec, buffer, 0, image.blank, first, count);
      const at = dataOffset + first * bytesPerValue;
      let length = count * bytesPerValue;
      if (first + count === n) {
        buffer.fill(0, length, end - at);
        length = end - at;
      }
      if (checksum) dataSum = onesComplementSum(buffer, 0, length, dataSum);
      put(buffer.subarray(0, length), at);
    }
  } else if (p.encode && s.paddedData > 0) {
    const data = new Uint8Array(s.paddedData);
    p.encode(data, 0);
    if (checksum) dataSum = onesComplementSum(data, 0, data.length);
    put(data, dataOffset);
  }
  const header = new Uint8Array(s.headerBytes);
  if (checksum) {
    p.cards[p.cards.length - 1]!.value = String(dataSum);
    const text = formatHeader(p.cards);
    putAscii(header, 0, text);
    const total = addSums(onesComplementSum(header, 0, header.length), dataSum);
    putAscii(header, text.indexOf("CHECKSUM= '") + 11, encodeChecksum(complement(total)));
  } else {
    putAscii(header, 0, formatHeader(p.cards));
  }
  put(header, offset);
  return end;
}

/**
 * Serialise HDUs through `put`, each HDU's data before its header (whose CHECKSUM needs the data's
 * sum); together the pieces cover the file once. The specs are checked before the first piece.
 * Returns the file's length.
 */
export function writeFitsPieces(hdus: WriteHdu[], options: WriteOptions, put: PieceSink): number {
  return writeSized(sizedHdus(hdus, options), options.checksum ?? true, put);
}

function writeSized(sized: SizedHdu[], checksum: boolean, put: PieceSink): number {
  let offset = 0;
  for (const s of sized) offset = writeHdu(s, checksum, offset, put);
  return offset;
}

/** Serialise HDUs to the bytes of a FITS file, held whole (small files; see writeFitsPieces). */
export function writeFits(hdus: WriteHdu[], options: WriteOptions = {}): Uint8Array {
  const sized = sizedHdus(hdus, options);
  const out = new Uint8Array(sized.reduce((n, s) => n + s.headerBytes + s.paddedData, 0));
  writeSized(sized, options.checksum ?? true, (bytes, position) => out.set(bytes, position));
  return out;
}
