import { escapeHtml } from '../html.js';

/** A report panel: a titled section with a stable id the browser tests look for. */
export function section(id: string, title: string, body: string, note?: string): string {
  return `<section class="panel" id="${id}"><h2>${escapeHtml(title)}</h2>${note ? `<p class="note">${escapeHtml(note)}</p>` : ''}${body}</section>`;
}

/** A panel whose product is missing (the stage did not run or failed). */
export function missing(id: string, title: string, why: string): string {
  return section(id, title, `<p class="missing">${escapeHtml(why)}</p>`);
}
