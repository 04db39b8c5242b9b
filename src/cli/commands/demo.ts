/**
 * `whorl demo [--out DIR]`: simulate a small night of the fictional galaxy and reduce it end to
 * end, then say where the products and the report are and what the curve gave.
 */
import { availableParallelism } from 'node:os';
import { join, resolve } from 'node:path';
import type { Command } from 'commander';
import { EXIT } from '../../errors.js';
import { loadManifest } from '../../run/manifest/resolve.js';
import { plainProgress } from '../../run/progress/plain.js';
import { reduceRun } from '../../run/runner.js';
import { simulateRun } from '../../sim/simulate.js';
import { trueRotation } from '../../sim/truth.js';
import { assertNoStaleFiles, writeSimulatedRun } from '../../sim/write.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

/** Default folder of the demo (git-ignored). */
export const DEMO_DIR = 'demo-output';

export const registerDemo: CommandRegistrar = (program: Command, io: CliIo, setExit) => {
  program
    .command('demo')
    .description('simulate a small night of a fictional galaxy and reduce it end to end')
    .option('-o, --out <dir>', 'folder for the simulated run and its products', DEMO_DIR)
    .action(async (flags: { out: string }) => {
      const dir = resolve(flags.out);
      const started = performance.now();
      io.out(`simulating a small observing night in ${dir} ...\n`);
      const sim = simulateRun({ size: 'small' });
      assertNoStaleFiles(sim, dir, '--out');
      writeSimulatedRun(sim, dir);
      io.out(`reducing ${join(dir, 'run.yaml')} ...\n`);
      const run = loadManifest(join(dir, 'run.yaml'));
      const result = await reduceRun(run, { jobs: availableParallelism(), onEvent: plainProgress(io.err, { quiet: true }) });
      for (const t of result.summary.targets) {
        const truth = sim.truth.targets.find((x) => x.name === t.name);
        const folder = join(run.outputDir, t.folder);
        if (t.status !== 'ok') {
          io.out(`${t.name}: FAILED: ${t.reason ?? ''}\n`);
          continue;
        }
        io.out(`${t.name}:\n`);
        io.out(`  products  ${folder}/\n`);
        io.out(`  report    ${join(folder, 'report.html')}\n`);
        const n = t.numbers;
        if (n.vOuterKms !== undefined) {
          const r = n.rMaxKpc;
          const simulated = truth && r !== undefined ? `; simulated V at ${r.toFixed(1)} kpc: ${trueRotation(truth, r / truth.kpcPerArcsec).toFixed(1)}` : '';
          io.out(`  v_outer   ${n.vOuterKms.toFixed(1)} km/s (folded curve, outermost points${simulated})\n`);
        }
        if (n.vSysKms !== undefined) io.out(`  v_sys     ${n.vSysKms.toFixed(1)} +- ${(n.vSysErrKms ?? NaN).toFixed(1)} km/s barycentric${truth ? ` (simulated: ${truth.vSysKms.toFixed(1)})` : ''}\n`);
      }
      io.out(`run index ${join(run.outputDir, 'index.html')}\n`);
      io.out(`done in ${((performance.now() - started) / 1000).toFixed(1)} s\n`);
      setExit(result.summary.counts.failed > 0 ? EXIT.someTargetsFailed : EXIT.ok);
    });
};
