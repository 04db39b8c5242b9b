import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { lightCsv, modellerText } from '../../../src/products/writers/index.js';
import { PYTHON } from '../../fits/outside-tools.js';
import { parseCsv, sampleCurve } from './sample-curve.js';

const { curve } = sampleCurve();
const hasNumpy = existsSync(PYTHON) && spawnSync(PYTHON, ['-c', 'import numpy'], { encoding: 'utf8' }).status === 0;
if (!hasNumpy) console.warn('SKIPPED: python3-numpy not installed at /usr/bin/python3; modeller.txt not read with numpy.loadtxt');

describe('light.csv', () => {
  test('one line per pixel of offset, in-plane radii, both sides and their mean, units line', () => {
    const csv = parseCsv(lightCsv(curve));
    expect(csv.names).toEqual(['r_arcsec', 'r_kpc', 'flux', 'flux_approaching', 'flux_receding', 'one_sided']);
    expect(csv.rows).toHaveLength(curve.light.length);
    expect(csv.comments.some((c) => c.startsWith('# units: r_arcsec=arcsec, r_kpc=kpc, flux=electron/pixel'))).toBe(true);
    const two = csv.rows.filter((r) => r[5] === '0');
    for (const r of two) expect(Number(r[2])).toBeCloseTo((Number(r[3]) + Number(r[4])) / 2, 2);
  });
});

describe('modeller.txt', () => {
  const text = modellerText(curve, { target: 'Meridian Wheel' });

  test('# lines state distance, inclination, v_sys and conventions; then radius (kpc), V and error per line', () => {
    const comments = text.split('\n').filter((l) => l.startsWith('#')).join('\n');
    expect(comments).toContain('Meridian Wheel');
    expect(comments).toMatch(/# distance 18\.000 Mpc/);
    expect(comments).toMatch(/# inclination 55\.00 \+- 2\.00 deg/);
    expect(comments).toMatch(/# v_sys \d+\.\d\d \+- \d+\.\d\d km\/s \(optical cz, barycentric\)/);
    expect(comments).toMatch(/# columns: radius_kpc {2}v_kms {2}err_kms/);
    const data = text.trimEnd().split('\n').filter((l) => !l.startsWith('#'));
    expect(data).toHaveLength(curve.points.length);
    expect(data.every((l) => l.trim().split(/\s+/).length === 3)).toBe(true);
  });

  test.skipIf(!hasNumpy)('numpy.loadtxt reads three columns matching the curve (python3-numpy)', () => {
    const r = spawnSync(PYTHON, ['-c', 'import sys, json, numpy as np\nd = np.loadtxt(sys.stdin)\nprint(json.dumps(d.tolist()))'], { input: text, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const rows = JSON.parse(r.stdout) as number[][];
    rows.forEach((row, k) => {
      expect(row[0]).toBeCloseTo(curve.points[k]!.rKpc, 4);
      expect(row[1]).toBeCloseTo(curve.points[k]!.vRot, 2);
      expect(row[2]).toBeCloseTo(curve.points[k]!.errTotal, 2);
    });
  });
});
