/**
 * Simulator speed: a full-size run (13 frames of 4096 x 2048 plus overscan) made in memory and
 * written to disk, and a small run. Target from the simulator brief: full size well under a
 * minute on one core, small in about a second.
 */
import { join } from 'node:path';
import { simulateRun } from '../sim/simulate.js';
import { writeSimulatedRun } from '../sim/write.js';
import { RssPeak } from './harness/rss-peak.js';
import type { BenchContext, BenchRow } from './types.js';

export async function benchSim(ctx: BenchContext): Promise<BenchRow[]> {
  const rss = new RssPeak();
  const rows: BenchRow[] = [];
  try {
    rss.take();
    let t0 = performance.now();
    simulateRun({ size: 'small' });
    rows.push({ name: 'sim: small run in memory (13 frames 1056x300)', wallMs: performance.now() - t0, peakRssMb: rss.take(), target: '~ 1000 ms' });

    t0 = performance.now();
    const cpu0 = process.cpuUsage();
    const full = simulateRun({ size: 'full' });
    const fullMs = performance.now() - t0;
    const cpu = process.cpuUsage(cpu0);
    const pixels = full.frames.reduce((n, f) => n + f.width * f.height, 0);
    // CPU time as well: on a shared machine the wall time also counts other processes.
    const cpuS = (cpu.user + cpu.system) / 1e6;
    rows.push({ name: 'sim: full run in memory (13 frames 4128x2048)', wallMs: fullMs, peakRssMb: rss.take(), figure: `${cpuS.toFixed(1)} s CPU, ${(pixels / 1e6 / cpuS).toFixed(1)} Mpixel/s`, target: '< 60000 ms' });

    t0 = performance.now();
    writeSimulatedRun(full, join(ctx.scratchDir, 'sim-full'));
    rows.push({ name: 'sim: write the full run (FITS with checksums, truth.json, run.yaml)', wallMs: performance.now() - t0, peakRssMb: rss.take() });
  } finally {
    await rss.stop();
  }
  return rows;
}
