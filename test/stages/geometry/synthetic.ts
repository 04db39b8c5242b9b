/**
 * Synthetic position-velocity curves with known truth for the geometry tests, made with the
 * published thin-disk formulas of /work/shared/REFERENCE.md "Geometry" written out here
 * (not with whorl's physics/disk.ts, so the tests do not check the code against itself):
 *   tan(theta) = tan(dphi)/cos(i),  R = |r| sqrt(cos^2 dphi + sin^2 dphi / cos^2 i),
 *   v_los = v_sys + V(R) sin i cos(theta), with the relative velocity c (z - z_sys)/(1 + z_sys).
 */
import type { LineTable, RowBin } from '../../../src/products/lines.js';
import type { VelocityPoint, VelocityTable } from '../../../src/products/curve.js';
import { Rng } from '../../../src/kernels/random.js';

const C_KMS = 299792.458; // SI, exact
const DEG = Math.PI / 180;

export interface DiskTruth {
  centreRow: number;
  vSysKms: number;
  inclinationDeg: number;
  slitToMajorDeg: number;
  arcsecPerPixel: number;
  /** True rotation speed (km/s) at in-plane radius R (arcsec). */
  curve: (rArcsec: number) => number;
}

export interface SynthOptions {
  rows: number;
  seed: number;
  /** Velocity error (km/s) at offset s (rows) from the centre. */
  error: (offsetRows: number) => number;
  /** Rows per velocity bin (1 = every row). */
  binRows?: number;
}

export const risingFlat = (vMax: number, rTurn: number) => (r: number): number => vMax * (1 - Math.exp(-r / rTurn));

/** In-plane radius and sin(i) cos(theta) (signed with the offset) from REFERENCE.md's formulas. */
export function referenceDeprojection(offsetArcsec: number, dphiDeg: number, incDeg: number): { radius: number; projection: number } {
  const cd = Math.cos(dphiDeg * DEG);
  const sd = Math.sin(dphiDeg * DEG);
  const ci = Math.cos(incDeg * DEG);
  const radius = Math.abs(offsetArcsec) * Math.sqrt(cd * cd + (sd * sd) / (ci * ci));
  const theta = Math.atan(Math.tan(dphiDeg * DEG) / ci);
  return { radius, projection: Math.sign(offsetArcsec) * Math.sin(incDeg * DEG) * Math.cos(theta) };
}

/** Noiseless line-of-sight velocity (km/s) at internal row y. */
export function trueVlos(t: DiskTruth, y: number): number {
  const { radius, projection } = referenceDeprojection((y - t.centreRow) * t.arcsecPerPixel, t.slitToMajorDeg, t.inclinationDeg);
  const dv = t.curve(radius) * projection;
  return t.vSysKms + dv * (1 + t.vSysKms / C_KMS);
}

export function synthVelocities(t: DiskTruth, o: SynthOptions): VelocityTable {
  const rnd = new Rng(o.seed);
  const step = o.binRows ?? 1;
  const points: VelocityPoint[] = [];
  for (let y0 = 0, bin = 0; y0 + step <= o.rows; y0 += step, bin++) {
    const yCentre = y0 + (step - 1) / 2;
    const e = o.error(yCentre - t.centreRow);
    points.push({ bin, rowStart: y0, rowEnd: y0 + step - 1, yCentre, vLos: trueVlos(t, yCentre) + e * rnd.normal(), vLosErr: e, flags: 0 });
  }
  return {
    points,
    perLine: [],
    barycentric: { correctionKms: 0, exposures: [], spreadKms: 0, frame: 'barycentric' },
    convention: 'optical',
  };
}

/** A LineTable holding what the geometry stage reads: the bins and a continuum profile peaked at `peakRow`. */
export function synthLines(v: VelocityTable, rows: number, peakRow: number, scaleRows = 15): LineTable {
  const bins: RowBin[] = v.points.map((p) => ({ rowStart: p.rowStart, rowEnd: p.rowEnd, yCentre: p.yCentre }));
  const continuumProfile = Float64Array.from({ length: rows }, (_, y) => 100 * Math.exp(-Math.abs(y - peakRow) / scaleRows));
  return {
    bins,
    measurements: [],
    fits: [],
    continuumProfile,
    sky: { skyRegions: [], galaxyRegion: [0, rows - 1], skySpectrum: new Float32Array(0), residualNormRms: new Float32Array(0), slitFactor: new Float32Array(rows).fill(1), emissionProfile: new Float64Array(rows) },
  };
}
