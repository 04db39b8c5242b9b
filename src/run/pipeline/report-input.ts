/**
 * The hook to the report (src/report): the pipeline hands it every product and diagnostic of a
 * target as a TargetReportInput, and the report renders report.html. The report computes no
 * science; this file only selects what it shows (the cut-out around the fitted lines).
 */
import type { Diagnostic } from '../../diagnostics.js';
import type { CalibratedFrame } from '../../products/frame.js';
import type { LineTable } from '../../products/lines.js';
import type { WavelengthSolution } from '../../products/wavelength.js';
import type { SpectrumCutout, TargetReportInput } from '../../report/types.js';
import type { TargetJob } from '../target-job.js';

/** Columns kept on each side of the outermost fitted line in the cut-out. */
const CUTOUT_MARGIN_PX = 40;

/** The sky-subtracted frame around the fitted lines, with the wavelength of each column at the central row. */
export function lineCutout(frame: CalibratedFrame, solution: WavelengthSolution, lines: LineTable): SpectrumCutout | undefined {
  const xs = lines.measurements.map((m) => m.centerPx).filter(Number.isFinite);
  if (xs.length === 0) return undefined;
  const x0 = Math.max(0, Math.floor(Math.min(...xs)) - CUTOUT_MARGIN_PX);
  const x1 = Math.min(frame.width, Math.ceil(Math.max(...xs)) + CUTOUT_MARGIN_PX + 1);
  const width = x1 - x0;
  const data = new Float32Array(width * frame.height);
  for (let y = 0; y < frame.height; y++) data.set(frame.sci.subarray(y * frame.width + x0, y * frame.width + x1), y * width);
  const mid = Math.floor(frame.height / 2) * solution.width;
  return { x0, width, height: frame.height, data, wavelength: solution.wave.slice(mid + x0, mid + x1) };
}

export interface ReportProducts {
  frame?: CalibratedFrame;
  solution?: WavelengthSolution;
  lines?: LineTable;
  velocities?: TargetReportInput['velocities'];
  curve?: TargetReportInput['curve'];
}

/** What the report of one target receives; `failure` makes it the short page of a failed target. */
export function targetReportInput(job: TargetJob, p: ReportProducts, diagnostics: Diagnostic[], provenance: Record<string, unknown>, failure?: string): TargetReportInput {
  const input: TargetReportInput = {
    name: job.target.name,
    setup: job.setup.name,
    status: failure === undefined ? 'ok' : 'failed',
    diagnostics,
    provenance,
  };
  const object = p.frame?.header.getString('OBJECT');
  if (object !== undefined) input.object = object;
  if (failure !== undefined) input.failure = failure;
  if (p.solution) input.solution = p.solution;
  if (p.lines) input.lines = p.lines;
  if (p.velocities) input.velocities = p.velocities;
  if (p.curve) input.curve = p.curve;
  if (p.frame && p.solution && p.lines) {
    const cutout = lineCutout(p.frame, p.solution, p.lines);
    if (cutout) input.cutout = cutout;
  }
  return input;
}
