/** `whorl simulate --out DIR`: write a simulated raw observing night with its truth and run.yaml. */
import type { Command } from 'commander';
import { EXIT, InputError } from '../../errors.js';
import { SIM_VARIANTS, type SimOptions } from '../../sim/options.js';
import { simulateRun } from '../../sim/simulate.js';
import { writeSimulatedRun } from '../../sim/write.js';
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
      const run = simulateRun(simulateOptionsFromFlags(flags));
      writeSimulatedRun(run, flags.out);
      const seconds = (performance.now() - started) / 1000;
      const kinds = ['bias', 'flat', 'arc', 'science'].map((k) => `${run.frames.filter((f) => f.kind === k).length} ${k}`).join(', ');
      io.out(`simulated ${run.frames.length} frames (${kinds}) in ${seconds.toFixed(1)} s\n`);
      for (const t of run.truth.targets) io.out(`  ${t.name}: v_sys ${t.vSysKms.toFixed(1)} km/s, inclination ${t.inclinationDeg} deg, setup ${t.setup}\n`);
      io.out(`wrote ${flags.out}/raw/, truth.json and run.yaml${run.expected ? ', expected/' : ''}\n`);
      io.out(`reduce it with: whorl reduce ${flags.out}/run.yaml\n`);
      setExit(EXIT.ok);
    });
};
