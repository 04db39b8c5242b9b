/**
 * CCD stage speed and memory on the cached full-size simulated run (issue 4 targets): one science
 * frame calibrated with bias and flat (< 1 s), the single-frame Laplacian cleaning (< 5 s), and
 * the peak memory of the whole step (< 1 GB). Calibration building and the three-exposure
 * combination are timed too, without targets. Figures compare with the simulator's truth.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadRawFrame } from '../fits/raw-frame.js';
import { MASK_BITS } from '../products/frame.js';
import { toInternal } from '../products/orientation.js';
import type { RunTruth } from '../sim/truth.js';
import { buildCalibration, calibrateScience, DEFAULT_CCD_SETTINGS, type CcdCalibration } from '../stages/ccd/index.js';
import { laplacianClean } from '../stages/ccd/laplacian-clean.js';
import { RssPeak } from './harness/rss-peak.js';
import type { BenchContext, BenchRow } from './types.js';

export async function benchCcd(ctx: BenchContext): Promise<BenchRow[]> {
  const truth = JSON.parse(readFileSync(join(ctx.runDir, 'truth.json'), 'utf8')) as RunTruth;
  const setupName = Object.keys(truth.setups)[0]!;
  const names = (kind: string, target?: string): string[] =>
    Object.entries(truth.frames).filter(([, f]) => f.kind === kind && f.setup === setupName && (target === undefined || f.target === target)).map(([n]) => n);
  const load = (list: string[]) => list.map((n) => loadRawFrame(join(ctx.runDir, n)));
  const target = truth.targets.find((t) => t.setup === setupName)!;
  const scienceNames = names('science', target.name);
  const rss = new RssPeak();
  const rows: BenchRow[] = [];
  const cpuMs: number[] = [];
  const timed = <T>(f: () => T): [T, number, number] => {
    rss.take();
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const out = f();
    const wall = performance.now() - t0;
    const c = process.cpuUsage(c0);
    cpuMs.push((c.user + c.system) / 1000);
    return [out, wall, rss.take()];
  };
  const cpu = (): string => `cpu ${cpuMs[cpuMs.length - 1]!.toFixed(0)} ms`;
  try {
    const calibrationFrames = { bias: load(names('bias')), flat: load(names('flat')), arc: load(names('arc')) };
    const counts = `${calibrationFrames.bias.length} bias, ${calibrationFrames.flat.length} flat, ${calibrationFrames.arc.length} arc`;
    const [calResult, calMs, calRss] = timed(() => buildCalibration(calibrationFrames, DEFAULT_CCD_SETTINGS));
    calibrationFrames.bias = calibrationFrames.flat = calibrationFrames.arc = []; // the runner drops them too
    const science = load(scienceNames);
    const cal = calResult.product;
    const expectedColumns = [...truth.setups[setupName]!.detector.hotColumns].sort((a, b) => a - b);
    rows.push({
      name: `ccd: build calibration ${cal.width}x${cal.height} (${counts})`,
      wallMs: calMs, peakRssMb: calRss,
      figure: `${cpu()}; ${cal.badColumns.length} bad columns (${JSON.stringify(cal.badColumns) === JSON.stringify(expectedColumns) ? 'as injected' : 'NOT as injected'})`,
    });
    // In a function of its own, so that its frames are garbage before the combination runs.
    const single = (): [number, number, number, number] => {
      const plain = { ...DEFAULT_CCD_SETTINGS, cleanSingleExposure: false };
      const [frame, oneMs, oneRss] = timed(() => calibrateScience([science[0]!], cal, plain).product);
      rows.push({ name: 'ccd: calibrate one science frame (overscan, bias, flat, gain, variance, mask)', wallMs: oneMs, peakRssMb: oneRss, figure: cpu(), target: '< 1000 ms' });
      const skip = new Uint16Array(frame.mask.length);
      for (let i = 0; i < skip.length; i++) skip[i] = frame.mask[i]! & ~MASK_BITS.cosmicRay;
      const [clean, cleanMs, cleanRss] = timed(() => laplacianClean(frame.sci, frame.var, skip, cal.width, cal.height, DEFAULT_CCD_SETTINGS.laplacian));
      const hit = injectedHits(truth, [scienceNames[0]!], cal);
      let found = 0;
      for (const p of hit) if (clean.hits[p] || skip[p]) found++;
      const flagged = clean.hits.reduce((a, b) => a + b, 0);
      rows.push({ name: 'ccd: single-frame Laplacian cleaning (van Dokkum 2001)', wallMs: cleanMs, peakRssMb: cleanRss, figure: `${cpu()}; ${((100 * found) / hit.length).toFixed(1)}% of ${hit.length} injected hit pixels masked, ${flagged} flagged, rounds ${clean.perRound.join('/')}`, target: '< 5000 ms' });
      return [oneMs, oneRss, cleanMs, cleanRss];
    };
    const [oneMs, oneRss, cleanMs, cleanRss] = single();
    const [all, allMs, allRss] = timed(() => calibrateScience(science, cal, DEFAULT_CCD_SETTINGS));
    const hit = injectedHits(truth, scienceNames, cal);
    let found = 0;
    for (const p of hit) if (all.product.rejected![p] || all.product.mask[p]) found++;
    rows.push({ name: `ccd: calibrate and combine ${science.length} exposures with cosmic-ray rejection`, wallMs: allMs, peakRssMb: allRss, figure: `${cpu()}; ${((100 * found) / hit.length).toFixed(1)}% of ${hit.length} injected hit pixels rejected or masked` });
    rows.push({ name: 'ccd: peak memory of the whole step', wallMs: calMs + oneMs + cleanMs + allMs, peakRssMb: Math.max(calRss, oneRss, cleanRss, allRss), target: '< 1024 MB' });
  } finally {
    await rss.stop();
  }
  return rows;
}

/** Internal indices of the pixels the simulator hit in these frames (truth lists raw trimmed pixels). */
function injectedHits(truth: RunTruth, frames: string[], cal: CcdCalibration): number[] {
  const tw = cal.orientation.transpose ? cal.height : cal.width;
  const th = cal.orientation.transpose ? cal.width : cal.height;
  const raw = new Uint16Array(tw * th);
  for (const name of frames) {
    const c = truth.frames[name]!.cosmicRays;
    for (let k = 0; k < c.x.length; k++) raw[c.y[k]! * tw + c.x[k]!] = 1;
  }
  const internal = toInternal(raw, tw, th, cal.orientation).data;
  const out: number[] = [];
  for (let i = 0; i < internal.length; i++) if (internal[i]) out.push(i);
  return out;
}
