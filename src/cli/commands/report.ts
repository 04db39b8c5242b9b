/** `whorl report OUTPUT`: render every report.html and the index of a reduced run again. */
import { resolve } from 'node:path';
import type { Command } from 'commander';
import { rebuildReports } from '../../run/report-files.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

export const registerReport: CommandRegistrar = (program: Command, io: CliIo) => {
  program
    .command('report')
    .description('render the reports (report.html per target, index.html) of a reduced run again, without reducing anything')
    .argument('<output>', "the output folder of a run (the manifest's `output`)")
    .action((output: string) => {
      const dir = resolve(output);
      const n = rebuildReports(dir);
      io.out(`${n} target report${n === 1 ? '' : 's'} and the index written in ${dir}\n`);
    });
};
