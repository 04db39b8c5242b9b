/**
 * The calibration cache keeps only what the calibration products do not hold: a calibration read
 * back from it (masters from bias.fits and flat.fits, wavelengths from the model) is the computed
 * one bit for bit, and a changed product makes the cache miss.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { unpackFromBytes } from '../../src/run/io/pack.js';
import { loadManifest } from '../../src/run/manifest/resolve.js';
import { cachedCalibration } from '../../src/run/pipeline/calibration-cache.js';
import { calibrateSetup } from '../../src/run/pipeline/setup-stages.js';
import { StageTimer } from '../../src/run/pipeline/timer.js';
import { reduceRun } from '../../src/run/runner.js';
import { copyOfSimulatedRun, isTimedOrState, listFiles, readBytes } from './simulated-run.js';

/** Deep equality with typed arrays compared value by value with Object.is (-0 and NaN included). */
function expectSame(a: unknown, b: unknown, path: string): void {
  if (ArrayBuffer.isView(a)) {
    expect(b?.constructor, path).toBe(a.constructor);
    const x = a as unknown as ArrayLike<number>;
    const y = b as ArrayLike<number>;
    expect(y.length, path).toBe(x.length);
    for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) expect(y[i], `${path}[${i}]`).toBe(x[i]);
    return;
  }
  if (a && typeof a === 'object') {
    expect(Object.keys(b as object).sort(), path).toEqual(Object.keys(a).sort());
    for (const [k, v] of Object.entries(a)) expectSame(v, (b as Record<string, unknown>)[k], `${path}.${k}`);
    return;
  }
  expect(b, path).toEqual(a);
}

const cacheFile = (out: string) => join(out, '.whorl', 'calib', 'red.bin');

/** Set a file's modification time to the nanosecond (utimes takes seconds as a double; touch -d takes them as text). */
function setMtimeNs(path: string, ns: bigint): void {
  execFileSync('touch', ['-m', '-d', `@${ns / 1000000000n}.${String(ns % 1000000000n).padStart(9, '0')}`, path]);
}

for (const variant of ['standard', 'rotated'] as const) {
  describe(`calibration cache (${variant} orientation)`, () => {
    it('reads back the computed calibration bit for bit, from a file much smaller than the products', async () => {
      const dir = copyOfSimulatedRun({ size: 'small', targets: 1, seed: 1, variant }, `calib-cache-${variant}`);
      const run = loadManifest(join(dir, 'run.yaml'));
      await reduceRun(run, { jobs: 1 });
      const { key } = unpackFromBytes<{ key: string }>(readFileSync(cacheFile(run.outputDir)));
      const restored = cachedCalibration(run.outputDir, 'red', key);
      expect(restored).toBeDefined();
      expect(statSync(cacheFile(run.outputDir)).size).toBeLessThan(statSync(join(run.outputDir, 'calib', 'red', 'flat.fits')).size / 10);

      // The same calibration computed afresh elsewhere (its products written there).
      const other = { ...run, outputDir: join(dir, 'fresh') };
      const fresh = calibrateSetup(run.setups['red']!, other, new StageTimer({ setup: 'red' }, 4, () => undefined, () => 0));
      expect(fresh.ccd.orientation.transpose).toBe(variant === 'rotated');
      expectSame(fresh, restored, 'calibration');
    });

    it('gives the same products when a target reruns on the cached calibration, and misses once a product changed', async () => {
      const dir = copyOfSimulatedRun({ size: 'small', targets: 1, seed: 1, variant }, `calib-rerun-${variant}`);
      const run = loadManifest(join(dir, 'run.yaml'));
      await reduceRun(run, { jobs: 1 });
      const files = listFiles(run.outputDir, isTimedOrState);
      const before = files.map((f) => readBytes(run.outputDir, f));

      rmSync(join(run.outputDir, '.whorl', 'targets'), { recursive: true });
      const again = await reduceRun(loadManifest(join(dir, 'run.yaml')), { jobs: 1 });
      expect(again.setupMs).toEqual({});
      expect(again.cached).toEqual([]);
      files.forEach((f, i) => expect(readBytes(run.outputDir, f).equals(before[i]!), f).toBe(true));

      // A flipped data byte with the old size and time: the DATASUM no longer verifies.
      const flat = join(run.outputDir, 'calib', 'red', 'flat.fits');
      const { key } = unpackFromBytes<{ key: string }>(readFileSync(cacheFile(run.outputDir)));
      const stat = statSync(flat, { bigint: true });
      const bytes = readFileSync(flat);
      bytes[bytes.length - 2880 * 10] ^= 1;
      writeFileSync(flat, bytes);
      setMtimeNs(flat, stat.mtimeNs);
      expect(statSync(flat, { bigint: true }).mtimeNs).toBe(stat.mtimeNs);
      expect(cachedCalibration(run.outputDir, 'red', key)).toBeUndefined();
      // Rewritten with the original bytes: a new modification time alone is a miss too.
      bytes[bytes.length - 2880 * 10] ^= 1;
      writeFileSync(flat, bytes);
      setMtimeNs(flat, stat.mtimeNs + 5000000000n);
      expect(cachedCalibration(run.outputDir, 'red', key)).toBeUndefined();
      rmSync(join(run.outputDir, '.whorl', 'targets'), { recursive: true });
      const redone = await reduceRun(loadManifest(join(dir, 'run.yaml')), { jobs: 1 });
      expect(Object.keys(redone.setupMs)).toEqual(['red']);
      expect(cachedCalibration(run.outputDir, 'red', key)).toBeDefined();
    });
  });
}
