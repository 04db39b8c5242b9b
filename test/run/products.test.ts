import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadManifest } from '../../src/run/manifest/resolve.js';
import { reduceRun } from '../../src/run/runner.js';
import type { RunTruth } from '../../src/sim/truth.js';
import { astropyJson, fitsverify, hasAstropy, hasFitsverify } from '../fits/outside-tools.js';
import { copyOfSimulatedRun, listFiles } from './simulated-run.js';

let dir: string;
let out: string;

beforeAll(async () => {
  dir = copyOfSimulatedRun({ size: 'small', targets: 1, seed: 1 }, 'layout');
  const run = loadManifest(join(dir, 'run.yaml'));
  out = run.outputDir;
  await reduceRun(run, { jobs: 1 });
});

/** Column names of a whorl CSV (comment lines start with '#'). */
function csvColumns(path: string): string[] {
  return readFileSync(path, 'utf8').split('\n').find((l) => l !== '' && !l.startsWith('#'))!.split(',');
}

describe('products of a simulated small run (issue 3 layout)', () => {
  it('has every file of the layout', () => {
    const files = listFiles(out, (f) => f.startsWith('.whorl'));
    const t = 'Halden-Spiral';
    expect(files).toEqual(
      expect.arrayContaining([
        'calib/red/bias.fits', 'calib/red/flat.fits', 'calib/red/solution.json', 'calib/red/arc-lines.csv',
        `${t}/spectrum.fits`, `${t}/rows.csv`, `${t}/rows.fits`, `${t}/curve.csv`, `${t}/curve.json`, `${t}/curve.fits`,
        `${t}/light.csv`, `${t}/modeller.txt`, `${t}/provenance.json`, `${t}/report.html`,
        'summary.json', 'provenance.json', 'timings.json', 'index.html',
      ]),
    );
  });

  it('rows.csv and curve.csv carry at least the columns of issue 3', () => {
    expect(csvColumns(join(out, 'Halden-Spiral/rows.csv'))).toEqual(
      expect.arrayContaining(['row_start', 'row_end', 'offset_arcsec', 'line', 'center_px', 'wavelength', 'wavelength_err', 'sigma_kms', 'flux', 'snr', 'v_los', 'v_los_err', 'flags']),
    );
    expect(csvColumns(join(out, 'Halden-Spiral/curve.csv'))).toEqual(
      expect.arrayContaining(['r_arcsec', 'r_kpc', 'v_rot', 'err_stat', 'err_sys', 'err_total', 'n_approaching', 'n_receding']),
    );
  });

  it('summary.json holds the key numbers, and v_sys is near the simulated truth', () => {
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')) as { targets: { status: string; numbers: Record<string, number> }[] };
    const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as RunTruth;
    const n = summary.targets[0]!.numbers;
    expect(summary.targets[0]!.status).toBe('ok');
    // Loose bar: the geometry stage's own tests check accuracy; this checks the numbers reach the summary.
    expect(Math.abs(n['vSysKms']! - truth.targets[0]!.vSysKms)).toBeLessThan(10);
    expect(n['vOuterKms']).toBeGreaterThan(50);
    expect(n['curvePoints']).toBeGreaterThan(3);
  });

  it.skipIf(!hasFitsverify)('every FITS product passes fitsverify', () => {
    for (const f of listFiles(out).filter((f) => f.endsWith('.fits'))) {
      const v = fitsverify(join(out, f));
      expect(v.errors, `${f}: ${v.text}`).toBe(0);
    }
  });

  it.skipIf(!hasAstropy)('spectrum.fits covers the trimmed data section of the raw frames (astropy)', () => {
    const shapes = astropyJson<{ raw: number[]; datasec: string; ext: Record<string, number[]> }>(
      `import sys, json
from astropy.io import fits
raw = fits.open(sys.argv[1].replace('products/Halden-Spiral/spectrum.fits', 'raw/sci_001.fits'))[0]
with fits.open(sys.argv[1]) as h:
    print(json.dumps({'raw': list(raw.data.shape), 'datasec': raw.header['DATASEC'], 'ext': {e.name: list(e.data.shape) for e in h[1:]}}))`,
      join(out, 'Halden-Spiral/spectrum.fits'),
    );
    const m = /^\[(\d+):(\d+),(\d+):(\d+)\]$/.exec(shapes.datasec)!;
    const trimmed = [Number(m[4]) - Number(m[3]) + 1, Number(m[2]) - Number(m[1]) + 1];
    for (const name of ['SCI', 'VAR', 'MASK', 'WAVE']) expect(shapes.ext[name], name).toEqual(trimmed);
  });
});

describe('products of the rotated variant (dispersion along raw y, wavelength decreasing with pixel)', () => {
  it.skipIf(!hasAstropy)('writes WAVE in the raw orientation: wavelength falls along the raw y axis, not along x', async () => {
    const rotated = copyOfSimulatedRun({ size: 'small', variant: 'rotated', targets: 1, seed: 1 }, 'rotated');
    const run = loadManifest(join(rotated, 'run.yaml'));
    const r = await reduceRun(run, { jobs: 1 });
    const t = r.summary.targets[0]!;
    expect(t.status, t.reason).toBe('ok');
    const wave = astropyJson<{ shape: number[]; colStart: number; colEnd: number; rowSlope: number; sci: number[] }>(
      `import sys, json
from astropy.io import fits
with fits.open(sys.argv[1]) as h:
    w = h['WAVE'].data
    c = w.shape[1] // 2
    print(json.dumps({'shape': list(w.shape), 'colStart': float(w[0, c]), 'colEnd': float(w[-1, c]), 'rowSlope': float(w[w.shape[0] // 2, -1] - w[w.shape[0] // 2, 0]), 'sci': list(h['SCI'].data.shape)}))`,
      join(run.outputDir, t.folder, 'spectrum.fits'),
    );
    expect(wave.sci).toEqual(wave.shape);
    expect(wave.colStart).toBeGreaterThan(wave.colEnd + 100); // hundreds of Angstrom over the dispersion axis, decreasing
    expect(Math.abs(wave.rowSlope)).toBeLessThan(5); // along the slit only the tilt of the lines
  });
});
