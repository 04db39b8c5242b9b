/**
 * The image header held by a tile-compressed HDU (Tiled Image Compression convention, Pence et al.
 * 2010, registered FITS convention; FITS Standard 4.0 section 10): ZBITPIX, ZNAXISn, ZSIMPLE ...
 * turned back into BITPIX, NAXISn, SIMPLE ..., and the table's own keywords removed.
 */
import { Header, type Card } from './header.js';

const RENAMED: Record<string, string> = {
  ZSIMPLE: 'SIMPLE',
  ZTENSION: 'XTENSION',
  ZBITPIX: 'BITPIX',
  ZNAXIS: 'NAXIS',
  ZEXTEND: 'EXTEND',
  ZBLOCKED: 'BLOCKED',
  ZPCOUNT: 'PCOUNT',
  ZGCOUNT: 'GCOUNT',
  ZHECKSUM: 'CHECKSUM',
  ZDATASUM: 'DATASUM',
};

/** Keywords that describe the binary table or the compression, not the image. */
const TABLE_ONLY =
  /^(XTENSION|BITPIX|NAXIS\d*|PCOUNT|GCOUNT|TFIELDS|THEAP|CHECKSUM|DATASUM|T(TYPE|FORM|UNIT|SCAL|ZERO|NULL|DIM|DISP)\d+|ZIMAGE|ZCMPTYPE|ZTILE\d+|ZNAME\d+|ZVAL\d+|ZQUANTIZ|ZDITHER0|ZMASKCMP)$/;

/** True when a BINTABLE header holds a tile-compressed image. */
export function isCompressedImage(tableHeader: Header): boolean {
  return tableHeader.getBoolean('ZIMAGE') === true;
}

/** The header of the compressed image, structural keywords first, as an uncompressed file would have it. */
export function imageHeaderOf(tableHeader: Header): Header {
  const naxis = tableHeader.getNumber('ZNAXIS') ?? 0;
  const structural: Card[] = [];
  const simple = tableHeader.getBoolean('ZSIMPLE');
  if (simple !== undefined) structural.push({ key: 'SIMPLE', value: simple });
  else structural.push({ key: 'XTENSION', value: tableHeader.getString('ZTENSION') ?? 'IMAGE' });
  structural.push({ key: 'BITPIX', value: tableHeader.getNumber('ZBITPIX') ?? 0 });
  structural.push({ key: 'NAXIS', value: naxis });
  for (let i = 1; i <= naxis; i++) structural.push({ key: `NAXIS${i}`, value: tableHeader.getNumber(`ZNAXIS${i}`) ?? 0 });
  if (simple === undefined) {
    structural.push({ key: 'PCOUNT', value: tableHeader.getNumber('ZPCOUNT') ?? 0 });
    structural.push({ key: 'GCOUNT', value: tableHeader.getNumber('ZGCOUNT') ?? 1 });
  }
  const rest: Card[] = [];
  for (const c of tableHeader.cards) {
    if (TABLE_ONLY.test(c.key)) continue;
    if (/^ZNAXIS\d*$/.test(c.key) || c.key === 'ZSIMPLE' || c.key === 'ZTENSION' || c.key === 'ZBITPIX' || c.key === 'ZPCOUNT' || c.key === 'ZGCOUNT') continue;
    const renamed = RENAMED[c.key];
    rest.push(renamed ? { ...c, key: renamed } : { ...c });
  }
  return new Header([...structural, ...rest]);
}
