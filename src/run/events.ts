/**
 * What a run tells the outside while it goes: one event type, shared by the live display, the
 * plain line-by-line log and `--json` (one event per line). Times are seconds since the run began.
 */

export type TargetStatus = 'ok' | 'failed' | 'cached';

export type RunEvent =
  | { type: 'run-start'; t: number; targets: string[]; jobs: number; stages: string[] }
  | { type: 'setup-start'; t: number; setup: string; targets: string[] }
  | { type: 'setup-done'; t: number; setup: string; status: 'ok' | 'failed' | 'cached'; reason?: string }
  | { type: 'target-start'; t: number; target: string }
  /** A stage begins; `index` counts from 0 among `total` stages of the target. */
  | { type: 'stage'; t: number; target?: string; setup?: string; stage: string; index: number; total: number }
  | { type: 'target-done'; t: number; target: string; status: TargetStatus; reason?: string; seconds: number }
  /** Something the user should know that is neither progress nor a failure. */
  | { type: 'notice'; t: number; message: string }
  | { type: 'run-done'; t: number; ok: number; failed: number; cached: number; seconds: number; summary: string };

export type EventSink = (e: RunEvent) => void;
