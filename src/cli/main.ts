/**
 * The `whorl` command: parses, validates and calls the library. Exit codes: 0 ok, 1 internal
 * fault, 2 bad input or usage, 3 some targets failed (reduce). A user mistake never prints a
 * stack trace; `--debug` adds one for internal faults.
 */
import { Command, CommanderError } from 'commander';
import { EXIT, InputError } from '../errors.js';
import { VERSION } from '../version.js';
import { type CliIo, processIo } from './io.js';
import { registerInspect } from './commands/inspect.js';
import { registerSimulate } from './commands/simulate.js';
import { registerReduce } from './commands/reduce.js';
import { registerDemo } from './commands/demo.js';
import { registerInventory } from './commands/inventory.js';
import { registerReport } from './commands/report.js';

/** Each command module adds itself to the program; its action reports a non-zero exit code through setExit. */
export type CommandRegistrar = (program: Command, io: CliIo, setExit: (code: number) => void) => void;

const COMMANDS: CommandRegistrar[] = [registerInspect, registerSimulate, registerReduce, registerDemo, registerInventory, registerReport];

export async function main(argv: string[], io: CliIo = processIo()): Promise<number> {
  let exitCode: number = EXIT.ok;
  const debug = argv.includes('--debug');
  const program = new Command()
    .name('whorl')
    .description('Rotation curves of disk galaxies from raw long-slit CCD frames.')
    .version(VERSION, '-V, --version', 'print the whorl version')
    .option('--debug', 'print stack traces of internal faults')
    .showHelpAfterError('(run with --help for usage)')
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err });
  for (const register of COMMANDS) register(program, io, (code) => (exitCode = code));
  try {
    await program.parseAsync(argv);
    return exitCode;
  } catch (e) {
    if (e instanceof CommanderError) {
      // --help and --version end here with exit code 0; usage mistakes are bad input.
      return e.exitCode === 0 ? EXIT.ok : EXIT.badInput;
    }
    if (e instanceof InputError) {
      io.err(`whorl: ${e.message}\n`);
      return EXIT.badInput;
    }
    const err = e instanceof Error ? e : new Error(String(e));
    io.err(`whorl: internal error: ${err.message}\n`);
    if (debug && err.stack) io.err(`${err.stack}\n`);
    else io.err('(this is a bug in whorl; rerun with --debug for details)\n');
    return EXIT.internal;
  }
}
