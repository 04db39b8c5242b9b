/**
 * light.csv: the stellar continuum along the slit folded about the kinematic centre, one line per
 * pixel of offset, at the in-plane radius of the curve (for comparing mass with light).
 */
import type { RotationCurve } from '../curve.js';
import { csvText, fixed } from './text-table.js';

export function lightCsv(curve: RotationCurve): string {
  const l = curve.light;
  return csvText(
    [
      'whorl folded continuum (stellar light) profile: one line per pixel of offset from the kinematic centre',
      `radii in the disk plane, deprojected like the curve (inclination ${fixed(curve.geometry.inclinationDeg, 2)} deg); flux: continuum per pixel and row, mean of the sides (or the one side there is)`,
    ],
    [
      { name: 'r_arcsec', unit: 'arcsec', cells: l.map((p) => fixed(p.rArcsec, 3)) },
      { name: 'r_kpc', unit: 'kpc', cells: l.map((p) => fixed(p.rKpc, 4)) },
      { name: 'flux', unit: 'electron/pixel', cells: l.map((p) => fixed(p.flux, 3)) },
      { name: 'flux_approaching', unit: 'electron/pixel', cells: l.map((p) => fixed(p.fluxApproaching, 3)) },
      { name: 'flux_receding', unit: 'electron/pixel', cells: l.map((p) => fixed(p.fluxReceding, 3)) },
      { name: 'one_sided', unit: '', cells: l.map((p) => (p.oneSided ? '1' : '0')) },
    ],
  );
}
