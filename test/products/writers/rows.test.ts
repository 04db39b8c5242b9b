import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { writeFits } from '../../../src/fits/index.js';
import { LINE_FLAGS } from '../../../src/products/lines.js';
import { rowMapping, rowsCsv, rowsTableHdu } from '../../../src/products/writers/index.js';
import { astropyJson, fitsverify, hasAstropy, hasFitsverify } from '../../fits/outside-tools.js';
import { parseCsv, sampleCurve } from './sample-curve.js';

const SPINE = ['row_start', 'row_end', 'offset_arcsec', 'line', 'center_px', 'wavelength', 'wavelength_err', 'sigma_kms', 'flux', 'snr', 'v_los', 'v_los_err', 'flags'];
const sample = sampleCurve();
const INTERNAL_WIDTH = 1024;

describe('row mapping', () => {
  test('rows keep their sense and become 1-based; the dispersion pixel mirrors when the frame was flipped (frame.ts Orientation)', () => {
    const plain = rowMapping({ transpose: false, flipX: false }, INTERNAL_WIDTH);
    const flipped = rowMapping({ transpose: true, flipX: true }, INTERNAL_WIDTH);
    expect([plain.toFileRow(0), plain.toFileRow(59), plain.toFileColumn(0), plain.toFileColumn(10.25)]).toEqual([1, 60, 1, 11.25]);
    expect([flipped.toFileRow(0), flipped.toFileColumn(0), flipped.toFileColumn(1023)]).toEqual([1, 1024, 1]);
  });
});

describe('rows.csv', () => {
  const map = rowMapping({ transpose: false, flipX: true }, INTERNAL_WIDTH);
  const text = rowsCsv(sample.lines, sample.velocities, sample.curve, map);
  const csv = parseCsv(text);
  const col = (n: string) => csv.names.indexOf(n);

  test('has the spine columns first and in order, one line per bin and line, manifest line names', () => {
    expect(csv.names.slice(0, SPINE.length)).toEqual(SPINE);
    expect(csv.rows).toHaveLength(sample.lines.measurements.length);
    expect(new Set(csv.rows.map((r) => r[col('line')]))).toEqual(new Set(['Halpha', 'NII6583']));
  });

  test('row_start/row_end are 1-based inclusive; offsets are from the kinematic centre; v_los is filled', () => {
    sample.lines.measurements.forEach((m, k) => {
      const bin = sample.lines.bins[m.bin]!;
      const r = csv.rows[k]!;
      expect([Number(r[col('row_start')]), Number(r[col('row_end')])]).toEqual([bin.rowStart + 1, bin.rowEnd + 1]);
      expect(Number(r[col('offset_arcsec')])).toBeCloseTo((bin.yCentre - sample.curve.centreRow) * 0.5, 3);
      expect(Number(r[col('center_px')])).toBeCloseTo(INTERNAL_WIDTH - m.centerPx, 4);
      expect(Number(r[col('v_los')])).toBeCloseTo(sample.velocities.perLine[k]!.vLos, 2);
    });
  });

  test('the header comments give every flag bit of LINE_FLAGS and the units of every column', () => {
    const all = csv.comments.join('\n');
    for (const [name, bit] of Object.entries(LINE_FLAGS)) expect(all).toContain(`${bit} ${name}`);
    const units = csv.comments.find((c) => c.startsWith('# units: '))!;
    expect(units.slice(9).split(', ').map((p) => p.split('=')[0])).toEqual(csv.names);
    expect(units).toContain('wavelength=Angstrom');
    expect(csv.rows.filter((r) => r[col('flags')] === String(LINE_FLAGS.lowSnr | LINE_FLAGS.blended))).toHaveLength(2);
  });
});

describe('rows.fits', () => {
  const map = rowMapping({ transpose: false, flipX: false }, INTERNAL_WIDTH);
  const dir = mkdtempSync(join(tmpdir(), 'whorl-rows-'));
  const path = join(dir, 'rows.fits');
  writeFileSync(path, writeFits([rowsTableHdu(sample.lines, sample.velocities, sample.curve, map)]));

  test.skipIf(!hasAstropy)('astropy reads the ROWS table with the spine columns, TUNITn and the flag bits in the header (python3-astropy)', () => {
    const got = astropyJson<{ names: string[]; units: Record<string, string>; line: string[]; rs: number[]; flagbits: string[] }>(
      [
        'import sys, json',
        'from astropy.io import fits',
        "h = fits.open(sys.argv[1])['ROWS']",
        "print(json.dumps({'names': h.columns.names, 'units': {c.name: c.unit for c in h.columns if c.unit}, 'line': [str(x) for x in h.data['line']],",
        "  'rs': [int(x) for x in h.data['row_start']], 'flagbits': [h.header[k] for k in h.header if k.startswith('FLAGBIT')]}))",
      ].join('\n'),
      path,
    );
    expect(got.names.slice(0, SPINE.length)).toEqual(SPINE);
    expect(got.units).toMatchObject({ row_start: 'pixel', offset_arcsec: 'arcsec', wavelength: 'Angstrom', v_los: 'km/s' });
    expect(got.line.slice(0, 2)).toEqual(['Halpha', 'NII6583']);
    expect(got.rs[0]).toBe(sample.lines.bins[0]!.rowStart + 1);
    expect(got.flagbits).toEqual(Object.keys(LINE_FLAGS));
  });

  test.skipIf(!hasFitsverify)('passes fitsverify without errors or warnings', () => {
    const r = fitsverify(path);
    expect(r.errors, r.text).toBe(0);
    expect(r.warnings, r.text).toBe(0);
  });
});
