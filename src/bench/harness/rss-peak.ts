/** Peak resident memory (MB) of the whole process between two reads, sampled by a helper thread. */
import { Worker } from 'node:worker_threads';

export class RssPeak {
  private readonly shared = new SharedArrayBuffer(8);
  private readonly peak = new Float64Array(this.shared);
  private readonly worker: Worker;

  constructor() {
    this.peak[0] = process.memoryUsage.rss() / 1048576;
    this.worker = new Worker(new URL('./rss-sampler.js', import.meta.url), { workerData: { buffer: this.shared } });
    this.worker.unref();
  }

  /** The peak since the last call (or the start), and start a new interval from the current RSS. */
  take(): number {
    const now = process.memoryUsage.rss() / 1048576;
    const peak = Math.max(this.peak[0]!, now);
    this.peak[0] = now;
    return peak;
  }

  async stop(): Promise<void> {
    await this.worker.terminate();
  }
}
