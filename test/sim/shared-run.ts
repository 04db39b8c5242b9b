/** Small simulated runs shared by the simulator's tests (each made once per test file). */
import { simulateRun, type SimFrame, type SimulatedRun } from '../../src/sim/index.js';

export const standardRun: () => SimulatedRun = once(() => simulateRun({ expected: true }));

function once<T>(make: () => T): () => T {
  let value: T | undefined;
  return () => (value ??= make());
}

export function frameOf(run: SimulatedRun, name: string): SimFrame {
  const f = run.frames.find((x) => x.name === name);
  if (!f) throw new Error(`no frame ${name}`);
  return f;
}

/** Electrons above the bias of trimmed raw pixel (x, y): (ADU - overscan mean of its row) x gain. */
export function electronsAboveBias(run: SimulatedRun, frame: SimFrame, x: number, y: number, overscanMean: Float64Array): number {
  const det = run.truth.setups[run.truth.frames[frame.name]!.setup]!.detector;
  return (frame.adu[y * frame.width + x]! - overscanMean[y]!) * det.gainEPerAdu;
}

/** Mean of the overscan strip of each row (ADU). */
export function overscanRowMeans(run: SimulatedRun, frame: SimFrame): Float64Array {
  const x0 = trimmedWidth(run, frame);
  const out = new Float64Array(frame.height);
  for (let y = 0; y < frame.height; y++) {
    let s = 0;
    for (let x = x0; x < frame.width; x++) s += frame.adu[y * frame.width + x]!;
    out[y] = s / (frame.width - x0);
  }
  return out;
}

export function trimmedWidth(run: SimulatedRun, frame: SimFrame): number {
  const setup = run.truth.setups[run.truth.frames[frame.name]!.setup]!;
  return setup.orientation.transpose ? setup.internalHeight : setup.internalWidth;
}
