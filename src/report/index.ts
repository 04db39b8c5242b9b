export type { TargetReportInput, RunIndexInput, RunIndexEntry, SpectrumCutout } from './types.js';
export { renderTargetReport } from './target-report.js';
export { renderRunIndex } from './run-index.js';
export { escapeHtml } from './html.js';
