import { escapeHtml, jsonForScript } from '../html.js';
import { LINE_FLAGS } from '../../products/lines.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

const SCALES = [1, 10, 100, 1000];
/** v to `digits` decimals (0-3), halves away from zero like toFixed, without the string round trip (thousands of values per page). */
const round = (v: number, digits: number) => {
  if (!Number.isFinite(v)) return null;
  const f = SCALES[digits]!;
  return v < 0 ? -Math.round(-v * f) / f : Math.round(v * f) / f;
};

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
  const byBin = new Map<number, typeof lines.fits>();
  for (const f of lines.fits) byBin.set(f.bin, [...(byBin.get(f.bin) ?? []), f]);
  const panels: string[] = [];
  const payload: unknown[] = [];
  for (const [bin, fits] of [...byBin.entries()].sort((a, b) => a[0] - b[0])) {
    const b = lines.bins[bin]!;
    const ms = lines.measurements.filter((m) => m.bin === bin);
    const flags = ms.reduce((acc, m) => acc | m.flags, 0);
    const rowsText = `rows ${input.fileRow(b.rowStart)}\u2013${input.fileRow(b.rowEnd)}`;
    const lineText = ms.map((m) => `${m.line} S/N ${m.snr.toFixed(1)}`).join('; ');
    const flagText = flags ? flagNames(flags).join(', ') : 'clean';
    panels.push(
      `<div class="row-panel" data-flagged="${flags ? 1 : 0}" data-index="${payload.length}"><div class="row-head">${escapeHtml(rowsText)} \u00b7 ${escapeHtml(lineText)} \u00b7 <span class="${flags ? 'flag' : 'ok'}">${escapeHtml(flagText)}</span></div>${fits.map(() => '<canvas width="220" height="150"></canvas>').join('')}</div>`,
    );
    payload.push(
      fits.map((f) => ({
        g: f.group,
        w: Array.from(f.wavelength, (v) => round(v, 3)),
        d: Array.from(f.data, (v) => round(v, 1)),
        e: Array.from(f.error, (v) => round(v, 1)),
        m: Array.from(f.model, (v) => round(v, 1)),
        x: Array.from(f.excluded),
      })),
    );
  }
  const nFlagged = panels.filter((p) => p.includes('data-flagged="1"')).length;
  const controls = `<p class="controls"><label><input type="checkbox" id="only-flagged"/> show only flagged bins</label> <span id="row-count">${panels.length} bins, ${nFlagged} flagged</span></p>`;
  const body = `${controls}<div id="row-grid" class="grid">${panels.join('')}</div><script type="application/json" id="row-fit-data">${jsonForScript(payload)}</script>`;
  return section('row-fits', 'Fits of every row', body, 'Each panel: data with 1-sigma error bars (blue), fitted model (orange), residuals below (data minus model); grey points were masked. Wavelength in \u00c5 (air).');
}
