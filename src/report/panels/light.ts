import { COLORS } from '../colors.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** The folded continuum light profile along the slit. */
export function lightPanel(input: TargetReportInput): string {
  const c = input.curve;
  if (!c || c.light.length === 0) return missing('light-profile', 'Light profile', 'No light profile is available.');
  const r = c.light.map((l) => l.rKpc);
  const plot = renderPlot({
    width: 460,
    height: 280,
    xLabel: 'Radius (kpc)',
    yLabel: 'Continuum (e\u207b per pixel)',
    series: [
      { kind: 'points', x: r, y: c.light.map((l) => l.fluxApproaching), color: COLORS.approaching, hollow: true, label: 'approaching' },
      { kind: 'points', x: r, y: c.light.map((l) => l.fluxReceding), color: COLORS.receding, hollow: true, label: 'receding' },
      { kind: 'line', x: r, y: c.light.map((l) => l.flux), color: COLORS.combined },
    ],
  });
  return section('light-profile', 'Light profile', plot);
}
