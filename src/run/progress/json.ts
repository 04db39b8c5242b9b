/** `--json`: one event per line on stdout, for machines. */
import type { EventSink } from '../events.js';

export function jsonProgress(write: (text: string) => void): EventSink {
  return (e) => write(`${JSON.stringify(e)}\n`);
}
