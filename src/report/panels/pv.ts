import { COLORS } from '../colors.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** Position-velocity diagram: line-of-sight velocity against offset along the slit, both sides. */
export function pvPanel(input: TargetReportInput): string {
  const c = input.curve;
  if (!c) return missing('position-velocity', 'Position-velocity diagram', 'No velocities are available.');
  const pick = (side: 'approaching' | 'receding', excluded: boolean) => c.pv.filter((p) => p.side === side && (p.exclusion !== null) === excluded);
  const series = (['approaching', 'receding'] as const).flatMap((side) => [
    { kind: 'points' as const, x: pick(side, false).map((p) => p.offsetArcsec), y: pick(side, false).map((p) => p.vLos), yErr: pick(side, false).map((p) => p.vLosErr), color: COLORS[side], label: side },
    { kind: 'points' as const, x: pick(side, true).map((p) => p.offsetArcsec), y: pick(side, true).map((p) => p.vLos), color: COLORS[side], hollow: true },
  ]);
  const plot = renderPlot({ width: 920, height: 320, xLabel: 'Offset along the slit from the kinematic centre (arcsec)', yLabel: 'v_los (km/s, barycentric)', series, hLines: [c.vSys] });
  return section('position-velocity', 'Position-velocity diagram', plot, 'Open symbols: excluded (near the minor axis or flagged). Dashed line: systemic velocity.');
}
