import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ONE_CORE_FLAG, wantsOneCoreRestart } from '../../src/cli/one-core.js';

// The restart runs real Node processes, so these use the build (npm test builds first).
const ONE_CORE_JS = resolve('dist/cli/one-core.js');
const BIN = resolve('bin/whorl');
const dir = mkdtempSync(join(tmpdir(), 'whorl-one-core-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A launcher process (a script file, no flags of its own) that restarts `script` through restartWithOneCoreFlag and exits with its code. */
function launcher(script: string) {
  const file = join(dir, `launch-${Math.random().toString(36).slice(2)}.mjs`);
  writeFileSync(file, `import { restartWithOneCoreFlag } from ${JSON.stringify(ONE_CORE_JS)}; process.exitCode = await restartWithOneCoreFlag(${JSON.stringify(script)}, ['a b', '--c']);`);
  return spawn(process.execPath, [file], { stdio: 'ignore' });
}

const exitOf = (child: ReturnType<typeof spawn>) => new Promise<number | null>((done) => child.on('exit', (code) => done(code)));

describe('wantsOneCoreRestart', () => {
  it('asks for a restart on one core only, and only once', () => {
    expect(wantsOneCoreRestart(1, [])).toBe(true);
    expect(wantsOneCoreRestart(2, [])).toBe(false);
    expect(wantsOneCoreRestart(1, ['--max-old-space-size=4096', ONE_CORE_FLAG])).toBe(false);
  });
});

describe('restartWithOneCoreFlag', () => {
  it('refuses in a process that already has the flag', async () => {
    const code = `import { restartWithOneCoreFlag } from ${JSON.stringify(ONE_CORE_JS)}; await restartWithOneCoreFlag(process.argv[1] ?? '', []);`;
    const run = spawnSync(process.execPath, [ONE_CORE_FLAG, '--input-type=module', '-e', code], { encoding: 'utf8', timeout: 20000 });
    expect(run.status).not.toBe(0);
    expect(run.stderr).toContain('already runs with');
  });

  it('runs the script with the flag and the same arguments, and returns its exit code', async () => {
    const script = join(dir, 'report.mjs');
    const out = join(dir, 'report.json');
    writeFileSync(script, `import { writeFileSync } from 'node:fs'; writeFileSync(${JSON.stringify(out)}, JSON.stringify({ execArgv: process.execArgv, args: process.argv.slice(2) })); process.exitCode = 3;`);
    expect(await exitOf(launcher(script))).toBe(3);
    const seen = JSON.parse(readFileSync(out, 'utf8'));
    expect(seen.execArgv).toContain(ONE_CORE_FLAG);
    expect(seen.args).toEqual(['a b', '--c']);
  });

  it('passes a termination on to the restarted process (exit code 128 + 15)', async () => {
    const script = join(dir, 'sleep.mjs');
    const pidFile = join(dir, 'sleep.pid');
    writeFileSync(script, `import { writeFileSync } from 'node:fs'; writeFileSync(${JSON.stringify(pidFile)}, String(process.pid)); setTimeout(() => {}, 60000);`);
    const parent = launcher(script);
    const exited = exitOf(parent);
    while (!existsSync(pidFile) || readFileSync(pidFile, 'utf8') === '') await new Promise((r) => setTimeout(r, 20));
    const childPid = Number(readFileSync(pidFile, 'utf8'));
    parent.kill('SIGTERM');
    expect(await exited).toBe(143);
    // The restarted process is gone too (signal 0 only checks that the pid exists).
    expect(() => process.kill(childPid, 0)).toThrow();
  });
});

describe('bin/whorl on one core', () => {
  // taskset (util-linux) is there on Debian; CPU 0 may lie outside a container's CPU set.
  const taskset = spawnSync('taskset', ['-c', '0', 'true']).status === 0;
  it.runIf(taskset)('restarts itself under taskset and keeps exit codes and messages (bad input: 2)', () => {
    const ok = spawnSync('taskset', ['-c', '0', process.execPath, BIN, '--version'], { encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(ok.stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
    const bad = spawnSync('taskset', ['-c', '0', process.execPath, BIN, 'reduce', join(dir, 'missing.yaml')], { encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('missing.yaml');
  });
});
