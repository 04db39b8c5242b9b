import { escapeHtml } from '../html.js';
import type { TargetReportInput } from '../types.js';
import { section } from './section.js';

/** Every diagnostic the stages recorded, most severe first. */
export function warningsPanel(input: TargetReportInput): string {
  const order = { error: 0, warning: 1, info: 2 } as const;
  const items = [...input.diagnostics].sort((a, b) => order[a.severity] - order[b.severity]);
  if (items.length === 0) return section('warnings', 'Warnings', '<p>No stage recorded anything to warn about.</p>');
  const rows = items
    .map((d) => {
      const place = d.place ? Object.entries(d.place).map(([k, v]) => `${k} ${v}`).join(', ') : '';
      const expect = d.expected !== undefined ? ` (expected ${d.expected}${d.actual !== undefined ? `, found ${d.actual}` : ''})` : '';
      return `<tr class="sev-${d.severity}"><td>${escapeHtml(d.severity)}</td><td><code>${escapeHtml(d.rule)}</code></td><td>${escapeHtml(place)}</td><td>${escapeHtml(d.message + expect)}</td></tr>`;
    })
    .join('');
  return section('warnings', 'Warnings', `<table class="diag"><tr><th>severity</th><th>rule</th><th>where</th><th>message</th></tr>${rows}</table>`);
}
