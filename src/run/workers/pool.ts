/**
 * Worker threads for targets, with the main thread as one more hand. Each setup's targets go out
 * as one batch (its calibration sent once to every worker); every thread takes the next target
 * from the batch's shared queue (protocol.ts) as soon as it is free. A worker that dies fails the
 * target it held alone and is replaced; the replacement joins the unfinished batches.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { threadId, Worker } from 'node:worker_threads';
import type { EventSink } from '../events.js';
import { pack } from '../io/pack.js';
import { executeTargetJob, failedOutcome, type SetupCalibration, type TargetJob, type TargetOutcome } from '../target-job.js';
import { claimJob, type FromWorker, type ToWorker } from './protocol.js';

/** The compiled worker script (the same path from src/ and dist/, both three levels below the root). */
export const WORKER_SCRIPT = fileURLToPath(new URL('../../../dist/run/workers/worker.js', import.meta.url));

export function workerScriptAvailable(): boolean {
  return existsSync(WORKER_SCRIPT);
}

interface Batch {
  message: ToWorker;
  calibration: SetupCalibration;
  claims: Int32Array;
  outcomes: (TargetOutcome | undefined)[];
  left: number;
  done: (outcomes: TargetOutcome[]) => void;
}

export class TargetPool {
  private readonly workers = new Set<Worker>();
  private readonly batches: Batch[] = [];
  private closing = false;

  /** Start `size` workers now, so that they load while the main thread calibrates (`script`: another worker, for tests). */
  constructor(size: number, private readonly onEvent: EventSink, private readonly script: string = WORKER_SCRIPT) {
    for (let i = 0; i < size; i++) this.spawn();
  }

  /** Queue a setup's targets for the workers; resolves with their outcomes, in the order of `jobs`. */
  submit(jobs: TargetJob[], calibration: SetupCalibration): Promise<TargetOutcome[]> {
    return new Promise((done) => {
      const claims = new SharedArrayBuffer(4 * (1 + jobs.length));
      const message: ToWorker = { type: 'batch', batch: this.batches.length, packed: pack(calibration), jobs, claims };
      this.batches.push({ message, calibration, claims: new Int32Array(claims), outcomes: jobs.map(() => undefined), left: jobs.length, done });
      for (const w of this.workers) w.postMessage(message);
    });
  }

  /**
   * Take targets in this thread too, batch by batch, until no target is left to take. Workers'
   * messages wait meanwhile (their events arrive late; their targets do not).
   */
  workHere(): void {
    for (const b of this.batches) {
      for (let i = claimJob(b.claims, threadId); i !== undefined; i = claimJob(b.claims, threadId)) {
        this.record(b, i, executeTargetJob(b.message.jobs[i]!, b.calibration, this.onEvent));
      }
    }
  }

  async close(): Promise<void> {
    this.closing = true;
    await Promise.all([...this.workers].map((w) => w.terminate()));
  }

  private spawn(): void {
    const worker = new Worker(this.script);
    const id = worker.threadId; // -1 once the worker has stopped
    this.workers.add(worker);
    let failure = '';
    worker.on('message', (msg: FromWorker) => {
      if (msg.type === 'event') this.onEvent(msg.event);
      else this.record(this.batches[msg.batch]!, msg.index, msg.outcome);
    });
    worker.on('error', (e) => void (failure = `worker failed: ${e.message}`));
    worker.on('exit', (code) => {
      this.workers.delete(worker);
      if (!this.closing) this.replace(id, failure || `worker exited with code ${code}`);
    });
    for (const b of this.batches) if (b.left > 0) worker.postMessage(b.message);
  }

  /** A worker died (its messages sent before are in): its unfinished target fails, a new worker takes its place. */
  private replace(deadThreadId: number, reason: string): void {
    for (const b of this.batches) {
      b.outcomes.forEach((o, i) => {
        if (o === undefined && Atomics.load(b.claims, 1 + i) === deadThreadId + 1) this.record(b, i, failedOutcome(b.message.jobs[i]!, 'run.worker-died', reason, {}));
      });
    }
    if (this.batches.some((b) => b.left > 0)) this.spawn();
  }

  private record(b: Batch, index: number, outcome: TargetOutcome): void {
    if (b.outcomes[index] !== undefined) return;
    b.outcomes[index] = outcome;
    if (--b.left === 0) b.done(b.outcomes as TargetOutcome[]);
  }
}
