import { COLORS } from '../colors.js';
import type { ArcLineMeasurement } from '../../products/wavelength.js';
import { renderPlot } from '../plot.js';
import type { TargetReportInput } from '../types.js';
import { missing, section } from './section.js';

/** Arc-line residuals of the wavelength solution against wavelength and against row. */
export function wavelengthPanel(input: TargetReportInput): string {
  const s = input.solution;
  if (!s) return missing('wavelength-solution', 'Wavelength solution', 'No wavelength solution is available.');
  const used = s.lines.filter((l) => l.used);
  const rejected = s.lines.filter((l) => !l.used);
  const series = (pick: (l: ArcLineMeasurement) => number) => [
    { kind: 'points' as const, x: used.map(pick), y: used.map((l) => l.residualAngstrom), color: COLORS.approaching, label: `used (${used.length})` },
    { kind: 'points' as const, x: rejected.map(pick), y: rejected.map((l) => l.residualAngstrom), color: COLORS.flagged, hollow: true, label: `rejected (${rejected.length})` },
  ];
  const byWave = renderPlot({ width: 460, height: 260, xLabel: 'Wavelength (\u00c5, air)', yLabel: 'Residual (\u00c5)', series: series((l) => l.wavelength), hLines: [0] });
  const byRow = renderPlot({ width: 460, height: 260, xLabel: 'Row (internal, 0-based)', yLabel: 'Residual (\u00c5)', series: series((l) => l.y), hLines: [0] });
  const note = `RMS ${s.rmsAngstrom.toFixed(4)} \u00c5 (${s.rmsPx.toFixed(3)} px, ${s.rmsKms.toFixed(2)} km/s); identified lines span ${s.identifiedRange[0].toFixed(1)}\u2013${s.identifiedRange[1].toFixed(1)} \u00c5.`;
  return section('wavelength-solution', 'Wavelength solution', `<div class="row">${byWave}${byRow}</div>`, note);
}
