/** Writing a simulated run to a folder: raw/*.fits, truth.json, run.yaml and, if kept, expected/*.fits. */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
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
