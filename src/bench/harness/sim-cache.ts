/**
 * Simulated runs for the benchmark, made once and kept under ./bench-cache/ (git-ignored), keyed
 * by the whorl version and the simulator options (a new version may simulate differently).
 */
import { existsSync, mkdirSync, mkdtempSync, renameSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { canonicalJson, sha256Text } from '../../run/io/hash.js';
import type { SimOptions } from '../../sim/options.js';
import { simulateRun } from '../../sim/simulate.js';
import { writeSimulatedRun } from '../../sim/write.js';
import { VERSION } from '../../version.js';

export interface CachedRun {
  dir: string;
  /** Seconds spent simulating now; 0 when the cache had it. */
  simulatedSeconds: number;
}

export function cachedSimulatedRun(root: string, options: SimOptions): CachedRun {
  const key = sha256Text(canonicalJson({ whorl: VERSION, options })).slice(0, 16);
  const dir = join(root, `${options.size ?? 'small'}-t${options.targets ?? 1}-${key}`);
  if (existsSync(join(dir, 'run.yaml'))) return { dir, simulatedSeconds: 0 };
  mkdirSync(root, { recursive: true });
  const t0 = performance.now();
  const tmp = mkdtempSync(join(root, '.partial-'));
  writeSimulatedRun(simulateRun(options), tmp);
  rmSync(dir, { recursive: true, force: true });
  renameSync(tmp, dir);
  return { dir, simulatedSeconds: (performance.now() - t0) / 1000 };
}
