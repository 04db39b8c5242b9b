/**
 * Test helper: a small simulated night (src/sim), made once per option set and shared by the
 * test files through test-output/ (git-ignored), plus a fresh copy per test so that each test
 * owns its products.
 */
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { simulateRun } from '../../src/sim/simulate.js';
import type { SimOptions } from '../../src/sim/options.js';
import { writeSimulatedRun } from '../../src/sim/write.js';

const ROOT = join(import.meta.dirname, '..', '..', 'test-output', 'run');

/** Folder of a simulated run (raw/, run.yaml, truth.json); simulated on first use. */
export function sharedSimulatedRun(options: SimOptions): string {
  const key = `sim-${options.size ?? 'small'}-${options.variant ?? 'standard'}-t${options.targets ?? 1}-s${options.seed ?? 1}`;
  const dir = join(ROOT, key);
  if (existsSync(join(dir, 'run.yaml'))) return dir;
  mkdirSync(ROOT, { recursive: true });
  const tmp = mkdtempSync(join(ROOT, `.${key}-`));
  writeSimulatedRun(simulateRun(options), tmp);
  try {
    renameSync(tmp, dir);
  } catch {
    rmSync(tmp, { recursive: true, force: true }); // another test file made it first
  }
  return dir;
}

/** A private copy of a simulated run (without products) for one test. */
export function copyOfSimulatedRun(options: SimOptions, label: string): string {
  const src = sharedSimulatedRun(options);
  const dir = mkdtempSync(join(ROOT, `${label}-`));
  for (const name of ['raw', 'run.yaml', 'truth.json']) cpSync(join(src, name), join(dir, name), { recursive: true });
  return dir;
}

/** Every file under `dir` (relative paths, sorted), skipping the given relative prefixes. */
export function listFiles(dir: string, skip: (rel: string) => boolean = () => false): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      const rel = relative(dir, p);
      if (skip(rel)) continue;
      if (statSync(p).isDirectory()) walk(p);
      else out.push(rel);
    }
  };
  walk(dir);
  return out.sort();
}

/** Products that must be byte-identical between runs: all but times (provenance, timings) and the cache state. */
export function isTimedOrState(rel: string): boolean {
  return rel.startsWith('.whorl') || rel.endsWith('provenance.json') || rel === 'timings.json';
}

export function readBytes(dir: string, rel: string): Buffer {
  return readFileSync(join(dir, rel));
}
