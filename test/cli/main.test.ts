import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { memoryIo } from '../../src/cli/io.js';
import { VERSION } from '../../src/version.js';

async function whorl(...args: string[]) {
  const io = memoryIo();
  const code = await main(['node', 'whorl', ...args], io);
  return { code, out: io.stdout, err: io.stderr };
}

describe('the whorl command', () => {
  it('prints its version and exits 0', async () => {
    const r = await whorl('--version');
    expect(r.code).toBe(0);
    expect(r.out.trim()).toBe(VERSION);
  });

  it('lists reduce and demo in its help', async () => {
    const r = await whorl('--help');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/reduce \[options\] <manifest>/);
    expect(r.out).toMatch(/demo \[options\]/);
  });

  it('exits 2 on an unknown command or option, with a hint and no stack trace', async () => {
    const unknown = await whorl('reduse');
    expect(unknown.code).toBe(2);
    expect(unknown.err).toMatch(/unknown command 'reduse'/);
    const option = await whorl('reduce', 'run.yaml', '--fast');
    expect(option.code).toBe(2);
    expect(option.err).toMatch(/unknown option '--fast'/);
    expect(option.err).not.toMatch(/\n\s+at /);
  });

  it('exits 2 with one line naming the file when the manifest is missing', async () => {
    const r = await whorl('reduce', '/nonexistent/run.yaml');
    expect(r.code).toBe(2);
    expect(r.err).toBe('whorl: /nonexistent/run.yaml: cannot read the manifest: no such file (expected a YAML run manifest)\n');
  });
});
