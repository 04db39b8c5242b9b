export * from './manifest/index.js';
export * from './names.js';
export * from './inventory/index.js';
export { reduceRun, selectTargets, type ReduceOptions, type ReduceResult } from './runner.js';
export type { RunEvent, EventSink, TargetStatus } from './events.js';
export type { RunSummary, SummaryEntry, KeyNumbers, DiagnosticCounts } from './summary.js';
export { jsonProgress, plainProgress, liveProgress } from './progress/index.js';
export { rebuildReports } from './report-files.js';
