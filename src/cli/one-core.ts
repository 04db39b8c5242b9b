/**
 * Node on one core. V8 optimises hot functions and collects garbage on background threads;
 * confined to one core, those run only when the scheduler takes the core from the main thread,
 * so the hot loops of a reduction wait longer in slower code and the collector's work is split
 * and handed over. Measured on the full-size benchmark run pinned with `taskset -c 0` (README,
 * Speed): --no-concurrent-recompilation saves 0.4-0.7 s of ~7 s, and --single-threaded (which
 * includes it and also keeps the garbage collector on the main thread) 0.15-0.24 s more. With a
 * second core free the background threads are a gain instead (unpinned: 6.0-7.3 s with them,
 * 6.6-7.6 s without), so the launchers restart Node with the flag only when the process may use
 * one core. Worker threads (`--jobs`) still work under it.
 */
import { spawn } from 'node:child_process';
import { availableParallelism, constants } from 'node:os';

export const ONE_CORE_FLAG = '--single-threaded';

/** Whether to start again with ONE_CORE_FLAG: one usable core (the affinity mask counts) and not done yet. */
export function wantsOneCoreRestart(cores: number = availableParallelism(), execArgv: readonly string[] = process.execArgv): boolean {
  return cores === 1 && !execArgv.includes(ONE_CORE_FLAG);
}

/**
 * Run `script` with `args` in a new Node with ONE_CORE_FLAG (and this process's own flags),
 * terminal and pipes shared. Interrupts and terminations sent to this process are passed on, so
 * a batch scheduler that signals the launcher stops the reduction. Resolves to the exit code, 128
 * + the signal's number when the child was killed (the shell's convention). Refuses in a process
 * that already has the flag, so a restart can never restart itself again.
 */
export function restartWithOneCoreFlag(script: string, args: readonly string[]): Promise<number> {
  if (process.execArgv.includes(ONE_CORE_FLAG)) return Promise.reject(new Error(`restartWithOneCoreFlag: this process already runs with ${ONE_CORE_FLAG}`));
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [...process.execArgv, ONE_CORE_FLAG, script, ...args], { stdio: 'inherit' });
    const forward = (signal: NodeJS.Signals) => child.kill(signal);
    const signals = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;
    for (const s of signals) process.on(s, forward);
    child.on('exit', (code, signal) => {
      for (const s of signals) process.off(s, forward);
      resolve(code ?? 128 + (signal ? constants.signals[signal] : 0));
    });
  });
}
