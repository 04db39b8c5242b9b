import { COLORS } from '../colors.js';
import { escapeHtml } from '../html.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** Enclosed mass M(<R) = V^2 R / G, the logarithmic slope, and what the shape means. */
export function dynamicsPanel(input: TargetReportInput): string {
  const c = input.curve;
  if (!c || c.dynamics.length === 0) return missing('dynamics', 'Enclosed mass and curve shape', 'No dynamics are available.');
  const d = c.dynamics;
  const massPlot = renderPlot({
    width: 460,
    height: 280,
    xLabel: 'Radius (kpc)',
    yLabel: 'M(<R) (10^10 solar masses)',
    series: [{ kind: 'points', x: d.map((q) => q.rKpc), y: d.map((q) => q.massMsun / 1e10), yErr: d.map((q) => q.massErrMsun / 1e10), color: COLORS.accent }],
  });
  const slopePlot = renderPlot({
    width: 460,
    height: 280,
    xLabel: 'Radius (kpc)',
    yLabel: 'd ln V / d ln R',
    series: [{ kind: 'points', x: d.map((q) => q.rKpc), y: d.map((q) => q.logSlope), color: COLORS.approaching }],
    hLines: [0, -0.5],
  });
  return section(
    'dynamics',
    'Enclosed mass and curve shape',
    `<div class="row">${massPlot}${slopePlot}</div><p class="shape"><strong>${escapeHtml(c.shape)}</strong>: ${escapeHtml(c.shapeSummary)}</p>`,
    'Dashed lines in the slope panel: flat (0) and Keplerian (\u22120.5).',
  );
}
