/**
 * The plain-text format of whorl's line lists (config/lamps/README.md): whitespace-separated
 * fields, `#` starts a comment, blank lines ignored. Errors carry the 1-based line and column.
 */
import { InputError } from '../errors.js';

export interface ListRow {
  /** Fields in order. */
  fields: string[];
  /** 1-based column of each field. */
  columns: number[];
  /** Text after `#`, trimmed ('' when absent). */
  comment: string;
  /** 1-based line number. */
  line: number;
}

/** Split a list into rows of fields, keeping the line and column of each field for error messages. */
export function splitListRows(text: string): ListRow[] {
  const rows: ListRow[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!;
    const hash = raw.indexOf('#');
    const body = hash >= 0 ? raw.slice(0, hash) : raw;
    const fields: string[] = [];
    const columns: number[] = [];
    for (const m of body.matchAll(/\S+/g)) {
      fields.push(m[0]);
      columns.push((m.index ?? 0) + 1);
    }
    if (fields.length === 0) continue;
    rows.push({ fields, columns, comment: hash >= 0 ? raw.slice(hash + 1).trim() : '', line: i + 1 });
  }
  return rows;
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** The field `index` of `row` as a finite number in [min, max], or an InputError at its place. */
export function numberField(row: ListRow, index: number, what: string, source: string, min: number, max: number): number {
  const text = row.fields[index]!;
  const value = NUMBER.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new InputError('linelist.invalid', `cannot read the ${what}`, { file: source, line: row.line, column: row.columns[index]! }, { expected: `a number in [${min}, ${max}]`, actual: JSON.stringify(text) });
  }
  return value;
}

/** An InputError unless the row has exactly `count` fields. */
export function expectFieldCount(row: ListRow, count: number, layout: string, source: string): void {
  if (row.fields.length === count) return;
  const column = row.fields.length > count ? row.columns[count]! : (row.columns[row.fields.length - 1] ?? 1);
  throw new InputError('linelist.invalid', `expected ${count} fields`, { file: source, line: row.line, column }, { expected: layout, actual: `${row.fields.length} fields` });
}
