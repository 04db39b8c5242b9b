import { encodeGreyPng, stretchToGrey } from '../png.js';
import { COLORS } from '../colors.js';
import { fmt } from '../html.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** The sky-subtracted 2-D spectrum around the fitted lines, with the fitted centroids drawn over it. */
export function spectrumImagePanel(input: TargetReportInput): string {
  const { cutout, lines } = input;
  if (!cutout) return missing('spectrum-image', '2-D spectrum around the lines', 'No calibrated spectrum is available.');
  const png = Buffer.from(encodeGreyPng(stretchToGrey(cutout.data), cutout.width, cutout.height)).toString('base64');
  const marks: string[] = [];
  for (const m of lines?.measurements ?? []) {
    const bin = lines!.bins[m.bin]!;
    const x = m.centerPx - cutout.x0 + 0.5;
    if (!Number.isFinite(x) || x < 0 || x > cutout.width) continue;
    const color = m.flags === 0 ? COLORS.model : COLORS.flagged;
    marks.push(`<line x1="${x.toFixed(2)}" x2="${x.toFixed(2)}" y1="${bin.rowStart}" y2="${bin.rowEnd + 1}" stroke="${color}" stroke-width="1.5" vector-effect="non-scaling-stroke"/>`);
  }
  const w0 = cutout.wavelength[0]!;
  const w1 = cutout.wavelength[cutout.wavelength.length - 1]!;
  const body =
    `<div class="spectrum" style="aspect-ratio:${cutout.width}/${Math.max(cutout.height, 1)}">` +
    `<img alt="2-D spectrum" src="data:image/png;base64,${png}"/>` +
    `<svg viewBox="0 0 ${cutout.width} ${cutout.height}" preserveAspectRatio="none">${marks.join('')}</svg></div>` +
    `<p class="axis-note">Horizontal: ${fmt(w0, 1)} to ${fmt(w1, 1)} \u00c5 (air, central row); vertical: rows along the slit, first row at the top. Marks: fitted centroids (orange clean, purple flagged).</p>`;
  return section('spectrum-image', '2-D spectrum around the lines', body);
}
