/**
 * A thread that samples the process's resident memory every few milliseconds into shared memory,
 * so the benchmark can read the peak of a synchronous stage right after it (the main thread
 * cannot sample while a stage runs). Started by rss-peak.ts.
 */
import { workerData } from 'node:worker_threads';

const peakMb = new Float64Array(workerData.buffer as SharedArrayBuffer);
const INTERVAL_MS = 5;

setInterval(() => {
  const mb = process.memoryUsage.rss() / 1048576;
  if (mb > peakMb[0]!) peakMb[0] = mb;
}, INTERVAL_MS);
