/** `whorl simulate --out DIR`: write a simulated raw observing night with its truth and run.yaml. */
import { statSync } from 'node:fs';
import type { Command } from 'commander';
import { EXIT, InputError } from '../../errors.js';
import { SIM_VARIANTS, type SimOptions } from '../../sim/options.js';
import { simulateRun } from '../../sim/simulate.js';
import { assertNoStaleFiles, writeSimulatedRun } from '../../sim/write.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

interface SimulateFlags {
  out: string;
  seed?: string;
  size?: string;
  variant?: string;
  targets?: string;
  setups?: string;
  expected?: boolean;
}

function wholeNumber(text: string | undefined, flag: string): number | undefined {
  if (text === undefined) return undefined;
  const n = Number(text);
  if (!/^\d+$/.test(text.trim()) || !Number.isSafeInteger(n)) throw new InputError('cli.not-a-number', `bad ${flag}`, { key: flag }, { expected: 'a whole number', actual: text });
  return n;
}

/** Codes of file-system refusals that are the user's to fix (a file in the way, no permission, read-only disk). */
const USER_FS_CODES = new Set(['ENOTDIR', 'EEXIST', 'EACCES', 'EPERM', 'EROFS', 'ENOSPC']);

/** The --out folder must be a folder or not exist yet; checked before minutes of simulation. */
function checkOutFolder(dir: string): void {
  let isFile: boolean;
  try {
    const stat = statSync(dir, { throwIfNoEntry: false });
    isFile = stat !== undefined && !stat.isDirectory();
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOTDIR') throw e;
    isFile = true; // a file stands where a parent folder should be
  }
  if (isFile) throw new InputError('cli.out-not-folder', 'cannot write the run there', { file: dir, key: '--out' }, { expected: 'a folder or a new path', actual: 'a file in the way' });
}

/** Write the run, turning a refusal by the file system into an InputError naming the path. */
function writeRunOrExplain(run: ReturnType<typeof simulateRun>, dir: string): void {
  try {
    writeSimulatedRun(run, dir);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === undefined || !USER_FS_CODES.has(code)) throw e;
    const path = (e as NodeJS.ErrnoException).path ?? dir;
    throw new InputError('cli.out-not-writable', `cannot write the run (${code})`, { file: path, key: '--out' }, { expected: 'a writable folder' });
  }
}

/** The options of the command as simulator options (the simulator checks ranges and names). */
export function simulateOptionsFromFlags(flags: SimulateFlags): SimOptions {
  const options: SimOptions = { expected: Boolean(flags.expected) };
  const seed = wholeNumber(flags.seed, '--seed');
  const targets = wholeNumber(flags.targets, '--targets');
  const setups = wholeNumber(flags.setups, '--setups');
  if (seed !== undefined) options.seed = seed;
  if (targets !== undefined) options.targets = targets;
  if (setups !== undefined) options.setups = setups;
  if (flags.size !== undefined) options.size = flags.size as SimOptions['size'];
  if (flags.variant !== undefined) options.variant = flags.variant as SimOptions['variant'];
  return options;
}

export const registerSimulate: CommandRegistrar = (program: Command, io: CliIo, setExit) => {
  program
    .command('simulate')
    .description('write a simulated raw observing night of fictional galaxies, with truth.json and run.yaml')
    .requiredOption('-o, --out <dir>', 'folder to write raw/, truth.json and run.yaml into')
    .option('--seed <n>', 'seed of every random draw (default 1)')
    .option('--size <size>', 'small (1024 x 300 pixels) or full (4096 x 2048)', 'small')
    .option('--variant <name>', `scenario: ${SIM_VARIANTS.join(', ')}`, 'standard')
    .option('--targets <n>', 'galaxies observed in the night (default 1)')
    .option('--setups <n>', 'spectral setups, 1 or 2 (default 1)')
    .option('--expected', 'also write the noiseless expected image of each frame under expected/')
    .action((flags: SimulateFlags) => {
      const started = performance.now();
      const options = simulateOptionsFromFlags(flags);
      checkOutFolder(flags.out);
      const run = simulateRun(options);
      assertNoStaleFiles(run, flags.out, '--out');
      writeRunOrExplain(run, flags.out);
      const seconds = (performance.now() - started) / 1000;
      const kinds = ['bias', 'flat', 'arc', 'science'].map((k) => `${run.frames.filter((f) => f.kind === k).length} ${k}`).join(', ');
      io.out(`simulated ${run.frames.length} frames (${kinds}) in ${seconds.toFixed(1)} s\n`);
      for (const t of run.truth.targets) io.out(`  ${t.name}: v_sys ${t.vSysKms.toFixed(1)} km/s, inclination ${t.inclinationDeg} deg, setup ${t.setup}\n`);
      io.out(`wrote ${flags.out}/raw/, truth.json and run.yaml${run.expected ? ', expected/' : ''}\n`);
      io.out(`reduce it with: whorl reduce ${flags.out}/run.yaml\n`);
      setExit(EXIT.ok);
    });
};
