/**
 * A worker thread: receives calibrations and target jobs, runs each target's stages and writes
 * its products (same code as the single-thread path), and sends events and the outcome back.
 * Compiled to dist/run/workers/worker.js, which the pool starts.
 */
import { parentPort } from 'node:worker_threads';
import { unpack } from '../io/pack.js';
import { executeTargetJob, type SetupCalibration } from '../target-job.js';
import type { FromWorker, ToWorker } from './protocol.js';

const port = parentPort;
if (port === null) throw new Error('worker.js must run in a worker thread');
const calibrations = new Map<string, SetupCalibration>();

port.on('message', (msg: ToWorker) => {
  if (msg.type === 'calibration') {
    calibrations.set(msg.setupKey, unpack<SetupCalibration>(msg.packed));
    return;
  }
  const calibration = calibrations.get(msg.job.setupKey);
  if (calibration === undefined) throw new Error(`no calibration ${msg.job.setupKey} sent before its target`);
  const outcome = executeTargetJob(msg.job, calibration, (event) => port.postMessage({ type: 'event', event } satisfies FromWorker));
  port.postMessage({ type: 'result', outcome } satisfies FromWorker);
});
