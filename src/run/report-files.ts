/**
 * report.html and index.html, and what they were made from. The inputs are kept under
 * `<output>/.whorl/report/` so that `whorl report OUTPUT` can render the pages again (after a
 * whorl update, say) without reducing anything.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { renderRunIndex, renderTargetReport } from '../report/index.js';
import type { RunIndexInput, TargetReportInput } from '../report/types.js';
import { writeFileAtomic } from './io/atomic.js';
import { packToBytes, unpackFromBytes } from './io/pack.js';
import { STATE_DIR } from './io/state.js';

const REPORT_STATE = join(STATE_DIR, 'report');
const INDEX_STATE = 'index.bin';

/** Render and write `<folder>/report.html`; returns its path relative to the output folder. */
export function writeTargetReport(outputDir: string, folder: string, input: TargetReportInput): string {
  const rel = join(folder, 'report.html');
  writeFileAtomic(join(outputDir, rel), renderTargetReport(input));
  // The report reads no per-pixel wavelengths (the cut-out carries its own): keep the state small.
  const kept = input.solution ? { ...input, solution: { ...input.solution, wave: new Float64Array(0) } } : input;
  writeFileAtomic(join(outputDir, REPORT_STATE, `${folder}.bin`), packToBytes(kept));
  return rel;
}

export function writeRunIndex(outputDir: string, input: RunIndexInput): void {
  writeFileAtomic(join(outputDir, 'index.html'), renderRunIndex(input));
  writeFileAtomic(join(outputDir, REPORT_STATE, INDEX_STATE), packToBytes(input));
}

/**
 * Render every report of a reduced run again from the kept inputs. Returns the number of target
 * reports written. An output folder whorl did not write is bad input.
 */
export function rebuildReports(outputDir: string): number {
  const dir = join(outputDir, REPORT_STATE);
  const indexFile = join(dir, INDEX_STATE);
  if (!existsSync(indexFile)) {
    throw new InputError('report.no-run', 'not an output folder of `whorl reduce` (or reduced by a whorl without kept report inputs)', { file: outputDir }, {
      expected: `${join(REPORT_STATE, INDEX_STATE)} inside it`,
    });
  }
  let count = 0;
  for (const name of readdirSync(dir).sort()) {
    if (name === INDEX_STATE || !name.endsWith('.bin')) continue;
    const input = unpackFromBytes<TargetReportInput>(readFileSync(join(dir, name)));
    writeFileAtomic(join(outputDir, name.slice(0, -'.bin'.length), 'report.html'), renderTargetReport(input));
    count++;
  }
  writeFileAtomic(join(outputDir, 'index.html'), renderRunIndex(unpackFromBytes<RunIndexInput>(readFileSync(indexFile))));
  return count;
}
