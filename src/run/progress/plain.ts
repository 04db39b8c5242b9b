/** Line-by-line messages when stdout is no terminal (or with --quiet: failures only). */
import type { EventSink } from '../events.js';

export function plainProgress(write: (text: string) => void, opts: { quiet?: boolean } = {}): EventSink {
  let total = 0;
  let done = 0;
  return (e) => {
    switch (e.type) {
      case 'run-start':
        total = e.targets.length;
        if (!opts.quiet) write(`whorl: ${total} target(s) on ${e.jobs} job(s)\n`);
        break;
      case 'setup-start':
        if (!opts.quiet) write(`setup ${e.setup}: calibrating\n`);
        break;
      case 'setup-done':
        if (e.status === 'failed') write(`setup ${e.setup}: FAILED: ${e.reason ?? ''}\n`);
        else if (!opts.quiet) write(`setup ${e.setup}: ${e.status === 'cached' ? 'unchanged, reused' : 'done'}\n`);
        break;
      case 'stage':
        if (!opts.quiet) write(`  ${e.target ?? `setup ${e.setup ?? ''}`}: ${e.stage}\n`);
        break;
      case 'target-done':
        done++;
        if (e.status === 'failed') write(`[${done}/${total}] ${e.target}: FAILED: ${e.reason ?? ''}\n`);
        else if (!opts.quiet) write(`[${done}/${total}] ${e.target}: ${e.status === 'cached' ? 'unchanged, reused' : `done in ${e.seconds.toFixed(1)} s`}\n`);
        break;
      case 'run-done':
        if (!opts.quiet) write(`${e.summary}\n`);
        break;
      case 'notice':
        write(`whorl: ${e.message}\n`);
        break;
      case 'target-start':
        break;
    }
  };
}
