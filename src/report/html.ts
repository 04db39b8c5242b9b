/** Escaping for text that comes from headers and manifests (an OBJECT of `<script>` stays text). */

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

export function escapeHtml(text: unknown): string {
  return String(text).replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);
}

/** JSON safe inside <script type="application/json">: no `</script>`, no HTML comment openers. */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value)
    .replace(/</g, '\\u003c')
    .replace(/>/g, '\\u003e')
    .replace(/&/g, '\\u0026')
    .replace(/\u2028/g, '\\u2028')
    .replace(/\u2029/g, '\\u2029');
}

/** A number for display with a fixed number of decimals; an em dash for NaN or undefined. */
export function fmt(value: number | undefined, decimals = 1): string {
  return value === undefined || !Number.isFinite(value) ? '\u2014' : value.toFixed(decimals);
}

/**
 * The 1-based row along the slit in the trimmed data section (as rows.csv counts them) of an
 * internal 0-based row: internal rows keep the raw axis's sense (Orientation, products/frame.ts).
 */
export function fileRow(internalRow: number): number {
  return internalRow + 1;
}
