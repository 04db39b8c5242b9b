/**
 * The run's own files under `output`: summary.json (a product: byte-identical on rerun),
 * timings.json and provenance.json (times, so they differ between runs), and index.html
 * through the report's run hook.
 */
import { join } from 'node:path';
import type { RunIndexEntry } from '../report/types.js';
import { VERSION } from '../version.js';
import { writeFileAtomic } from './io/atomic.js';
import { writeRunIndex } from './report-files.js';
import { readTargetState } from './io/state.js';
import { libraryVersions } from './io/versions.js';
import type { ResolvedRun } from './manifest/resolve.js';
import type { RunSummary } from './summary.js';
import type { TargetOutcome } from './target-job.js';

export interface RunTimings {
  outcomes: Map<string, TargetOutcome>;
  cached: string[];
  setupMs: Record<string, Record<string, number>>;
  seconds: number;
  startedUtc: string;
  jobs: number;
}

export function writeRunProducts(run: ResolvedRun, summary: RunSummary, t: RunTimings): void {
  const out = run.outputDir;
  writeFileAtomic(join(out, 'summary.json'), `${JSON.stringify(summary, null, 1)}\n`);
  const timings = {
    startedUtc: t.startedUtc,
    seconds: t.seconds,
    jobs: t.jobs,
    calibrationMs: t.setupMs,
    targets: Object.fromEntries(
      [...t.outcomes].map(([name, o]) => [name, { status: o.entry.status, seconds: o.seconds, stageMs: o.stageMs, peakMemoryMb: o.peakMemoryMb }]),
    ),
    unchanged: t.cached,
  };
  writeFileAtomic(join(out, 'timings.json'), `${JSON.stringify(timings, null, 1)}\n`);
  const provenance = {
    whorlVersion: VERSION,
    libraries: libraryVersions(),
    manifest: run.manifestPath,
    settings: { output: run.outputDir, setups: run.setups, targets: run.targets },
    targets: summary.targets.map((e) => ({ name: e.name, folder: e.folder, status: e.status, provenance: e.status === 'ok' ? `${e.folder}/provenance.json` : undefined })),
    timings,
    finishedUtc: new Date().toISOString(),
  };
  writeFileAtomic(join(out, 'provenance.json'), `${JSON.stringify(provenance, null, 1)}\n`);
  writeRunIndex(out, { title: `whorl run ${summary.manifest}`, whorlVersion: VERSION, targets: indexEntries(run, summary) });
}

function indexEntries(run: ResolvedRun, summary: RunSummary): RunIndexEntry[] {
  return summary.targets
    .filter((e) => e.status !== 'not-run')
    .map((e) => {
      const target = run.targets.find((t) => t.folder === e.folder);
      const thumbnail = readTargetState(run.outputDir, e.folder)?.thumbnail;
      const entry: RunIndexEntry = { name: e.name, folder: e.folder, status: e.status === 'ok' ? 'ok' : 'failed', warnings: e.diagnostics.warning };
      if (e.reason !== undefined) entry.failure = e.reason;
      if (e.numbers.vSysKms !== undefined) entry.vSys = e.numbers.vSysKms;
      if (e.numbers.vSysErrKms !== undefined) entry.vSysErr = e.numbers.vSysErrKms;
      if (e.numbers.vOuterKms !== undefined) entry.vOuter = e.numbers.vOuterKms;
      const incl = e.numbers.inclinationDeg ?? target?.inclination_deg;
      if (incl !== undefined) entry.inclinationDeg = incl;
      if (target) entry.distanceMpc = target.distance_mpc;
      if (thumbnail) entry.curve = thumbnail;
      return entry;
    });
}
