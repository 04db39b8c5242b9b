/**
 * ASCII-table extensions (FITS Standard 4.0, section 7.2): fields at TBCOLn (1-based) with
 * TFORMn Aw, Iw, Fw.d, Ew.d, Dw.d; TNULLn strings and blank fields read as NaN.
 */
import { InputError, type ErrorPlace } from '../errors.js';
import type { Header } from './header.js';
import type { TableColumn, TableData } from './types.js';

interface AsciiColumn extends TableColumn {
  start: number;
  width: number;
  type: string;
  scale: number;
  zero: number;
  nullText?: string;
}

export function readAsciiTable(header: Header, bytes: Uint8Array, dataOffset: number, dataLength: number, place: ErrorPlace): TableData {
  const rowBytes = header.getNumber('NAXIS1') ?? 0;
  const rows = header.getNumber('NAXIS2') ?? 0;
  if (rowBytes * rows > dataLength) {
    throw new InputError('fits.bad-keyword', 'data unit is smaller than NAXIS1 x NAXIS2', { ...place, key: 'GCOUNT' }, { expected: `${rowBytes * rows} bytes`, actual: `${dataLength}` });
  }
  const fields = header.getNumber('TFIELDS') ?? 0;
  const cols: AsciiColumn[] = [];
  for (let n = 1; n <= fields; n++) {
    const form = header.getString(`TFORM${n}`) ?? '';
    const m = /^\s*([AIFED])(\d+)(\.\d+)?\s*$/.exec(form.toUpperCase());
    const start = header.getNumber(`TBCOL${n}`);
    if (!m || start === undefined || start < 1 || start - 1 + Number(m[2]) > rowBytes) {
      throw new InputError('fits.bad-tform', 'invalid ASCII-table column', { ...place, key: m ? `TBCOL${n}` : `TFORM${n}` }, {
        expected: `TFORMn Aw/Iw/Fw.d/Ew.d/Dw.d and TBCOLn inside NAXIS1 = ${rowBytes}`,
        actual: `${form} at ${String(start)}`,
      });
    }
    const col: AsciiColumn = { name: header.getString(`TTYPE${n}`) ?? `COL${n}`, format: form, start: start - 1, width: Number(m[2]), type: m[1]!, scale: header.getNumber(`TSCAL${n}`) ?? 1, zero: header.getNumber(`TZERO${n}`) ?? 0 };
    const unit = header.getString(`TUNIT${n}`);
    if (unit) col.unit = unit;
    const nullText = header.getString(`TNULL${n}`);
    if (nullText !== undefined) col.nullText = nullText;
    cols.push(col);
  }
  const field = (r: number, c: AsciiColumn): string => {
    const at = dataOffset + r * rowBytes + c.start;
    return String.fromCharCode(...bytes.subarray(at, at + c.width));
  };
  return {
    rows,
    columns: cols.map(({ name, format, unit }) => (unit === undefined ? { name, format } : { name, format, unit })),
    column(name: string) {
      const c = cols.find((x) => x.name.toUpperCase() === name.toUpperCase());
      if (!c) throw new InputError('fits.no-column', `no column ${name}`, place, { expected: cols.map((x) => x.name).join(', ') });
      if (c.type === 'A') return Array.from({ length: rows }, (_, r) => field(r, c).trimEnd());
      const out = new Float64Array(rows);
      for (let r = 0; r < rows; r++) {
        const text = field(r, c);
        const t = text.trim();
        out[r] = t === '' || (c.nullText !== undefined && text.trimEnd() === c.nullText.trimEnd()) ? NaN : c.zero + c.scale * Number(t.replace(/D/i, 'E'));
      }
      return out;
    },
  };
}
