/**
 * summary.json: per target status, key numbers and diagnostic counts, in manifest order. It is a
 * product and byte-identical on rerun: timings go to timings.json and provenance.json instead.
 */
import type { Diagnostic } from '../diagnostics.js';

export interface DiagnosticCounts {
  info: number;
  warning: number;
  error: number;
}

/** The numbers a reader looks at first; absent when the stage that gives them did not run. */
export interface KeyNumbers {
  /** Systemic velocity and its error, km/s (convention and frame as in the target's settings). */
  vSysKms?: number;
  vSysErrKms?: number;
  /** Error-weighted outer rotation speed, km/s. */
  vOuterKms?: number;
  inclinationDeg?: number;
  curvePoints?: number;
  /** Largest deprojected radius of the curve, kpc. */
  rMaxKpc?: number;
  curveShape?: string;
  /** RMS of the wavelength solution, Angstrom, and the flexure shift, km/s. */
  arcRmsAngstrom?: number;
  flexureKms?: number;
  lineMeasurements?: number;
}

export interface SummaryEntry {
  name: string;
  folder: string;
  setup: string;
  status: 'ok' | 'failed' | 'not-run';
  /** Why it failed, in one line, with the error code. */
  reason?: string;
  reasonCode?: string;
  /** Stages that ran, in order. */
  stages: string[];
  /** Product files, relative to the output folder. */
  products: string[];
  numbers: KeyNumbers;
  diagnostics: DiagnosticCounts;
}

export interface RunSummary {
  whorlVersion: string;
  /** Base name of the manifest file (no folder, so the summary does not depend on where the run sits). */
  manifest: string;
  counts: { ok: number; failed: number; notRun: number };
  targets: SummaryEntry[];
}

export function countDiagnostics(items: readonly Diagnostic[]): DiagnosticCounts {
  const c: DiagnosticCounts = { info: 0, warning: 0, error: 0 };
  for (const d of items) c[d.severity]++;
  return c;
}

export function buildSummary(whorlVersion: string, manifest: string, targets: SummaryEntry[]): RunSummary {
  const counts = { ok: 0, failed: 0, notRun: 0 };
  for (const t of targets) {
    if (t.status === 'ok') counts.ok++;
    else if (t.status === 'failed') counts.failed++;
    else counts.notRun++;
  }
  return { whorlVersion, manifest, counts, targets };
}
