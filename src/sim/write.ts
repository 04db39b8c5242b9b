/** Writing a simulated run to a folder: raw/*.fits, truth.json, run.yaml and, if kept, expected/*.fits. */
import { mkdirSync, readdirSync, renameSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';
import { expectedToFits, simFrameToFits } from './convert.js';
import { trimmedSize } from './detector.js';
import type { SimulatedRun } from './simulate.js';

/** Write to a temporary name beside the target, then rename: a file is complete or absent. */
function writeAtomic(path: string, data: Uint8Array | string): void {
  mkdirSync(dirname(path), { recursive: true });
  const temp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  writeFileSync(temp, data);
  renameSync(temp, path);
}

/** truth.json text: indented objects, arrays of numbers on one line each. */
export function truthJson(run: SimulatedRun): string {
  return `${JSON.stringify(run.truth, null, 1).replace(/\[\s+([-+\d.eE,\s]+?)\s+\]/g, (_, inner: string) => `[${inner.replace(/\s+/g, '')}]`)}\n`;
}

/** Files under `dir` (relative names, '/'-separated) in the folders a run writes to, or none when absent. */
function filesIn(dir: string, folder: string): string[] {
  try {
    return readdirSync(join(dir, folder), { recursive: true, withFileTypes: true })
      .filter((e) => e.isFile())
      .map((e) => join(e.parentPath, e.name).slice(dir.length + 1).split('\\').join('/'));
  } catch {
    return [];
  }
}

/**
 * Files in `dir`'s raw/ and expected/ folders that writing `run` would not replace: left by another
 * run, they would be picked up by the globs of the new run.yaml (raw/sci_*.fits).
 */
export function staleRunFiles(run: SimulatedRun, dir: string): string[] {
  const written = new Set(run.frames.map((f) => f.name));
  if (run.expected) for (const name of run.expected.keys()) written.add(`expected/${basename(name)}`);
  return [...filesIn(dir, 'raw'), ...filesIn(dir, 'expected')].filter((name) => !written.has(name)).sort();
}

/**
 * Refuse a folder that holds raw or expected frames this run would not replace: the globs of its
 * run.yaml would pick them up and mix another night into this one.
 */
export function assertNoStaleFiles(run: SimulatedRun, dir: string, key: string): void {
  const stale = staleRunFiles(run, dir);
  if (stale.length === 0) return;
  const shown = stale.slice(0, 3).join(', ') + (stale.length > 3 ? `, ... (${stale.length} files)` : '');
  throw new InputError('cli.out-holds-other-run', 'the folder holds files this run would not replace, and the globs of its run.yaml would pick them up', { file: dir, key }, { expected: 'a new or empty folder, or one holding the same run', actual: shown });
}

/**
 * Write the run under `dir`: each frame at its relative name, `truth.json`, `run.yaml`, and the
 * expected images as `expected/<frame file name>` (float32 electrons) when the run kept them.
 */
export function writeSimulatedRun(run: SimulatedRun, dir: string): void {
  for (const frame of run.frames) writeAtomic(join(dir, frame.name), simFrameToFits(frame));
  if (run.expected) {
    for (const [name, electrons] of run.expected) {
      const setup = run.truth.setups[run.truth.frames[name]!.setup]!;
      const { width, height } = trimmedSize(setup.orientation, setup.internalWidth, setup.internalHeight);
      writeAtomic(join(dir, 'expected', basename(name)), expectedToFits(name, width, height, electrons));
    }
  }
  writeAtomic(join(dir, 'truth.json'), truthJson(run));
  writeAtomic(join(dir, 'run.yaml'), run.manifestYaml);
}
