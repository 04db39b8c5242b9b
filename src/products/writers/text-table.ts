/**
 * Deterministic text for the product tables: fixed-decimal numbers (no locale, no exponent
 * surprises), 'nan' for missing values (read as NaN by numpy, pandas and astropy), and CSV with
 * '#' comment lines above the header. Shared by the curve, rows and light formatters.
 */

/** x with `digits` decimals; 'nan', 'inf', '-inf' for non-finite; never '-0.00'. */
export function fixed(x: number, digits: number): string {
  if (Number.isNaN(x)) return 'nan';
  if (!Number.isFinite(x)) return x > 0 ? 'inf' : '-inf';
  const s = x.toFixed(digits);
  // '-0.00' (a small negative rounded to zero) loses its sign; Number() only for the negatives
  return s.charCodeAt(0) === 45 && Number(s) === 0 ? s.slice(1) : s;
}

/** x in exponent form with `digits` decimals of the mantissa (e.g. 9.300e+10). */
export function exponent(x: number, digits: number): string {
  if (!Number.isFinite(x)) return fixed(x, 0);
  return x.toExponential(digits);
}

/** A value for JSON: non-finite numbers become null (JSON has no NaN). */
export function jsonNumber(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

export interface TextColumn {
  name: string;
  /** Unit for the '# units:' line ('' for dimensionless, counts and flags). */
  unit: string;
  cells: string[];
}

/** CSV text: the comment lines (each prefixed '# '), a units line, the header, one line per row. */
export function csvText(comments: string[], columns: TextColumn[]): string {
  const rows = columns[0]?.cells.length ?? 0;
  const lines = comments.map((c) => `# ${c}`);
  lines.push(`# units: ${columns.map((c) => `${c.name}=${c.unit === '' ? '1' : c.unit}`).join(', ')}`);
  lines.push(columns.map((c) => c.name).join(','));
  for (let r = 0; r < rows; r++) lines.push(columns.map((c) => csvCell(c.cells[r]!)).join(','));
  return `${lines.join('\n')}\n`;
}

/** Quote a cell only when it holds a comma, quote or newline (RFC 4180). */
function csvCell(s: string): string {
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
