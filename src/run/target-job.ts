/**
 * One target, start to finish: run its stages on the setup's calibration, write every product
 * atomically, then its provenance and state. The same function runs in the main thread
 * (`--jobs 1`) and in worker threads, so products do not depend on `--jobs`. A target that fails
 * (InputError in its own frames, StageError, or any fault) gives a failed outcome; nothing throws.
 */
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { VERSION } from '../version.js';
import type { EventSink } from './events.js';
import { describeFailure } from './failure.js';
import { writeFileAtomic } from './io/atomic.js';
import { clearTargetState, readTargetState, writeTargetState, type CurveThumbnail } from './io/state.js';
import { libraryVersions } from './io/versions.js';
import { manifestRelative, type ResolvedSetup, type ResolvedTarget } from './manifest/resolve.js';
import { targetReportInput } from './pipeline/report-input.js';
import { writeTargetReport } from './report-files.js';
import { runTargetStages, TARGET_STAGES } from './pipeline/target-stages.js';
import { curveThumbnail, targetKeyNumbers, writeTargetProducts } from './pipeline/target-writes.js';
import type { SetupCalibration } from './pipeline/setup-stages.js';
import { StageTimer } from './pipeline/timer.js';
import { countDiagnostics, type SummaryEntry } from './summary.js';

export type { SetupCalibration } from './pipeline/setup-stages.js';

/** An input file as provenance records it: path relative to the manifest's folder, sha256. */
export interface InputFile {
  role: 'bias' | 'flat' | 'arc' | 'line-list' | 'science';
  file: string;
  sha256: string;
}

/** Everything a worker needs besides the calibration (structured-clone safe). */
export interface TargetJob {
  target: ResolvedTarget;
  setup: ResolvedSetup;
  outputDir: string;
  baseDir: string;
  /** Cache key of this target (inputs, settings, version) and of its setup's calibration. */
  key: string;
  setupKey: string;
  inputs: InputFile[];
  /** Start of the run (ms since the epoch), for event times. */
  runStartMs: number;
}

export interface TargetOutcome {
  entry: SummaryEntry;
  /** Wall time per stage, ms. */
  stageMs: Record<string, number>;
  seconds: number;
  /** Peak V8 heap plus array buffers of the thread that ran it, MB (sampled at stage boundaries). */
  peakMemoryMb: number;
  thumbnail?: CurveThumbnail;
}

export function failedOutcome(job: TargetJob, code: string, reason: string, stageMs: Record<string, number>): TargetOutcome {
  return {
    entry: {
      name: job.target.name,
      folder: job.target.folder,
      setup: job.setup.name,
      status: 'failed',
      reason,
      reasonCode: code,
      stages: Object.keys(stageMs),
      products: [],
      numbers: {},
      diagnostics: { info: 0, warning: 0, error: 0 },
    },
    stageMs,
    seconds: Object.values(stageMs).reduce((a, b) => a + b, 0) / 1000,
    peakMemoryMb: 0,
  };
}

/** `lastUse`: no later target reads `calibration`'s per-pixel wavelengths (see runTargetStages). */
export function executeTargetJob(job: TargetJob, calibration: SetupCalibration, emit: EventSink, lastUse = false): TargetOutcome {
  const now = () => (Date.now() - job.runStartMs) / 1000;
  const started = new Date();
  emit({ type: 'target-start', t: now(), target: job.target.name });
  const previous = readTargetState<SummaryEntry>(job.outputDir, job.target.folder);
  clearTargetState(job.outputDir, job.target.folder);
  const timer = new StageTimer({ target: job.target.name }, TARGET_STAGES.length + 1, emit, now);
  const provenance = {
    whorlVersion: VERSION,
    libraries: libraryVersions(),
    target: job.target.name,
    folder: job.target.folder,
    cacheKey: job.key,
    calibrationKey: job.setupKey,
    inputs: job.inputs,
    // Paths relative to the manifest's folder: products (the report shows these) must not depend on where the run sits.
    settings: { setup: relativeFiles(job.setup, job.baseDir), target: relativeFiles(job.target, job.baseDir), calibration: calibration.settings } as Record<string, unknown>,
  };
  const diagnostics = () => [...calibration.diagnostics, ...timer.diagnostics];
  let outcome: TargetOutcome;
  try {
    const products = runTargetStages(job, calibration, timer, lastUse);
    provenance.settings['stages'] = products.settings;
    const files = timer.step('write', () => writeTargetProducts(job, calibration, products, diagnostics(), provenance));
    const provenanceFile = writeProvenance(job, { ...provenance, stagesMs: timer.ms, startedUtc: started.toISOString(), finishedUtc: new Date().toISOString() });
    const entry: SummaryEntry = {
      name: job.target.name,
      folder: job.target.folder,
      setup: job.setup.name,
      status: 'ok',
      stages: timer.stagesRun,
      products: [...files, provenanceFile],
      numbers: targetKeyNumbers(products, calibration),
      diagnostics: countDiagnostics(diagnostics()),
    };
    outcome = { entry, stageMs: timer.ms, seconds: (Date.now() - started.getTime()) / 1000, peakMemoryMb: timer.peakMemoryMb, thumbnail: curveThumbnail(products) };
  } catch (e) {
    const [code, reason] = describeFailure(e);
    outcome = failedOutcome(job, code, reason, timer.ms);
    outcome.peakMemoryMb = timer.peakMemoryMb;
    // A failed target keeps no products from an earlier run: they would no longer match its inputs.
    for (const p of previous?.entry.products ?? []) rmSync(join(job.outputDir, p), { force: true });
    const report = writeTargetReport(job.outputDir, job.target.folder, targetReportInput(job, { solution: calibration.solution }, diagnostics(), provenance, reason));
    outcome.entry.products = [report, writeProvenance(job, { ...provenance, failure: { code, reason }, stagesMs: timer.ms, startedUtc: started.toISOString(), finishedUtc: new Date().toISOString() })];
    outcome.entry.diagnostics = countDiagnostics(diagnostics());
  }
  const key = outcome.entry.status === 'ok' ? job.key : `failed:${job.key}`;
  writeTargetState(job.outputDir, job.target.folder, { key, products: outcome.entry.products, entry: outcome.entry, ...(outcome.thumbnail ? { thumbnail: outcome.thumbnail } : {}) });
  const done = { type: 'target-done', t: now(), target: job.target.name, status: outcome.entry.status, seconds: outcome.seconds } as const;
  emit(outcome.entry.reason !== undefined ? { ...done, status: 'failed', reason: outcome.entry.reason } : { ...done, status: 'ok' });
  return outcome;
}

function writeProvenance(job: TargetJob, provenance: Record<string, unknown>): string {
  const file = join(job.target.folder, 'provenance.json');
  writeFileAtomic(join(job.outputDir, file), `${JSON.stringify(provenance, null, 1)}\n`);
  return file;
}

/** A resolved setup or target with its file lists relative to the manifest's folder. */
function relativeFiles<T extends object>(value: T, baseDir: string): T {
  const out = { ...value } as Record<string, unknown>;
  for (const key of ['bias', 'flat', 'arc', 'line_lists', 'frames']) {
    const list = out[key];
    if (Array.isArray(list)) out[key] = list.map((p: string) => manifestRelative(baseDir, p));
  }
  return out as T;
}
