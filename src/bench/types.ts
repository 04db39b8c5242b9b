/** One line of the `npm run bench` table. Each area exports `bench<Area>(ctx)` returning rows. */
export interface BenchRow {
  /** Area and what was measured, e.g. `fits: decode 4096x2048 uint16`. */
  name: string;
  wallMs: number;
  /** Peak resident memory during the measurement, MB (process.memoryUsage().rss sampled), if measured. */
  peakRssMb?: number;
  /** A throughput or other figure with its unit, e.g. `412 MB/s`, `31000 fits/s`. */
  figure?: string;
  /** The target from the issue, e.g. `< 100 ms`. */
  target?: string;
}

export interface BenchContext {
  /** Folder with a cached full-size simulated run (raw/, truth.json, run.yaml). */
  runDir: string;
  /** Scratch folder for outputs. */
  scratchDir: string;
}
