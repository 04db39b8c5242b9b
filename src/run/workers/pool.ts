/**
 * A fixed pool of worker threads for targets. Each worker receives a setup's calibration once,
 * then target jobs one at a time; a worker that dies fails its target alone and is replaced.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { EventSink } from '../events.js';
import { failedOutcome, type TargetJob, type TargetOutcome } from '../target-job.js';
import type { FromWorker, ToWorker } from './protocol.js';

/** The compiled worker script (the same path from src/ and dist/, both three levels below the root). */
export const WORKER_SCRIPT = fileURLToPath(new URL('../../../dist/run/workers/worker.js', import.meta.url));

export function workerScriptAvailable(): boolean {
  return existsSync(WORKER_SCRIPT);
}

interface Slot {
  worker: Worker;
  sent: Set<string>;
  busy?: { job: TargetJob; done: (o: TargetOutcome) => void };
}

interface Pending {
  job: TargetJob;
  calibration: unknown;
  done: (o: TargetOutcome) => void;
}

export class TargetPool {
  private readonly slots: Slot[] = [];
  private readonly queue: Pending[] = [];

  constructor(size: number, private readonly onEvent: EventSink) {
    for (let i = 0; i < size; i++) this.slots.push(this.spawn());
  }

  /** Run one target; `packedCalibration` is its setup's calibration (io/pack.ts). */
  run(job: TargetJob, packedCalibration: unknown): Promise<TargetOutcome> {
    return new Promise((done) => {
      this.queue.push({ job, calibration: packedCalibration, done });
      this.pump();
    });
  }

  async close(): Promise<void> {
    await Promise.all(this.slots.map((s) => s.worker.terminate()));
  }

  private spawn(): Slot {
    const worker = new Worker(WORKER_SCRIPT);
    const slot: Slot = { worker, sent: new Set() };
    worker.on('message', (msg: FromWorker) => {
      if (msg.type === 'event') this.onEvent(msg.event);
      else this.finish(slot, msg.outcome);
    });
    worker.on('error', (e) => this.replace(slot, `worker failed: ${e.message}`));
    worker.on('exit', (code) => {
      if (slot.busy) this.replace(slot, `worker exited with code ${code}`);
    });
    return slot;
  }

  private finish(slot: Slot, outcome: TargetOutcome): void {
    const busy = slot.busy;
    slot.busy = undefined;
    busy?.done(outcome);
    this.pump();
  }

  private replace(slot: Slot, reason: string): void {
    const busy = slot.busy;
    slot.busy = undefined;
    const i = this.slots.indexOf(slot);
    if (i >= 0) this.slots.splice(i, 1, this.spawn());
    void slot.worker.terminate();
    busy?.done(failedOutcome(busy.job, 'run.worker-died', reason, {}));
    this.pump();
  }

  private pump(): void {
    for (const slot of this.slots) {
      if (slot.busy || this.queue.length === 0) continue;
      const next = this.queue.shift()!;
      slot.busy = { job: next.job, done: next.done };
      if (!slot.sent.has(next.job.setupKey)) {
        slot.worker.postMessage({ type: 'calibration', setupKey: next.job.setupKey, packed: next.calibration } satisfies ToWorker);
        slot.sent.add(next.job.setupKey);
      }
      slot.worker.postMessage({ type: 'target', job: next.job } satisfies ToWorker);
    }
  }
}
