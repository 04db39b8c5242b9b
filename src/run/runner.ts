/**
 * `whorl reduce`: from a resolved manifest to products. Calibrations are computed once per setup
 * (in this thread, cached on disk by content), then targets run in parallel on worker threads and this one;
 * each target's products are cached by a key of its inputs' sha256, its resolved settings, the
 * stages that exist, the whorl version and a hash of whorl's code, so a rerun redoes only what
 * changed.
 */
import { mkdirSync } from 'node:fs';
import { basename, join } from 'node:path';
import { InputError } from '../errors.js';
import { VERSION } from '../version.js';
import type { EventSink, RunEvent } from './events.js';
import { removePartialFiles } from './io/atomic.js';
import { codeFingerprint } from './io/code-fingerprint.js';
import { canonicalJson, sha256File, sha256Text } from './io/hash.js';
import { isUpToDate, readTargetState, STATE_DIR } from './io/state.js';
import { manifestRelative, type ResolvedRun, type ResolvedSetup, type ResolvedTarget } from './manifest/resolve.js';
import { calibrateSetupCached, SETUP_STAGES } from './pipeline/setup-stages.js';
import { TARGET_STAGES } from './pipeline/target-stages.js';
import { writeRunProducts } from './run-writes.js';
import { buildSummary, type RunSummary, type SummaryEntry } from './summary.js';
import { executeTargetJob, failedOutcome, type InputFile, type SetupCalibration, type TargetJob, type TargetOutcome } from './target-job.js';
import { TargetPool, workerScriptAvailable } from './workers/pool.js';

export interface ReduceOptions {
  /** Targets in parallel (worker threads); 1 runs everything in this thread. */
  jobs: number;
  /** Names (or folder names) of the targets to run; default all. */
  only?: readonly string[];
  /** Ignore the cache and redo everything. */
  force?: boolean;
  onEvent?: EventSink;
}

export interface ReduceResult {
  summary: RunSummary;
  /** Outcomes of the targets run this time (cached ones excluded), by target name. */
  outcomes: Map<string, TargetOutcome>;
  cached: string[];
  /** Per setup computed this time: wall time per calibration stage, ms. */
  setupMs: Record<string, Record<string, number>>;
  seconds: number;
}

export async function reduceRun(run: ResolvedRun, opts: ReduceOptions): Promise<ReduceResult> {
  const runStartMs = Date.now();
  const now = () => (Date.now() - runStartMs) / 1000;
  const emit: EventSink = opts.onEvent ?? (() => undefined);
  const selected = selectTargets(run.targets, opts.only);
  emit({ type: 'run-start', t: 0, targets: selected.map((t) => t.name), jobs: opts.jobs, stages: [...SETUP_STAGES, ...TARGET_STAGES] });
  prepareFolders(run);

  const code = codeFingerprint();
  const hashes = new Map<string, string>();
  const hashOf = (p: string) => hashes.get(p) ?? (hashes.set(p, hashInput(p)), hashes.get(p)!);
  const rel = (p: string) => manifestRelative(run.baseDir, p);
  const setupInputs = (s: ResolvedSetup): InputFile[] => [
    ...s.bias.map((f) => ({ role: 'bias' as const, file: rel(f), sha256: hashOf(f) })),
    ...s.flat.map((f) => ({ role: 'flat' as const, file: rel(f), sha256: hashOf(f) })),
    ...s.arc.map((f) => ({ role: 'arc' as const, file: rel(f), sha256: hashOf(f) })),
    ...s.line_lists.map((f) => ({ role: 'line-list' as const, file: rel(f), sha256: hashOf(f) })),
  ];
  const setupKeys = new Map<string, { key: string; inputs: InputFile[] }>();
  const setupKeyOf = (s: ResolvedSetup) => {
    let k = setupKeys.get(s.name);
    if (!k) {
      const inputs = setupInputs(s);
      const settings = { ...s, bias: undefined, flat: undefined, arc: undefined, line_lists: undefined };
      k = { key: sha256Text(canonicalJson({ whorl: VERSION, code, stages: SETUP_STAGES, settings, inputs })), inputs };
      setupKeys.set(s.name, k);
    }
    return k;
  };

  const jobs: TargetJob[] = [];
  const cached: string[] = [];
  for (const t of selected) {
    const setup = run.setups[t.setup]!;
    const sk = setupKeyOf(setup);
    const inputs = [...sk.inputs, ...t.frames.map((f) => ({ role: 'science' as const, file: rel(f), sha256: hashOf(f) }))];
    const settings = { ...t, frames: undefined };
    const key = sha256Text(canonicalJson({ whorl: VERSION, code, stages: TARGET_STAGES, setupKey: sk.key, settings, inputs }));
    if (!opts.force && isUpToDate(run.outputDir, readTargetState(run.outputDir, t.folder), key)) {
      cached.push(t.name);
      emit({ type: 'target-done', t: now(), target: t.name, status: 'cached', seconds: 0 });
      continue;
    }
    jobs.push({ target: t, setup, outputDir: run.outputDir, baseDir: run.baseDir, key, setupKey: sk.key, inputs, runStartMs });
  }

  const outcomes = new Map<string, TargetOutcome>();
  const setupMs: Record<string, Record<string, number>> = {};
  const caching: Promise<void>[] = [];
  // Workers start now, so that they load while the main thread calibrates; each setup's targets
  // go to them as soon as its calibration is ready (the next setup calibrates meanwhile), and the
  // main thread, once every setup is calibrated, takes targets too: --jobs N is this thread and
  // N - 1 workers.
  const parallel = Math.min(opts.jobs, jobs.length);
  if (parallel > 1 && !workerScriptAvailable()) emit({ type: 'notice', t: now(), message: 'worker script missing (run `npm run build`): targets run one at a time' });
  const pool = parallel > 1 && workerScriptAvailable() ? new TargetPool(parallel - 1, emit) : undefined;
  const inThisThread: [TargetJob, SetupCalibration][] = [];
  const inPool: Promise<void>[] = [];
  try {
    for (const setupName of [...new Set(jobs.map((j) => j.setup.name))]) {
      const setup = run.setups[setupName]!;
      const mine = jobs.filter((j) => j.setup.name === setupName);
      emit({ type: 'setup-start', t: now(), setup: setupName, targets: mine.map((j) => j.target.name) });
      const result = calibrateSetupCached(setup, run, setupKeyOf(setup).key, Boolean(opts.force), emit, now);
      if (!result.ok) {
        emit({ type: 'setup-done', t: now(), setup: setupName, status: 'failed', reason: result.reason });
        for (const j of mine) {
          const o = failedOutcome(j, result.code, `calibration of setup '${setupName}' failed: ${result.reason}`, {});
          outcomes.set(j.target.name, o);
          emit({ type: 'target-done', t: now(), target: j.target.name, status: 'failed', reason: o.entry.reason!, seconds: 0 });
        }
        continue;
      }
      if (result.ms) setupMs[setupName] = result.ms;
      if (result.caching) caching.push(result.caching);
      emit({ type: 'setup-done', t: now(), setup: setupName, status: result.ms ? 'ok' : 'cached' });
      if (pool) inPool.push(pool.submit(mine, result.calibration).then((os) => os.forEach((o, i) => void outcomes.set(mine[i]!.target.name, o))));
      else for (const j of mine) inThisThread.push([j, result.calibration]);
    }
    // The last target of a setup here may shift the arc's wavelengths in place: no one reads them after it
    // (the cache was given a copy without them; a worker's calibration may share memory, so only here).
    inThisThread.forEach(([j, cal], i) => {
      const lastUse = !inThisThread.slice(i + 1).some(([, later]) => later === cal);
      outcomes.set(j.target.name, executeTargetJob(j, cal, emit, lastUse));
    });
    pool?.workHere();
    await Promise.all(inPool);
  } finally {
    await pool?.close();
  }

  // A cache that could not be written only costs time on the next run.
  for (const c of await Promise.allSettled(caching)) if (c.status === 'rejected') emit({ type: 'notice', t: now(), message: `calibration cache not written: ${String(c.reason)}` });
  const entries = run.targets.map((t): SummaryEntry => outcomes.get(t.name)?.entry ?? readTargetState<SummaryEntry>(run.outputDir, t.folder)?.entry ?? notRun(t));
  const summary = buildSummary(VERSION, basename(run.manifestPath), entries);
  const seconds = now();
  writeRunProducts(run, summary, { outcomes, cached, setupMs, seconds, startedUtc: new Date(runStartMs).toISOString(), jobs: opts.jobs });
  const failed = selected.filter((t) => outcomes.get(t.name)?.entry.status === 'failed').length;
  const done: RunEvent = {
    type: 'run-done',
    t: seconds,
    ok: selected.length - failed - cached.length,
    failed,
    cached: cached.length,
    seconds,
    summary: `${selected.length - failed} of ${selected.length} target(s) ok${failed ? `, ${failed} failed` : ''}${cached.length ? ` (${cached.length} unchanged)` : ''}; products in ${run.outputDir}`,
  };
  emit(done);
  return { summary, outcomes, cached, setupMs, seconds };
}

/** The targets named by `--only` (by name or folder), in manifest order; unknown names are a user mistake. */
export function selectTargets(targets: readonly ResolvedTarget[], only?: readonly string[]): ResolvedTarget[] {
  if (!only || only.length === 0) return [...targets];
  for (const name of only) {
    if (!targets.some((t) => t.name === name || t.folder === name)) {
      throw new InputError('reduce.unknown-target', `no target named '${name}' in the manifest`, { key: '--only' }, { expected: `one of ${targets.map((t) => t.name).join(', ')}` });
    }
  }
  return targets.filter((t) => only.includes(t.name) || only.includes(t.folder));
}

/** sha256 of an input; a file that vanished since the manifest was read is the user's to fix. */
function hashInput(path: string): string {
  try {
    return sha256File(path);
  } catch (e) {
    throw new InputError('run.unreadable-input', `cannot read the input file (${(e as NodeJS.ErrnoException).code ?? String(e)})`, { file: path });
  }
}

function notRun(t: ResolvedTarget): SummaryEntry {
  return { name: t.name, folder: t.folder, setup: t.setup, status: 'not-run', stages: [], products: [], numbers: {}, diagnostics: { info: 0, warning: 0, error: 0 } };
}

/** Create the output folders and remove temporary files a killed run left behind. */
function prepareFolders(run: ResolvedRun): void {
  mkdirSync(join(run.outputDir, STATE_DIR, 'targets'), { recursive: true });
  mkdirSync(join(run.outputDir, STATE_DIR, 'calib'), { recursive: true });
  for (const dir of [run.outputDir, join(run.outputDir, STATE_DIR, 'targets'), join(run.outputDir, STATE_DIR, 'calib')]) removePartialFiles(dir);
  for (const s of Object.values(run.setups)) removePartialFiles(join(run.outputDir, 'calib', s.folder));
  for (const t of run.targets) removePartialFiles(join(run.outputDir, t.folder));
}
