/** A small rotation curve with its line table, for the formatter tests (seeded synthetic disk). */
import { LINE_FLAGS, type LineMeasurement, type LineTable } from '../../../src/products/lines.js';
import type { RotationCurve, VelocityTable } from '../../../src/products/curve.js';
import { buildRotationCurve } from '../../../src/stages/geometry/index.js';
import { risingFlat, synthLines, synthVelocities } from '../../stages/geometry/synthetic.js';

export interface Sample {
  lines: LineTable;
  velocities: VelocityTable;
  curve: RotationCurve;
}

/** 60 rows in bins of 2, two lines per bin (Halpha and NII6583), slit 20 deg from the major axis. */
export function sampleCurve(): Sample {
  const rows = 60;
  const truth = { centreRow: 30.3, vSysKms: 4100, inclinationDeg: 55, slitToMajorDeg: 20, arcsecPerPixel: 0.5, curve: risingFlat(160, 3) };
  const velocities = synthVelocities(truth, { rows, seed: 4, error: (s) => 3 + 0.1 * Math.abs(s), binRows: 2 });
  const lines = synthLines(velocities, rows, 30);
  const measurements: LineMeasurement[] = [];
  const perLine: VelocityTable['perLine'] = [];
  for (const p of velocities.points) {
    for (const [line, rest] of [['Halpha', 6562.8], ['NII6583', 6583.454]] as const) {
      const wavelength = rest * (1 + p.vLos / 299792.458);
      measurements.push({
        bin: p.bin, line, group: 'Halpha+NII', restAir: rest, centerPx: 100 + p.bin * 0.1, wavelength, wavelengthErr: 0.05,
        sigmaObsAngstrom: 1.2, sigmaInstrAngstrom: 1.0, sigmaKms: 25, sigmaKmsErr: 2, flux: 1000 + p.bin, fluxErr: 30, snr: 33.3, chi2Reduced: 1.05,
        flags: p.bin === 3 ? LINE_FLAGS.lowSnr | LINE_FLAGS.blended : 0,
      });
      perLine.push({ vLos: p.vLos, vLosErr: p.vLosErr * Math.SQRT2 });
    }
  }
  const withLines: LineTable = { ...lines, measurements };
  const table: VelocityTable = { ...velocities, perLine };
  const curve = buildRotationCurve(table, withLines, { arcsecPerPixel: 0.5, distanceMpc: 18, inclinationDeg: 55, inclinationErrDeg: 2, majorAxisPaDeg: 40, slitPaDeg: 60, seeingFwhmArcsec: 1 }).product;
  return { lines: withLines, velocities: table, curve };
}

/** Parse CSV text with '#' comments: [comment lines, header names, rows of cells]. */
export function parseCsv(text: string): { comments: string[]; names: string[]; rows: string[][] } {
  const lines = text.trimEnd().split('\n');
  const comments = lines.filter((l) => l.startsWith('#'));
  const data = lines.filter((l) => !l.startsWith('#'));
  return { comments, names: data[0]!.split(','), rows: data.slice(1).map((l) => l.split(',')) };
}
