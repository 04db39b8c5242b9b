// A worker that takes a target from each batch (as dist/run/workers/worker.js does) and dies holding it.
import { parentPort, threadId } from 'node:worker_threads';

parentPort.on('message', (msg) => {
  const claims = new Int32Array(msg.claims);
  const index = Atomics.add(claims, 0, 1);
  if (index >= claims.length - 1) return;
  Atomics.store(claims, 1 + index, threadId + 1);
  process.exit(7);
});
