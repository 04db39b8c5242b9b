import { escapeHtml, jsonForScript, fileRow } from '../html.js';
import { LINE_FLAGS, type BinFit, type LineMeasurement } from '../../products/lines.js';
import { packFits } from '../fit-data.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

function flagNames(flags: number): string[] {
  return Object.entries(LINE_FLAGS)
    .filter(([, bit]) => (flags & bit) !== 0)
    .map(([name]) => name);
}

/**
 * Small multiples of every row bin's fit: data with error bars, model and residuals, drawn on
 * canvases by the page script from the embedded data; a filter shows only the flagged bins.
 */
export function rowFitsPanel(input: TargetReportInput): string {
  const lines = input.lines;
  if (!lines || lines.fits.length === 0) return missing('row-fits', 'Fits of every row', 'No line fits are available.');
  const byBin = new Map<number, BinFit[]>();
  for (const f of lines.fits) byBin.set(f.bin, [...(byBin.get(f.bin) ?? []), f]);
  const measurementsOf = new Map<number, LineMeasurement[]>();
  for (const m of lines.measurements) measurementsOf.set(m.bin, [...(measurementsOf.get(m.bin) ?? []), m]);
  const panels: string[] = [];
  const panelFits: BinFit[][] = [];
  for (const [bin, fits] of [...byBin.entries()].sort((a, b) => a[0] - b[0])) {
    const b = lines.bins[bin]!;
    const ms = measurementsOf.get(bin) ?? [];
    const flags = ms.reduce((acc, m) => acc | m.flags, 0);
    const rowsText = `rows ${fileRow(b.rowStart)}\u2013${fileRow(b.rowEnd)}`;
    const lineText = ms.map((m) => `${m.line} S/N ${m.snr.toFixed(1)}`).join('; ');
    const flagText = flags ? flagNames(flags).join(', ') : 'clean';
    panels.push(
      `<div class="row-panel" data-flagged="${flags ? 1 : 0}" data-index="${panelFits.length}"><div class="row-head">${escapeHtml(rowsText)} \u00b7 ${escapeHtml(lineText)} \u00b7 <span class="${flags ? 'flag' : 'ok'}">${escapeHtml(flagText)}</span></div>${fits.map(() => '<canvas width="220" height="150"></canvas>').join('')}</div>`,
    );
    panelFits.push(fits);
  }
  const nFlagged = panels.filter((p) => p.includes('data-flagged="1"')).length;
  const controls = `<p class="controls"><label><input type="checkbox" id="only-flagged"/> show only flagged bins</label> <span id="row-count">${panels.length} bins, ${nFlagged} flagged</span></p>`;
  const body = `${controls}<div id="row-grid" class="grid">${panels.join('')}</div><script type="application/json" id="row-fit-data">${jsonForScript(packFits(panelFits))}</script>`;
  return section('row-fits', 'Fits of every row', body, 'Each panel: data with 1-sigma error bars (blue), fitted model (orange), residuals below (data minus model); grey points were masked. Wavelength in \u00c5 (air).');
}
