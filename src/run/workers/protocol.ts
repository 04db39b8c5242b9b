/** Messages between the runner and its worker threads (structured clone; products packed, see io/pack.ts). */
import type { RunEvent } from '../events.js';
import type { TargetJob, TargetOutcome } from '../target-job.js';

export type ToWorker =
  /** Calibration products of a setup, sent once per worker and setup key. */
  | { type: 'calibration'; setupKey: string; packed: unknown }
  | { type: 'target'; job: TargetJob };

export type FromWorker = { type: 'event'; event: RunEvent } | { type: 'result'; outcome: TargetOutcome };
