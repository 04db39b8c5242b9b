/** Reading a binary or ASCII table HDU as columns. */
import { InputError } from '../errors.js';
import { readAsciiTable } from './ascii-table.js';
import { binColumnValues } from './bintable.js';
import { binLayout, findColumn } from './bintable-layout.js';
import { hduAt } from './image.js';
import type { FitsFile, TableColumn, TableData } from './types.js';

export function readTable(file: FitsFile, index: number): TableData {
  const hdu = hduAt(file, index);
  const place = { file: file.source, hdu: index };
  if (hdu.kind === 'table') return readAsciiTable(hdu.header, file.bytes, hdu.dataOffset, hdu.dataLength, place);
  if (hdu.kind !== 'bintable') {
    throw new InputError('fits.not-table', 'HDU is not a table', place, { expected: 'a BINTABLE or TABLE extension', actual: hdu.kind });
  }
  const layout = binLayout(hdu.header, place, hdu.dataLength);
  const columns: TableColumn[] = layout.columns.map((c) => (c.unit === undefined ? { name: c.name, format: c.format } : { name: c.name, format: c.format, unit: c.unit }));
  return {
    rows: layout.rows,
    columns,
    column(name: string) {
      const col = findColumn(layout, name);
      if (!col) throw new InputError('fits.no-column', `no column ${name}`, place, { expected: `one of ${columns.map((c) => c.name).join(', ')}` });
      return binColumnValues(file.bytes, hdu.dataOffset, layout, col, { ...place, key: `TTYPE${col.number}` });
    },
  };
}
