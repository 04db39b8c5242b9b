/**
 * The live display on a terminal: an overall bar (targets done, ETA) and one bar per running
 * target showing its stage. Colour only when allowed (NO_COLOR unset, see cli/io.ts).
 */
import cliProgress from 'cli-progress';
import type { EventSink } from '../events.js';

export function liveProgress(stream: NodeJS.WritableStream, color: boolean): EventSink & { stop(): void } {
  const bold = (s: string) => (color ? `\u001b[1m${s}\u001b[22m` : s);
  const bars = new cliProgress.MultiBar(
    {
      stream,
      hideCursor: true,
      clearOnComplete: false,
      stopOnComplete: false,
      etaBuffer: 8,
      barsize: 24,
      format: (options, params, payload: { label: string; stage: string }) => {
        const width = options.barsize ?? 24;
        const filled = Math.round(params.progress * width);
        const bar = '#'.repeat(filled) + '-'.repeat(width - filled);
        const eta = payload.label === 'all' && Number.isFinite(params.eta) && params.value > 0 ? ` ETA ${params.eta}s` : '';
        return `${bold(payload.label.padEnd(18).slice(0, 18))} [${bar}] ${String(params.value)}/${String(params.total)} ${payload.stage}${eta}`;
      },
    },
    cliProgress.Presets.legacy,
  );
  let overall: cliProgress.SingleBar | undefined;
  const perTarget = new Map<string, cliProgress.SingleBar>();
  const sink = (e: Parameters<EventSink>[0]): void => {
    switch (e.type) {
      case 'run-start':
        overall = bars.create(e.targets.length, 0, { label: 'all', stage: '' });
        break;
      case 'setup-start':
        perTarget.set(`setup:${e.setup}`, bars.create(1, 0, { label: `setup ${e.setup}`, stage: 'calibrating' }));
        break;
      case 'setup-done': {
        const bar = perTarget.get(`setup:${e.setup}`);
        bar?.update(bar.getTotal(), { stage: e.status === 'failed' ? `FAILED: ${e.reason ?? ''}` : e.status === 'cached' ? 'unchanged' : 'calibrated' });
        break;
      }
      case 'target-start':
        perTarget.set(e.target, bars.create(1, 0, { label: e.target, stage: 'starting' }));
        break;
      case 'stage': {
        const bar = e.target !== undefined ? perTarget.get(e.target) : perTarget.get(`setup:${e.setup ?? ''}`);
        bar?.setTotal(e.total);
        bar?.update(e.index, { stage: e.stage });
        break;
      }
      case 'target-done': {
        const bar = perTarget.get(e.target) ?? bars.create(1, 0, { label: e.target, stage: '' });
        bar.update(bar.getTotal(), { stage: e.status === 'failed' ? `FAILED: ${e.reason ?? ''}` : e.status === 'cached' ? 'unchanged' : `done ${e.seconds.toFixed(1)} s` });
        overall?.increment(1, { stage: '' });
        break;
      }
      case 'notice':
        bars.log(`${e.message}\n`);
        break;
      case 'run-done':
        overall?.update({ stage: '' });
        bars.stop();
        stream.write(`${e.summary}\n`);
        break;
    }
  };
  return Object.assign(sink, { stop: () => bars.stop() });
}
