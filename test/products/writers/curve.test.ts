import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { writeFits } from '../../../src/fits/index.js';
import { curveCsv, curveJson, curveTableHdu } from '../../../src/products/writers/index.js';
import { astropyJson, fitsverify, hasAstropy, hasFitsverify } from '../../fits/outside-tools.js';
import { parseCsv, sampleCurve } from './sample-curve.js';

const { curve } = sampleCurve();
const REQUIRED = ['r_arcsec', 'r_kpc', 'v_rot', 'err_stat', 'err_sys', 'err_total', 'n_approaching', 'n_receding'];

describe('curve.csv', () => {
  const text = curveCsv(curve);
  const csv = parseCsv(text);

  test('starts with the spine columns in order, then the sides, error parts and flags; one line per radial bin', () => {
    expect(csv.names.slice(0, REQUIRED.length)).toEqual(REQUIRED);
    for (const name of ['v_approaching', 'v_receding', 'err_asymmetry', 'err_inclination', 'one_sided']) expect(csv.names).toContain(name);
    expect(csv.rows).toHaveLength(curve.points.length);
    expect(csv.rows.every((r) => r.length === csv.names.length)).toBe(true);
  });

  test('a # units line names the unit of every column; the comments state v_sys, geometry and the asymmetry convention', () => {
    const units = csv.comments.find((c) => c.startsWith('# units: '))!;
    const pairs = new Map(units.slice(9).split(', ').map((p) => p.split('=') as [string, string]));
    expect([...pairs.keys()]).toEqual(csv.names);
    expect(pairs.get('v_rot')).toBe('km/s');
    expect(pairs.get('r_kpc')).toBe('kpc');
    const all = csv.comments.join('\n');
    expect(all).toMatch(/v_sys 4\d\d\d\.\d\d \+- \d+\.\d\d km\/s/);
    expect(all).toMatch(/inclination 55\.00 \+- 2\.00 deg/);
    expect(all).toMatch(/half the difference of the sides at the same radius \(common practice/);
    expect(all).toMatch(/optical convention, barycentric/);
  });

  test('values read back to the printed precision, flags as 0/1, and the same curve gives the same bytes', () => {
    const col = (n: string) => csv.names.indexOf(n);
    curve.points.forEach((p, k) => {
      expect(Number(csv.rows[k]![col('v_rot')])).toBeCloseTo(p.vRot, 2);
      expect(Number(csv.rows[k]![col('err_total')])).toBeCloseTo(p.errTotal, 2);
      expect(csv.rows[k]![col('one_sided')]).toBe(p.oneSided ? '1' : '0');
    });
    expect(text).not.toMatch(/NaN|undefined|Infinity/);
    expect(curveCsv(sampleCurve().curve)).toBe(text);
  });

  test.skipIf(!hasAstropy)('astropy reads it as a table with the same columns (python3-astropy, ascii.read with # comments)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'whorl-curve-'));
    const path = join(dir, 'curve.csv');
    writeFileSync(path, text);
    const got = astropyJson<{ names: string[]; v: number[] }>(
      "import sys, json\nfrom astropy.io import ascii\nt = ascii.read(sys.argv[1], format='csv', comment='#')\nprint(json.dumps({'names': t.colnames, 'v': [float(x) for x in t['v_rot']]}))",
      path,
    );
    expect(got.names).toEqual(csv.names);
    got.v.forEach((v, k) => expect(v).toBeCloseTo(curve.points[k]!.vRot, 2));
  });
});

describe('curve.json', () => {
  test('holds v_sys with its error, the geometry, a units entry for every column, and null for missing numbers', () => {
    const json = curveJson(curve, { target: 'Meridian Wheel' }) as Record<string, any>;
    const round = JSON.parse(JSON.stringify(json));
    expect(round.target).toBe('Meridian Wheel');
    expect(round.v_sys).toBeCloseTo(curve.vSys, 10);
    expect(round.v_sys_err).toBeGreaterThan(0);
    expect(round.geometry).toMatchObject({ inclination: 55, inclination_err: 2, major_axis_pa: 40, slit_pa: 60, distance: 18 });
    for (const name of Object.keys(round.points[0])) expect(round.units[name]).toBeDefined();
    expect(round.units.v_sys).toBe('km/s');
    const oneSided = round.points.find((p: any) => p.one_sided === true);
    if (oneSided) expect(oneSided.v_approaching === null || oneSided.v_receding === null).toBe(true);
  });
});

describe('curve.fits', () => {
  const bytes = writeFits([curveTableHdu(curve)]);
  const dir = mkdtempSync(join(tmpdir(), 'whorl-curve-'));
  const path = join(dir, 'curve.fits');
  writeFileSync(path, bytes);

  test.skipIf(!hasAstropy)('astropy reads the CURVE table: TUNITn units, values, and geometry, distance and v_sys in the header (python3-astropy)', () => {
    const got = astropyJson<{ units: Record<string, string>; v: number[]; hdr: Record<string, number | string>; names: string[] }>(
      [
        'import sys, json',
        'from astropy.io import fits',
        "h = fits.open(sys.argv[1])['CURVE']",
        "print(json.dumps({'names': h.columns.names, 'units': {c.name: c.unit for c in h.columns if c.unit}, 'v': [float(x) for x in h.data['v_rot']],",
        "  'hdr': {k: h.header[k] for k in ['VSYS', 'VSYSERR', 'INCLIN', 'INCLERR', 'MAJPA', 'SLITPA', 'DISTMPC', 'SPECSYS', 'CENTROW']}}))",
      ].join('\n'),
      path,
    );
    expect(got.names.slice(0, REQUIRED.length)).toEqual(REQUIRED);
    expect(got.units).toMatchObject({ r_arcsec: 'arcsec', r_kpc: 'kpc', v_rot: 'km/s', err_total: 'km/s' });
    got.v.forEach((v, k) => expect(v).toBe(curve.points[k]!.vRot));
    expect(got.hdr).toMatchObject({ INCLIN: 55, INCLERR: 2, MAJPA: 40, SLITPA: 60, DISTMPC: 18, SPECSYS: 'BARYCENT' });
    expect(got.hdr.VSYS).toBeCloseTo(curve.vSys, 8);
    expect(got.hdr.CENTROW).toBeCloseTo(curve.centreRow + 1, 8);
  });

  test.skipIf(!hasFitsverify)('passes fitsverify without errors or warnings', () => {
    const r = fitsverify(path);
    expect(r.errors, r.text).toBe(0);
    expect(r.warnings, r.text).toBe(0);
  });
});
