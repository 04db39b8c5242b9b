/** What the report renders. It reads products and diagnostics; it computes no science. */
import type { Diagnostic } from '../diagnostics.js';
import type { LineTable } from '../products/lines.js';
import type { RotationCurve, VelocityTable } from '../products/curve.js';
import type { WavelengthSolution } from '../products/wavelength.js';

/** A cut-out of the calibrated 2-D spectrum around the fitted lines (internal orientation). */
export interface SpectrumCutout {
  /** First internal column of the cut-out. */
  x0: number;
  width: number;
  height: number;
  /** Sky-subtracted electrons, row-major. */
  data: Float32Array;
  /** Wavelength (Angstrom) of each column at the central row, for the axis. */
  wavelength: Float64Array;
}

export interface TargetReportInput {
  /** Target name from the manifest. */
  name: string;
  /** OBJECT from the science header, if any. */
  object?: string;
  setup: string;
  /** Status of the target; a failed target gets a short page with the reason. */
  status: 'ok' | 'failed';
  failure?: string;
  solution?: WavelengthSolution;
  lines?: LineTable;
  velocities?: VelocityTable;
  curve?: RotationCurve;
  cutout?: SpectrumCutout;
  diagnostics: Diagnostic[];
  /** Provenance as written to provenance.json (rendered as a table, not interpreted). */
  provenance: Record<string, unknown>;
}

export interface RunIndexEntry {
  name: string;
  /** Folder of the target's products, relative to the index. */
  folder: string;
  status: 'ok' | 'failed';
  failure?: string;
  vSys?: number;
  vSysErr?: number;
  vOuter?: number;
  inclinationDeg?: number;
  distanceMpc?: number;
  warnings: number;
  /** The folded curve, for the thumbnail. */
  curve?: { rKpc: number[]; vRot: number[]; err: number[] };
}

export interface RunIndexInput {
  title: string;
  whorlVersion: string;
  targets: RunIndexEntry[];
}
