import { COLORS } from '../colors.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** The folded rotation curve: each side, and the combined curve with statistical and total errors. */
export function curvePanel(input: TargetReportInput): string {
  const c = input.curve;
  if (!c) return missing('rotation-curve', 'Folded rotation curve', 'No rotation curve is available.');
  const p = c.points;
  const r = p.map((q) => q.rKpc);
  const plot = renderPlot({
    width: 920,
    height: 340,
    xLabel: 'Radius in the disk (kpc)',
    yLabel: 'Rotation speed (km/s)',
    series: [
      { kind: 'points', x: r, y: p.map((q) => q.vApproaching), color: COLORS.approaching, hollow: true, label: 'approaching side' },
      { kind: 'points', x: r, y: p.map((q) => q.vReceding), color: COLORS.receding, hollow: true, label: 'receding side' },
      { kind: 'points', x: r, y: p.map((q) => q.vRot), yErr: p.map((q) => q.errTotal), color: COLORS.muted },
      { kind: 'points', x: r, y: p.map((q) => q.vRot), yErr: p.map((q) => q.errStat), color: COLORS.combined, label: 'folded (stat. and total errors)' },
    ],
    xRange: [0, Math.max(1e-3, ...r.filter(Number.isFinite)) * 1.05],
  });
  const oneSided = p.filter((q) => q.oneSided).length;
  return section(
    'rotation-curve',
    'Folded rotation curve',
    plot,
    `Black bars: statistical error; grey bars: total (statistical, half the difference between the sides, and inclination, in quadrature). ${oneSided} radii have only one side.`,
  );
}
