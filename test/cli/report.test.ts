import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { memoryIo } from '../../src/cli/io.js';
import { copyOfSimulatedRun } from '../run/simulated-run.js';

const whorl = (io: ReturnType<typeof memoryIo>, ...args: string[]) => main(['node', 'whorl', ...args], io);

describe('whorl report OUTPUT', () => {
  it('renders the same report.html and index.html again from a reduced run', async () => {
    const dir = copyOfSimulatedRun({ size: 'small' }, 'report-rebuild');
    expect(await whorl(memoryIo(), 'reduce', join(dir, 'run.yaml'), '--jobs', '1', '--quiet')).toBe(0);
    const out = join(dir, 'products');
    const folder = 'Halden-Spiral';
    const before = { report: readFileSync(join(out, folder, 'report.html')), index: readFileSync(join(out, 'index.html')) };
    rmSync(join(out, folder, 'report.html'));
    rmSync(join(out, 'index.html'));
    const io = memoryIo();
    expect(await whorl(io, 'report', out)).toBe(0);
    expect(io.stdout).toContain('1 target report');
    expect(readFileSync(join(out, folder, 'report.html')).equals(before.report)).toBe(true);
    expect(readFileSync(join(out, 'index.html')).equals(before.index)).toBe(true);
    rmSync(dir, { recursive: true, force: true });
  });

  it('refuses a folder that whorl did not reduce, naming it, with exit code 2', async () => {
    const io = memoryIo();
    expect(await whorl(io, 'report', 'fixtures')).toBe(2);
    expect(io.stderr).toMatch(/fixtures: not an output folder/);
    expect(io.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });
});
