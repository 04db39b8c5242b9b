/** Messages between the runner and its worker threads (structured clone; products packed, see io/pack.ts). */
import type { RunEvent } from '../events.js';
import type { TargetJob, TargetOutcome } from '../target-job.js';

/**
 * A setup's targets and its calibration, sent once to every worker. The threads share the queue
 * through `claims` (Int32Array over a SharedArrayBuffer): slot 0 is the index of the next job to
 * take, slot 1 + i the threadId + 1 of the thread that took job i (0 while nobody has), so a
 * thread takes the next target the moment it is free, without waiting for the main thread's
 * event loop, and a dead worker's target is known.
 */
export interface TargetBatch {
  batch: number;
  packed: unknown;
  jobs: TargetJob[];
  claims: SharedArrayBuffer;
}

export type ToWorker = { type: 'batch' } & TargetBatch;

export type FromWorker = { type: 'event'; event: RunEvent } | { type: 'result'; batch: number; index: number; outcome: TargetOutcome };

/** Claim the next job of a batch for this thread; undefined when none is left. */
export function claimJob(claims: Int32Array, threadId: number): number | undefined {
  const index = Atomics.add(claims, 0, 1);
  if (index >= claims.length - 1) return undefined;
  Atomics.store(claims, 1 + index, threadId + 1);
  return index;
}
