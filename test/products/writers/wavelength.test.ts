import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatArcLinesCsv, formatSolutionJson } from '../../../src/products/writers/wavelength.js';
import type { WavelengthSolution } from '../../../src/products/wavelength.js';

const model = { kind: 'legendre2d' as const, xOrder: 1, yOrder: 0, xMin: 0, xMax: 99, yMin: 0, yMax: 9, coeffs: [6500, 49.5] };
const solution: WavelengthSolution = {
  width: 100,
  height: 10,
  wave: new Float64Array(1000),
  model,
  lsfSigmaPx: { kind: 'legendre2d', xOrder: 0, yOrder: 0, xMin: 0, xMax: 99, yMin: 0, yMax: 9, coeffs: [1.3] },
  flipX: true,
  lines: [
    { wavelength: 6506.5281, element: 'Ne', x: 56.5, y: 4.5, sigmaPx: 1.31, residualAngstrom: 0.002, used: true },
    { wavelength: 6532.8822, element: 'Ne', x: 82.9, y: 4.5, sigmaPx: 1.29, residualAngstrom: -0.3, used: false },
  ],
  rmsAngstrom: 0.002,
  rmsPx: 0.002,
  rmsKms: 0.09,
  identifiedRange: [6506.5281, 6506.5281],
  flexure: { shiftAngstrom: 0.1, shiftErrAngstrom: NaN, shiftKms: 4.6, lines: [{ wavelength: 6363.776, name: 'OI6364', measured: 6363.67, error: 0.01, used: true }] },
};

describe('wavelength solution files', () => {
  it('solution.json holds the model, 1-based line pixels, and null for non-finite numbers', () => {
    const doc = JSON.parse(formatSolutionJson(solution, ['raw/arc_001.fits']));
    expect(doc.model).toEqual(model);
    expect(doc.lines[0].x).toBeCloseTo(57.5, 12);
    expect(doc.lines[0].y).toBeCloseTo(5.5, 12);
    expect(doc.flexure.shiftErrAngstrom).toBeNull();
    expect(doc.linePositions).toEqual({ used: 1, rejected: 1, distinctLines: 1 });
    expect(doc.flipX).toBe(true);
  });

  it('arc-lines.csv has one row per position with residuals in A, px (1 A/px model) and km/s', () => {
    const text = formatArcLinesCsv(solution);
    const rows = text.split('\n').filter((l) => l !== '' && !l.startsWith('#'));
    expect(rows[0]).toBe('wavelength,element,x,y,sigma,residual_A,residual_px,residual_kms,used');
    expect(rows.length).toBe(3);
    const cells = rows[2]!.split(',');
    expect(cells[5]).toBe('-0.30000');
    expect(cells[6]).toBe('-0.3000'); // dispersion of the model: 49.5 A per half-width of 49.5 px = 1 A/px
    expect(Number(cells[7])).toBeCloseTo((-0.3 / 6532.8822) * 299792.458, 3); // c exact (SI)
    expect(cells[8]).toBe('0');
  });

  it('arc-lines.csv reads back with numpy.genfromtxt (Debian python3-numpy)', () => {
    if (!existsSync('/usr/bin/python3')) {
      console.warn('skipped: /usr/bin/python3 (Debian python3-numpy) is not installed');
      return;
    }
    const dir = mkdtempSync(join(tmpdir(), 'whorl-arc-'));
    const file = join(dir, 'arc-lines.csv');
    writeFileSync(file, formatArcLinesCsv(solution));
    const py = `import numpy as np\nf = ${JSON.stringify(file)}\nskip = sum(1 for l in open(f) if l.startswith('#'))\nt = np.genfromtxt(f, delimiter=',', names=True, dtype=None, encoding='utf-8', skip_header=skip)\nprint(len(t), float(t['residual_A'][1]), int(t['used'][0]))`;
    const r = spawnSync('/usr/bin/python3', ['-c', py], { encoding: 'utf8' });
    if (r.status !== 0 && /No module named/.test(r.stderr)) {
      console.warn('skipped: numpy is not installed for /usr/bin/python3');
      return;
    }
    expect(r.stdout.trim()).toBe('2 -0.3 1');
  });
});
