/**
 * The run's memory between invocations, under `<output>/.whorl/`: for each target the cache key
 * of its last complete run and the summary entry it produced; for each setup what its calibration
 * needs besides its product files (packed, with its key; see run/pipeline/calibration-cache.ts).
 * A state file is written only after every product it lists, so a killed run leaves the target
 * without state and the next run redoes it.
 */
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomic, writeFileAtomicInBackground } from './atomic.js';
import { packToBytes, unpackFromBytes } from './pack.js';

export const STATE_DIR = '.whorl';

/** The folded curve in brief, for the run index's thumbnails (kpc, km/s). */
export interface CurveThumbnail {
  rKpc: number[];
  vRot: number[];
  err: number[];
}

export interface TargetState<Entry> {
  key: string;
  /** Product files, relative to the output folder. */
  products: string[];
  entry: Entry;
  thumbnail?: CurveThumbnail;
}

function targetStatePath(outputDir: string, folder: string): string {
  return join(outputDir, STATE_DIR, 'targets', `${folder}.json`);
}

export function readTargetState<Entry = unknown>(outputDir: string, folder: string): TargetState<Entry> | undefined {
  try {
    return JSON.parse(readFileSync(targetStatePath(outputDir, folder), 'utf8')) as TargetState<Entry>;
  } catch {
    return undefined;
  }
}

export function writeTargetState<Entry>(outputDir: string, folder: string, state: TargetState<Entry>): void {
  writeFileAtomic(targetStatePath(outputDir, folder), `${JSON.stringify(state, null, 1)}\n`);
}

export function clearTargetState(outputDir: string, folder: string): void {
  rmSync(targetStatePath(outputDir, folder), { force: true });
}

/** True when the state has `key` and all its products are still there. */
export function isUpToDate(outputDir: string, state: TargetState<unknown> | undefined, key: string): boolean {
  return state !== undefined && state.key === key && state.products.every((p) => existsSync(join(outputDir, p)));
}

function calibPath(outputDir: string, folder: string): string {
  return join(outputDir, STATE_DIR, 'calib', `${folder}.bin`);
}

/** Calibration products cached for `key`, or undefined. */
export function readCachedCalibration<T>(outputDir: string, folder: string, key: string): T | undefined {
  try {
    const stored = unpackFromBytes<{ key: string; value: T }>(readFileSync(calibPath(outputDir, folder)));
    return stored.key === key ? stored.value : undefined;
  } catch {
    return undefined;
  }
}

/** Cache a setup's calibration; written in the background, so await the promise before the run ends. */
export function writeCachedCalibration(outputDir: string, folder: string, key: string, value: unknown): Promise<void> {
  return writeFileAtomicInBackground(calibPath(outputDir, folder), packToBytes({ key, value }));
}
