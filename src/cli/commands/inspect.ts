/**
 * `whorl inspect FILE... [--json]`: what each FITS file holds, HDU by HDU. Every file is read even
 * when an earlier one is malformed; a malformed file (including a wrong CHECKSUM or DATASUM) is
 * reported on stderr and makes the exit code 2.
 */
import type { Command } from 'commander';
import { EXIT, InputError, type ErrorPlace } from '../../errors.js';
import { readFitsFile } from '../../fits/read-file.js';
import { summariseFits, type HduSummary } from '../../fits/summary.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

/** One file in the JSON document. */
export type FileReport =
  | { path: string; ok: true; warnings: string[]; hdus: HduSummary[] }
  | { path: string; ok: false; error: { code: string; message: string; place: ErrorPlace } };

export function inspectFile(path: string): FileReport {
  try {
    const file = readFitsFile(path, { checksum: 'error' });
    return { path, ok: true, warnings: file.warnings, hdus: summariseFits(file) };
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    return { path, ok: false, error: { code: e.code, message: e.message, place: e.place } };
  }
}

/** Numbers for people: integers as they are, others with 6 significant digits. */
function num(v: number): string {
  if (Number.isNaN(v)) return '-';
  if (Number.isInteger(v) && Math.abs(v) < 1e9) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a < 1e-3 || a >= 1e9)) return v.toExponential(5).replace(/\.?0+e/, 'e');
  return v.toPrecision(6).replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
}

function table(rows: string[][]): string {
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => (r[c] ?? '').length)));
  return rows.map((r) => `  ${r.map((cell, c) => (c === r.length - 1 ? cell : cell.padEnd(widths[c]!))).join('  ')}`.trimEnd()).join('\n') + '\n';
}

function size(h: HduSummary): string {
  if (h.rows !== undefined) return `${h.columns!.length} columns x ${h.rows} rows`;
  if (h.dimensions.length === 0) return 'no data';
  return h.dimensions.join(' x ');
}

export function formatReport(r: FileReport & { ok: true }): string {
  let out = `${r.path}: ${r.hdus.length} HDU${r.hdus.length === 1 ? '' : 's'}\n`;
  const withPixels = r.hdus.some((h) => h.pixels);
  const rows: string[][] = [['HDU', 'type', 'EXTNAME', 'BITPIX', 'size', ...(withPixels ? ['min', 'max', 'mean', 'median', 'NaN/BLANK'] : [])]];
  for (const h of r.hdus) {
    const type = h.compression ? `${h.type} (${h.compression})` : h.type;
    const p = h.pixels;
    const stats = p ? [num(p.min), num(p.max), num(p.mean), num(p.median), String(p.nanOrBlank)] : withPixels ? ['', '', '', '', ''] : [];
    rows.push([String(h.index), type, h.extname ?? '-', String(h.bitpix), size(h), ...stats]);
  }
  out += table(rows);
  for (const h of r.hdus.filter((x) => x.columns && x.columns.length > 0)) {
    out += `  HDU ${h.index} columns:\n`;
    out += table(h.columns!.map((c) => ['  ', c.name, c.format, c.unit ?? '']));
  }
  for (const h of r.hdus.filter((x) => x.pixels && x.pixels.infinite > 0)) out += `  HDU ${h.index}: ${h.pixels!.infinite} infinite pixels left out of the statistics\n`;
  for (const w of r.warnings) out += `  warning: ${w}\n`;
  return out;
}

export const registerInspect: CommandRegistrar = (program: Command, io: CliIo, setExit) => {
  program
    .command('inspect')
    .description('list the HDUs of FITS files: type, size, BITPIX, EXTNAME, pixel statistics and table columns')
    .argument('<files...>', 'FITS files (plain, gzipped or tile-compressed)')
    .option('--json', 'print one JSON document instead of tables')
    .action((files: string[], flags: { json?: boolean }) => {
      const reports = files.map(inspectFile);
      if (flags.json) io.out(`${JSON.stringify({ files: reports }, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
      for (const r of reports) {
        if (!r.ok) io.err(`whorl: ${r.error.message}\n`);
        else if (!flags.json) io.out(formatReport(r));
      }
      setExit(reports.every((r) => r.ok) ? EXIT.ok : EXIT.badInput);
    });
};
