/**
 * modeller.txt: the rotation curve as a plain whitespace table for mass-modelling programs:
 * radius (kpc), rotation speed (km/s), total error (km/s), one point per line, with '#' lines
 * stating the distance, inclination, v_sys and the conventions used. Beam-smeared points are
 * kept and marked in a comment, so the modeller decides.
 */
import type { RotationCurve } from '../curve.js';
import { fixed } from './text-table.js';

export interface ModellerMeta {
  /** Target name as in the manifest. */
  target: string;
}

export function modellerText(curve: RotationCurve, meta: ModellerMeta): string {
  const g = curve.geometry;
  const smeared = curve.points.filter((p) => p.beamSmeared).length;
  const lines = [
    `# whorl rotation curve of ${meta.target}`,
    `# distance ${fixed(g.distanceMpc, 3)} Mpc (${fixed(g.kpcPerArcsec, 6)} kpc per arcsec)`,
    `# inclination ${fixed(g.inclinationDeg, 2)} +- ${fixed(g.inclinationErrDeg, 2)} deg (${g.inclinationSource === 'given' ? 'given' : 'Hubble 1926 from the axis ratio'})`,
    `# position angles: major axis ${fixed(g.majorAxisPaDeg, 2)} deg, slit ${fixed(g.slitPaDeg, 2)} deg`,
    `# v_sys ${fixed(curve.vSys, 2)} +- ${fixed(curve.vSysErr, 2)} km/s (${curve.convention} cz, ${curve.velocityFrame})`,
    `# radius: in the disk plane (deprojected); V: rotation speed, both sides folded; error: statistical, asymmetry (half the difference of the sides) and inclination in quadrature`,
    ...(smeared > 0 ? [`# the first ${smeared} points lie within two seeing FWHM of the centre (beam smearing lowers V)`] : []),
    `# columns: radius_kpc  v_kms  err_kms`,
  ];
  for (const p of curve.points) lines.push(`${fixed(p.rKpc, 4).padStart(10)} ${fixed(p.vRot, 2).padStart(9)} ${fixed(p.errTotal, 2).padStart(8)}`);
  return `${lines.join('\n')}\n`;
}
