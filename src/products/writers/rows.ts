/**
 * rows.csv and rows.fits: one line per row bin and emission line, with the line fit and the
 * line-of-sight velocity. Rows and pixels are written 1-based and inclusive in the trimmed raw
 * data section (FITS convention); offsets along the slit from the kinematic centre (arcsec,
 * positive towards increasing row); velocities km/s in the curve's convention and frame.
 */
import { Header } from '../../fits/header.js';
import type { TableHduSpec } from '../../fits/write-types.js';
import type { Orientation } from '../frame.js';
import { LINE_FLAGS, type LineTable } from '../lines.js';
import type { RotationCurve, VelocityTable } from '../curve.js';
import { csvText, fixed } from './text-table.js';

/** From internal pixels to the 1-based pixels of the trimmed raw data section. */
export interface RowMapping {
  /** Internal row (along the slit) -> 1-based pixel along the slit in the trimmed raw section. */
  toFileRow(internalRow: number): number;
  /** Internal x (along the dispersion, fractional) -> 1-based pixel along the dispersion in the raw section. */
  toFileColumn(internalX: number): number;
}

/**
 * The mapping of a frame with this orientation and internal width (frame.ts, Orientation): the slit
 * axis keeps its sense (internal y is the raw pixel along the slit), the dispersion axis is
 * mirrored when flipX.
 */
export function rowMapping(orientation: Orientation, internalWidth: number): RowMapping {
  return {
    toFileRow: (y) => y + 1,
    toFileColumn: (x) => (orientation.flipX ? internalWidth - 1 - x : x) + 1,
  };
}

/** Bit meanings of the flags column, for the file headers (LINE_FLAGS in products/lines.ts). */
function flagLegend(): string {
  return Object.entries(LINE_FLAGS).map(([name, bit]) => `${bit} ${name}`).join(', ');
}

interface RowColumn {
  name: string;
  unit: string;
  format: 'J' | 'D' | 'A';
  /** Decimals in CSV (numbers only). */
  digits: number;
}

const COLUMNS: RowColumn[] = [
  { name: 'row_start', unit: 'pixel', format: 'J', digits: 0 },
  { name: 'row_end', unit: 'pixel', format: 'J', digits: 0 },
  { name: 'offset_arcsec', unit: 'arcsec', format: 'D', digits: 3 },
  { name: 'line', unit: '', format: 'A', digits: 0 },
  { name: 'center_px', unit: 'pixel', format: 'D', digits: 4 },
  { name: 'wavelength', unit: 'Angstrom', format: 'D', digits: 4 },
  { name: 'wavelength_err', unit: 'Angstrom', format: 'D', digits: 4 },
  { name: 'sigma_kms', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'flux', unit: 'electron', format: 'D', digits: 1 },
  { name: 'snr', unit: '', format: 'D', digits: 2 },
  { name: 'v_los', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'v_los_err', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'flags', unit: '', format: 'J', digits: 0 },
  { name: 'group', unit: '', format: 'A', digits: 0 },
  { name: 'rest_wavelength', unit: 'Angstrom', format: 'D', digits: 4 },
  { name: 'sigma_kms_err', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'flux_err', unit: 'electron', format: 'D', digits: 1 },
  { name: 'chi2_reduced', unit: '', format: 'D', digits: 3 },
  { name: 'v_bin', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'v_bin_err', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'r_arcsec', unit: 'arcsec', format: 'D', digits: 3 },
  { name: 'v_rot', unit: 'km/s', format: 'D', digits: 2 },
  { name: 'in_fold', unit: '', format: 'J', digits: 0 },
];

/** The table as columns of numbers and strings, one entry per measurement. */
function rowValues(lines: LineTable, velocities: VelocityTable, curve: RotationCurve, map: RowMapping): Map<string, (number | string)[]> {
  const cols = new Map<string, (number | string)[]>(COLUMNS.map((c) => [c.name, []]));
  const put = (name: string, v: number | string): void => void cols.get(name)!.push(v);
  const binPoint = new Map(velocities.points.map((p) => [p.bin, p]));
  const pvPoint = new Map(curve.pv.map((p) => [p.bin, p]));
  const scale = curve.geometry.arcsecPerPixel;
  lines.measurements.forEach((m, k) => {
    const bin = lines.bins[m.bin]!;
    const a = map.toFileRow(bin.rowStart);
    const b = map.toFileRow(bin.rowEnd);
    const vel = velocities.perLine[k];
    const point = binPoint.get(m.bin);
    const pv = pvPoint.get(m.bin);
    put('row_start', Math.min(a, b));
    put('row_end', Math.max(a, b));
    put('offset_arcsec', (bin.yCentre - curve.centreRow) * scale);
    put('line', m.line);
    put('center_px', map.toFileColumn(m.centerPx));
    put('wavelength', m.wavelength);
    put('wavelength_err', m.wavelengthErr);
    put('sigma_kms', m.sigmaKms);
    put('flux', m.flux);
    put('snr', m.snr);
    put('v_los', vel?.vLos ?? NaN);
    put('v_los_err', vel?.vLosErr ?? NaN);
    put('flags', m.flags);
    put('group', m.group);
    put('rest_wavelength', m.restAir);
    put('sigma_kms_err', m.sigmaKmsErr);
    put('flux_err', m.fluxErr);
    put('chi2_reduced', m.chi2Reduced);
    put('v_bin', point?.vLos ?? NaN);
    put('v_bin_err', point?.vLosErr ?? NaN);
    put('r_arcsec', pv?.radiusArcsec ?? NaN);
    put('v_rot', pv?.vRot ?? NaN);
    put('in_fold', pv !== undefined && pv.exclusion === null ? 1 : 0);
  });
  return cols;
}

function describe(curve: RotationCurve): string[] {
  return [
    'whorl per-row line measurements: one line per row bin and emission line',
    'row_start,row_end: first and last pixel along the slit in the bin, 1-based inclusive, trimmed data section; center_px: 1-based pixel along the dispersion, same section',
    `offset_arcsec: along the slit from the kinematic centre (row ${fixed(curve.centreRow + 1, 2)}), positive towards increasing row`,
    `wavelengths: air; velocities: ${curve.convention} convention, ${curve.velocityFrame}; v_bin: error-weighted mean of the bin's lines; r_arcsec, v_rot: the bin in the disk plane; in_fold: 1 when the bin enters the folded curve`,
    `flags (sum of bits): ${flagLegend()}`,
  ];
}

export function rowsCsv(lines: LineTable, velocities: VelocityTable, curve: RotationCurve, map: RowMapping): string {
  const values = rowValues(lines, velocities, curve, map);
  return csvText(
    describe(curve),
    COLUMNS.map((c) => ({
      name: c.name,
      unit: c.unit,
      cells: values.get(c.name)!.map((v) => (typeof v === 'string' ? v : fixed(v, c.digits))),
    })),
  );
}

/** rows.fits: a ROWS binary table with the same columns and TUNITn units; the flag bits in FLAGBITn cards. */
export function rowsTableHdu(lines: LineTable, velocities: VelocityTable, curve: RotationCurve, map: RowMapping): TableHduSpec {
  const values = rowValues(lines, velocities, curve, map);
  const header = new Header()
    .set('VELCONV', curve.convention, 'velocity convention (optical: cz)')
    .set('SPECSYS', curve.velocityFrame === 'barycentric' ? 'BARYCENT' : 'HELIOCEN', 'velocity frame (WCS Paper III)')
    .set('CENTROW', curve.centreRow + 1, '[pixel] kinematic centre behind offset_arcsec, 1-based');
  for (const [name, bit] of Object.entries(LINE_FLAGS)) header.set(`FLAGBIT${Math.log2(bit)}`, name, `${bit} in the flags column`);
  header.comment('Rows and pixels 1-based inclusive in the trimmed raw data section; wavelengths in air.');
  const spec: TableHduSpec = {
    kind: 'bintable',
    name: 'ROWS',
    header,
    columns: COLUMNS.map((c) => {
      const v = values.get(c.name)!;
      const unit = c.unit !== '' ? { unit: c.unit } : {};
      return c.format === 'A' ? { name: c.name, format: 'A' as const, values: v as string[] } : { name: c.name, format: c.format, ...unit, values: Float64Array.from(v as number[]) };
    }),
  };
  return spec;
}
