import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { memoryIo } from '../../src/cli/io.js';

describe('whorl demo', () => {
  it('simulates and reduces a small night, printing where the products and the report are', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'whorl-demo-')), 'demo');
    const io = memoryIo();
    const code = await main(['node', 'whorl', 'demo', '--out', out], io);
    expect(code, io.stderr).toBe(0);
    expect(io.stdout).toContain(`report    ${join(out, 'products', 'Halden-Spiral', 'report.html')}`);
    expect(io.stdout).toMatch(/v_outer\s+\d+\.\d km\/s \(folded curve, outermost points; simulated V at \d+\.\d kpc: \d+\.\d\)/);
    expect(io.stdout).toMatch(/v_sys\s+\d+\.\d \+- \d+\.\d km\/s barycentric \(simulated: \d+\.\d\)/);
    for (const f of ['run.yaml', 'truth.json', 'products/index.html', 'products/Halden-Spiral/curve.csv']) expect(existsSync(join(out, f)), f).toBe(true);
  });

  it('refuses a folder holding frames of another run, which its globs would mix in (exit 2)', async () => {
    const out = mkdtempSync(join(tmpdir(), 'whorl-demo-stale-'));
    mkdirSync(join(out, 'raw'));
    writeFileSync(join(out, 'raw', 'sci_009.fits'), 'not this run');
    const io = memoryIo();
    expect(await main(['node', 'whorl', 'demo', '--out', out], io)).toBe(2);
    expect(io.stderr).toContain('raw/sci_009.fits');
  });
});
