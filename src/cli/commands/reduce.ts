/** `whorl reduce RUN.yaml`: every target of a manifest to products (see src/run/runner.ts). */
import { availableParallelism } from 'node:os';
import type { Command } from 'commander';
import { EXIT, InputError } from '../../errors.js';
import type { EventSink } from '../../run/events.js';
import { loadManifest } from '../../run/manifest/resolve.js';
import { jsonProgress } from '../../run/progress/json.js';
import { liveProgress } from '../../run/progress/live.js';
import { plainProgress } from '../../run/progress/plain.js';
import { reduceRun } from '../../run/runner.js';
import type { RunSummary } from '../../run/summary.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

interface ReduceFlags {
  jobs?: string;
  only?: string[];
  force?: boolean;
  quiet?: boolean;
  json?: boolean;
}

export const registerReduce: CommandRegistrar = (program: Command, io: CliIo, setExit) => {
  program
    .command('reduce')
    .description('reduce every target of a run manifest to rotation curves and products')
    .argument('<manifest>', 'the run manifest (YAML)')
    .option('-j, --jobs <n>', 'targets reduced in parallel (default: number of cores)')
    .option('--only <names...>', 'reduce only these targets (names or folder names)')
    .option('--force', 'ignore cached results and redo everything')
    .option('-q, --quiet', 'print only failures')
    .option('--json', 'print one JSON event per line instead of messages')
    .action(async (manifest: string, flags: ReduceFlags) => {
      const jobs = parseJobs(flags.jobs);
      const run = loadManifest(manifest);
      const progress = chooseProgress(io, flags);
      try {
        const result = await reduceRun(run, { jobs, ...(flags.only ? { only: flags.only } : {}), force: Boolean(flags.force), onEvent: progress });
        if (!flags.json && !flags.quiet) io.out(formatSummaryTable(result.summary, result.cached));
        setExit(result.summary.targets.some((t) => t.status === 'failed' && result.outcomes.has(t.name)) ? EXIT.someTargetsFailed : EXIT.ok);
      } finally {
        progress.stop?.();
      }
    });
};

export function parseJobs(text: string | undefined): number {
  if (text === undefined) return availableParallelism();
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1) throw new InputError('cli.jobs', 'bad --jobs', { key: '--jobs' }, { expected: 'a whole number >= 1', actual: text });
  return n;
}

function chooseProgress(io: CliIo, flags: ReduceFlags): EventSink & { stop?: () => void } {
  if (flags.json) return jsonProgress(io.out);
  if (io.isTty && !flags.quiet) return liveProgress(process.stderr, io.color);
  return plainProgress(io.err, { quiet: Boolean(flags.quiet) });
}

/** One line per target: status, systemic and outer velocity, folder. */
export function formatSummaryTable(summary: RunSummary, cached: readonly string[]): string {
  const rows = summary.targets
    .filter((t) => t.status !== 'not-run')
    .map((t) => {
      const n = t.numbers;
      const status = t.status === 'ok' ? (cached.includes(t.name) ? 'ok (unchanged)' : 'ok') : 'FAILED';
      const v = (x: number | undefined, e?: number) => (x === undefined ? '-' : e === undefined ? x.toFixed(1) : `${x.toFixed(1)} +- ${e.toFixed(1)}`);
      return [t.name, status, v(n.vSysKms, n.vSysErrKms), v(n.vOuterKms), t.status === 'failed' ? (t.reason ?? '') : `${t.folder}/`];
    });
  const head = ['target', 'status', 'v_sys km/s', 'v_outer km/s', 'products / reason'];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (r: string[]) => `${r.map((c, i) => (i === r.length - 1 ? c : c.padEnd(widths[i]!))).join('  ')}\n`;
  return line(head) + rows.map(line).join('');
}
