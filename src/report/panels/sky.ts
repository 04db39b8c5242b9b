import { COLORS } from '../colors.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** Sky-subtraction residual (RMS over the sky rows in units of the noise) around the fitted lines. */
export function skyPanel(input: TargetReportInput): string {
  const { lines, solution, cutout } = input;
  if (!lines || !solution) return missing('sky-residual', 'Sky subtraction', 'No sky model is available.');
  const { sky } = lines;
  const mid = Math.floor(solution.height / 2);
  const x0 = cutout?.x0 ?? 0;
  const x1 = cutout ? cutout.x0 + cutout.width : solution.width;
  const wave: number[] = [];
  const resid: number[] = [];
  const skyFlux: number[] = [];
  for (let x = x0; x < x1; x++) {
    wave.push(solution.wave[mid * solution.width + x]!);
    resid.push(sky.residualNormRms[x]!);
    skyFlux.push(sky.skySpectrum[x]!);
  }
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
  const regions = sky.skyRegions.map(([a, b]) => `${input.fileRow(a)}\u2013${input.fileRow(b)}`).join(', ');
  return section('sky-residual', 'Sky subtraction', `<div class="row">${residPlot}${skyPlot}</div>`, `Sky rows (1-based, as in rows.csv): ${regions}. A residual near 1 means the sky was removed down to the noise.`);
}
