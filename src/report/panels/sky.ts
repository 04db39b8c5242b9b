import { COLORS } from '../colors.js';
import { fileRow } from '../html.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** Sky-subtraction residual (RMS over the sky rows in units of the noise) around the fitted lines. */
export function skyPanel(input: TargetReportInput): string {
  const { lines, cutout } = input;
  if (!lines || !cutout) return missing('sky-residual', 'Sky subtraction', 'No sky model is available.');
  const { sky } = lines;
  // The cut-out's columns, with the wavelength of each at the central row.
  const wave = Array.from(cutout.wavelength);
  const resid = Array.from(sky.residualNormRms.subarray(cutout.x0, cutout.x0 + cutout.width));
  const skyFlux = Array.from(sky.skySpectrum.subarray(cutout.x0, cutout.x0 + cutout.width));
  const residPlot = renderPlot({
    width: 460,
    height: 240,
    xLabel: 'Wavelength (\u00c5, air)',
    yLabel: 'Sky-row RMS / noise',
    series: [{ kind: 'line', x: wave, y: resid, color: COLORS.approaching }],
    hLines: [1],
  });
  const skyPlot = renderPlot({
    width: 460,
    height: 240,
    xLabel: 'Wavelength (\u00c5, air)',
    yLabel: 'Sky (e\u207b per pixel)',
    series: [{ kind: 'line', x: wave, y: skyFlux, color: COLORS.muted }],
  });
  const regions = sky.skyRegions.map(([a, b]) => `${fileRow(a)}\u2013${fileRow(b)}`).join(', ');
  return section('sky-residual', 'Sky subtraction', `<div class="row">${residPlot}${skyPlot}</div>`, `Sky rows (1-based, as in rows.csv): ${regions}. A residual near 1 means the sky was removed down to the noise.`);
}
