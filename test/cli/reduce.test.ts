import { readFileSync, truncateSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { memoryIo } from '../../src/cli/io.js';
import type { RunEvent } from '../../src/run/events.js';
import { copyOfSimulatedRun, listFiles, sharedSimulatedRun } from '../run/simulated-run.js';

const ONE = { size: 'small', targets: 1, seed: 1 } as const;

async function whorl(...args: string[]) {
  const io = memoryIo();
  const code = await main(['node', 'whorl', ...args], io);
  return { code, out: io.stdout, err: io.stderr };
}

beforeAll(() => void sharedSimulatedRun(ONE));

describe('whorl reduce', () => {
  it('exits 2 on a malformed manifest, naming the file, key and line, without a stack trace', async () => {
    const dir = copyOfSimulatedRun(ONE, 'cli-bad');
    const manifest = join(dir, 'run.yaml');
    writeFileSync(manifest, readFileSync(manifest, 'utf8').replace(/inclination_deg: [\d.]+/, 'inclination_deg: steep'));
    const r = await whorl('reduce', manifest, '--jobs', '1');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/run\.yaml, targets\[0\]\.inclination_deg, line \d+:\d+: wrong type \(expected number\)/);
    expect(r.err).not.toMatch(/\n\s+at /);
    expect(r.out).toBe('');
  });

  it('exits 2 on a bad --jobs and on an unknown --only name', async () => {
    const manifest = join(sharedSimulatedRun(ONE), 'run.yaml');
    expect((await whorl('reduce', manifest, '--jobs', 'many')).code).toBe(2);
    const r = await whorl('reduce', manifest, '--only', 'Nobody');
    expect(r.code).toBe(2);
    expect(r.err).toContain("no target named 'Nobody'");
  });

  it('reduces a run: exit 0, a summary table, plain progress, products under output', async () => {
    const dir = copyOfSimulatedRun(ONE, 'cli-ok');
    const r = await whorl('reduce', join(dir, 'run.yaml'), '--jobs', '1');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^target\s+status/);
    expect(r.out).toMatch(/Halden Spiral\s+ok/);
    expect(r.err).toContain('[1/1] Halden Spiral: done in');
    const files = listFiles(join(dir, 'products'), (f) => f.startsWith('.whorl'));
    expect(files).toEqual(expect.arrayContaining(['summary.json', 'index.html', 'calib/red/bias.fits', 'calib/red/solution.json', 'Halden-Spiral/spectrum.fits']));

    const again = await whorl('reduce', join(dir, 'run.yaml'), '--jobs', '1', '--quiet');
    expect(again.code).toBe(0);
    expect(again.out + again.err).toBe('');
  });

  it('exits 3 when a target fails, naming it and the reason', async () => {
    const dir = copyOfSimulatedRun(ONE, 'cli-fail');
    truncateSync(join(dir, 'raw', 'sci_002.fits'), 4000);
    const r = await whorl('reduce', join(dir, 'run.yaml'), '--jobs', '1');
    expect(r.code).toBe(3);
    expect(r.out).toMatch(/Halden Spiral\s+FAILED\s+.*sci_002\.fits/);
    expect(r.err).toMatch(/\[1\/1\] Halden Spiral: FAILED: .*sci_002\.fits/);
  });

  it('--json prints one parseable event per line, ending with run-done', async () => {
    const dir = copyOfSimulatedRun(ONE, 'cli-json');
    const r = await whorl('reduce', join(dir, 'run.yaml'), '--jobs', '1', '--json');
    expect(r.code).toBe(0);
    const events = r.out.trim().split('\n').map((l) => JSON.parse(l) as RunEvent);
    expect(events[0]!.type).toBe('run-start');
    expect(events.at(-1)!.type).toBe('run-done');
    expect(events.some((e) => e.type === 'stage' && e.target === 'Halden Spiral')).toBe(true);
    expect(r.err).toBe('');
  });

  it('keeps outputs inside `output` whatever the target is called', async () => {
    const dir = copyOfSimulatedRun(ONE, 'cli-escape');
    const manifest = join(dir, 'run.yaml');
    writeFileSync(manifest, readFileSync(manifest, 'utf8').replace('name: Halden Spiral', 'name: ../../escaped'));
    const r = await whorl('reduce', manifest, '--jobs', '1');
    expect(r.code).toBe(0);
    expect(listFiles(dir).filter((f) => !f.startsWith('products/') && !f.startsWith('raw/'))).toEqual(['run.yaml', 'truth.json']);
    expect(listFiles(join(dir, 'products'))).toContain('escaped/spectrum.fits');
  });
});
