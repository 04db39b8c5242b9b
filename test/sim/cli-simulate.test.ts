import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { main } from '../../src/cli/main.js';

const base = mkdtempSync(join(tmpdir(), 'whorl-sim-cli-'));
afterAll(() => rmSync(base, { recursive: true, force: true }));

async function whorl(...args: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = memoryIo();
  const code = await main(['node', 'whorl', ...args], io);
  return { code, out: io.stdout, err: io.stderr };
}

describe('whorl simulate', () => {
  it('writes a run with --expected and says where', async () => {
    const out = join(base, 'night');
    const r = await whorl('simulate', '--out', out, '--seed', '4', '--expected');
    expect(r.code).toBe(0);
    expect(r.out).toContain('simulated 13 frames (5 bias, 3 flat, 2 arc, 3 science)');
    expect(r.out).toContain('Halden Spiral');
    expect(readdirSync(out).sort()).toEqual(['expected', 'raw', 'run.yaml', 'truth.json']);
  });

  it('writes several targets with --targets', async () => {
    const out = join(base, 'three');
    const r = await whorl('simulate', '--out', out, '--targets', '3');
    expect(r.code).toBe(0);
    expect(readdirSync(join(out, 'raw')).filter((n) => n.startsWith('sci_'))).toHaveLength(9);
    expect(existsSync(join(out, 'expected'))).toBe(false);
  });

  it('exits 2 naming the option for a bad variant, size, seed or target count, without a stack trace', async () => {
    for (const [args, word] of [
      [['--variant', 'tilted'], 'variant'],
      [['--size', 'huge'], 'size'],
      [['--seed', 'abc'], '--seed'],
      [['--targets', '0'], 'targets'],
    ] as const) {
      const r = await whorl('simulate', '--out', join(base, 'bad'), ...args);
      expect(r.code).toBe(2);
      expect(r.err).toContain(word);
      expect(r.err).not.toMatch(/\n\s+at /);
    }
    expect(existsSync(join(base, 'bad'))).toBe(false);
  });

  it('exits 2 naming the path, before simulating, when a file stands at --out or above it', async () => {
    const file = join(base, 'a-file');
    writeFileSync(file, 'not a folder\n');
    for (const out of [file, join(file, 'night')]) {
      const r = await whorl('simulate', '--out', out);
      expect(r.code).toBe(2);
      expect(r.err).toContain(out);
      expect(r.err).toContain('--out');
      expect(r.err).not.toMatch(/internal error|\n\s+at /);
    }
  });

  it('refuses a folder that holds frames of another run (its globs would mix them in); the same run again is fine', async () => {
    const out = join(base, 'reused');
    expect((await whorl('simulate', '--out', out, '--targets', '2')).code).toBe(0);
    expect((await whorl('simulate', '--out', out, '--targets', '2')).code).toBe(0);
    const r = await whorl('simulate', '--out', out);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/reused, --out: the folder holds files this run would not replace.*raw\/sci_004\.fits/);
    expect(readdirSync(join(out, 'raw')).filter((n) => n.startsWith('sci_'))).toHaveLength(6);
  });
});
