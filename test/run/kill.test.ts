import { spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { describe, expect, it } from 'vitest';
import type { RunEvent } from '../../src/run/events.js';
import { copyOfSimulatedRun, isTimedOrState, listFiles, readBytes } from './simulated-run.js';

const ROOT = join(import.meta.dirname, '..', '..');
const CLI = join(ROOT, 'bin', 'whorl');
const BUILT = existsSync(join(ROOT, 'dist', 'cli', 'main.js'));
const TWO = { size: 'small', targets: 2, seed: 1 } as const;

/**
 * Run the CLI with --json (and SIGKILL it at the first event `when` accepts); resolves with the
 * events seen. Every run of this test goes through the built CLI, so all use the same code.
 */
function runCli(manifest: string, when: (e: RunEvent) => boolean = () => false): Promise<RunEvent[]> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, [CLI, 'reduce', manifest, '--jobs', '1', '--json'], { stdio: ['ignore', 'pipe', 'pipe'] });
    const events: RunEvent[] = [];
    createInterface({ input: child.stdout }).on('line', (line) => {
      const e = JSON.parse(line) as RunEvent;
      events.push(e);
      if (when(e)) child.kill('SIGKILL');
    });
    child.on('error', fail);
    child.on('exit', () => done(events));
  });
}

describe.skipIf(!BUILT)('a run killed mid-stage', () => {
  it('leaves no partial product, and the rerun gives products identical to an uninterrupted run', async () => {
    const reference = copyOfSimulatedRun(TWO, 'kill-ref');
    expect((await runCli(join(reference, 'run.yaml'))).at(-1)?.type).toBe('run-done');
    const refOut = join(reference, 'products');
    const refFiles = listFiles(refOut, isTimedOrState);

    for (const [label, when] of [
      // while the second target writes its products (after its first file may have landed)
      ['write', (e: RunEvent) => e.type === 'stage' && e.stage === 'write' && e.target === 'Orrin Disk'],
      // in the middle of the first target's sky stage
      ['sky', (e: RunEvent) => e.type === 'stage' && e.stage === 'sky' && e.target === 'Halden Spiral'],
    ] as const) {
      const dir = copyOfSimulatedRun(TWO, `kill-${label}`);
      const manifest = join(dir, 'run.yaml');
      const out = join(dir, 'products');
      const seen = await runCli(manifest, when);
      expect(seen.some(when), label).toBe(true);
      expect(seen.some((e) => e.type === 'run-done'), label).toBe(false);

      // Whatever is in place is complete: byte-identical to the uninterrupted run's file.
      for (const f of listFiles(out, isTimedOrState).filter((f) => !/(^|\/)\.[^/]*\.partial-/.test(f))) {
        if (f === 'summary.json' || f === 'index.html') continue; // from no run yet: the killed run never reached them
        expect(refFiles, `${label}: ${f}`).toContain(f);
        expect(readBytes(out, f).equals(readBytes(refOut, f)), `${label}: ${f}`).toBe(true);
      }

      const resumed = await runCli(manifest);
      expect(resumed.at(-1)?.type, label).toBe('run-done');
      if (label === 'write') expect(resumed.filter((e) => e.type === 'target-done' && e.status === 'cached').map((e) => e.type === 'target-done' && e.target)).toEqual(['Halden Spiral']);
      expect(listFiles(out, isTimedOrState)).toEqual(refFiles);
      for (const f of refFiles) expect(readBytes(out, f).equals(readBytes(refOut, f)), `${label} rerun: ${f}`).toBe(true);
      const leftovers = readdirSync(out, { recursive: true }).map(String).filter((f) => f.includes('.partial-'));
      expect(leftovers, label).toEqual([]);
    }
  });
});

if (!BUILT) console.warn('test/run/kill.test.ts: dist/ missing (run `npm run build`), kill test skipped');
