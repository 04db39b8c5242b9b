import { escapeHtml, fmt, fileRow } from '../html.js';
import { LINE_FLAGS } from '../../products/lines.js';
import type { TargetReportInput } from '../types.js';
import { section } from './section.js';

/** The numbers a reader checks first, each with its unit. */
export function keyNumbersPanel(input: TargetReportInput): string {
  const { curve, solution, velocities, lines } = input;
  const rows: [string, string][] = [];
  if (curve) {
    rows.push(['Systemic velocity (barycentric, optical)', `${fmt(curve.vSys, 2)} \u00b1 ${fmt(curve.vSysErr, 2)} km/s (${curve.vSysSource})`]);
    rows.push(['Outer rotation speed', `${fmt(curve.vOuter, 1)} km/s`]);
    const vmax = curve.points.reduce((m, p) => (Number.isFinite(p.vRot) && p.vRot > m ? p.vRot : m), -Infinity);
    rows.push(['Largest folded rotation speed', `${fmt(vmax, 1)} km/s`]);
    rows.push(['Inclination', `${fmt(curve.geometry.inclinationDeg, 1)} \u00b1 ${fmt(curve.geometry.inclinationErrDeg, 1)} deg (${curve.geometry.inclinationSource})`]);
    rows.push(['Distance', `${fmt(curve.geometry.distanceMpc, 2)} Mpc (${fmt(curve.geometry.kpcPerArcsec * 1000, 1)} pc/arcsec)`]);
    rows.push(['Slit to major axis', `${fmt(curve.geometry.slitPaDeg - curve.geometry.majorAxisPaDeg, 1)} deg`]);
    rows.push(['Kinematic centre', `row ${fmt(fileRow(curve.centreRow), 2)} \u00b1 ${fmt(curve.centreRowErr, 2)} (${curve.centreSource})`]);
    rows.push(['Curve shape', curve.shape]);
  }
  if (solution) {
    rows.push(['Wavelength solution RMS', `${fmt(solution.rmsAngstrom, 4)} \u00c5 = ${fmt(solution.rmsPx, 3)} px = ${fmt(solution.rmsKms, 2)} km/s`]);
    const used = solution.lines.filter((l) => l.used).length;
    rows.push(['Arc lines used / measured', `${used} / ${solution.lines.length}`]);
    if (solution.flexure) {
      rows.push(['Flexure shift (sky lines)', `${fmt(solution.flexure.shiftAngstrom, 4)} \u00b1 ${fmt(solution.flexure.shiftErrAngstrom, 4)} \u00c5 (${fmt(solution.flexure.shiftKms, 2)} km/s)`]);
    }
  }
  if (velocities) {
    const b = velocities.barycentric;
    rows.push([`${b.frame === 'barycentric' ? 'Barycentric' : 'Heliocentric'} correction`, `${fmt(b.correctionKms, 3)} km/s (spread between exposures ${fmt(b.spreadKms, 3)} km/s)`]);
    rows.push(['Velocity convention', velocities.convention]);
  }
  if (lines) {
    const flagged = lines.measurements.filter((m) => m.flags !== 0).length;
    rows.push(['Row bins fitted', String(lines.bins.length)]);
    rows.push(['Line measurements flagged', `${flagged} of ${lines.measurements.length}`]);
  }
  const flagNames = Object.entries(LINE_FLAGS)
    .map(([k, v]) => `${v} ${k}`)
    .join(', ');
  const body = `<table class="keys">${rows.map(([k, v]) => `<tr><th>${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`).join('')}</table>`;
  return section('key-numbers', 'Key numbers', body, `Line flag bits: ${flagNames}.`);
}
