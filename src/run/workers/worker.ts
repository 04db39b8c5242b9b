/**
 * A worker thread: receives batches (a setup's calibration and targets), takes their targets one
 * at a time from the queue it shares with the other threads, runs each target's stages and writes
 * its products (same code as the single-thread path), and sends events and outcomes back.
 * Compiled to dist/run/workers/worker.js, which the pool starts.
 */
import { parentPort, threadId } from 'node:worker_threads';
import type { RunEvent } from '../events.js';
import { unpack } from '../io/pack.js';
import { executeTargetJob, type SetupCalibration } from '../target-job.js';
import { claimJob, type FromWorker, type ToWorker } from './protocol.js';

const port = parentPort;
if (port === null) throw new Error('worker.js must run in a worker thread');
const emit = (event: RunEvent) => port.postMessage({ type: 'event', event } satisfies FromWorker);

port.on('message', (msg: ToWorker) => {
  const claims = new Int32Array(msg.claims);
  let calibration: SetupCalibration | undefined;
  for (let index = claimJob(claims, threadId); index !== undefined; index = claimJob(claims, threadId)) {
    calibration ??= unpack<SetupCalibration>(msg.packed);
    const outcome = executeTargetJob(msg.jobs[index]!, calibration, emit);
    port.postMessage({ type: 'result', batch: msg.batch, index, outcome } satisfies FromWorker);
  }
});
