/** A small simulated run (src/sim) calibrated once per variant and shared by the CCD tests. */
import { simulateRun, simFrameToRaw, type SimulatedRun, type SimVariant } from '../../../src/sim/index.js';
import { buildCalibration } from '../../../src/stages/ccd/build-calibration.js';
import type { CcdCalibration } from '../../../src/stages/ccd/calibration.js';
import { DEFAULT_CCD_SETTINGS, type CcdSettings } from '../../../src/stages/ccd/settings.js';
import type { RawFrame } from '../../../src/products/frame.js';
import type { Diagnostic } from '../../../src/diagnostics.js';

export interface CalibratedRun {
  run: SimulatedRun;
  raw: Map<string, RawFrame>;
  byKind: (kind: 'bias' | 'flat' | 'arc' | 'science') => RawFrame[];
  cal: CcdCalibration;
  diagnostics: Diagnostic[];
}

const cache = new Map<string, CalibratedRun>();

export function calibratedRun(variant: SimVariant, settings: CcdSettings = DEFAULT_CCD_SETTINGS, seed = 7): CalibratedRun {
  const key = `${variant}:${seed}:${JSON.stringify(settings)}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const run = simulateRun({ size: 'small', variant, expected: true, seed });
  const raw = new Map(run.frames.map((f) => [f.name, simFrameToRaw(f)]));
  const byKind = (kind: string): RawFrame[] => run.frames.filter((f) => f.kind === kind).map((f) => raw.get(f.name)!);
  const result = buildCalibration({ bias: byKind('bias'), flat: byKind('flat'), arc: byKind('arc') }, settings);
  const out = { run, raw, byKind, cal: result.product, diagnostics: result.diagnostics };
  cache.set(key, out);
  return out;
}
