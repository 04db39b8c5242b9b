import { escapeHtml } from './html.js';
import { STYLE } from './style.js';

/**
 * A complete self-contained page. The Content-Security-Policy forbids every network request
 * (only inline script/style and data: images), so the page opens from disk and fetches nothing.
 */
export function page(title: string, body: string, script = ''): string {
  const csp = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; script-src 'unsafe-inline'";
  return (
    `<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">` +
    `<meta http-equiv="Content-Security-Policy" content="${csp}">` +
    `<meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<title>${escapeHtml(title)}</title><style>${STYLE}</style></head>` +
    `<body>${body}${script ? `<script>${script}</script>` : ''}</body></html>\n`
  );
}
