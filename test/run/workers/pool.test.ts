import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ResolvedSetup, ResolvedTarget } from '../../../src/run/manifest/resolve.js';
import type { SetupCalibration, TargetJob } from '../../../src/run/target-job.js';
import { claimJob } from '../../../src/run/workers/protocol.js';
import { TargetPool } from '../../../src/run/workers/pool.js';

const DYING = join(import.meta.dirname, 'dying-worker.mjs');

function job(name: string): TargetJob {
  const target = { name, folder: name.toLowerCase(), setup: 'red', frames: [] } as unknown as ResolvedTarget;
  return { target, setup: { name: 'red' } as ResolvedSetup, outputDir: '/nonexistent', baseDir: '/nonexistent', key: `k-${name}`, setupKey: 's', inputs: [], runStartMs: 0 };
}

describe('the target queue shared by the threads', () => {
  it('hands each job to exactly one taker, then none, and records who took it', () => {
    const claims = new Int32Array(new SharedArrayBuffer(4 * 4));
    expect([claimJob(claims, 0), claimJob(claims, 5), claimJob(claims, 0), claimJob(claims, 5)]).toEqual([0, 1, 2, undefined]);
    expect([...claims.subarray(1)]).toEqual([1, 6, 1]);
  });
});

describe('TargetPool', () => {
  it('fails the target a dying worker held, with the reason, and its replacement goes on with the rest', async () => {
    const pool = new TargetPool(1, () => undefined, DYING);
    try {
      const outcomes = await pool.submit([job('Alpha Disk'), job('Beta Disk'), job('Gamma Disk')], {} as SetupCalibration);
      expect(outcomes.map((o) => o.entry.name)).toEqual(['Alpha Disk', 'Beta Disk', 'Gamma Disk']);
      for (const o of outcomes) {
        expect(o.entry.status).toBe('failed');
        expect(o.entry.reasonCode).toBe('run.worker-died');
        expect(o.entry.reason).toMatch(/exited with code 7/);
      }
    } finally {
      await pool.close();
    }
  }, 20_000);
});
