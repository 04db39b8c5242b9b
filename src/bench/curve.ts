/**
 * Rotation-curve speed at full size: the injected v_los of every row of the cached full-size
 * simulated run (truth.json), with Gaussian noise, as a velocity table of one point per row (the
 * worst case: no row binning), then buildRotationCurve timed (symmetry fit with its bootstrap,
 * deprojection, fold, light profile, dynamics). No target in the issues; the figure says how many
 * points were folded and how far the centre and v_sys landed from the truth.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { VelocityPoint, VelocityTable } from '../products/curve.js';
import type { LineTable } from '../products/lines.js';
import { Rng } from '../kernels/random.js';
import type { RunTruth } from '../sim/truth.js';
import { buildRotationCurve } from '../stages/geometry/index.js';
import type { BenchContext, BenchRow } from './types.js';

const REPEATS = 3;
/** Velocity error per row (km/s) at the centre and its growth per arcsec of offset. */
const ERROR_CENTRE_KMS = 3;
const ERROR_PER_ARCSEC = 0.2;

export async function benchCurve(ctx: BenchContext): Promise<BenchRow[]> {
  const truth = JSON.parse(readFileSync(join(ctx.runDir, 'truth.json'), 'utf8')) as RunTruth;
  const t = truth.targets[0]!;
  const rng = new Rng(7);
  const points: VelocityPoint[] = t.vLosKms.map((v, y) => {
    const e = ERROR_CENTRE_KMS + ERROR_PER_ARCSEC * Math.abs(y - t.centreRow) * t.arcsecPerPixel;
    return { bin: y, rowStart: y, rowEnd: y, yCentre: y, vLos: v + e * rng.normal(), vLosErr: e, flags: 0 };
  });
  const velocities: VelocityTable = {
    points,
    perLine: [],
    barycentric: { correctionKms: 0, exposures: [], spreadKms: 0, frame: 'barycentric' },
    convention: 'optical',
  };
  const rows = t.vLosKms.length;
  const lines: LineTable = {
    bins: points.map((p) => ({ rowStart: p.rowStart, rowEnd: p.rowEnd, yCentre: p.yCentre })),
    measurements: [],
    fits: [],
    continuumProfile: Float64Array.from({ length: rows }, (_, y) => Math.exp(-Math.abs(y - t.centreRow) * t.arcsecPerPixel / t.continuum.scaleArcsec)),
    sky: { skyRegions: [], galaxyRegion: [0, rows - 1], skySpectrum: new Float32Array(0), residualNormRms: new Float32Array(0), slitFactor: new Float32Array(rows).fill(1), emissionProfile: new Float64Array(rows) },
  };
  const settings = {
    arcsecPerPixel: t.arcsecPerPixel,
    distanceMpc: t.distanceMpc,
    inclinationDeg: t.inclinationDeg,
    majorAxisPaDeg: t.majorAxisPaDeg,
    slitPaDeg: t.slitPaDeg,
  };
  let best = Infinity;
  let peak = 0;
  let curve = buildRotationCurve(velocities, lines, settings).product;
  for (let i = 0; i < REPEATS; i++) {
    const t0 = performance.now();
    curve = buildRotationCurve(velocities, lines, settings).product;
    best = Math.min(best, performance.now() - t0);
    peak = Math.max(peak, process.memoryUsage().rss / 2 ** 20);
  }
  return [
    {
      name: `curve: buildRotationCurve, ${rows} rows unbinned`,
      wallMs: best,
      peakRssMb: peak,
      figure: `${curve.points.length} radial bins; centre ${(curve.centreRow - t.centreRow).toFixed(3)} rows, v_sys ${(curve.vSys - t.vSysKms).toFixed(2)} km/s from truth`,
    },
  ];
}
