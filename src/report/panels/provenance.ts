import { escapeHtml } from '../html.js';
import type { TargetReportInput } from '../types.js';
import { section } from './section.js';

/** Provenance as recorded by the runner: inputs with their hashes, settings, versions. */
export function provenancePanel(input: TargetReportInput): string {
  const text = JSON.stringify(input.provenance, null, 2);
  return section('provenance', 'Provenance', `<details><summary>Inputs, settings and versions</summary><pre>${escapeHtml(text)}</pre></details>`);
}
