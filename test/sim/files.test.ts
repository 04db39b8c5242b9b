import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { loadRawFrame } from '../../src/fits/raw-frame.js';
import { loadManifest } from '../../src/run/manifest/resolve.js';
import { simFrameToRaw, writeSimulatedRun, type RunTruth } from '../../src/sim/index.js';
import { standardRun } from './shared-run.js';

const run = standardRun();
const dir = mkdtempSync(join(tmpdir(), 'whorl-sim-'));
writeSimulatedRun(run, dir);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const FITSVERIFY = '/usr/bin/fitsverify';
const PYTHON = '/usr/bin/python3';
const hasAstropy = existsSync(PYTHON) && spawnSync(PYTHON, ['-c', 'import astropy, numpy'], { encoding: 'utf8' }).status === 0;
if (!existsSync(FITSVERIFY)) console.warn('SKIPPED: fitsverify checks of the simulated frames (/usr/bin/fitsverify not installed)');
if (!hasAstropy) console.warn('SKIPPED: astropy read-back of the simulated frames (/usr/bin/python3 with astropy not installed)');

describe('writeSimulatedRun', () => {
  it('writes raw/*.fits, expected/*.fits, truth.json and run.yaml, and no temporary files', () => {
    expect(readdirSync(join(dir, 'raw')).sort()).toEqual(run.frames.map((f) => f.name.slice(4)).sort());
    expect(readdirSync(join(dir, 'expected'))).toHaveLength(run.frames.length);
    expect(readdirSync(dir).sort()).toEqual(['expected', 'raw', 'run.yaml', 'truth.json']);
    const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as RunTruth;
    expect(truth).toEqual(JSON.parse(JSON.stringify(run.truth)));
  });

  it('reads back with whorl\'s FITS reader exactly as simFrameToRaw gives the frame', () => {
    for (const f of [run.frames[0]!, run.frames[9]!]) {
      const disk = loadRawFrame(join(dir, f.name));
      const mem = simFrameToRaw(f);
      expect([disk.width, disk.height]).toEqual([mem.width, mem.height]);
      expect(disk.data).toEqual(mem.data);
      for (const c of mem.header.cards) expect(disk.header.get(c.key), c.key).toEqual(c.value);
    }
  });

  it('writes a run.yaml with the manifest keys, approximate (never exact) wavelength and dispersion', () => {
    const m = parse(readFileSync(join(dir, 'run.yaml'), 'utf8'));
    expect(m.output).toBe('products');
    const red = m.setups.red;
    for (const key of ['dispersion_axis', 'arcsec_per_pixel', 'approx_wavelength', 'approx_dispersion', 'lamps', 'gain', 'read_noise', 'bias', 'flat', 'arc']) expect(red).toHaveProperty(key);
    const st = run.truth.setups['red']!;
    const central = st.dispersion.coeffs[0]! - 0.5 * st.dispersion.coeffs[2]!;
    const meanDispersion = (2 * st.dispersion.coeffs[1]!) / (st.internalWidth - 1);
    expect(red.approx_wavelength).not.toBe(central);
    expect(Math.abs(red.approx_wavelength - central)).toBeLessThan(20);
    expect(red.approx_dispersion).not.toBe(meanDispersion);
    expect(Math.abs(red.approx_dispersion / meanDispersion - 1)).toBeLessThan(0.05);
    const t = m.targets[0];
    for (const key of ['name', 'setup', 'frames', 'lines', 'distance_mpc', 'inclination_deg', 'major_axis_pa_deg', 'slit_pa_deg']) expect(t).toHaveProperty(key);
  });

  it('writes a run.yaml that the runner manifest loader accepts, each list resolving to the right frames', () => {
    const resolved = loadManifest(join(dir, 'run.yaml'));
    const red = resolved.setups['red']!;
    const names = (paths: string[]) => paths.map((p) => p.slice(dir.length + 1)).sort();
    expect(names(red.bias)).toEqual(run.frames.filter((f) => f.kind === 'bias').map((f) => f.name));
    expect(names(red.flat)).toEqual(run.frames.filter((f) => f.kind === 'flat').map((f) => f.name));
    expect(names(red.arc)).toEqual(run.frames.filter((f) => f.kind === 'arc').map((f) => f.name));
    expect(names(resolved.targets[0]!.frames)).toEqual(run.truth.targets[0]!.exposures.map((e) => e.frame));
  });

  it.runIf(existsSync(FITSVERIFY))('passes fitsverify (HEASARC) for every raw and expected file', () => {
    const files = [...run.frames.map((f) => join(dir, f.name)), ...readdirSync(join(dir, 'expected')).map((n) => join(dir, 'expected', n))];
    const result = spawnSync(FITSVERIFY, ['-q', '-e', ...files], { encoding: 'utf8' });
    expect(result.stdout.split('\n').filter((l) => l.startsWith('verification OK'))).toHaveLength(files.length);
  });

  it.runIf(hasAstropy)('reads back in astropy with the same unsigned values, header values and expected electrons', () => {
    const sci = run.frames.find((f) => f.kind === 'science')!;
    const script = [
      'import json, sys, numpy as np',
      'from astropy.io import fits',
      'h = fits.open(sys.argv[1])[0]',
      'e = fits.getdata(sys.argv[2])',
      'd = h.data',
      "print(json.dumps({'dtype': str(d.dtype), 'shape': list(d.shape), 'sum': int(d.astype(np.int64).sum()), 'first': [int(v) for v in d[0, :5]], 'max': int(d.max()),",
      "  'gain': h.header['GAIN'], 'datasec': h.header['DATASEC'], 'dateobs': h.header['DATE-OBS'], 'esum': float(e.astype(np.float64).sum()), 'eshape': list(e.shape)}))",
    ].join('\n');
    const out = JSON.parse(execFileSync(PYTHON, ['-c', script, join(dir, sci.name), join(dir, 'expected', sci.name.slice(4))], { encoding: 'utf8' }));
    let sum = 0;
    let max = 0;
    for (const v of sci.adu) {
      sum += v;
      max = Math.max(max, v);
    }
    expect(out.dtype).toBe('uint16');
    expect(out.shape).toEqual([sci.height, sci.width]);
    expect(out.sum).toBe(sum);
    expect(out.max).toBe(max);
    expect(out.first).toEqual(Array.from(sci.adu.slice(0, 5)));
    expect([out.gain, out.datasec, out.dateobs]).toEqual([sci.header.getNumber('GAIN'), sci.header.getString('DATASEC'), sci.header.getString('DATE-OBS')]);
    const e = run.expected!.get(sci.name)!;
    expect(out.eshape).toEqual([300, 1024]);
    expect(Math.abs(out.esum / e.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-6);
  });
});
