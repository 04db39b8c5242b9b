/** The benchmark table as plain text: one row per measurement, columns aligned. */
import type { BenchRow } from '../types.js';

export function formatBenchTable(rows: readonly BenchRow[]): string {
  const cells = rows.map((r) => [
    r.name,
    Number.isFinite(r.wallMs) ? r.wallMs.toFixed(0) : '-',
    r.peakRssMb !== undefined && r.peakRssMb > 0 ? r.peakRssMb.toFixed(0) : '-',
    r.figure ?? '',
    r.target ?? '',
  ]);
  const head = ['measurement', 'wall ms', 'peak MB', 'figure', 'target'];
  const widths = head.map((h, i) => Math.max(h.length, ...cells.map((c) => c[i]!.length)));
  const line = (c: string[]) => `${c.map((v, i) => (i === 1 || i === 2 ? v.padStart(widths[i]!) : v.padEnd(widths[i]!))).join('  ').trimEnd()}\n`;
  return line(head) + line(widths.map((w) => '-'.repeat(w))) + cells.map(line).join('');
}
